/**
 * `heathours build`: the whole atlas, as named stages (each a module with a typed input and
 * output):
 *
 *   plan (plan-stage.ts) → compute (compute-stage.ts) → merge (merge-stage.ts: per band of rows,
 *   the merge, normals, niche and cell files) → regions (region-stage.ts) → publish
 *   (publish-stage.ts: layers, NetCDF, indexes, manifest) → site (pipeline/run/site-stage.ts)
 *
 * A distributed run cuts the same flow into array jobs: `--shard K/N` runs compute for a slice of
 * the compute tasks; `--merge DIR --tile K/N` runs merge for a slice of the blocks of rows, each
 * band kept in DIR/bands (band-store.ts); `--assemble DIR` runs regions, publish and site on them.
 *
 * Everything is written into a staging folder first; the output folder is replaced only when the
 * whole build succeeded, so a failed build publishes nothing. Partials go to the cache (or, with
 * `--no-cache`, to a scratch folder removed at the end); so do the merge bands' scratch files.
 * Memory is bounded by a tile and a block of hours (memory-plan.ts), never by the grid, the record
 * or the number of regions.
 */
import { mkdir, rename, rm } from 'node:fs/promises';
import { availableParallelism } from 'node:os';
import { basename, dirname, join, resolve } from 'node:path';
import { loadConfig, type ResolvedConfig } from '../config/load.ts';
import type { KernelCounts } from '../physics/index.ts';
import { consoleLogger, silentLogger, type Logger } from '../model/effects.ts';
import { withProcessLock } from '../model/lock.ts';
import { buildSite } from './site-stage.ts';
import { planBuild, type BuildPlan } from './plan-stage.ts';
import { computeStage, workerInit, type ComputeMode } from './compute-stage.ts';
import { startShardPool, type ShardPool, type WorkerInit } from './shard-pool.ts';
import { mergeStage, stagingTarget, type RegionSlicing } from './merge-stage.ts';
import type { MergeTileSummary } from './merge-tile.ts';
import { bandDir, bandDone, bandsKey, bandsRootOf, linkBandData, readBands, writeBand } from './band-store.ts';
import { regionStage } from './region-stage.ts';
import { publishStage } from './publish-stage.ts';
import { BuildLocked, DiskFull } from './errors.ts';

export interface BuildAtlasOptions {
  configPath: string;
  /** Output folder; default the config's `output`. */
  outDir?: string;
  /** Worker threads; default all cores. */
  jobs?: number;
  /** Memory budget (`4G`); default the config's `memory`, else 3 G. */
  memory?: string;
  quiet?: boolean;
  /** Skip the Astro site (publish data files only, into outDir/data). */
  dataOnly?: boolean;
  logger?: Logger;
  /** Partial cache folder; default the config's `cache`; `false` computes every shard and keeps nothing. */
  cache?: string | false;
  /** Distributed run: compute slice `k` of `n` of the compute tasks into `partialsDir`; publish nothing. */
  shard?: { k: number; n: number; partialsDir: string };
  /**
   * Distributed run: merge the partials under this folder (computes nothing) and publish; with
   * `mergeSlice`, only merge the bands of slice K of N into `mergeDir/bands` and publish nothing.
   */
  mergeDir?: string;
  mergeSlice?: { k: number; n: number };
  /** Distributed run: join the merged bands under this folder (its `bands/`, from every `--tile K/N`) and publish. */
  assembleDir?: string;
  /** Hours a built year may miss per variable before the coverage check stops the build [h]; default 0. */
  maxMissingHours?: number;
  /** Fewest regions the region stage runs on the worker threads (default REGION_POOL_MIN; tests lower it). */
  regionPoolMin?: number;
  /** When the merge shares a band's regions out among workers (default DEFAULT_REGION_SLICING of merge-stage.ts; tests lower it). */
  regionSlicing?: RegionSlicing;
}

export interface BuildReport {
  outDir: string;
  shards: number;
  /** Shards computed in this run, and reused (cache) or merged (partial files) [–]. */
  computed: number;
  reused: number;
  /** Land cell-hours computed in this run [–]. */
  cellHours: number;
  /** Seconds spent computing shards (wall clock) [s]. */
  computeSeconds: number;
  /** Seconds spent merging the partials into bands (normals and cell files included) [s]. */
  mergeSeconds: number;
  /** Bytes of partial files written in this run [B]. */
  partialBytes: number;
  /** Seconds from the computed shards to the published output: merge, regions, layers, site [s]. */
  publishSeconds: number;
  totalSeconds: number;
  physics: KernelCounts;
  /** Worker time per land cell-hour computed: read, physics, reduction [ns]. */
  perCellHour: { read: number; physics: number; reduce: number };
  /** The plan's estimate of the whole build, for comparison with what it took. */
  estimate: BuildPlan['estimate'];
}

export async function buildAtlas(o: BuildAtlasOptions): Promise<BuildReport> {
  const rc = await loadConfig(o.configPath);
  const outDir = resolve(o.outDir ?? rc.outputDir);
  if (o.shard || o.mergeSlice) return runBuild(o, rc, outDir);
  await mkdir(dirname(outDir), { recursive: true });
  // Two builds into one output folder must not interleave: the second stops with a clear error.
  return withProcessLock(`${outDir}.build-lock`, () => runBuild(o, rc, outDir), {
    onWait: (pid) => {
      throw BuildLocked({ outDir, pid }, { file: rc.path });
    },
  });
}

async function runBuild(o: BuildAtlasOptions, rc: ResolvedConfig, outDir: string): Promise<BuildReport> {
  const t0 = Date.now();
  const base = o.logger ?? (o.quiet ? silentLogger : consoleLogger);
  // Every line carries the seconds since the start, so a slow step shows itself.
  const stamp = () => `[${((Date.now() - t0) / 1000).toFixed(1).padStart(5)} s]`;
  const log: Logger = { info: (m) => base.info(`${stamp()} ${m}`), warn: (m) => base.warn(`${stamp()} ${m}`) };
  const cfg = rc.config;
  // The compute workers start now and load their code while the plan hashes the inputs; they are
  // sent their set-up when the plan is made. They are stopped after the compute stage: the merge
  // and the inputs' summary start fresh workers, so a merge holds nothing of computing (memory).
  const jobs = Math.max(1, o.jobs ?? availableParallelism());
  let setUp: { resolve(i: WorkerInit): void; reject(e: unknown): void } | undefined;
  const pool: ShardPool = startShardPool(jobs, new Promise<WorkerInit>((resolve, reject) => (setUp = { resolve, reject })));
  let plan: BuildPlan;
  try {
    plan = await planBuild(
      rc,
      {
        jobs,
        memory: o.memory,
        mergeSlice: o.mergeSlice,
        noMerge: o.assembleDir !== undefined,
        maxMissingHours: o.maxMissingHours,
        site: !o.dataOnly && o.shard === undefined && o.mergeDir === undefined,
      },
      log,
    );
  } catch (e) {
    setUp!.reject(e);
    await pool.close();
    throw e;
  }
  setUp!.resolve(workerInit(plan));
  const scratch = join(dirname(outDir), `.${basename(outDir)}.scratch-${process.pid}`);
  const shared = o.mergeDir ?? o.assembleDir;
  const cacheDir = o.cache === false || shared ? undefined : join(resolve(o.cache ?? rc.cacheDir), cfg.id);
  try {
    const mode: ComputeMode = o.shard
      ? { kind: 'slice', ...o.shard }
      : shared
        ? { kind: 'merge', partialsDir: shared }
        : { kind: 'cache', cacheDir, scratchDir: join(scratch, 'partials') };
    const compute = await computeStage(plan, mode, log, o.quiet, pool);
    await pool.close();
    const report = (publishSeconds: number, mergeSeconds: number): BuildReport => ({
      outDir: o.shard ? join(resolve(o.shard.partialsDir), `slice-${o.shard.k}-of-${o.shard.n}`) : outDir,
      shards: o.shard ? compute.partials.size : plan.shards.length,
      computed: compute.computed,
      reused: (o.shard ? compute.partials.size : plan.shards.length) - compute.computed,
      cellHours: compute.cellHours,
      computeSeconds: compute.seconds,
      mergeSeconds,
      partialBytes: compute.partialBytes,
      publishSeconds,
      totalSeconds: (Date.now() - t0) / 1000,
      physics: compute.physics,
      perCellHour: compute.perCellHour,
      estimate: plan.estimate,
    });
    if (o.shard) {
      log.info(
        `slice ${o.shard.k}/${o.shard.n} done: ${compute.computed} computed, ${compute.partials.size - compute.computed} reused, ${(compute.partialBytes / 1e6).toFixed(1)} MB of partials`,
      );
      return report(0, 0);
    }
    if (o.mergeSlice && o.mergeDir) {
      // One task of a distributed merge: its bands into DIR/bands, each finished with band.json.
      const dir = o.mergeDir;
      const key = bandsKey(plan);
      const merged = await mergeStage(
        plan,
        compute.partials,
        {
          dataDir: (b, v) => join(bandDir(dir, b.rows, v), 'data'),
          scratchDir: (b, v) => join(bandDir(dir, b.rows, v), 'scratch'),
          done: (b, v) => bandDone(dir, key, b.rows, v),
          finished: (b, v, s) => writeBand(dir, key, b.blocks, s, v),
        },
        log,
        o.quiet,
        o.regionSlicing,
      );
      log.info(`merge slice ${o.mergeSlice.k}/${o.mergeSlice.n} done: ${plan.bands.length} band(s) of ${plan.blocks.length} blocks of rows in all`);
      return report(0, merged.seconds);
    }

    // Publish into a staging folder, then build the site from it.
    const tp = Date.now();
    const stage = join(dirname(outDir), `.${basename(outDir)}.stage-${process.pid}`);
    await rm(stage, { recursive: true, force: true });
    const dataDir = join(stage, 'data');
    await mkdir(dataDir, { recursive: true });
    try {
      const generated = process.env.HEATHOURS_BUILD_TIME ?? new Date().toISOString();
      let tiles: MergeTileSummary[][];
      let mergeSeconds = 0;
      if (o.assembleDir) {
        // The last step of a distributed run: the merged bands of every weather, checked, their files linked in.
        const dir = o.assembleDir;
        tiles = plan.variants.map((v) => {
          const bands = readBands(dir, plan, v);
          for (const b of bands) linkBandData(b, join(dataDir, v.dataPath));
          log.info(`assembling ${bands.length} merged band(s) from ${bandsRootOf(dir, v)}`);
          return bands.map((b) => b.summary);
        });
      } else {
        const merged = await mergeStage(plan, compute.partials, stagingTarget(dataDir, join(scratch, 'bands')), log, o.quiet, o.regionSlicing);
        tiles = merged.tiles;
        mergeSeconds = merged.seconds;
      }
      for (let vi = 0; vi < plan.variants.length; vi++)
        await regionStage(plan, plan.variants[vi], tiles[vi], join(dataDir, plan.variants[vi].dataPath), generated, log, o.quiet, jobs, o.regionPoolMin);
      await publishStage({
        plan,
        tiles,
        compute,
        stage,
        outDir,
        summaryCacheDir: cacheDir ? join(cacheDir, 'summary') : undefined,
        generated,
        log,
        quiet: o.quiet,
      });
      await rm(scratch, { recursive: true, force: true });
      if (o.dataOnly) {
        const { replaceDirAtomic } = await import('../model/effects.ts');
        await replaceDirAtomic(outDir, async (tmp) => rename(dataDir, join(tmp, 'data')));
      } else {
        log.info('building the site');
        await buildSite({ dataDir: stage, outDir, quiet: o.quiet, moveData: true, base: cfg.site.base, jobs: o.jobs, parts: plan.memory.siteParts });
      }
      const totalSeconds = (Date.now() - t0) / 1000;
      log.info(`atlas written to ${outDir} in ${totalSeconds.toFixed(1)} s (estimated ${plan.estimate.seconds.total.toFixed(0)} s)`);
      return report((Date.now() - tp) / 1000, mergeSeconds);
    } catch (e) {
      throw diskFull(e, stage);
    } finally {
      await rm(stage, { recursive: true, force: true });
    }
  } finally {
    await pool.close();
    await rm(scratch, { recursive: true, force: true });
    await plan.close();
  }
}

/** A full disk while publishing becomes the catalogued DiskFull; other errors pass unchanged. */
function diskFull(e: unknown, path: string): unknown {
  const code = (e as NodeJS.ErrnoException)?.code;
  if (code === 'ENOSPC' || code === 'EDQUOT')
    return DiskFull({ path: (e as NodeJS.ErrnoException).path ?? path, what: 'publishing the atlas' }, { file: (e as NodeJS.ErrnoException).path ?? path });
  return e;
}
