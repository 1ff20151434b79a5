/**
 * The whole estimate from a place's histograms and the checked inputs: the work kernel of the
 * pipeline's work model (pipeline/work: limit curve or table, clothing, allowable work fraction),
 * the shift shares, each year's monthly figures, then the baseline mean and P90 year per month and
 * for the project period. Pure: the browser script fetches the tile and calls this.
 */
import { prepareWorkKernel, type WorkKernel } from '../../../pipeline/work/work-fraction.ts';
import type { EstimateContext } from '../../../pipeline/schedule/context.ts';
import { EstimatePeriodInvalid } from '../../../pipeline/schedule/errors.ts';
import type { EstimateInputs } from '../../../pipeline/schedule/inputs.ts';
import { monthOccurrences } from '../../../pipeline/schedule/project-period.ts';
import { monthlyFigures, type MonthlyYear } from './monthly.ts';
import { shiftShares } from './shift-shares.ts';
import { estimateStatistics, type EstimateStatistics } from './statistics.ts';

export interface EstimateResult {
  inputs: EstimateInputs;
  kernel: WorkKernel;
  /** Limit at the work rate [°C-WBGT] and the measured WBGT above which an hour is above it [°C]. */
  limitWork: number;
  threshold: number;
  /** Per calendar month (index 0 = January): how often it occurs in the project, 0 if not worked. */
  occurrences: Uint16Array;
  perYear: MonthlyYear[];
  statistics: EstimateStatistics;
}

/**
 * Runs the estimate. `histograms` holds one array per year of `ctx.years` (tile layout).
 * Catalogued errors from pipeline/work (MetabolicRateOutOfRange, RestRateNotBelowWork,
 * ClothingAdjustmentOutOfRange, LimitOutsideHistogram, WorkTimeZoneUnknown) and
 * EstimatePeriodInvalid.
 */
export function runEstimate(histograms: readonly Float64Array[], inputs: EstimateInputs, ctx: EstimateContext): EstimateResult {
  const kernel = prepareWorkKernel({
    workRate: inputs.workRate,
    restRate: ctx.restRate,
    limit: { model: inputs.limitModel, acclimatization: inputs.acclimatization, airMovement: inputs.airMovement },
    clothingAdjustment: inputs.clothing.cav,
  });
  const occurrences = monthOccurrences(inputs.period);
  for (let m = 0; m < 12; m++) if (!inputs.workMonths[m]) occurrences[m] = 0;
  if (occurrences.every((n) => n === 0)) throw EstimatePeriodInvalid({ problem: 'the project period holds none of the ticked work months' }, { key: 'months' });
  const shares = shiftShares(ctx.years, ctx.timeZone, inputs.shift);
  const perYear = histograms.map((h, y) => monthlyFigures(h, shares[y], { kernel, exposure: inputs.exposure, rest: inputs.rest }));
  const statistics = estimateStatistics(perYear, ctx.baseline, occurrences);
  return { inputs, kernel, limitWork: kernel.limitWork, threshold: kernel.threshold, occurrences, perYear, statistics };
}
