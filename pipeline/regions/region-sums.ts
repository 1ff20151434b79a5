/**
 * Region statistics built tile by tile. A tile adds, for each region it overlaps, the area-weighted
 * sums of its cells' values (Σ w·x and Σ w over cells with a value, per year and field), the
 * highest cell of each field and the weighted WBGT histograms; parts of the same region from
 * different tiles are then added. Sums are double-double pairs (double-double.ts), so the result
 * does not depend on how the grid was cut into tiles or in which order the tiles were added.
 *
 * The region's value of a field in a year is Σ w·x / Σ w when the cells with a value hold at least
 * {@link REGION_MIN_COVERAGE} of the region's weight (weights sum to 1 over the region, cell-weights.ts
 * and land-mask.ts), NaN otherwise: the area-weighted mean of region-stats.ts, applied tile by tile.
 * Pure: arrays in, arrays out.
 */
import { ddAdd, ddAddAll, ddAddPair, ddValue } from './double-double.ts';

/** Share of a region's weight that must have a value for the region's value to count [1]. */
export const REGION_MIN_COVERAGE = 0.8;

/** The cells of one region inside one tile. */
export interface RegionTileCells {
  /** Region index in the build's region list. */
  region: number;
  /** Position of each cell in the tile's cell list (ascending). */
  local: Int32Array;
  /** Global cell index of each cell. */
  cells: Int32Array;
  /** The cell's share of the region [1] (the region's weights sum to 1). */
  weight: Float64Array;
  /** The cell's weight in the region's histograms: weight / Σ weight over the region's land cells [1]. */
  histWeight: Float64Array;
}

/** One figure's sums of one region over some of its cells. */
export interface RegionFigureSums {
  nYears: number;
  nFields: number;
  /** Σ w·x per year × field, double-double pairs: pair (y · nFields + f). */
  swx: Float64Array;
  /** Σ w over the cells with a value, per year × field, double-double pairs. */
  sw: Float64Array;
  /** Highest baseline mean of a cell per field [unit of the figure], NaN when none. */
  worstValue: Float64Array;
  /** That cell (global index), −1 when none; ties go to the lowest cell index. */
  worstCell: Int32Array;
}

export function emptyFigureSums(nYears: number, nFields: number): RegionFigureSums {
  return {
    nYears,
    nFields,
    swx: new Float64Array(2 * nYears * nFields),
    sw: new Float64Array(2 * nYears * nFields),
    worstValue: new Float64Array(nFields).fill(NaN),
    worstCell: new Int32Array(nFields).fill(-1),
  };
}

/**
 * Adds one year of a tile's values into a region's sums.
 * @param values per tile cell × field: values[local · nFields + f] [unit of the figure], NaN = no value
 */
export function addYearValues(s: RegionFigureSums, y: number, values: Float64Array, rc: RegionTileCells): void {
  const nF = s.nFields;
  const base = y * nF;
  for (let k = 0; k < rc.local.length; k++) {
    const c = rc.local[k];
    const w = rc.weight[k];
    const row = c * nF;
    for (let f = 0; f < nF; f++) {
      const x = values[row + f];
      if (x !== x) continue;
      ddAdd(s.swx, base + f, w * x);
      ddAdd(s.sw, base + f, w);
    }
  }
}

/** Folds a tile's cell baseline means (per tile cell × field) into the region's highest cell per field. */
export function addWorstCells(s: RegionFigureSums, mean: Float64Array, rc: RegionTileCells): void {
  const nF = s.nFields;
  for (let k = 0; k < rc.local.length; k++) {
    const row = rc.local[k] * nF;
    const cell = rc.cells[k];
    for (let f = 0; f < nF; f++) mergeWorst(s, f, mean[row + f], cell);
  }
}

function mergeWorst(s: RegionFigureSums, f: number, x: number, cell: number): void {
  if (x !== x || cell < 0) return;
  const v = s.worstValue[f];
  if (s.worstCell[f] < 0 || x > v || (x === v && cell < s.worstCell[f])) {
    s.worstValue[f] = x;
    s.worstCell[f] = cell;
  }
}

/** Adds part `b` of a region into `a` (same shape). */
export function addFigureSums(a: RegionFigureSums, b: RegionFigureSums): void {
  ddAddAll(a.swx, b.swx);
  ddAddAll(a.sw, b.sw);
  for (let f = 0; f < a.nFields; f++) mergeWorst(a, f, b.worstValue[f], b.worstCell[f]);
}

/**
 * The region's value per year × field [unit of the figure]: Σ w·x / Σ w where Σ w reaches
 * {@link REGION_MIN_COVERAGE}, else NaN.
 */
export function regionYearValues(s: RegionFigureSums): Float64Array {
  const n = s.nYears * s.nFields;
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const sw = ddValue(s.sw, i);
    out[i] = sw >= REGION_MIN_COVERAGE && sw > 0 ? ddValue(s.swx, i) / sw : NaN;
  }
  return out;
}

/**
 * Area-weighted means of per-cell values with no coverage rule (e.g. mean annual temperature):
 * `pairs` holds, per quantity q, the pairs Σ w·x at 2q and Σ w at 2q + 1.
 */
export function addWeightedMeans(pairs: Float64Array, values: ArrayLike<number>, nQuantities: number, rc: RegionTileCells): void {
  for (let k = 0; k < rc.local.length; k++) {
    const w = rc.weight[k];
    for (let q = 0; q < nQuantities; q++) {
      const x = values[rc.local[k] * nQuantities + q];
      if (x !== x) continue;
      ddAdd(pairs, 2 * q, w * x);
      ddAdd(pairs, 2 * q + 1, w);
    }
  }
}

/** The means of {@link addWeightedMeans}' pairs: Σ w·x / Σ w, NaN without a cell. */
export function weightedMeans(pairs: Float64Array, nQuantities: number): Float64Array {
  const out = new Float64Array(nQuantities);
  for (let q = 0; q < nQuantities; q++) {
    const sw = ddValue(pairs, 2 * q + 1);
    out[q] = sw > 0 ? ddValue(pairs, 2 * q) / sw : NaN;
  }
  return out;
}

/**
 * Adds the weighted histograms of a tile's cells of one region into `acc` (double-double pairs, one
 * per value of a region-year: slot × `run` bins): Σ histWeight · count.
 * @param hist a merged year of the tile's `nCells` cells, slot-major: slot × cell × `run` values [h]
 * @param slots slots per year (months × local hours) and `run` values per cell and slot
 * @param touched when given (one byte per slot), each slot a count was added to is set to 1
 */
export function addWeightedHistograms(
  acc: Float64Array,
  hist: Uint16Array,
  nCells: number,
  slots: number,
  run: number,
  rc: RegionTileCells,
  touched?: Uint8Array,
): void {
  // Bins are read two at a time: most pairs are empty.
  const pairs = (hist.byteOffset & 3) === 0 && (run & 1) === 0 ? new Uint32Array(hist.buffer, hist.byteOffset, hist.length >> 1) : undefined;
  for (let s = 0; s < slots; s++) {
    const a0 = s * run;
    for (let k = 0; k < rc.local.length; k++) {
      const wt = rc.histWeight[k];
      const src0 = (s * nCells + rc.local[k]) * run;
      if (pairs !== undefined) {
        const p0 = src0 >> 1;
        for (let i = 0; i < run >> 1; i++) {
          if (pairs[p0 + i] === 0) continue;
          if (touched) touched[s] = 1;
          const lo = hist[src0 + 2 * i];
          const hi = hist[src0 + 2 * i + 1];
          if (lo !== 0) ddAdd(acc, a0 + 2 * i, wt * lo);
          if (hi !== 0) ddAdd(acc, a0 + 2 * i + 1, wt * hi);
        }
      } else {
        for (let i = 0; i < run; i++) {
          const n = hist[src0 + i];
          if (n === 0) continue;
          if (touched) touched[s] = 1;
          ddAdd(acc, a0 + i, wt * n);
        }
      }
    }
  }
}

/** Adds histogram pairs `b` into `a`, pair by pair. */
export function addHistogramPairs(a: Float64Array, b: Float64Array): void {
  for (let i = 0; i < a.length >> 1; i++) if (b[2 * i] !== 0 || b[2 * i + 1] !== 0) ddAddPair(a, i, b, i);
}
