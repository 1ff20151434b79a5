/**
 * Typical WBGT per month and local hour for a region, from its calculator histogram tiles
 * (src/data/region-histograms.ts `loadPooledHistograms`): for each month and local clock hour
 * (the hour starting then), the hours of all baseline years are pooled (area-weighted over the region's grid cells, as the
 * tile stores them) and their median is taken. Within a 0.25 °C bin the hours are taken as spread
 * evenly, as pipeline/work/histogram-estimate.ts does; the median is then the grouped-data
 * median `lo + (N/2 − F)/f · w` (lower edge of the median bin, hours below it F, hours in it f,
 * width w; the textbook formula for grouped data). A median in an open end bin is ±Infinity
 * (below 5 °C, at or above 45 °C). Pure.
 */
import { HIST_LEN, HOURS, MONTHS } from '../../../pipeline/reduce/layout.ts';
import { WBGT_BIN_EDGES } from '../../../pipeline/work/wbgt-bins.ts';
import type { PooledHistograms } from '../../data/region-histograms.ts';

/**
 * The `p` quantile of binned hours (layout of pipeline/work/wbgt-bins.ts: an open bin below
 * `edges[0]`, closed bins, an open bin at or above the last edge) [°C].
 * @param counts hours per bin [h], read from `offset` for `edges.length + 1` bins
 * @param p quantile [0–1]
 * @returns the quantile [°C]; −Infinity / +Infinity in an open end bin; NaN with no hours
 */
export function binnedQuantile(counts: ArrayLike<number>, p: number, edges: ArrayLike<number> = WBGT_BIN_EDGES, offset = 0): number {
  const nBins = edges.length + 1;
  let total = 0;
  for (let j = 0; j < nBins; j++) total += counts[offset + j];
  if (!(total > 0)) return NaN;
  const target = p * total;
  let below = 0;
  for (let j = 0; j < nBins; j++) {
    const c = counts[offset + j];
    if (c > 0 && below + c >= target) {
      if (j === 0) return -Infinity;
      if (j === nBins - 1) return Infinity;
      const lo = edges[j - 1];
      const hi = edges[j];
      return lo + ((target - below) / c) * (hi - lo);
    }
    below += c;
  }
  return Infinity;
}

export interface HourMatrix {
  /** Which statistic the values are. */
  statistic: 'median';
  exposure: 'sun' | 'shade';
  /** The years pooled [year]. */
  years: number[];
  /** Median WBGT [°C], month-major: index = month0 × 24 + hour (NaN: no hours). */
  values: Float64Array;
  /** Hours pooled per month and hour [h]. */
  hours: Float64Array;
}

/** Index of (month 0–11, local hour 0–23) in {@link HourMatrix} arrays. */
export function matrixIndex(month0: number, hour: number): number {
  return month0 * HOURS + hour;
}

/** The median WBGT per month × local hour of hours pooled over the baseline years. */
export function typicalWbgtMatrix(h: PooledHistograms): HourMatrix {
  const values = new Float64Array(MONTHS * HOURS);
  const hours = new Float64Array(MONTHS * HOURS);
  for (let k = 0; k < MONTHS * HOURS; k++) {
    const offset = k * HIST_LEN;
    let n = 0;
    for (let b = 0; b < HIST_LEN; b++) n += h.counts[offset + b];
    values[k] = binnedQuantile(h.counts, 0.5, WBGT_BIN_EDGES, offset);
    hours[k] = n;
  }
  return { statistic: 'median', exposure: h.exposure, years: h.years, values, hours };
}
