/**
 * The whole estimate's schedule side from a place's histograms and the checked inputs, the one
 * entry point of the /estimate/ page and `heathours estimate`: the work kernel of the pipeline's
 * work model (limit, clothing, allowable work fraction), the replayable weather years of the
 * record, and the bid's answers (bid.ts).
 */
import { prepareWorkKernel, type WorkKernel } from '../work/work-fraction.ts';
import { answerBid, type BidAnswer } from './bid.ts';
import type { EstimateContext } from './context.ts';
import type { EstimateInputs } from './inputs.ts';
import { weatherYears, type WeatherYears } from './weather-years.ts';

export interface BidRun {
  kernel: WorkKernel;
  weather: WeatherYears;
  answer: BidAnswer;
}

/** The work kernel of the inputs. Catalogued errors of pipeline/work (rates, clothing). */
export function inputKernel(inputs: EstimateInputs, ctx: EstimateContext): WorkKernel {
  return prepareWorkKernel({
    workRate: inputs.workRate,
    restRate: ctx.restRate,
    limit: { model: inputs.limitModel, acclimatization: inputs.acclimatization, airMovement: inputs.airMovement },
    clothingAdjustment: inputs.clothing.cav,
  });
}

/**
 * Runs the bid for `histograms` (one per year of `ctx.years`). Catalogued errors: those of
 * pipeline/work (LimitOutsideHistogram …), ScheduleNoWeatherYears, ScheduleNotFinished,
 * ScheduleDeadlineUnreachable.
 */
export function runBid(histograms: readonly Float64Array[], inputs: EstimateInputs, ctx: EstimateContext): BidRun {
  const kernel = inputKernel(inputs, ctx);
  const weather = weatherYears(histograms, ctx.years, { kernel, exposure: inputs.exposure, rest: inputs.rest });
  const answer = answerBid(
    {
      job: { start: inputs.job.start, workHours: inputs.job.workHours, crew: inputs.crew, pattern: inputs.shift, holidays: inputs.job.holidays },
      costs: inputs.costs,
      otherPatterns: inputs.otherPatterns,
      deadline: inputs.job.deadline,
    },
    weather.usable,
  );
  return { kernel, weather, answer };
}
