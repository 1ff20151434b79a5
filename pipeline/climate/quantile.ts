/**
 * Quantiles by linear interpolation between order statistics: Hyndman & Fan (1996) type 7, the
 * default of R's `quantile()` and numpy's `percentile()` (docs/methods.md §10.1).
 *
 * Sort ascending x(1) … x(n); h = (n − 1)·p + 1; Q(p) = x(⌊h⌋) + (h − ⌊h⌋)·(x(⌊h⌋+1) − x(⌊h⌋)).
 * For n = 30: median = (x15 + x16)/2, P90 = x27 + 0.1·(x28 − x27).
 * NaN values (missing years) are left out and counted; n = 0 gives NaN.
 */
import { ClimateProbabilityOutOfRange } from './errors.ts';

/** A quantile with the number of values it was computed from. */
export interface QuantileResult {
  /** The quantile [units of the values]; NaN when no value was finite. */
  value: number;
  /** Values used (finite) [count]. */
  n: number;
  /** Values left out because they were NaN (or ±Infinity) [count]. */
  excluded: number;
}

/** Throws ClimateProbabilityOutOfRange unless 0 ≤ p ≤ 1. */
export function checkProbability(p: number): void {
  if (!(p >= 0 && p <= 1)) throw ClimateProbabilityOutOfRange({ p }, { key: 'p' });
}

/**
 * Type-7 quantile of the first `n` values of an ascending, finite array (no checks on the order).
 * @param sorted Values sorted ascending [any unit]
 * @param p Probability [1], 0 ≤ p ≤ 1 (not checked here; see {@link quantile})
 * @param n How many leading values of `sorted` to use [count]
 * @returns Q(p) [unit of the values]; NaN when n = 0
 */
export function quantileSorted(sorted: ArrayLike<number>, p: number, n: number = sorted.length): number {
  if (n <= 0) return NaN;
  const h = (n - 1) * p; // 0-based position: h − 1 in the 1-based formula
  const j = Math.floor(h);
  if (j >= n - 1) return sorted[n - 1];
  const g = h - j;
  const lo = sorted[j];
  return g === 0 ? lo : lo + g * (sorted[j + 1] - lo);
}

/**
 * The finite values of `values`, sorted ascending, and how many were left out.
 * @param values Any values [any unit]; NaN and ±Infinity are left out
 */
export function sortFinite(values: ArrayLike<number>): { sorted: Float64Array; excluded: number } {
  const out = new Float64Array(values.length);
  let n = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (Number.isFinite(v)) out[n++] = v;
  }
  const sorted = out.subarray(0, n).sort();
  return { sorted, excluded: values.length - n };
}

/**
 * Type-7 quantile of unsorted values, NaN years left out and counted.
 * @param values One value per year [any unit], NaN where the year is missing
 * @param p Probability [1], 0 ≤ p ≤ 1 (0.5 = median, 0.9 = 90th-percentile year)
 */
export function quantile(values: ArrayLike<number>, p: number): QuantileResult {
  checkProbability(p);
  const { sorted, excluded } = sortFinite(values);
  return { value: quantileSorted(sorted, p), n: sorted.length, excluded };
}
