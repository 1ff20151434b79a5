/**
 * The demo dataset: invented hourly ERA5-style NetCDF files for the invented territory
 * (pipeline/demo/territory.ts), in the legacy NetCDF-3 layout, the NetCDF-4 layout, or mixed
 * (legacy up to {@link MIXED_LAST_LEGACY_YEAR}, NetCDF-4 after).
 *
 * Files in `outDir`: `era5-demo-<year>.nc` (one per year, every time-varying variable),
 * `era5-demo-lsm.nc` (the invariant land-sea mask, one time step) and, for the demo's scenarios,
 * `scenarios/warming-level-1.5.nc` and `scenarios/warming-level-2.0.nc` (invented monthly change
 * factors, change-factors.ts). A year's file depends only on
 * (seed, year, grid, layout) and, in NetCDF-4, on whether it is the last year asked for (its
 * last three months are then marked preliminary). Asking for a new year writes only that year;
 * the mask file is rewritten only when its bytes would change.
 */
import { mkdirSync, readFileSync, renameSync, rmSync, statSync, writeFileSync, existsSync } from 'node:fs';
import { writeFileAtomicSync } from '../model/effects.ts';
import { join } from 'node:path';
import { availableParallelism } from 'node:os';
import { runInWorkers } from '../infra/worker-pool.ts';
import { SOLAR_FIRST_YEAR, SOLAR_LAST_YEAR } from '../physics/solar-position.ts';
import { startProgress } from '../model/progress.ts';
import { makeCellClimate } from './cell-climate.ts';
import { DemoGridInvalid, DemoLayoutUnknown, DemoOutputUnwritable, DemoSeedInvalid, DemoYearOutOfRange } from './errors.ts';
import { writeLegacyLandSeaMask } from './legacy-layout.ts';
import { h5wasmReady } from './netcdf4-writer.ts';
import { PRELIMINARY_MONTHS, writeNetcdf4LandSeaMask } from './netcdf4-layout.ts';
import { runYearJob, type YearJob } from './year-job.ts';
import { COUNTRY_GRID, DEFAULT_GRID, SMALL_GRID, placeGrid, type GridSpec } from './territory.ts';
import { changeFactorFile, DEMO_WARMING_LEVELS, writeDemoChangeFactors } from './change-factors.ts';
import { yearHours } from './weather.ts';
import { demoPopulation, POPULATION_FILE } from './population.ts';
import { writeGeoTiff } from '../publish/layers/geotiff-write.ts';

import { DEFAULT_SEED, DEMO_LAYOUTS, type DemoGridChoice, type DemoLayout } from './choices.ts';
export type { DemoGridChoice } from './choices.ts';

export { DEFAULT_SEED, DEMO_LAYOUTS, type DemoLayout };
/** In the mixed layout, years up to this one are legacy, later ones NetCDF-4 [year]. */
export const MIXED_LAST_LEGACY_YEAR = 2022;
/** First and last year the demo can generate [year] (the solar-position formulas' range). */
export const DEMO_FIRST_YEAR = SOLAR_FIRST_YEAR;
export const DEMO_LAST_YEAR = SOLAR_LAST_YEAR;
/** Name of the invariant land-sea mask file. */
export const LSM_FILE = 'era5-demo-lsm.nc';

/** File name of a year's data. */
export function yearFileName(year: number): string {
  return `era5-demo-${year}.nc`;
}

/** The layout a year is written in. */
export function layoutOfYear(layout: DemoLayout, year: number): 'legacy' | 'netcdf4' {
  if (layout === 'mixed') return year <= MIXED_LAST_LEGACY_YEAR ? 'legacy' : 'netcdf4';
  return layout;
}

function resolveGrid(grid: DemoGridChoice | undefined): GridSpec {
  if (grid === undefined || grid === 'default') return DEFAULT_GRID;
  if (grid === 'small') return SMALL_GRID;
  if (grid === 'country') return COUNTRY_GRID;
  if (typeof grid === 'object' && grid !== null) {
    const { nLat, nLon, resolution } = grid;
    if (Number.isInteger(nLat) && Number.isInteger(nLon) && nLat >= 1 && nLon >= 1 && nLat * nLon <= 1_000_000 && resolution > 0 && resolution <= 5)
      return { nLat, nLon, resolution };
  }
  throw DemoGridInvalid({ grid: JSON.stringify(grid) }, { key: 'grid' });
}

/** Fails early, before any data is generated, when `dir` cannot be created or written. */
function checkWritable(dir: string): void {
  try {
    mkdirSync(dir, { recursive: true });
    if (!statSync(dir).isDirectory()) throw new Error('not a folder');
    const probe = join(dir, `.heathours-write-check.${process.pid}.tmp`);
    writeFileSync(probe, '');
    rmSync(probe, { force: true });
  } catch (e) {
    throw DemoOutputUnwritable({ dir, reason: (e as NodeJS.ErrnoException).code ?? (e as Error).message }, { file: dir });
  }
}

/**
 * Writes the invented demo dataset. Each file is written atomically (temporary name, then rename).
 * @returns `files`: the weather files written (the dataset's inputs); `changeFactors`: the
 * scenarios' change files written; `unchanged`: files that already held the same bytes.
 */
export async function writeDemoDataset(opts: {
  outDir: string;
  years: number[];
  layout: 'legacy' | 'netcdf4' | 'mixed';
  grid?: DemoGridChoice;
  seed?: number;
  quiet?: boolean;
  /** Years written at once, each in a worker thread [–]; default: the number of cores. 1 = in this thread. */
  jobs?: number;
}): Promise<{ files: string[]; changeFactors: string[]; unchanged: string[] }> {
  const layout = opts.layout;
  if (!DEMO_LAYOUTS.includes(layout)) throw DemoLayoutUnknown({ layout: String(layout) }, { key: 'layout' });
  const seed = opts.seed ?? DEFAULT_SEED;
  if (!Number.isInteger(seed) || seed < 0 || seed > 2147483647) throw DemoSeedInvalid({ seed: String(seed) }, { key: 'seed' });
  const years = [...new Set(opts.years)].sort((a, b) => a - b);
  if (years.length === 0) throw DemoYearOutOfRange({ year: NaN, first: DEMO_FIRST_YEAR, last: DEMO_LAST_YEAR }, { key: 'years' });
  for (const y of years)
    if (!Number.isInteger(y) || y < DEMO_FIRST_YEAR || y > DEMO_LAST_YEAR)
      throw DemoYearOutOfRange({ year: y, first: DEMO_FIRST_YEAR, last: DEMO_LAST_YEAR }, { key: 'years' });
  const spec = resolveGrid(opts.grid);
  checkWritable(opts.outDir);

  const cc = makeCellClimate(placeGrid(spec));
  const lastYear = years[years.length - 1];
  const preliminaryFromMs = Date.UTC(lastYear, 12 - PRELIMINARY_MONTHS, 1) + 3_600_000;
  if (layout === 'netcdf4') await h5wasmReady();

  const total = years.reduce((s, y) => s + yearHours(y).nHours * (layoutOfYear(layout, y) === 'legacy' ? 2 : 1), 0);
  // Counted in hours of weather generated: a legacy year is generated twice (once for the
  // packing ranges of its int16 variables, once to write them).
  const progress = startProgress('demo-data', total, { quiet: opts.quiet, unit: 'hours generated' });
  const files: string[] = [];
  const changeFactors: string[] = [];
  const unchanged: string[] = [];
  try {
    // The invariant mask: written beside the years, replaced only if its bytes would change.
    const lsmPath = join(opts.outDir, LSM_FILE);
    const lsmNew = join(opts.outDir, `.${LSM_FILE}.${process.pid}.new`);
    const lsmLayout = layout === 'netcdf4' ? 'netcdf4' : 'legacy';
    try {
      if (lsmLayout === 'legacy') writeLegacyLandSeaMask(lsmNew, cc, seed);
      else writeNetcdf4LandSeaMask(lsmNew, cc, seed);
      if (existsSync(lsmPath) && readFileSync(lsmPath).equals(readFileSync(lsmNew))) {
        unchanged.push(lsmPath);
      } else {
        renameSync(lsmNew, lsmPath);
        files.push(lsmPath);
      }
    } finally {
      rmSync(lsmNew, { force: true });
    }
    // The invented population raster (for the workforce weighting): the same for every grid and year.
    const popPath = join(opts.outDir, POPULATION_FILE);
    const tif = writeGeoTiff(demoPopulation(), {
      units: 'people',
      description: 'INVENTED people per pixel of the demo territory (heathours demo-data); not derived from any real data',
    });
    if (existsSync(popPath) && readFileSync(popPath).equals(tif)) unchanged.push(popPath);
    else {
      writeFileAtomicSync(popPath, tif);
      files.push(popPath);
    }
    const jobs: YearJob[] = years.map((year) => ({
      path: join(opts.outDir, yearFileName(year)),
      grid: spec,
      seed,
      year,
      layout: layoutOfYear(layout, year),
      preliminaryFromMs: year === lastYear ? preliminaryFromMs : Infinity,
    }));
    const parallel = Math.max(1, Math.min(opts.jobs ?? availableParallelism(), jobs.length));
    const tick = (h: number) => progress.tick(h);
    if (parallel === 1) for (const job of jobs) await runYearJob(job, tick);
    else await runInParallel(jobs, parallel, tick);
    files.push(...jobs.map((j) => j.path));
    // The scenarios' invented change factors: rewritten only when their bytes would change.
    mkdirSync(join(opts.outDir, 'scenarios'), { recursive: true });
    for (const level of DEMO_WARMING_LEVELS) {
      const path = join(opts.outDir, changeFactorFile(level));
      const fresh = join(opts.outDir, 'scenarios', `.${process.pid}.${level}.new.nc`);
      try {
        writeDemoChangeFactors(fresh, cc.grid, level);
        if (existsSync(path) && readFileSync(path).equals(readFileSync(fresh))) unchanged.push(path);
        else {
          renameSync(fresh, path);
          changeFactors.push(path);
        }
      } finally {
        rmSync(fresh, { force: true });
      }
    }
  } finally {
    progress.done();
  }
  return { files, changeFactors, unchanged };
}

/**
 * Runs year jobs in up to `parallel` worker threads (pipeline/infra/worker-pool.ts), NetCDF-4
 * years (the slowest) first. After a failure no new year starts, and the years being written
 * finish (each file appears whole or not at all), then the first error is thrown.
 */
async function runInParallel(jobs: YearJob[], parallel: number, tick: (h: number) => void): Promise<void> {
  const queue = [...jobs].sort((a, b) => (a.layout === b.layout ? a.year - b.year : a.layout === 'netcdf4' ? -1 : 1));
  await runInWorkers<YearJob, void>('demo-year', queue, {
    size: parallel,
    describe: (job) => `demo year ${job.year}`,
    onProgress: (_job, hours) => tick(hours),
    onFailure: 'drain',
  });
}

export { COUNTRY_GRID, DEFAULT_GRID, SMALL_GRID, placeGrid } from './territory.ts';
export type { GridSpec } from './territory.ts';
