/**
 * How far the estimate page's figure for a region and month is from the region report's, for the
 * same settings (the atlas's own: default class, acclimatization, exposure, shift, clothing,
 * rest). The two come from different data: the report quotes the region table, the pipeline's
 * count of each shift hour; the estimate page works on the calculator's histogram tiles, which
 * hold every day's hours in 0.25 °C bins, scaled by the share of each month × hour that the
 * shift's weekdays cover (src/lib/estimate and pipeline/schedule, the estimate page's month-by-
 * month code, run here at build time on the same tile). So the report can say, per region, by how much they differ. Pure.
 */
import type { EstimateContext } from '../../../pipeline/schedule/context.ts';
import { parseInputs } from '../../../pipeline/schedule/inputs.ts';
import { runEstimate } from '../estimate/estimate.ts';
import { FIGURE_HOURS_LOST, MONTH_PERIODS, type RegionFigures } from './region-figures.ts';

/** One month of the comparison, baseline means [h per worker]. */
export interface MonthDifference {
  /** `01`–`12`. */
  period: string;
  /** The region table's (and the report's) value [h]. */
  report: number;
  /** The estimate page's value with the atlas's settings [h]. */
  estimate: number;
  /** estimate − report [h]. */
  difference: number;
  /** Shift hours of the month, baseline mean, as the estimate counts them [h]. */
  shiftHours: number;
}

export interface EstimateDifference {
  workloadClass: string;
  acclimatization: string;
  exposure: string;
  months: MonthDifference[];
  /** The month with the largest |difference|. */
  largest: MonthDifference;
  /** The largest |difference| as a share of that month's shift hours [%]. */
  largestShare: number;
}

/**
 * Runs the estimate for region `regionId` with the atlas's settings on its tile (`histograms`, one
 * per year of `ctx.years`) and compares its monthly mean hours lost with the region table's.
 * Catalogued errors of src/lib/estimate (e.g. EstimateRegionUnknown).
 */
export function estimateDifference(regionId: string, histograms: readonly Float64Array[], ctx: EstimateContext, figures: RegionFigures): EstimateDifference {
  const inputs = parseInputs({ region: regionId }, ctx, 'C');
  const result = runEstimate(histograms, inputs, ctx);
  const d = ctx.defaults;
  const months: MonthDifference[] = MONTH_PERIODS.map((period, m) => {
    const report = figures.get({
      figure: FIGURE_HOURS_LOST,
      period,
      workloadClass: d.classId,
      acclimatization: d.acclimatization,
      exposure: d.exposure,
      statistic: 'mean',
    });
    const stats = result.statistics.months[m];
    const estimate = stats.lost.mean;
    return { period, report, estimate, difference: estimate - report, shiftHours: stats.shiftHours.mean };
  });
  const finite = months.filter((x) => Number.isFinite(x.difference));
  const largest = finite.reduce((a, b) => (Math.abs(b.difference) > Math.abs(a.difference) ? b : a), finite[0] ?? months[0]);
  return {
    workloadClass: d.classId,
    acclimatization: d.acclimatization,
    exposure: d.exposure,
    months,
    largest,
    largestShare: (100 * Math.abs(largest.difference)) / largest.shiftHours,
  };
}
