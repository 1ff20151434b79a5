/**
 * One year's monthly figures for one worker from a histogram tile: shift hours, hours above the
 * limit and hours lost to rest breaks, per calendar month.
 *
 * For each month m and local hour h the slot's WBGT histogram (sun or shade, by exposure) goes
 * through the work model's own `estimateFromHistogram` (pipeline/work/histogram-estimate.ts: hours
 * spread evenly within a 0.25 °C bin, the bin holding the threshold split linearly, f at the
 * middle of the part above it) and is scaled by the slot's shift share (shift-shares.ts):
 *
 *   above(y, m) = Σ_h share(y, m, h) · hoursAbove(hist(y, m, h))       [h]
 *   lost(y, m)  = Σ_h share(y, m, h) · hoursLost(hist(y, m, h))        [h]
 *   shift(y, m) = Σ_h share(y, m, h) · hours(hist(y, m, h))            [h]
 *
 * Breaks in the shade while working in the sun pair each sun bin with a shade WBGT by quantile
 * (rest-wbgt.ts); each bin above the threshold then goes through `estimateFromHistogram` alone
 * with its own rest WBGT.
 */
import { HIST_LEN, HOURS, MONTHS, N_EXPOSURES } from '../../../pipeline/reduce/layout.ts';
import { WBGT_BIN_EDGES, estimateFromHistogram, type Exposure, type WorkKernel } from '../../../pipeline/work/index.ts';
import { histogramQuantile } from './rest-wbgt.ts';
import type { YearShiftShares } from './shift-shares.ts';

/** Where breaks are taken: where the work is, in the shade (see rest-wbgt.ts), or at a fixed measured WBGT [°C]. */
export type RestChoice = { kind: 'same-place' } | { kind: 'shade' } | { kind: 'fixed'; wbgt: number };

/** One year's figures, per month (index 0 = January). */
export interface MonthlyYear {
  year: number;
  /** Hours of data in the month, all hours of the day [h]. */
  validHours: Float64Array;
  /** Hours the month holds (days × 24) [h]. */
  expectedHours: Float64Array;
  /** Hours of data inside the shift [h]. */
  shiftHours: Float64Array;
  /** Hours above the limit inside the shift, per worker [h]. */
  above: Float64Array;
  /** Hours lost to rest breaks inside the shift, per worker [h]. */
  lost: Float64Array;
}

/** What the figures depend on besides the histogram. */
export interface MonthlySettings {
  kernel: WorkKernel;
  exposure: Exposure;
  rest: RestChoice;
}

/**
 * Monthly figures of one year from `hist` (months × hours × exposures × bins [h], the tile layout
 * of pipeline/publish/histogram-tiles.ts and point-tile-codec.ts) and that year's shift shares.
 * Catalogued error from pipeline/work: LimitOutsideHistogram (threshold below 5 °C or above 45 °C).
 */
export function monthlyFigures(hist: Float64Array, shares: YearShiftShares, s: MonthlySettings): MonthlyYear {
  const year = shares.year;
  const out: MonthlyYear = {
    year,
    validHours: new Float64Array(MONTHS),
    expectedHours: Float64Array.from({ length: MONTHS }, (_, m) => 24 * new Date(Date.UTC(year, m + 1, 0)).getUTCDate()),
    shiftHours: new Float64Array(MONTHS),
    above: new Float64Array(MONTHS),
    lost: new Float64Array(MONTHS),
  };
  const x = s.exposure === 'sun' ? 0 : 1;
  for (let m = 0; m < MONTHS; m++) {
    for (let h = 0; h < HOURS; h++) {
      const slot = (m * HOURS + h) * N_EXPOSURES;
      const sunOff = slot * HIST_LEN;
      for (let j = 0; j < HIST_LEN; j++) out.validHours[m] += hist[sunOff + j];
      const share = shares.share[m * HOURS + h];
      if (share === 0) continue;
      const off = (slot + x) * HIST_LEN;
      const counts = hist.subarray(off, off + HIST_LEN);
      const paired = s.rest.kind === 'shade' && x === 0;
      const e = estimateFromHistogram(WBGT_BIN_EDGES, counts, s.kernel, s.rest.kind === 'fixed' ? s.rest.wbgt : null);
      out.shiftHours[m] += share * e.hours;
      out.above[m] += share * e.hoursAbove;
      out.lost[m] += share * (paired ? lostRestingInShade(hist, off, (slot + 1) * HIST_LEN, s.kernel, e.hours) : e.hoursLost);
    }
  }
  return out;
}

const scratch = new Float64Array(HIST_LEN);

/**
 * Hours lost [h] of the sun histogram at `sunOff` when breaks are in the shade, each sun bin
 * resting at the shade WBGT of the same cumulative share (rest-wbgt.ts); `hours` = the slot's hours [h].
 */
function lostRestingInShade(hist: Float64Array, sunOff: number, shadeOff: number, kernel: WorkKernel, hours: number): number {
  const edges = WBGT_BIN_EDGES;
  const thr = kernel.threshold;
  let lost = 0;
  let below = 0;
  for (let j = 0; j < HIST_LEN; j++) {
    const c = hist[sunOff + j];
    if (c === 0) continue;
    const top = j === HIST_LEN - 1;
    if (j > 0 && (top || edges[j] > thr)) {
      // Share of the slot's sun hours below the point where the estimate evaluates f: the middle
      // of the bin's part above the threshold (the open top bin: its middle by count).
      let frac = 0.5;
      if (!top) {
        const lo = edges[j - 1];
        const hi = edges[j];
        frac = (0.5 * (Math.max(lo, thr) + hi) - lo) / (hi - lo);
      }
      const rest = histogramQuantile(hist, shadeOff, (below + frac * c) / hours);
      scratch[j] = c;
      lost += estimateFromHistogram(edges, scratch, kernel, rest).hoursLost;
      scratch[j] = 0;
    }
    below += c;
  }
  return lost;
}
