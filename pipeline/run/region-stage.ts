/**
 * Stage 4 of a build, the regions: each region's parts from every merge band it overlaps are
 * added, its normals computed and its table (tidy CSV, the wide CSV and the workbook), summary
 * and calculator tile written (./region-write.ts). With `jobs` > 1 and at least
 * {@link REGION_POOL_MIN} regions the regions run on `jobs` worker threads (the entry `region`,
 * ./region-worker.ts), handed out one at a time; else in this thread. Each region is made whole
 * by one thread, so the files are the same bytes for any number of threads. Memory holds one
 * region per thread. Run once per weather: the record into `data/`, each scenario into
 * `data/scenarios/<id>/` (same files, the scenario named in its workbooks).
 */
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { regionSheetInfo } from '../publish/region-spreadsheets.ts';
import { STATISTIC_RULES } from '../publish/manifest.ts';
import { CAUTIONS } from '../work/index.ts';
import { CODE_VERSION } from '../model/version.ts';
import type { RegionRecordRef } from '../formats/region-parts.ts';
import { startProgress } from '../model/progress.ts';
import type { Logger } from '../model/effects.ts';
import type { BuildPlan, BuildVariant } from './plan-stage.ts';
import { describeScenario } from '../scenario/describe.ts';
import type { MergeTileSummary } from './merge-tile.ts';
import { regionScratch, writeRegion, type RegionContext, type RegionTask } from './region-write.ts';
import { startWorkerPool } from '../infra/worker-pool.ts';

export interface RegionOutcome {
  seconds: number;
  /** Threads that made the regions [count]: 1 in this thread, else the pool's workers. */
  threads: number;
}

/**
 * Fewest regions run on worker threads; fewer run in this thread (a worker's start costs about
 * 0.3–1 s, the time of some 20–60 regions on this thread).
 */
export const REGION_POOL_MIN = 64;

export async function regionStage(
  plan: BuildPlan,
  variant: BuildVariant,
  tiles: readonly MergeTileSummary[],
  dataDir: string,
  generated: string,
  log: Logger,
  quiet?: boolean,
  jobs = 1,
  poolMin = REGION_POOL_MIN,
): Promise<RegionOutcome> {
  const t0 = Date.now();
  const cfg = plan.rc.config;
  // What the region workbooks' assumptions sheet says of the build (and of the scenario).
  const sc = variant.scenario;
  const sheetInfo = {
    ...regionSheetInfo({
      ...cfg,
      ...cfg.dataset,
      buildTime: generated,
      codeVersion: CODE_VERSION,
      configDigest: plan.configDigest,
      inputFiles: plan.ds.files.length,
      work: plan.work,
      figures: [...plan.defs, ...(plan.workforce?.regionDefs ?? [])],
      statistics: STATISTIC_RULES,
      cautions: CAUTIONS,
    }),
    ...(sc ? { scenario: { name: sc.name, ...describeScenario(sc, variant.check) } } : {}),
  };
  const wf = plan.workforce;
  const ctx: RegionContext = {
    dataDir,
    years: plan.years,
    latestYear: plan.latestYear,
    baseline: cfg.baseline,
    defs: plan.defs,
    nEval: plan.work.evaluations.length,
    sheetInfo,
    regionWorkbooks: cfg.regionWorkbooks,
    ...(wf
      ? {
          workforce: {
            regionDefs: wf.regionDefs,
            annualHours: wf.annualHours,
            config: { name: wf.config.name, year: wf.config.year, licence: wf.config.licence, invented: wf.config.invented },
          },
        }
      : {}),
  };
  // Which records of which band files belong to each region.
  const refs = plan.regions.map(() => [] as Array<{ path: string; ref: RegionRecordRef }>);
  for (const t of tiles) for (const part of t.regionParts) for (const ref of part.records) refs[ref.region].push({ path: part.path, ref });
  const taskOf = (r: number): RegionTask => {
    const w = plan.weights[r];
    return {
      index: r,
      region: { id: plan.regions[r].id, name: plan.regions[r].name },
      weights: { cells: w.cells, coveredFraction: w.coveredFraction, regionArea: w.regionArea },
      refs: refs[r],
      ...(wf ? { workforce: { people: wf.regionPeople[r], profile: wf.shares.regions[r] } } : {}),
    };
  };
  mkdirSync(join(dataDir, 'regions'), { recursive: true });
  mkdirSync(join(dataDir, 'calculator'), { recursive: true });
  const nR = plan.regions.length;
  const threads = jobs > 1 && nR >= poolMin ? Math.min(jobs, nR) : 1;
  const progress = startProgress(sc ? `regions (${sc.id})` : 'regions', nR, { quiet });
  if (threads === 1) {
    const scratch = regionScratch(plan.years.length);
    for (let r = 0; r < nR; r++) {
      await writeRegion(ctx, taskOf(r), scratch);
      progress.tick();
    }
  } else {
    const pool = startWorkerPool<RegionTask, number>('region', { size: threads, init: ctx, describe: (t) => `region ${t.region.id}` });
    try {
      // Each task points at what the plan already holds (cells, records): no region's data is copied here.
      const tasks = Array.from({ length: nR }, (_, r) => taskOf(r));
      await pool.run(tasks, {
        depth: (queued, n) => (queued > n ? 2 : 1),
        onResult: () => progress.tick(),
        // A region being written is finished, not killed half-way; none is handed out after a failure.
        onFailure: 'drain',
      });
    } finally {
      await pool.close();
    }
  }
  progress.done();
  const seconds = (Date.now() - t0) / 1000;
  log.info(
    `${nR} region(s)${sc ? ` of scenario ${sc.id}` : ''}: tables, summaries and calculator tiles in ${seconds.toFixed(1)} s${threads > 1 ? ` on ${threads} threads` : ''}`,
  );
  return { seconds, threads };
}
