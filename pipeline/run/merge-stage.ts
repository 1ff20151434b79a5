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
import type { MergeTileInput, MergeTileSummary, RegionPartsRef } from './merge-tile.ts';
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
  slicing: RegionSlicing = DEFAULT_REGION_SLICING,
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
  // Fewer bands than workers, and bands whose regions are the bulk of the work: each such band's
  // regions go to several tasks (its first slice stays with the band's own task).
  const slices = regionSlices(inputs, plan.jobs, slicing);
  if (slices.tasks.length > 0)
    log.info(`${slices.tasks.length} more merge task(s) share out the regions of ${inputs.length} band(s) among ${plan.jobs} workers`);
  const byId = new Map<string, MergeTileSummary>();
  const sliceParts = new Map<string, RegionPartsRef>();
  const progress = startProgress('merge', inputs.length, { quiet });
  // A band is finished when its own task and every slice of its regions are done.
  const finish = (id: string) => {
    const main = byId.get(id);
    const mine = slices.tasks.filter((s) => s.of === id);
    if (!main || mine.some((s) => !sliceParts.has(s.tile.id))) return;
    const summary: MergeTileSummary = { ...main, regionParts: [...main.regionParts, ...mine.map((s) => sliceParts.get(s.tile.id)!)] };
    byId.set(id, summary);
    const t = todo.find((x) => mergeTaskId(x.band, x.variant) === id)!;
    target.finished?.(t.band, t.variant, summary);
    progress.tick();
  };
  const t0 = Date.now();
  log.info(
    `merging ${inputs.length} band(s) of rows${plan.variants.length > 1 ? ` (the record and ${plan.variants.length - 1} scenario(s))` : ''} on ${plan.jobs} worker(s): normals, trends, niche, cell tables, map chunks, calculator tiles`,
  );
  await runTasks(
    [...slices.inputs.map((tile): PoolTask => ({ kind: 'merge', tile })), ...slices.tasks.map((s): PoolTask => ({ kind: 'merge-regions', tile: s.tile }))],
    workerInit(plan),
    plan.jobs,
    {
      onTask: (id, summary) => {
        if (summary === undefined) return;
        byId.set(id, summary);
        finish(id);
      },
      onRegionParts: (id, parts) => {
        sliceParts.set(id, parts);
        finish(slices.tasks.find((s) => s.tile.id === id)!.of);
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

/** When a band's regions are shared out among workers ({@link regionSlices}). */
export interface RegionSlicing {
  /** Fewest regions a slice holds [count]. */
  minRegions: number;
  /** Times over that a band's regions must overlap its cells before they are sliced [1]. */
  overlap: number;
}

/** Slices of at least 256 regions, for bands whose regions overlap their cells 4 times over or more. */
export const DEFAULT_REGION_SLICING: RegionSlicing = { minRegions: 256, overlap: 4 };

/**
 * How the bands' regions are shared out when there are fewer bands than workers: a band whose
 * region parts outweigh its own merge (its regions overlap its cells at least `slicing.overlap`
 * times over, as with thousands of small districts on a coarse grid) gets up to ⌈workers /
 * bands⌉ slices of at least `slicing.minRegions` regions, in region order.
 * Each slice beyond the first is a task of its own, which merges the band's partials again (cheap
 * beside its regions' work) and writes only its regions' parts; the band's own task keeps the
 * first slice and the workforce's people-weighted sums of every region. The parts of each region
 * are the same whichever task writes them, so the published output does not depend on the slicing.
 */
export function regionSlices(
  bands: readonly MergeTileInput[],
  jobs: number,
  slicing: RegionSlicing = DEFAULT_REGION_SLICING,
): { inputs: MergeTileInput[]; tasks: Array<{ of: string; tile: MergeTileInput }> } {
  if (bands.length === 0 || bands.length >= jobs) return { inputs: [...bands], tasks: [] };
  const per = Math.ceil(jobs / bands.length);
  const inputs: MergeTileInput[] = [];
  const tasks: Array<{ of: string; tile: MergeTileInput }> = [];
  for (const b of bands) {
    let overlaps = 0;
    for (const rc of b.regions) overlaps += rc.cells.length;
    const k = Math.min(per, Math.floor(b.regions.length / slicing.minRegions));
    if (k < 2 || overlaps < slicing.overlap * b.cells.length) {
      inputs.push(b);
      continue;
    }
    const size = Math.ceil(b.regions.length / k);
    inputs.push({ ...b, regions: b.regions.slice(0, size) });
    for (let j = 1; j * size < b.regions.length; j++) {
      tasks.push({
        of: b.id,
        tile: { ...b, id: `${b.id}-regions-${j}`, regions: b.regions.slice(j * size, (j + 1) * size), regionsOnly: true },
      });
    }
  }
  return { inputs, tasks };
}
