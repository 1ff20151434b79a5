/**
 * One file of the demo dataset as a self-contained job, so that years can be written in worker
 * threads (./year-worker.ts) or in the calling thread with the same code and the same bytes.
 */
import { makeCellClimate } from './cell-climate.ts';
import { writeLegacyYear } from './legacy-layout.ts';
import { h5wasmReady } from './netcdf4-writer.ts';
import { writeNetcdf4Year } from './netcdf4-layout.ts';
import { placeGrid, type GridSpec } from './territory.ts';

export interface YearJob {
  path: string;
  grid: GridSpec;
  seed: number;
  year: number;
  layout: 'legacy' | 'netcdf4';
  /** Stamps at or after this instant get expver "0005" [ms since 1970 UTC]; Infinity for none. */
  preliminaryFromMs: number;
}

/** Writes the job's file; `tick` is called with the number of hours done [h]. */
export async function runYearJob(job: YearJob, tick: (hours: number) => void): Promise<void> {
  const cc = makeCellClimate(placeGrid(job.grid));
  if (job.layout === 'legacy') writeLegacyYear(job.path, cc, job.seed, job.year, tick);
  else {
    await h5wasmReady();
    writeNetcdf4Year(job.path, cc, job.seed, job.year, job.preliminaryFromMs, tick);
  }
}
