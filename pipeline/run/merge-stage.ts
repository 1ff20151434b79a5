/**
 * Stage 3 of a build, the merge: every merge band (pipeline/run/merge-tile.ts) on the worker
 * pool, each reading its shards' partial files, publishing its cells' files and handing on its
 * grid piece and region parts. Bands are independent, so they run in parallel and in any order;
 * only their small summaries come back.
 */
import { mkdirSync } from 'node:fs';
import { startProgress } from '../model/progress.ts';
import type { Logger } from '../model/effects.ts';
import { runTasks, type PoolTask } from './shard-pool.ts';
import type { BuildPlan } from './plan-stage.ts';
import type { MergeTileInput, MergeTileSummary } from './merge-tile.ts';
import { workerInit } from './compute-stage.ts';

export interface MergeOutcome {
  /** One summary per band, in band (row) order. */
  tiles: MergeTileSummary[];
  seconds: number;
}

/**
 * Merges every band. `partials` maps shard ids to their files; outputs go to `dataDir` (the
 * staging data folder) and scratch files to `scratchDir`.
 */
export async function mergeStage(plan: BuildPlan, partials: ReadonlyMap<string, string>, dataDir: string, scratchDir: string, log: Logger, quiet?: boolean): Promise<MergeOutcome> {
  mkdirSync(scratchDir, { recursive: true });
  const cfg = plan.rc.config;
  const inputs: MergeTileInput[] = plan.bands.map((band) => ({
    id: band.id,
    rows: band.rows,
    blocks: band.blocks,
    cells: band.cells,
    subset: band.subset,
    years: plan.years,
    baseline: cfg.baseline,
    latestYear: plan.latestYear,
    partials: plan.years.map((year) =>
      plan.shards
        .filter((s) => s.year === year && band.tiles.includes(s.tileIndex))
        .map((s) => ({ id: s.id, path: partials.get(s.id)! }))
        .sort((a, b) => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0)),
    ),
    grid: plan.ds.grid,
    regions: band.regions,
    dataDir,
    scratchDir,
  }));
  const byId = new Map<string, MergeTileSummary>();
  const progress = startProgress('merge', inputs.length, { quiet });
  const t0 = Date.now();
  log.info(`merging ${inputs.length} band(s) of rows on ${plan.jobs} worker(s): normals, niche, cell tables, map chunks, calculator tiles`);
  await runTasks(
    inputs.map((tile): PoolTask => ({ kind: 'merge', tile })),
    workerInit(plan),
    plan.jobs,
    {
      onTask: (id, summary) => {
        byId.set(id, summary!);
        progress.tick();
      },
    },
  );
  progress.done();
  const seconds = (Date.now() - t0) / 1000;
  log.info(`merged ${inputs.length} band(s) in ${seconds.toFixed(1)} s`);
  return { tiles: inputs.map((i) => byId.get(i.id)!), seconds };
}
