/**
 * Stage 2 of a build, the shards: where each shard's partial comes from (the cache, a distributed
 * run's partials folder, or a computation, with the reason logged), and the computation of the
 * missing ones on the worker pool, each partial written to its file (the cache, a slice folder, or
 * the build's scratch folder). Nothing is held in memory: the merge stage reads the files.
 */
import { join, resolve } from 'node:path';
import { emptyCounts, addCounts, emptyChangeCounts, addChangeCounts, type ChangeCounts, type KernelCounts } from '../physics/index.ts';
import { startProgress } from '../model/progress.ts';
import type { Logger } from '../model/effects.ts';
import { describeSources, sourcesFromCache, sourcesFromPartials, type KeyedShard, type ShardSource } from './shard-sources.ts';
import { partialPath } from './partial-store.ts';
import { runTasks, type PoolTask, type ShardPool, type ShardStores } from './shard-pool.ts';
import { memberCacheDir, type BuildPlan } from './plan-stage.ts';
import type { ComputeTask } from './compute-task.ts';

export type ComputeMode =
  | { kind: 'cache'; cacheDir: string | undefined; scratchDir: string }
  | { kind: 'merge'; partialsDir: string }
  | { kind: 'slice'; k: number; n: number; partialsDir: string };

export interface ComputeOutcome {
  /** Shard id → its partial file. */
  partials: Map<string, string>;
  /** Shards computed now, and the land cell-hours they held [–]. */
  computed: number;
  cellHours: number;
  /** Land cell-hours of the whole plan, computed now or before (from the partials' reports) [–]. */
  allCellHours: number;
  physics: KernelCounts;
  /** Wall time of the computation [s]; bytes of partial files written [B]. */
  seconds: number;
  partialBytes: number;
  /** Worker time per land cell-hour computed: read, physics, reduction [ns]. */
  perCellHour: { read: number; physics: number; reduce: number };
  /**
   * Per weather (`baseline`, or the scenario id): land cell-hours of its whole record, physics
   * counts, and the relative-humidity clamps its changes made (computed now or before).
   */
  byVariant: Record<string, VariantCounts>;
}

/** What one weather's shards counted. */
export interface VariantCounts {
  cellHours: number;
  physics: KernelCounts;
  change: ChangeCounts;
}

/** Runs the compute stage on `pool` (the build's workers, kept running), or on workers started for it. */
export async function computeStage(plan: BuildPlan, mode: ComputeMode, log: Logger, quiet?: boolean, pool?: ShardPool): Promise<ComputeOutcome> {
  let keyed: readonly KeyedShard[] = plan.keyed;
  let tasks: readonly ComputeTask[] = plan.tasks;
  let sources: ShardSource[];
  if (mode.kind === 'merge') {
    sources = sourcesFromPartials(keyed, resolve(mode.partialsDir)).sources;
  } else if (mode.kind === 'slice') {
    tasks = plan.tasks.filter((_, i) => i % mode.n === mode.k - 1);
    const ids = new Set(tasks.flatMap((t) => t.shards.map((s) => s.id)));
    keyed = plan.keyed.filter((k) => ids.has(k.shard.id));
    sources = sourcesFromCache(keyed, sliceDir(mode));
  } else {
    sources = sourcesFromCache(keyed, mode.cacheDir);
  }
  for (const line of describeSources(keyed, sources)) log.info(line);

  const partials = new Map<string, string>();
  const storeDir = mode.kind === 'slice' ? sliceDir(mode) : mode.kind === 'cache' ? (mode.cacheDir ?? mode.scratchDir) : undefined;
  const stores: ShardStores = {};
  keyed.forEach((kd, i) => {
    const s = sources[i];
    if (s.kind === 'file') partials.set(kd.shard.id, s.path);
    else {
      const path = partialPath(storeDir!, kd.shard.id);
      partials.set(kd.shard.id, path);
      stores[kd.shard.id] = {
        path,
        meta: {
          shardId: kd.shard.id,
          year: kd.shard.year,
          tileIndex: kd.shard.tileIndex,
          key: kd.key,
          provenance: kd.provenance as unknown as Record<string, unknown>,
        },
      };
    }
  });
  // A task computes only its shards that are not there already; their reads are still shared.
  const work: PoolTask[] = tasks.flatMap((t) => {
    const todo = t.shards.filter((s) => stores[s.id] !== undefined);
    return todo.length === 0 ? [] : [{ kind: 'compute' as const, task: { ...t, shards: todo }, stores }];
  });
  const nShards = work.reduce((n, t) => n + (t.kind === 'compute' ? t.task.shards.length : 0), 0);
  const physics = emptyCounts();
  const timing = { read: 0, physics: 0, reduce: 0 };
  const labelOf = new Map(plan.variants.flatMap((v) => v.shards.map((s) => [s.id, v.label] as const)));
  const byVariant: Record<string, VariantCounts> = Object.fromEntries(
    plan.variants.map((v) => [v.label, { cellHours: 0, physics: emptyCounts(), change: emptyChangeCounts() }]),
  );
  const countIn = (id: string, cellHoursOf: number, p: KernelCounts, c: ChangeCounts | undefined) => {
    const v = byVariant[labelOf.get(id) ?? 'baseline'];
    v.cellHours += cellHoursOf;
    addCounts(v.physics, p);
    if (c) addChangeCounts(v.change, c);
  };
  let cellHours = 0;
  let partialBytes = 0;
  log.info(`computing ${nShards} of ${keyed.length} shards in ${work.length} task(s) on ${plan.jobs} worker(s)${storeDir ? ` into ${storeDir}` : ''}`);
  const progress = startProgress('shards', nShards, { quiet });
  const t0 = Date.now();
  await runTasks(work, pool ?? workerInit(plan), plan.jobs, {
    onShardProgress: () => progress.tick(),
    onShard: (id, r) => {
      countIn(id, r.cellHours, r.physics, r.change);
      addCounts(physics, r.physics);
      cellHours += r.cellHours;
      partialBytes += r.storedBytes;
      timing.read += r.timing.read;
      timing.physics += r.timing.physics;
      timing.reduce += r.timing.reduce;
    },
  });
  progress.done();
  const seconds = (Date.now() - t0) / 1000;
  const ns = (ms: number) => (ms * 1e6) / Math.max(1, cellHours);
  if (nShards > 0) {
    log.info(
      `computed ${(cellHours / 1e6).toFixed(1)} M cell-hours in ${seconds.toFixed(1)} s (${(cellHours / seconds / 1e6).toFixed(2)} M/s); ${physics.notConverged} not converged, ${physics.rejected} rejected, ${physics.dewPointClamped} dew points clamped`,
    );
    log.info(
      `worker time per land cell-hour: read ${ns(timing.read).toFixed(0)} ns, physics ${ns(timing.physics).toFixed(0)} ns, reduce ${ns(timing.reduce).toFixed(0)} ns`,
    );
  }
  // Counts of the whole record (reused shards report what their computation counted).
  let allCellHours = cellHours;
  keyed.forEach((k, i) => {
    const s = sources[i];
    if (s.kind !== 'file') return;
    allCellHours += s.meta.report.cellHours;
    addCounts(physics, s.meta.report.physics as unknown as KernelCounts);
    countIn(k.shard.id, s.meta.report.cellHours, s.meta.report.physics as unknown as KernelCounts, s.meta.report.change as unknown as ChangeCounts | undefined);
  });
  for (const v of plan.variants) {
    const c = byVariant[v.label].change;
    if (v.scenario !== undefined && c.humidityClampedHigh + c.humidityClampedLow > 0) {
      log.info(
        `scenario ${v.label}: relative humidity clamped to 100 % in ${c.humidityClampedHigh} cell-hours and to the 1 % floor in ${c.humidityClampedLow} (the change would have taken it beyond)`,
      );
    }
  }
  return {
    partials,
    computed: nShards,
    cellHours,
    allCellHours,
    physics,
    seconds,
    partialBytes,
    perCellHour: { read: ns(timing.read), physics: ns(timing.physics), reduce: ns(timing.reduce) },
    byVariant,
  };
}

/** What every worker is started with. */
export function workerInit(plan: BuildPlan) {
  const cfg = plan.rc.config;
  return {
    files: plan.rc.inputFiles,
    datasetOptions: {
      product: cfg.dataset.product,
      landSeaMask: cfg.dataset.landSeaMask,
      digests: false,
      reuseBlockBuffers: true,
      memberCache: memberCacheDir(plan.rc),
    },
    context: plan.context,
  };
}

function sliceDir(mode: { k: number; n: number; partialsDir: string }): string {
  return join(resolve(mode.partialsDir), `slice-${mode.k}-of-${mode.n}`);
}
