/**
 * The yearly rebuild and distributed runs, on the invented demo dataset (0.25° grid, 655 land
 * cells, 2020–2024; the same files as bench/pipeline.bench.ts):
 * - rebuild-one-year: wall time of `heathours build` (data only) after adding 2024 to a cache
 *   filled by a 2020–2023 build, as a fraction of a full 2020–2024 build with an empty cache
 *   (aim ≤ 1/5 plus the publish step, whose share of the full build is in the details);
 * - merge: wall time of `heathours build --merge DIR` over the full build's partials (what the
 *   last step of an array job costs), with the partial size per shard;
 * - projection-country: the wall time projected, from the measured shard cost, merge and publish,
 *   for a 0.1° country of 20,000 land cells over 30 years on 50 workers.
 * Every build runs in a child process (bench/pipeline-child.mjs), one after another, so their
 * ratios come from one run on the same (noisy, shared) machine.
 */
import { mkdirSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { buildInChild, DEMO_DATA_DIR as DATA, DEMO_YEARS as YEARS, ensureDemoData, type ChildReport } from './pipeline-runs.ts';
import type { Bench, BenchFigure } from './types.ts';

const ROOT = fileURLToPath(new URL('../', import.meta.url));
const DIR = join(ROOT, '.cache', 'bench', 'rebuild');

async function setUp(): Promise<void> {
  await ensureDemoData();
  // Two views of the same files: the first four years, and all five (the new year arrives).
  for (const [name, years] of [
    ['data-4y', YEARS.slice(0, 4)],
    ['data-5y', YEARS],
  ] as const) {
    const d = join(DIR, name);
    rmSync(d, { recursive: true, force: true });
    mkdirSync(d, { recursive: true });
    for (const f of [...years.map((y) => `era5-demo-${y}.nc`), 'era5-demo-lsm.nc']) symlinkSync(join(DATA, f), join(d, f));
  }
  for (const [name, data, last] of [
    ['atlas-4y.yaml', 'data-4y', 2023],
    ['atlas-5y.yaml', 'data-5y', 2024],
  ] as const) {
    writeFileSync(
      join(DIR, name),
      `id: bench
title: Benchmark atlas (invented data)
dataset:
  files: [${data}/*.nc]
  landSeaMask: { variable: lsm, threshold: 0.5 }
  invented: true
years: [2020, ${last}]
baseline: [2020, 2023]
timeZone: Etc/GMT+10
regions: ${join(ROOT, 'content/regions')}
output: out
work:
  classesFile: ${join(ROOT, 'content/workload-classes.yaml')}
`,
    );
  }
}

function build(config: string, out: string, jobs: number, options: Record<string, unknown>): ChildReport {
  return buildInChild(join(DIR, config), join(DIR, out), jobs, options);
}

const round = (x: number, d = 3) => Math.round(x * 10 ** d) / 10 ** d;

export const bench: Bench = {
  names: ['rebuild-one-year', 'merge', 'projection-country'],
  async run() {
    mkdirSync(DIR, { recursive: true });
    await setUp();
    const jobs = availableParallelism();
    const cacheFull = join(DIR, 'cache-full');
    const cacheYearly = join(DIR, 'cache-yearly');
    rmSync(cacheFull, { recursive: true, force: true });
    rmSync(cacheYearly, { recursive: true, force: true });

    const full = build('atlas-5y.yaml', 'out-full', jobs, { cache: cacheFull });
    build('atlas-4y.yaml', 'out-4y', jobs, { cache: cacheYearly });
    const rebuild = build('atlas-5y.yaml', 'out-rebuild', jobs, { cache: cacheYearly });
    const merged = build('atlas-5y.yaml', 'out-merge', jobs, { mergeDir: join(cacheFull, 'bench') });

    const publishShare = full.publishSeconds / full.totalSeconds;
    const fraction = rebuild.totalSeconds / full.totalSeconds;
    const out: BenchFigure[] = [];
    out.push({
      bench: 'rebuild-one-year',
      value: round(fraction),
      unit: 'of full build',
      input: `invented demo, 655 land cells, 2020-2023 cached, 2024 added; ${full.shards} shards in all`,
      fullSeconds: round(full.totalSeconds, 1),
      rebuildSeconds: round(rebuild.totalSeconds, 1),
      recomputedShards: rebuild.computed,
      reusedShards: rebuild.reused,
      aim: round(1 / YEARS.length + publishShare),
      publishShareOfFull: round(publishShare),
      sameResultAsFull: rebuild.checksum === full.checksum,
      checksum: rebuild.checksum,
    });
    const perShard = full.partialBytes / Math.max(1, full.computed);
    out.push({
      bench: 'merge',
      value: round(merged.mergeSeconds, 2),
      unit: 's',
      input: `${full.shards} partials of the full build (${round(full.partialBytes / 1e6, 1)} MB)`,
      partialMBPerShard: round(perShard / 1e6, 2),
      partialKBPerCellYear: round(full.partialBytes / 1e3 / (655 * YEARS.length), 2),
      mergeBuildSeconds: round(merged.totalSeconds, 1),
      publishSeconds: round(merged.publishSeconds, 1),
      sameResultAsFull: merged.checksum === full.checksum,
      checksum: merged.checksum,
    });
    // Projection: worker-seconds per land cell-year from the measured compute phase (all
    // workers busy), merge time per cell-year, publish time per land cell (one machine).
    const cellYears = 655 * YEARS.length;
    const workerSecondsPerCellYear = (full.computeSeconds * jobs) / cellYears;
    const mergePerCellYear = merged.mergeSeconds / cellYears;
    const publishPerCell = merged.publishSeconds / 655;
    const country = { cells: 20_000, years: 30, workers: 50 };
    const computeS = (country.cells * country.years * workerSecondsPerCellYear) / country.workers;
    const mergeS = country.cells * country.years * mergePerCellYear;
    const publishS = country.cells * publishPerCell;
    out.push({
      bench: 'projection-country',
      value: round((computeS + mergeS + publishS) / 60, 1),
      unit: 'min',
      input: `${country.cells} land cells x ${country.years} years on ${country.workers} workers, from this run's demo costs`,
      computeMinutes: round(computeS / 60, 1),
      mergeMinutes: round(mergeS / 60, 1),
      publishMinutes: round(publishS / 60, 1),
      workerSecondsPerCellYear: round(workerSecondsPerCellYear, 4),
      partialGB: round((country.cells * country.years * (full.partialBytes / cellYears)) / 1e9, 1),
      checksum: full.checksum,
    });
    return out;
  },
};
