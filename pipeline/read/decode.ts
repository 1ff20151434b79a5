/**
 * The fused hot-path decoder: mask (cf-mask.ts), unpack (cf-scale.ts) and convert units
 * (units.ts) in one pass over a typed array, with no per-value function call:
 * `out = missing(raw) ? NaN : raw * a + b`, where `a = scale_factor * k` and
 * `b = add_offset * k + c` for a linear unit conversion `canonical = k * source + c`.
 */
import type { MaskSpec } from './cf-mask.ts';
import type { ScaleOffset } from './cf-scale.ts';
import type { RawArray } from './source.ts';

/** A linear unit conversion: `canonical = k * source + c`. */
export interface LinearUnit {
  k: number;
  c: number;
}

export const IDENTITY_UNIT: LinearUnit = { k: 1, c: 0 };

/** Everything the decoder loop needs, in raw units for the tests and folded for the arithmetic. */
export interface DecodePlan {
  fill0: number;
  fill1: number;
  /** Further fill values beyond the first two (rare). */
  fillRest: number[];
  lo: number;
  hi: number;
  /** Multiplier [canonical units per raw step]. */
  a: number;
  /** Offset [canonical units]. */
  b: number;
}

/** Folds mask, packing and unit conversion into one plan. */
export function makeDecodePlan(mask: MaskSpec, so: ScaleOffset, unit: LinearUnit = IDENTITY_UNIT): DecodePlan {
  return {
    fill0: mask.fill.length > 0 ? mask.fill[0] : NaN,
    fill1: mask.fill.length > 1 ? mask.fill[1] : NaN,
    fillRest: mask.fill.slice(2),
    lo: mask.validMin,
    hi: mask.validMax,
    a: so.scale * unit.k,
    b: so.offset * unit.k + unit.c,
  };
}

/**
 * Decodes `n` raw values from `raw[from]` into `out[to]` [canonical units]; returns how many
 * were missing (fill, missing_value, NaN, or outside the valid range).
 */
export function decodeRun(raw: RawArray, from: number, n: number, out: Float32Array, to: number, p: DecodePlan): number {
  const { fill0, fill1, lo, hi, a, b } = p;
  let missing = 0;
  if (p.fillRest.length === 0) {
    for (let i = 0; i < n; i++) {
      const x = raw[from + i];
      if (x !== x || x === fill0 || x === fill1 || x < lo || x > hi) {
        out[to + i] = NaN;
        missing++;
      } else out[to + i] = x * a + b;
    }
    return missing;
  }
  const rest = p.fillRest;
  for (let i = 0; i < n; i++) {
    const x = raw[from + i];
    if (x !== x || x === fill0 || x === fill1 || x < lo || x > hi || rest.includes(x)) {
      out[to + i] = NaN;
      missing++;
    } else out[to + i] = x * a + b;
  }
  return missing;
}

/** Decodes a whole raw array into a new Float32Array [canonical units]. */
export function decodeAll(raw: RawArray, p: DecodePlan): { values: Float32Array; missing: number } {
  const values = new Float32Array(raw.length);
  const missing = decodeRun(raw, 0, raw.length, values, 0, p);
  return { values, missing };
}
