/**
 * Counter-based random numbers for the invented demo weather: every value is a pure function of
 * (seed, stream, day, node), so any day of any year can be computed without running the
 * generator from the start, and the result never depends on which years were asked for.
 *
 * The integer mixer is the 32-bit finaliser of MurmurHash3 (`fmix32`, Austin Appleby, public
 * domain); normal deviates use the Box–Muller transform (Box & Muller 1958, Ann. Math. Stat.
 * 29:610–611).
 */

/** MurmurHash3 32-bit finaliser [–]: a bijective avalanche mix of a 32-bit integer. */
export function fmix32(h: number): number {
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h >>> 0;
}

/** Hash of four integer keys to a 32-bit unsigned integer [–]. */
export function hash4(a: number, b: number, c: number, d: number): number {
  let h = fmix32((a | 0) ^ 0x9e3779b9);
  h = fmix32(h ^ Math.imul(b | 0, 0x85ebca6b));
  h = fmix32(h ^ Math.imul(c | 0, 0xc2b2ae35));
  h = fmix32(h ^ Math.imul(d | 0, 0x27d4eb2f));
  return h;
}

/** Uniform deviate in (0, 1) [–] for the given keys. */
export function uniform(seed: number, stream: number, index: number, node: number): number {
  return (hash4(seed, stream, index, node) + 0.5) / 4294967296;
}

/** Standard normal deviate [–] for the given keys (Box–Muller, cosine branch). */
export function normal(seed: number, stream: number, index: number, node: number): number {
  const u1 = uniform(seed, stream * 2 + 1, index, node);
  const u2 = uniform(seed, stream * 2 + 2, index, node);
  return Math.sqrt(-2 * Math.log(u1)) * Math.cos(2 * Math.PI * u2);
}
