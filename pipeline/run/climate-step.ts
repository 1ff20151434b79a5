/**
 * Across years: per-cell and per-region normals of every figure (baseline mean, median, P90
 * year, min, max, years used, latest year), the worst cell of each region, and mean annual
 * temperature against the human climate niche. Pure: arrays in, arrays out.
 */
import { computeNormals, annualMeanFromMonthlySums, assessNiche, type Normals, type NicheAssessment } from '../climate/index.ts';
import { regionFieldStats, type CellWeights } from '../regions/index.ts';
import type { YearCounts } from '../reduce/merge.ts';
import { MONTHS } from '../reduce/layout.ts';
import { PERIODS, type FigureSeries } from './figures.ts';

/** Share of a region's weight that must have a value for the region's value to count [1]. */
export const REGION_MIN_COVERAGE = 0.8;

export interface FigureNormals {
  series: FigureSeries;
  /** Per land cell: items (cell * PERIODS + period) * nCombo + combo. */
  cell: Normals;
  /** Per region: items (region * PERIODS + period) * nCombo + combo; stats of the region-mean series. */
  region: Normals;
  /** Per region item: highest baseline-mean of a cell of the region, and that cell (global index). */
  worstValue: Float64Array;
  worstCell: Int32Array;
}

export interface ClimateContext {
  years: number[];
  baseline: [number, number];
  latestYear: number;
  /** Global indices of the land cells, in the order of the counts. */
  cells: Int32Array;
  /** Cells of the whole grid. */
  nGrid: number;
  regions: CellWeights[];
}

/** Expands land-cell values (one per land cell × field) into grid order with NaN elsewhere. */
function toGrid(values: Float64Array, nFields: number, ctx: ClimateContext, out: Float64Array): Float64Array {
  out.fill(NaN);
  const nLand = ctx.cells.length;
  for (let c = 0; c < nLand; c++) {
    const g = ctx.cells[c];
    for (let f = 0; f < nFields; f++) out[f * ctx.nGrid + g] = values[c * nFields + f];
  }
  return out;
}

export function figureNormals(series: FigureSeries, ctx: ClimateContext): FigureNormals {
  const nC = series.def.combos.length;
  const nLand = ctx.cells.length;
  const nFields = PERIODS * nC;
  const nItems = nLand * nFields;
  const nY = ctx.years.length;
  const values = new Float64Array(nY * nItems);
  const valid = new Float64Array(nY * nItems);
  const expected = new Float64Array(nY * nItems);
  for (let y = 0; y < nY; y++) {
    values.set(series.values[y], y * nItems);
    for (let cp = 0; cp < nLand * PERIODS; cp++) {
      const v = series.validHours[y][cp];
      const e = series.expectedHours[y][cp];
      for (let k = 0; k < nC; k++) {
        valid[y * nItems + cp * nC + k] = v;
        expected[y * nItems + cp * nC + k] = e;
      }
    }
  }
  const rule = { maxMissingHours: 240, minYearShare: 0.8 };
  // Annual items may miss 240 h too; the rule is applied per item (month or year) alike.
  const cell = computeNormals({ years: ctx.years, values, nItems, validHours: valid, expectedHours: expected }, { baseline: ctx.baseline, latestYear: ctx.latestYear, rule });

  // Region series: area-weighted mean over the region's cells, year by year.
  const nR = ctx.regions.length;
  const rItems = nR * nFields;
  const rValues = new Float64Array(nY * rItems).fill(NaN);
  const grid = new Float64Array(nFields * ctx.nGrid);
  const masked = new Float64Array(nItems);
  for (let y = 0; y < nY; y++) {
    // A year's cell value that fails the completeness rule does not enter the region mean.
    for (let i = 0; i < nItems; i++) masked[i] = expected[y * nItems + i] - valid[y * nItems + i] <= rule.maxMissingHours ? values[y * nItems + i] : NaN;
    toGrid(masked, nFields, ctx, grid);
    ctx.regions.forEach((w, r) => {
      const s = regionFieldStats(w, grid, nFields, ctx.nGrid);
      for (let f = 0; f < nFields; f++) {
        rValues[y * rItems + r * nFields + f] = s.coveredWeight[f] >= REGION_MIN_COVERAGE ? s.mean[f] : NaN;
      }
    });
  }
  const region = computeNormals({ years: ctx.years, values: rValues, nItems: rItems }, { baseline: ctx.baseline, latestYear: ctx.latestYear, rule });

  // Worst cell: the region's cell with the highest baseline mean.
  const worstValue = new Float64Array(rItems).fill(NaN);
  const worstCell = new Int32Array(rItems).fill(-1);
  toGrid(cell.mean, nFields, ctx, grid);
  ctx.regions.forEach((w, r) => {
    const s = regionFieldStats(w, grid, nFields, ctx.nGrid);
    for (let f = 0; f < nFields; f++) {
      worstValue[r * nFields + f] = s.max[f];
      worstCell[r * nFields + f] = s.maxCell[f];
    }
  });
  return { series, cell, region, worstValue, worstCell };
}

export interface NicheResult {
  /** Per land cell and year: mean annual temperature [°C], index y * nLand + c. */
  annualMean: Float64Array;
  assessment: NicheAssessment;
  /** Per region: area-weighted baseline MAT, latest MAT and shift [°C]. */
  regionBaselineMat: Float64Array;
  regionLatestMat: Float64Array;
}

/** Mean annual temperature per cell and year, and its place against the niche. */
export function nicheStep(yearCounts: readonly YearCounts[], ctx: ClimateContext): NicheResult {
  const nLand = ctx.cells.length;
  const nY = ctx.years.length;
  const sum = new Float64Array(nY * MONTHS * nLand);
  const validHours = new Float64Array(nY * MONTHS * nLand);
  const expectedHours = new Float64Array(nY * MONTHS * nLand);
  yearCounts.forEach((yc, y) => {
    for (let c = 0; c < nLand; c++) {
      for (let m = 0; m < MONTHS; m++) {
        const k = (y * MONTHS + m) * nLand + c;
        sum[k] = yc.airSum[c * MONTHS + m] / 100;
        validHours[k] = yc.airHours[c * MONTHS + m];
        expectedHours[k] = yc.expectedHours[m];
      }
    }
  });
  const annualMean = annualMeanFromMonthlySums({ years: ctx.years, nCells: nLand, sum, validHours, expectedHours });
  const assessment = assessNiche({ years: ctx.years, annualMean, nCells: nLand, baseline: ctx.baseline, latest: [ctx.latestYear, ctx.latestYear] });
  const grid = new Float64Array(2 * ctx.nGrid);
  const both = new Float64Array(2 * nLand);
  for (let c = 0; c < nLand; c++) {
    both[c * 2] = assessment.baselineMat[c];
    both[c * 2 + 1] = assessment.latestMat[c];
  }
  toGrid(both, 2, ctx, grid);
  const regionBaselineMat = new Float64Array(ctx.regions.length);
  const regionLatestMat = new Float64Array(ctx.regions.length);
  ctx.regions.forEach((w, r) => {
    const s = regionFieldStats(w, grid, 2, ctx.nGrid);
    regionBaselineMat[r] = s.mean[0];
    regionLatestMat[r] = s.mean[1];
  });
  return { annualMean, assessment, regionBaselineMat, regionLatestMat };
}
