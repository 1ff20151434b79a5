/**
 * The rest-place WBGT the calculator pairs with each sun hour when work is in the sun and breaks
 * are in the shade.
 *
 * A one-dimensional histogram does not pair each sun hour with the shade WBGT of the same hour
 * (the pipeline's `restLocation: shade` does, hour by hour). Our approximation, per year × month ×
 * local hour slot: the sun and shade WBGT of a slot are taken as perfectly rank-correlated (the
 * hottest sun hours are the hottest shade hours, which holds closely since both follow the same
 * air temperature and humidity), so the sun hours at cumulative share p of the slot's sun
 * histogram rest at the shade WBGT at the same share p of the slot's shade histogram
 * ("quantile pairing"), with hours spread evenly within each 0.25 °C bin as in
 * pipeline/work/histogram-estimate.ts. Its error is measured against a pipeline build with
 * `restLocation: shade` (test/site/estimate-logic.test.ts) and stated on the page; the simpler
 * choice of the slot's mean shade WBGT for every hour was measured too and is several times worse
 * (it gives the hot hours too cool a rest place).
 */
import { HIST_LEN } from '../../../pipeline/reduce/layout.ts';
import { WBGT_BIN_EDGES } from '../../../pipeline/work/index.ts';

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
