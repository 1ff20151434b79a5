/**
 * Across the baseline years: the mean and the 90th-percentile year of each monthly figure, and of
 * the project-period totals, with the pipeline's own climate code (pipeline/climate/normals.ts:
 * Hyndman–Fan type 7 quantiles, docs/methods.md §10.1; completeness rule MONTHLY_COMPLETENESS, the rule
 * the region tables use: a month counts when at most 240 of its hours are missing, a normal needs
 * 80 % of the baseline years).
 *
 * Project totals: each baseline year is replayed over the project period (its months taken as
 * often as the period holds them), T_y = Σ_m occurrences(m) · value(y, m) over the work months;
 * the mean and P90 are those of T_y across the baseline years. A year with an incomplete work
 * month gives no T_y. So the P90 total is the total of a 1-in-10 year, not a sum of monthly P90s.
 */
import { MONTHLY_COMPLETENESS, completenessMask } from '../../../pipeline/climate/completeness.ts';
import { computeNormals } from '../../../pipeline/climate/normals.ts';
import type { MonthlyYear } from './monthly.ts';

/** The figures carried per month [h]. */
export const QUANTITIES = ['shiftHours', 'above', 'lost'] as const;
export type Quantity = (typeof QUANTITIES)[number];
const NQ = QUANTITIES.length;

/** Mean and 90th-percentile year of one figure [h], and the baseline years that counted. */
export interface FigureStats {
  mean: number;
  p90: number;
  yearsUsed: number;
}

export type QuantityStats = Record<Quantity, FigureStats>;

export interface EstimateStatistics {
  /** Per calendar month (index 0 = January), per worker. */
  months: QuantityStats[];
  /** Over the project period's work months, per worker. */
  total: QuantityStats;
  baseline: [number, number];
  /** Baseline years needed for a normal [years]. */
  minYears: number;
}

/**
 * Normals of the monthly figures of `perYear` (ascending years, the whole tile) over `baseline`,
 * and the totals for `occurrences` (per calendar month, 0 for months not worked).
 */
export function estimateStatistics(perYear: readonly MonthlyYear[], baseline: [number, number], occurrences: ArrayLike<number>): EstimateStatistics {
  const years = perYear.map((y) => y.year);
  const nItems = 12 * NQ;
  const values = new Float64Array(years.length * nItems);
  const valid = new Float64Array(years.length * nItems);
  const expected = new Float64Array(years.length * nItems);
  perYear.forEach((y, r) => {
    for (let m = 0; m < 12; m++) {
      const e = y.expectedHours[m];
      // Region tiles hold area-weighted hours (fractions): whole hours, at most the month's.
      const v = Math.min(e, Math.round(y.validHours[m]));
      QUANTITIES.forEach((q, k) => {
        const i = r * nItems + m * NQ + k;
        values[i] = y[q][m];
        valid[i] = v;
        expected[i] = e;
      });
    }
  });
  const rule = MONTHLY_COMPLETENESS;
  const monthly = computeNormals({ years, values, nItems, validHours: valid, expectedHours: expected }, { baseline, rule });
  const mask = completenessMask(valid, expected, nItems, rule);

  // Project totals, year by year.
  const totals = new Float64Array(years.length * NQ);
  for (let r = 0; r < years.length; r++) {
    for (let k = 0; k < NQ; k++) {
      let t = 0;
      for (let m = 0; m < 12; m++) {
        const n = occurrences[m];
        if (n === 0) continue;
        const i = r * nItems + m * NQ + k;
        t = mask[i] === 1 ? t + n * values[i] : NaN;
      }
      totals[r * NQ + k] = t;
    }
  }
  const total = computeNormals({ years, values: totals, nItems: NQ }, { baseline, rule });

  const stats = (n: typeof monthly, i: number): FigureStats => ({ mean: n.mean[i], p90: n.p90[i], yearsUsed: n.yearsUsed[i] });
  const pack = (n: typeof monthly, base: number): QuantityStats => Object.fromEntries(QUANTITIES.map((q, k) => [q, stats(n, base + k)])) as QuantityStats;
  return {
    months: Array.from({ length: 12 }, (_, m) => pack(monthly, m * NQ)),
    total: pack(total, 0),
    baseline,
    minYears: monthly.minYears,
  };
}
