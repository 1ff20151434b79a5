/**
 * fuzz-readers: the long fuzz run of the readers (issue 18), the suite's test/fuzz/readers.test.ts
 * with many more mutants: per format (NetCDF-3 classic, 64-bit offset, NetCDF-4, the `point`
 * CSV, the atlas YAML) the truncation sweep, then random damage weighted to headers and metadata,
 * each mutant in a worker thread under a time limit. One figure per format: the outcome counts
 * (read / catalogued / internal / unnamed / noisy / hang / crash) and the slowest mutant [s];
 * the aim is 0 of every defect and the slowest under 10 s.
 *
 * Mutants per format: 10,000 (HEATHOURS_FUZZ_COUNT to change, HEATHOURS_FUZZ_SEED for another
 * seed, HEATHOURS_FUZZ_FORMATS=netcdf4,point-csv for some formats). Inputs are invented (one year
 * of the small demo grid), under .cache/bench/fuzz; mutants with a defect are kept there.
 * The machine is shared: times are wall clock on 2 workers.
 */
import { join } from 'node:path';
import { rmSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { fileURLToPath } from 'node:url';
import { describeDefect, runCampaign } from '../test/fuzz/campaign.ts';
import { FORMATS, type FormatId } from '../test/fuzz/mutate.ts';
import type { Bench, BenchFigure } from './types.ts';

const DIR = fileURLToPath(new URL('../.cache/bench/fuzz/', import.meta.url));

export const bench: Bench = {
  names: ['fuzz-readers'],
  async run(): Promise<BenchFigure[]> {
    const count = Number(process.env.HEATHOURS_FUZZ_COUNT ?? 10_000);
    const seed = Number(process.env.HEATHOURS_FUZZ_SEED ?? 1);
    const formats = (process.env.HEATHOURS_FUZZ_FORMATS?.split(',') ?? FORMATS) as FormatId[];
    rmSync(join(DIR, 'mutants'), { recursive: true, force: true });
    let done = 0;
    const total = count * formats.length;
    const workers = Math.max(1, Math.min(2, availableParallelism()));
    const { summaries, seconds } = await runCampaign({
      count, seed, workers, timeoutMs: 60_000, dir: DIR, formats,
      onResult: () => {
        done++;
        if (done % 500 === 0) process.stderr.write(`fuzz-readers: ${done} of ${total} mutants\n`);
      },
    });
    for (const s of summaries) for (const d of s.defects.slice(0, 3)) process.stderr.write(`${describeDefect(d)}\n\n`);
    const defects = summaries.reduce((a, s) => a + s.defects.length, 0);
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
      seed,
      workers,
      runSeconds: Math.round(seconds),
      allDefects: defects,
    }));
  },
};
