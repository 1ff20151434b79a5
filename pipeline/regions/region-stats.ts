/**
 * Region statistics of per-cell fields: for each field, the area-weighted mean over the region's
 * cells (cells where the field is NaN are left out and the weight that remained is reported), and
 * the highest and lowest cell (for hours lost, the highest is the worst). Many fields at once:
 * `fields` is a fields × cells matrix, value[f · nCells + cell].
 *
 * Mean_f = Σ_c w_c·x_fc / Σ_c w_c over cells with finite x_fc (common practice for area-weighted
 * averages; weights from cell-weights.ts).
 */
import { RegionFieldShape } from './errors.ts';
import type { CellWeights } from './cell-weights.ts';

export interface RegionFieldStats {
  regionId: string;
  nFields: number;
  /** Area-weighted mean per field [unit of the field]; NaN when no cell has a value. */
  mean: Float64Array;
  /** Share of the region's weight whose cells had a value, per field [1]. */
  coveredWeight: Float64Array;
  /** Highest value per field [unit of the field] and its cell index (−1 when none). */
  max: Float64Array;
  maxCell: Int32Array;
  /** Lowest value per field [unit of the field] and its cell index (−1 when none). */
  min: Float64Array;
  minCell: Int32Array;
}

export interface RegionStatsOptions {
  /**
   * Smallest share of a cell inside the region for it to count as the highest or lowest [1];
   * default 0 (every overlapping cell). The mean always uses every cell by its weight.
   */
  extremesMinFraction?: number;
}

/**
 * Statistics of `nFields` fields over one region. Ties go to the lowest cell index.
 * @param w Cell weights of the region
 * @param fields value[f · nCells + cell] [any unit per field]
 * @param nFields Fields [count]
 * @param nCells Cells of the grid [count]
 */
export function regionFieldStats(
  w: CellWeights,
  fields: ArrayLike<number>,
  nFields: number,
  nCells: number,
  options: RegionStatsOptions = {},
): RegionFieldStats {
  if (fields.length !== nFields * nCells) {
    throw RegionFieldShape(
      { detail: `fields hold ${fields.length} values; ${nFields} fields × ${nCells} cells need ${nFields * nCells}` },
      { variable: 'fields' },
    );
  }
  const nc = w.cells.length;
  if (nc > 0 && w.cells[nc - 1] >= nCells) {
    throw RegionFieldShape({ detail: `region "${w.regionId}" uses cell ${w.cells[nc - 1]} but the fields have ${nCells} cells` }, { variable: 'fields' });
  }
  const minFraction = options.extremesMinFraction ?? 0;
  const mean = new Float64Array(nFields);
  const coveredWeight = new Float64Array(nFields);
  const max = new Float64Array(nFields);
  const min = new Float64Array(nFields);
  const maxCell = new Int32Array(nFields);
  const minCell = new Int32Array(nFields);
  const { cells, weight, fraction } = w;
  for (let f = 0; f < nFields; f++) {
    const base = f * nCells;
    let sw = 0;
    let swx = 0;
    let hi = -Infinity,
      lo = Infinity;
    let hiCell = -1,
      loCell = -1;
    for (let k = 0; k < nc; k++) {
      const c = cells[k];
      const x = fields[base + c];
      if (x !== x) continue;
      const wk = weight[k];
      sw += wk;
      swx += wk * x;
      if (fraction[k] >= minFraction) {
        if (x > hi) {
          hi = x;
          hiCell = c;
        }
        if (x < lo) {
          lo = x;
          loCell = c;
        }
      }
    }
    mean[f] = sw > 0 ? swx / sw : NaN;
    coveredWeight[f] = sw;
    max[f] = hiCell >= 0 ? hi : NaN;
    min[f] = loCell >= 0 ? lo : NaN;
    maxCell[f] = hiCell;
    minCell[f] = loCell;
  }
  return { regionId: w.regionId, nFields, mean, coveredWeight, max, maxCell, min, minCell };
}
