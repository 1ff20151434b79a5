/**
 * Region histograms for the browser calculator: per year, the area-weighted mean over a region's
 * cells of the hourly WBGT counts per month × local hour × exposure × bin [h]. A region's figure
 * computed from them is the area-weighted mean of its cells' figures, as in the region tables,
 * since the estimate is linear in the counts.
 */
import type { CellWeights } from '../regions/index.ts';
import type { YearCounts } from './merge.ts';
import { HIST_LEN, HOURS, MONTHS, N_EXPOSURES } from './layout.ts';

/** Values per region-year: months × hours × exposures × bins. */
export const REGION_HIST_SIZE = MONTHS * HOURS * N_EXPOSURES * HIST_LEN;

/**
 * Adds one year's cell histograms into region histograms.
 * @param landIndex global cell index → position in `yc.cells` (−1 for cells not computed)
 * @returns per region a Float32Array of REGION_HIST_SIZE [h]
 */
export function regionHistograms(yc: YearCounts, regions: readonly CellWeights[], landIndex: Int32Array): Float32Array[] {
  const per = REGION_HIST_SIZE;
  return regions.map((w) => {
    const out = new Float64Array(per);
    let total = 0;
    for (let j = 0; j < w.cells.length; j++) {
      const c = landIndex[w.cells[j]];
      if (c < 0) continue;
      total += w.weight[j];
    }
    for (let j = 0; j < w.cells.length; j++) {
      const c = landIndex[w.cells[j]];
      if (c < 0 || total <= 0) continue;
      const wt = w.weight[j] / total;
      const src = yc.histogram.subarray(c * per, (c + 1) * per);
      for (let k = 0; k < per; k++) if (src[k] !== 0) out[k] += wt * src[k];
    }
    return Float32Array.from(out);
  });
}
