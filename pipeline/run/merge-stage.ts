/**
 * Stage 3 of a build, the merge: every merge band (pipeline/run/merge-tile.ts) of every weather
 * (the record, each scenario) on the worker pool, each reading its shards' partial files,
 * publishing its cells' files and handing on its grid piece and region parts. Bands are
 * independent, so they run in parallel and in any order; only their small summaries come back.
 */
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { startProgress } from '../model/progress.ts';
import type { Logger } from '../model/effects.ts';
import { runTasks, type PoolTask } from './shard-pool.ts';
import type { BuildPlan, BuildVariant, MergeBand } from './plan-stage.ts';
import type { MergeTileInput, MergeTileSummary } from './merge-tile.ts';
import { workerInit } from './compute-stage.ts';

export interface MergeOutcome {
  /** Per weather (plan.variants order): one summary per band merged now, in band (row) order. */
  tiles: MergeTileSummary[][];
  seconds: number;
}

/** Where each band's files go, per weather: its published files and its scratch files. */
export interface BandTarget {
  dataDir(band: MergeBand, variant: BuildVariant): string;
  scratchDir(band: MergeBand, variant: BuildVariant): string;
  /** A band already merged (by an earlier run of a distributed task) is skipped. */
  done?(band: MergeBand, variant: BuildVariant): boolean;
  /** Called as each band is finished. */
  finished?(band: MergeBand, variant: BuildVariant, summary: MergeTileSummary): void;
}

/**
 * One machine: every band's published files straight into the staging data folder (a scenario's
 * into `data/scenarios/<id>/`), its scratch files into a folder per weather.
 */
export function stagingTarget(dataDir: string, scratchDir: string): BandTarget {
  return { dataDir: (_, v) => join(dataDir, v.dataPath), scratchDir: (_, v) => join(scratchDir, v.label) };
}

/** The merge task id of a band of a weather: the band's rows, `@<scenario id>` for a scenario. */
export function mergeTaskId(band: MergeBand, v: BuildVariant): string {
  return v.scenario === undefined ? band.id : `${band.id}@${v.scenario.id}`;
}

/**
 * Merges every band of the plan. `partials` maps shard ids to their files; `target` says where
 * each band's files go.
 */
export async function mergeStage(
  plan: BuildPlan,
  partials: ReadonlyMap<string, string>,
  target: BandTarget,
  log: Logger,
  quiet?: boolean,
): Promise<MergeOutcome> {
  const cfg = plan.rc.config;
  const todo = plan.variants.flatMap((variant, vi) => plan.bands.filter((b) => !target.done?.(b, variant)).map((band) => ({ band, variant, vi })));
  const all = plan.bands.length * plan.variants.length;
  if (todo.length < all) log.info(`${all - todo.length} band(s) already merged by an earlier run: kept`);
  for (const { band, variant } of todo) {
    mkdirSync(target.dataDir(band, variant), { recursive: true });
    mkdirSync(target.scratchDir(band, variant), { recursive: true });
  }
  const inputs: MergeTileInput[] = todo.map(({ band, variant }) => ({
    id: mergeTaskId(band, variant),
    rows: band.rows,
    blocks: band.blocks,
    cells: band.cells,
    subset: band.subset,
    years: plan.years,
    baseline: cfg.baseline,
    latestYear: plan.latestYear,
    partials: plan.years.map((year) =>
      variant.shards
        .filter((s) => s.year === year && band.tiles.includes(s.tileIndex))
        .map((s) => ({ id: s.id, path: partials.get(s.id)! }))
        .sort((a, b) => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0)),
    ),
    grid: plan.ds.grid,
    regions: band.regions,
    workforce: band.workforce,
    dataDir: target.dataDir(band, variant),
    scratchDir: target.scratchDir(band, variant),
  }));
  const byId = new Map<string, MergeTileSummary>();
  const progress = startProgress('merge', inputs.length, { quiet });
  const t0 = Date.now();
  log.info(
    `merging ${inputs.length} band(s) of rows${plan.variants.length > 1 ? ` (the record and ${plan.variants.length - 1} scenario(s))` : ''} on ${plan.jobs} worker(s): normals, trends, niche, cell tables, map chunks, calculator tiles`,
  );
  await runTasks(
    inputs.map((tile): PoolTask => ({ kind: 'merge', tile })),
    workerInit(plan),
    plan.jobs,
    {
      onTask: (id, summary) => {
        byId.set(id, summary!);
        const t = todo.find((x) => mergeTaskId(x.band, x.variant) === id)!;
        target.finished?.(t.band, t.variant, summary!);
        progress.tick();
      },
    },
  );
  progress.done();
  const seconds = (Date.now() - t0) / 1000;
  log.info(`merged ${inputs.length} band(s) in ${seconds.toFixed(1)} s`);
  const tiles: MergeTileSummary[][] = plan.variants.map(() => []);
  todo.forEach((t, i) => tiles[t.vi].push(byId.get(inputs[i].id)!));
  return { tiles, seconds };
}
