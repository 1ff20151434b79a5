/**
 * Hours above the limit and hours lost estimated from a histogram of hourly WBGT instead of the
 * hours themselves (for the browser calculator, which gets counts per month × local hour).
 *
 * Within each bin the hours are taken as spread evenly. Bins wholly above the threshold
 * (L(M_w) − CAV, see work-fraction.ts) count in full; the bin that holds the threshold counts the
 * share above it, linearly: `count·(upper − threshold)/(upper − lower)`. Hours lost per bin are
 * the hours above times `1 − f` at the middle of the part above the threshold (midpoint rule);
 * the open top bin uses `f` at its lower edge. The open bottom bin is below the threshold
 * whenever the threshold is inside the edges; a threshold outside the edges is an error
 * (LimitOutsideHistogram), since the open bins cannot be split.
 *
 * Rest elsewhere can only be a fixed WBGT here (`restWbgt`), since a one-dimensional histogram
 * does not pair each hour with its rest-place WBGT.
 */
import { LimitOutsideHistogram, WbgtHistogramInvalid } from './errors.ts';
import { allowableWorkFraction, type WorkKernel } from './work-fraction.ts';

/** What the histogram gives. All in hours. */
export interface HistogramEstimate {
  /** Hours counted (all bins) [h]. */
  hours: number;
  /** Expected hours above the limit [h]. */
  hoursAbove: number;
  /** Expected hours lost to rest, Σ (1 − f) [h]. */
  hoursLost: number;
}

/**
 * Estimates hours above the limit and hours lost from `counts` over `edges` [°C] (layout of
 * wbgt-bins.ts: counts.length = edges.length + 1) for one work kernel (class, limit, clothing).
 * `restWbgt` [°C]: measured WBGT of a fixed rest place, or null to rest in the same place.
 * Catalogued errors: WbgtHistogramInvalid, LimitOutsideHistogram.
 */
export function estimateFromHistogram(
  edges: ArrayLike<number>,
  counts: ArrayLike<number>,
  kernel: WorkKernel,
  restWbgt: number | null = null,
): HistogramEstimate {
  const nE = edges.length;
  if (nE < 2) throw WbgtHistogramInvalid({ problem: `${nE} edge(s); at least 2 are needed` });
  if (counts.length !== nE + 1) throw WbgtHistogramInvalid({ problem: `${counts.length} counts for ${nE} edges; expected ${nE + 1}` });
  for (let j = 0; j < nE; j++) {
    if (!Number.isFinite(edges[j]) || (j > 0 && !(edges[j] > edges[j - 1]))) {
      throw WbgtHistogramInvalid({ problem: `edge ${j} (${edges[j]}) is not finite or not above the previous edge` });
    }
  }
  let hours = 0;
  for (let j = 0; j <= nE; j++) {
    const c = counts[j];
    if (!Number.isFinite(c) || c < 0) throw WbgtHistogramInvalid({ problem: `count ${j} is ${c}; counts must be finite and not negative` });
    hours += c;
  }
  const thr = kernel.threshold;
  const lower = edges[0];
  const upper = edges[nE - 1];
  if (thr < lower || thr > upper) throw LimitOutsideHistogram({ threshold: thr, lower, upper });

  let hoursAbove = 0;
  let hoursLost = 0;
  for (let j = 1; j < nE; j++) {
    const c = counts[j];
    if (c === 0) continue;
    const lo = edges[j - 1];
    const hi = edges[j];
    if (hi <= thr) continue;
    const from = lo >= thr ? lo : thr;
    const share = (hi - from) / (hi - lo);
    const above = c * share;
    hoursAbove += above;
    hoursLost += above * (1 - allowableWorkFraction(0.5 * (from + hi), restWbgt, kernel));
  }
  const top = counts[nE];
  if (top > 0) {
    hoursAbove += top;
    hoursLost += top * (1 - allowableWorkFraction(upper, restWbgt, kernel));
  }
  return { hours, hoursAbove, hoursLost };
}
