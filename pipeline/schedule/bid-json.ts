/**
 * The estimate as one JSON object: what `heathours estimate --json` prints and the page's JSON
 * download holds, field for field (tested). Hours, days and money to 0.01; dates as YYYY-MM-DD.
 *
 * Required fields (issue 14): `finishDate.{mean,p50,p90}`, `addedWorkingDays.{mean,p50,p90}`,
 * `crewHoursLost.{mean,p50,p90}`, `cost.{mean,p90}` (and p50), `startMonths` (12 entries, each
 * with `addedWorkingDays.{p50,p90}`), `years` (one entry per replayed year); with scenarios asked
 * for, `scenarios` holds one entry per scenario with the same fields and what the scenario is.
 */
import { CAUTIONS } from '../work/cautions.ts';
import { APPROXIMATION_NOTE } from './approximation.ts';
import { bidFigures, type BidFigures } from './bid-figures.ts';
import type { EstimateContext } from './context.ts';
import type { EstimateInputs } from './inputs.ts';
import type { ResolvedPlace } from './place.ts';
import type { BidRun } from './run-bid.ts';
import type { ScenarioRun } from './scenario-runs.ts';

export { BID_JSON_FORMAT, type BidFigures } from './bid-figures.ts';

/** The JSON object from the figures: the figures, then how they are made and the cautions. */
export function bidJsonOf(figures: BidFigures) {
  return { ...figures, approximation: APPROXIMATION_NOTE, cautions: CAUTIONS.map((c) => c.text) };
}

/** The JSON object of an estimate (bid-figures.ts, then the notes). */
export function bidJson(run: BidRun, inputs: EstimateInputs, ctx: EstimateContext, place: ResolvedPlace, scenarios: readonly ScenarioRun[] = []) {
  return bidJsonOf(bidFigures(run, inputs, ctx, place, scenarios));
}

export type BidJson = ReturnType<typeof bidJson>;
/** One scenario's entry of {@link BidJson}. */
export type BidScenarioJson = BidJson['scenarios'][number];
