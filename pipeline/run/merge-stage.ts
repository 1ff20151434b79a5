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
import type { BuildPlan, MergeBand } from './plan-stage.ts';
import type { MergeTileInput, MergeTileSummary } from './merge-tile.ts';
import { workerInit } from './compute-stage.ts';

export interface MergeOutcome {
  /** One summary per band, in band (row) order. */
  tiles: MergeTileSummary[];
  seconds: number;
}

/** Where each band's files go: its published files and its scratch files. */
export interface BandTarget {
  dataDir(band: MergeBand): string;
  scratchDir(band: MergeBand): string;
  /** A band already merged (by an earlier run of a distributed task) is skipped. */
  done?(band: MergeBand): boolean;
  /** Called as each band is finished. */
  finished?(band: MergeBand, summary: MergeTileSummary): void;
}

/** One machine: every band's published files straight into the staging data folder. */
export function stagingTarget(dataDir: string, scratchDir: string): BandTarget {
  return { dataDir: () => dataDir, scratchDir: () => scratchDir };
}

/**
 * Merges every band of the plan. `partials` maps shard ids to their files; `target` says where
 * each band's files go.
 */
export async function mergeStage(plan: BuildPlan, partials: ReadonlyMap<string, string>, target: BandTarget, log: Logger, quiet?: boolean): Promise<MergeOutcome> {
  const cfg = plan.rc.config;
  const todo = plan.bands.filter((b) => !target.done?.(b));
  if (todo.length < plan.bands.length) log.info(`${plan.bands.length - todo.length} band(s) already merged by an earlier run: kept`);
  for (const band of todo) {
    mkdirSync(target.dataDir(band), { recursive: true });
    mkdirSync(target.scratchDir(band), { recursive: true });
  }
  const inputs: MergeTileInput[] = todo.map((band) => ({
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
    workforce: band.workforce,
    dataDir: target.dataDir(band),
    scratchDir: target.scratchDir(band),
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
        target.finished?.(todo.find((b) => b.id === id)!, summary!);
        progress.tick();
      },
    },
  );
  progress.done();
  const seconds = (Date.now() - t0) / 1000;
  log.info(`merged ${inputs.length} band(s) in ${seconds.toFixed(1)} s`);
  return { tiles: inputs.map((i) => byId.get(i.id)!), seconds };
}
