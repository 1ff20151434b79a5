/**
 * The job replayed on each scenario the inputs ask for: the same place, work, shift, crew, start
 * and costs as the record's run, on the scenario's tiles (`data/scenarios/<id>/calculator/…`, the
 * record's files moved into the scenario's folder, as pipeline/run/publish-stage.ts variantPath
 * writes them). A scenario is the record's weather with its monthly means shifted (the delta change
 * method, docs/methods.md §16): a what-if, not a forecast. Pure: the page and `heathours estimate`
 * pass their own loader, so both give the same numbers.
 */
import { HeathoursError } from '../model/errors.ts';
import type { EstimateContext, EstimateScenario } from './context.ts';
import { ScheduleDeadlineUnreachable } from './errors.ts';
import type { EstimateInputs } from './inputs.ts';
import { loadPlace, type AtlasLoader, type ResolvedPlace } from './place.ts';
import { runBid, type BidRun } from './run-bid.ts';

/** One scenario's run of the job. */
export interface ScenarioRun {
  scenario: EstimateScenario;
  run: BidRun;
  place: ResolvedPlace;
  /** Why the crew for the deadline is missing in this scenario (the deadline cannot be met), or null. */
  deadlineProblem: string | null;
}

/** A path below the site root (`data/…`) moved into the scenario's folder (`data/scenarios/<id>/…`). */
export function scenarioPath(path: string, s: EstimateScenario): string {
  const dir = s.dataPath.endsWith('/') ? s.dataPath : `${s.dataPath}/`;
  return path.replace(/^data\//, dir);
}

/** The estimate's context with every tile path in the scenario's folder (same years, regions, grid and chunks). */
export function scenarioContext(ctx: EstimateContext, s: EstimateScenario): EstimateContext {
  return {
    ...ctx,
    regions: ctx.regions.map((r) => ({ ...r, path: scenarioPath(r.path, s) })),
    cells: ctx.cells ? { grid: ctx.cells.grid, chunks: ctx.cells.chunks.map((c) => ({ ...c, path: scenarioPath(c.path, s) })) } : null,
  };
}

/**
 * Runs the bid with the record's deadline; when the deadline cannot be met, runs it again
 * without and says why (the schedule is still wanted). Catalogued errors of runBid otherwise.
 */
export function runBidKeepingSchedule(
  histograms: readonly Float64Array[],
  inputs: EstimateInputs,
  ctx: EstimateContext,
): { run: BidRun; deadlineProblem: string | null } {
  try {
    return { run: runBid(histograms, inputs, ctx), deadlineProblem: null };
  } catch (e) {
    if (!(e instanceof HeathoursError && e.code === ScheduleDeadlineUnreachable.code)) throw e;
    return { run: runBid(histograms, { ...inputs, job: { ...inputs.job, deadline: null } }, ctx), deadlineProblem: `${e.message}. ${e.hint}` };
  }
}

/**
 * The job on each scenario of `inputs.scenarios`, in the atlas's order. Catalogued errors: those
 * of loadPlace (EstimateDataUnavailable naming a scenario tile that is missing) and runBid.
 */
export async function runScenarios(inputs: EstimateInputs, ctx: EstimateContext, load: AtlasLoader): Promise<ScenarioRun[]> {
  const out: ScenarioRun[] = [];
  for (const id of inputs.scenarios) {
    const scenario = ctx.scenarios.find((s) => s.id === id)!;
    const sctx = scenarioContext(ctx, scenario);
    const { place, histograms } = await loadPlace(inputs.place, sctx, load);
    const { run, deadlineProblem } = runBidKeepingSchedule(histograms, inputs, sctx);
    out.push({ scenario, run, place, deadlineProblem });
  }
  return out;
}
