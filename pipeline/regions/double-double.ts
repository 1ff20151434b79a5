/**
 * Sums kept as double-double numbers (an unevaluated pair hi + lo of float64 values), so that a
 * region's sum over its cells comes out the same whichever way its cells are split into tiles and
 * whatever order the tiles are added in: the pair carries about 106 bits, and the float64 it is
 * finally rounded to is the correctly rounded sum except when the exact sum lies within about
 * n · 2⁻¹⁰⁶ of a rounding boundary (n terms).
 *
 * TwoSum (Knuth, The Art of Computer Programming vol. 2, §4.2.2, Theorem B; Møller 1965) gives the
 * rounding error of one addition exactly; FastTwoSum (Dekker 1971) renormalises a pair with
 * |hi| ≥ |lo|. Accumulation and pair addition as in the "sloppy" double-double addition of
 * Hida, Li and Bailey (2001, QD library, "Algorithms for quad-double precision floating point
 * arithmetic", §3), from memory.
 *
 * Layout: a Float64Array holds pairs at [2i] (hi) and [2i + 1] (lo).
 */

/** Adds `x` into the pair at `a[2i]`, `a[2i + 1]`. */
export function ddAdd(a: Float64Array, i: number, x: number): void {
  const hi = a[2 * i];
  const s = hi + x;
  const bb = s - hi;
  const e = hi - (s - bb) + (x - bb) + a[2 * i + 1];
  const h = s + e;
  a[2 * i] = h;
  a[2 * i + 1] = e - (h - s);
}

/** Adds the pair at `b[2j]`, `b[2j + 1]` into the pair at `a[2i]`, `a[2i + 1]`. */
export function ddAddPair(a: Float64Array, i: number, b: Float64Array, j: number): void {
  const ahi = a[2 * i];
  const bhi = b[2 * j];
  const s = ahi + bhi;
  const bb = s - ahi;
  const e = ahi - (s - bb) + (bhi - bb) + (a[2 * i + 1] + b[2 * j + 1]);
  const h = s + e;
  a[2 * i] = h;
  a[2 * i + 1] = e - (h - s);
}

/** The float64 value of the pair at `a[2i]`, `a[2i + 1]`. */
export function ddValue(a: Float64Array, i: number): number {
  return a[2 * i] + a[2 * i + 1];
}

/** Adds every pair of `b` into the pair at the same position of `a` (same lengths). */
export function ddAddAll(a: Float64Array, b: Float64Array): void {
  for (let i = 0; i < a.length >> 1; i++) ddAddPair(a, i, b, i);
}
