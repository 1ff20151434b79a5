/**
 * scenario-cost: wall time of `heathours build` (data only, no cache) of the invented demo
 * (0.25° grid, 655 land cells, 2020–2024) with its two invented change-factor scenarios (+1.5 and
 * +2 °C warming levels), as a ratio of the same build of the record alone (aim ≤ 3.1: the physics
 * is redone for each scenario; reading, planning and the site are shared). Both builds run in child
 * processes (bench/pipeline-child.mjs), one after the other in one run, so the ratio comes from the
 * same (noisy, shared) machine.
 */
import { existsSync, mkdirSync, writeFileSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { join } from 'node:path';
import { changeFactorFile, DEMO_WARMING_LEVELS } from '../pipeline/demo/change-factors.ts';
import { writeDemoDataset } from '../pipeline/demo/index.ts';
import { BENCH_ROOT as ROOT, buildInChild, DEMO_DATA_DIR as DATA, DEMO_YEARS, ensureDemoData } from './pipeline-runs.ts';
import type { Bench } from './types.ts';

const DIR = join(ROOT, '.cache', 'bench', 'scenario-cost');

function atlas(scenarios: string): string {
  return `id: bench
title: Benchmark atlas (invented data)
dataset:
  files: [${DATA}/*.nc]
  landSeaMask: { variable: lsm, threshold: 0.5 }
  invented: true
years: [2020, 2024]
baseline: [2020, 2023]
timeZone: Etc/GMT+10
regions: ${join(ROOT, 'content/regions')}
output: out
work:
  classesFile: ${join(ROOT, 'content/workload-classes.yaml')}
${scenarios}`;
}

const round = (x: number, d = 3) => Math.round(x * 10 ** d) / 10 ** d;

export const bench: Bench = {
  names: ['scenario-cost'],
  async run() {
    mkdirSync(DIR, { recursive: true });
    await ensureDemoData();
    if (!DEMO_WARMING_LEVELS.every((l) => existsSync(join(DATA, changeFactorFile(l))))) {
      await writeDemoDataset({ outDir: DATA, years: DEMO_YEARS, layout: 'mixed', quiet: true });
    }
    const scenarios = DEMO_WARMING_LEVELS.map(
      (l) => `  - { id: level-${String(l).replace('.', '-')}, name: "+${l} (invented)", changeFile: ${join(DATA, changeFactorFile(l))}, humidity: relative }`,
    ).join('\n');
    writeFileSync(join(DIR, 'baseline.yaml'), atlas(''));
    writeFileSync(join(DIR, 'scenarios.yaml'), atlas(`scenarios:\n${scenarios}\n`));
    const jobs = availableParallelism();
    const base = buildInChild(join(DIR, 'baseline.yaml'), join(DIR, 'out-baseline'), jobs);
    const both = buildInChild(join(DIR, 'scenarios.yaml'), join(DIR, 'out-scenarios'), jobs);
    return [
      {
        bench: 'scenario-cost',
        value: round(both.totalSeconds / base.totalSeconds),
        unit: 'x baseline alone',
        input: `invented demo, 655 land cells, 2020-2024, ${DEMO_WARMING_LEVELS.length} change-factor scenarios`,
        aim: '<= 3.1',
        baselineSeconds: round(base.totalSeconds, 1),
        withScenariosSeconds: round(both.totalSeconds, 1),
        baselineShards: base.shards,
        withScenariosShards: both.shards,
        jobs,
        checksum: both.checksum,
        sameRecordTables: both.checksum === base.checksum,
      },
    ];
  },
};
