/**
 * fuzz-readers: the long fuzz run of the readers (issue 18), the suite's test/fuzz/readers.test.ts
 * with many more mutants: per format (NetCDF-3 classic, 64-bit offset, NetCDF-4, the `point`
 * CSV, the atlas YAML) the truncation sweep, then random damage weighted to headers and metadata,
 * each mutant in a worker thread under a time limit. One figure per format: the outcome counts
 * (read / catalogued / internal / unnamed / noisy / hang / crash) and the slowest mutant [s];
 * the aim is 0 of every defect and the slowest under 10 s.
 *
 * Mutants per format: 10,000 (HEATHOURS_FUZZ_COUNT to change, HEATHOURS_FUZZ_SEED for another
 * seed, HEATHOURS_FUZZ_FORMATS=netcdf4,point-csv for some formats). HEATHOURS_FUZZ_SECONDS=N
 * gives the run a time budget [s]: the formats then run one after the other (in the order
 * listed), each until its count or its share of the time left (time a fast format does not need
 * passes on), and each figure says how many mutants ran. Inputs are invented (one year of the
 * small demo grid), under .cache/bench/fuzz; the mutants are written to a memory-backed folder
 * (/dev/shm) where there is one, and those with a defect are kept (the report names them).
 * The machine is shared: times are wall clock on 2 workers, with the load average beside them;
 * the slowest mutant's CPU time alone is measured by `npx tsx test/fuzz/regenerate.ts ... --run`.
 */
import { join } from 'node:path';
import { existsSync, rmSync, rmdirSync } from 'node:fs';
import { availableParallelism, loadavg } from 'node:os';
import { fileURLToPath } from 'node:url';
import { describeDefect, runCampaign } from '../test/fuzz/campaign.ts';
import { FORMATS, type FormatId } from '../test/fuzz/mutate.ts';
import type { Bench, BenchFigure } from './types.ts';

const DIR = fileURLToPath(new URL('../.cache/bench/fuzz/', import.meta.url));
/** Mutants live a few milliseconds each: a memory-backed folder where there is one. */
const MUTANTS = existsSync('/dev/shm') ? join('/dev/shm', `heathours-fuzz-${process.pid}`) : join(DIR, 'mutants');

export const bench: Bench = {
  names: ['fuzz-readers'],
  async run(): Promise<BenchFigure[]> {
    const count = Number(process.env.HEATHOURS_FUZZ_COUNT ?? 10_000);
    const seed = Number(process.env.HEATHOURS_FUZZ_SEED ?? 1);
    const formats = (process.env.HEATHOURS_FUZZ_FORMATS?.split(',') ?? FORMATS) as FormatId[];
    const budget = process.env.HEATHOURS_FUZZ_SECONDS ? Number(process.env.HEATHOURS_FUZZ_SECONDS) : undefined;
    rmSync(join(DIR, 'mutants'), { recursive: true, force: true });
    let done = 0;
    let starts = 0;
    const total = count * formats.length;
    const workers = Math.max(1, Math.min(2, availableParallelism()));
    const load: number[] = [];
    const sampler = setInterval(() => load.push(loadavg()[0]), 30_000);
    sampler.unref();
    let campaign: Awaited<ReturnType<typeof runCampaign>>;
    try {
      campaign = await runCampaign({
        count,
        seed,
        workers,
        timeoutMs: 60_000,
        dir: DIR,
        formats,
        budgetSeconds: budget,
        mutantDir: MUTANTS,
        onResult: () => {
          done++;
          if (done % 500 === 0) process.stderr.write(`fuzz-readers: ${done} of ${total} mutants (load ${loadavg()[0].toFixed(1)})\n`);
        },
        onWorkerStart: () => starts++,
      });
    } finally {
      clearInterval(sampler);
    }
    const { summaries, seconds, poolSeconds } = campaign;
    // Mutants with a defect stay (their paths are in the report); the folder goes when empty.
    try {
      rmdirSync(MUTANTS);
    } catch {
      // kept: it holds the mutants with a defect
    }
    for (const s of summaries) for (const d of s.defects.slice(0, 3)) process.stderr.write(`${describeDefect(d)}\n\n`);
    const defects = summaries.reduce((a, s) => a + s.defects.length, 0);
    const meanLoad = load.length > 0 ? load.reduce((a, b) => a + b, 0) / load.length : loadavg()[0];
    return summaries.map((s) => ({
      bench: 'fuzz-readers',
      value: s.defects.length,
      unit: 'defects',
      format: s.format,
      mutants: s.mutants,
      read: s.counts.read,
      catalogued: s.counts.catalogued,
      internal: s.counts.internal,
      unnamed: s.counts.unnamed,
      noisy: s.counts.noisy,
      hang: s.counts.hang,
      crash: s.counts.crash,
      truncationsRead: s.sweepRead,
      slowestSeconds: Math.round(s.slowestMs / 10) / 100,
      slowest: s.slowest.slice(0, 160),
      ...(s.seconds !== undefined ? { formatSeconds: Math.round(s.seconds), mutantsPerSecond: Math.round((s.mutants / s.seconds) * 100) / 100 } : {}),
      seed,
      workers,
      runSeconds: Math.round(seconds),
      mutantsPerSecondAll: Math.round((summaries.reduce((a, x) => a + x.mutants, 0) / poolSeconds) * 100) / 100,
      workerStarts: starts,
      loadAverage: Math.round(meanLoad * 10) / 10,
      allDefects: defects,
    }));
  },
};
