/**
 * Statistics across the replayed weather years: the mean, the median and the 90th-percentile year
 * with the climate stage's own quantile rule (pipeline/climate/quantile.ts: Hyndman & Fan 1996
 * type 7, docs/methods.md §10.1), and the number of years they come from.
 */
import { quantileSorted, sortFinite } from '../climate/quantile.ts';

/** Mean, median and P90 of one figure across years, with the years used. */
export interface Spread {
  mean: number;
  p50: number;
  p90: number;
  min: number;
  max: number;
  /** Years the figure comes from [count]. */
  n: number;
}

/** The spread of one value per year (all finite: a replay either finishes or throws). */
export function spread(values: ArrayLike<number>): Spread {
  const { sorted } = sortFinite(values);
  const n = sorted.length;
  let sum = 0;
  for (let i = 0; i < n; i++) sum += sorted[i];
  return {
    mean: n > 0 ? sum / n : NaN,
    p50: quantileSorted(sorted, 0.5),
    p90: quantileSorted(sorted, 0.9),
    min: n > 0 ? sorted[0] : NaN,
    max: n > 0 ? sorted[n - 1] : NaN,
    n,
  };
}
