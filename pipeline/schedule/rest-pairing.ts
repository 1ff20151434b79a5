/**
 * The rest-place WBGT paired with each sun hour when work is in the sun and breaks are in the
 * shade, from histograms alone.
 *
 * A one-dimensional histogram does not pair each sun hour with the shade WBGT of the same hour
 * (the pipeline's `restLocation: shade` does, hour by hour). Our approximation, per year × month ×
 * local hour slot: the sun and shade WBGT of a slot are taken as perfectly rank-correlated (the
 * hottest sun hours are the hottest shade hours, which holds closely since both follow the same
 * air temperature and humidity), so the sun hours at cumulative share p of the slot's sun
 * histogram rest at the shade WBGT at the same share p of the slot's shade histogram
 * ("quantile pairing"), with hours spread evenly within each 0.25 °C bin as in
 * pipeline/work/histogram-estimate.ts. Its error is measured against a pipeline build with
 * `restLocation: shade` (test/site/estimate-logic.test.ts) and stated on the estimate page; the
 * simpler choice of the slot's mean shade WBGT for every hour was measured too and is several
 * times worse (it gives the hot hours too cool a rest place).
 */
import { estimateFromHistogram } from '../work/histogram-estimate.ts';
import { WBGT_BIN_EDGES, WBGT_HISTOGRAM_LENGTH } from '../work/wbgt-bins.ts';
import type { WorkKernel } from '../work/work-fraction.ts';

const HIST_LEN = WBGT_HISTOGRAM_LENGTH;
const NE = WBGT_BIN_EDGES.length;

/**
 * The WBGT [°C] at cumulative share `p` (0–1) of the histogram `counts[offset …]` [h], linear
 * within bins; the open bins are taken at their edge (5 °C, 45 °C). Null when it holds no hours.
 */
export function histogramQuantile(counts: ArrayLike<number>, offset: number, p: number): number | null {
  let total = 0;
  for (let j = 0; j < HIST_LEN; j++) total += counts[offset + j];
  if (!(total > 0)) return null;
  const target = p * total;
  let below = 0;
  for (let j = 0; j < HIST_LEN; j++) {
    const c = counts[offset + j];
    if (c === 0) continue;
    if (below + c >= target) {
      if (j === 0) return WBGT_BIN_EDGES[0];
      if (j === HIST_LEN - 1) return WBGT_BIN_EDGES[NE - 1];
      const lo = WBGT_BIN_EDGES[j - 1];
      const hi = WBGT_BIN_EDGES[j];
      return lo + ((target - below) / c) * (hi - lo);
    }
    below += c;
  }
  return WBGT_BIN_EDGES[NE - 1];
}

const scratch = new Float64Array(HIST_LEN);

/**
 * Hours lost [h] of the sun histogram at `hist[sunOff …]` when breaks are in the shade, each sun
 * bin resting at the shade WBGT (histogram at `hist[shadeOff …]`) of the same cumulative share;
 * `hours` = the slot's sun hours [h].
 */
export function lostRestingInShade(hist: Float64Array, sunOff: number, shadeOff: number, kernel: WorkKernel, hours: number): number {
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
