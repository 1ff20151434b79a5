/**
 * pipeline: land cell-hours per second of `heathours build` end to end (decode + physics + work +
 * reduce over all shards, sun and shade, the four default classes × acclimatization), on the
 * invented demo dataset (pipeline/demo: 0.25° grid of 32 × 34 cells, 655 land cells, 2020–2024,
 * legacy and NetCDF-4 files), with 1 worker and with all cores. The figure is the compute phase
 * (the shards); the whole build's wall time is in the details.
 * pipeline-peak-rss: peak resident memory [MB] of the whole build process (all threads), for
 * 1 year and for 5 years of the same dataset: memory is bounded by the shard, not the record.
 * Each build runs in a child process (bench/pipeline-child.mjs), from the shipped compiled
 * JavaScript; the pipeline figure's details add the same build from the TypeScript sources.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { buildInChild, ensureDemoData, type ChildReport } from './pipeline-runs.ts';
import type { Bench, BenchFigure } from './types.ts';

const ROOT = fileURLToPath(new URL('../', import.meta.url));
const DIR = join(ROOT, '.cache', 'bench', 'pipeline');

async function inputs(): Promise<void> {
  await ensureDemoData();
  for (const [name, years] of [
    ['atlas-5y.yaml', [2020, 2024]],
    ['atlas-1y.yaml', [2021, 2021]],
  ] as const) {
    writeFileSync(
      join(DIR, name),
      `id: bench
title: Benchmark atlas (invented data)
dataset:
  files: [data/*.nc]
  landSeaMask: { variable: lsm, threshold: 0.5 }
  invented: true
years: [${years[0]}, ${years[1]}]
baseline: [${years[0]}, ${years[1]}]
timeZone: Etc/GMT+10
regions: ${join(ROOT, 'content/regions')}
output: out
work:
  classesFile: ${join(ROOT, 'content/workload-classes.yaml')}
`,
    );
  }
}

function build(config: string, jobs: number, code: 'compiled' | 'sources' = 'compiled'): ChildReport {
  return buildInChild(join(DIR, config), join(DIR, `out-${config}-${jobs}-${code}`), jobs, undefined, code);
}

export const bench: Bench = {
  names: ['pipeline', 'pipeline-peak-rss'],
  async run(only) {
    mkdirSync(DIR, { recursive: true });
    await inputs();
    const all = availableParallelism();
    const out: BenchFigure[] = [];
    const many = build('atlas-5y.yaml', all);
    if (only !== 'pipeline-peak-rss') {
      const one = build('atlas-5y.yaml', 1);
      const fromSources = build('atlas-5y.yaml', all, 'sources');
      const rate = (r: ChildReport) => r.cellHours / r.computeSeconds;
      out.push({
        bench: 'pipeline',
        value: Math.round(rate(many)),
        unit: 'cell-hours/s',
        workers: all,
        input: `invented demo dataset, 655 land cells x 5 years hourly (${many.cellHours} land cell-hours), ${many.shards} shards, 16 evaluations`,
        oneWorker: Math.round(rate(one)),
        speedup: Math.round((rate(many) / rate(one)) * 100) / 100,
        buildSeconds: Math.round(many.totalSeconds * 10) / 10,
        checksum: many.checksum,
        sameResultWithOneWorker: one.checksum === many.checksum,
        code: 'the shipped compiled JavaScript (compiled/, what `heathours build` runs)',
        fromSourcesUnderTsx: Math.round(rate(fromSources)),
        fromSourcesNote: 'the same build from the TypeScript sources under tsx, as the tests run: each worker transpiles its modules when it starts',
        sameResultFromSources: fromSources.checksum === many.checksum,
      });
    }
    if (only !== 'pipeline') {
      const oneYear = build('atlas-1y.yaml', all);
      out.push({
        bench: 'pipeline-peak-rss',
        value: Math.round(many.maxRssKb / 1024),
        unit: 'MB',
        input: `the 5-year demo build with ${all} workers (process peak RSS, all threads)`,
        oneYearMB: Math.round(oneYear.maxRssKb / 1024),
        checksum: many.checksum,
      });
    }
    return out;
  },
};
