/**
 * Beyond one machine (issue: the merge split by tile, a real Slurm cluster):
 * - cluster-demo: the invented demo (0.25°, 655 land cells, 2020–2024) through a one-node Slurm
 *   cluster started here (test/helpers/slurm-cluster.ts), with the README's script (shard array,
 *   merge array, assemble): wall time as a ratio of the one-machine build of the same atlas, and
 *   whether the two sites are byte-identical.
 * - merge-split: on the country-size grid of bench/scale.bench.ts (160 × 160 cells, 2 years), the
 *   merge step as 1, 2 and 4 merge tasks (`--merge DIR --tile K/M`, run side by side, one worker
 *   each) and the assemble step; then a projection, from the measured per-unit costs, of a
 *   continent of 300,000 land cells × 30 years on 100 nodes of 4 cores. The model: compute =
 *   cell-hours × (measured worker-seconds per cell-hour) / (nodes × cores); merge = cell-years ×
 *   (measured worker-seconds per cell-year of a merge task) / (nodes × cores); assemble (one node)
 *   = grid cells × (measured seconds per grid cell of the assemble step, which grows with the
 *   layers and NetCDF) + regions × (measured seconds per region); file-system and scheduler
 *   overheads are not modelled.
 * Every build runs as a separate process.
 */
import { execFileSync, spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { ensureDemoData, DEMO_DATA_DIR } from './pipeline-runs.ts';
import { startSlurmCluster } from '../test/helpers/slurm-cluster.ts';
import type { Bench, BenchFigure } from './types.ts';
import { readTree, treeDifferences } from '../test/helpers/file-tree.ts';

const ROOT = fileURLToPath(new URL('../', import.meta.url)).replace(/\/$/, '');
const DIR = join(ROOT, '.cache', 'bench', 'cluster');
const CLI = join(ROOT, 'bin', 'heathours.mjs');
const BUILD_TIME = '2026-06-01T00:00:00.000Z';

/** Whether two folders hold the same files with the same bytes. */
const sameTree = (a: string, b: string): boolean => treeDifferences(readTree(a), readTree(b)).length === 0;

/** One `heathours build …` process; returns its wall time [s]. */
function cli(args: string[], cwd = DIR): number {
  const t = Date.now();
  const r = spawnSync(process.execPath, [CLI, 'build', ...args, '--quiet'], {
    cwd,
    env: { ...process.env, HEATHOURS_BUILD_TIME: BUILD_TIME },
    encoding: 'utf8',
    maxBuffer: 1 << 26,
  });
  if (r.status !== 0) throw new Error(`heathours build ${args.join(' ')} failed: ${r.stderr}`);
  return (Date.now() - t) / 1000;
}

/** Several `heathours build …` processes side by side; returns the wall time until the last ends [s]. */
async function cliParallel(argsList: string[][]): Promise<number> {
  const t = Date.now();
  await Promise.all(
    argsList.map(
      (args) =>
        new Promise<void>((resolve, reject) => {
          const p = spawn(process.execPath, [CLI, 'build', ...args, '--quiet'], {
            cwd: DIR,
            env: { ...process.env, HEATHOURS_BUILD_TIME: BUILD_TIME },
            stdio: ['ignore', 'ignore', 'pipe'],
          });
          let err = '';
          p.stderr.on('data', (d) => (err += d));
          p.on('exit', (code) => (code === 0 ? resolve() : reject(new Error(`heathours build ${args.join(' ')} failed: ${err}`))));
        }),
    ),
  );
  return (Date.now() - t) / 1000;
}

function demoConfig(): string {
  const path = join(DIR, 'demo.yaml');
  writeFileSync(
    path,
    `id: cluster
title: Cluster benchmark (invented data)
dataset:
  files: [${DEMO_DATA_DIR}/*.nc]
  landSeaMask: { variable: lsm, threshold: 0.5 }
  invented: true
years: [2020, 2024]
baseline: [2020, 2023]
timeZone: Etc/GMT+10
regions: ${join(ROOT, 'content/regions')}
output: out
shards: { cellsPerBlock: 256 }
work:
  classesFile: ${join(ROOT, 'content/workload-classes.yaml')}
`,
  );
  return path;
}

async function clusterDemo(): Promise<BenchFigure> {
  await ensureDemoData();
  const config = demoConfig();
  for (const d of ['site-one', 'site-slurm', 'parts']) rmSync(join(DIR, d), { recursive: true, force: true });
  const oneSeconds = cli(['--config', config, '--out', join(DIR, 'site-one'), '--no-cache']);
  const cluster = await startSlurmCluster(join(DIR, 'slurm'));
  try {
    const readme = readFileSync(join(ROOT, 'README.md'), 'utf8');
    const script = /<!-- slurm-script[^>]*-->\n```sh\n([\s\S]*?)```/.exec(readme)![1];
    writeFileSync(join(DIR, 'heathours.sh'), script);
    const t = Date.now();
    const submit = spawnSync('bash', [join(DIR, 'heathours.sh')], {
      cwd: DIR,
      encoding: 'utf8',
      env: {
        ...cluster.env,
        HEATHOURS_BUILD_TIME: BUILD_TIME,
        HEATHOURS: ROOT,
        CONFIG: config,
        PARTIALS: join(DIR, 'parts'),
        SITE: join(DIR, 'site-slurm'),
        SHARDS: '8',
        MERGES: '2',
        CPUS: '1',
      },
    });
    if (submit.status !== 0) throw new Error(`the Slurm script failed: ${submit.stderr}`);
    const last = Number(submit.stdout.trim().split('\n').pop());
    await cluster.waitFor([String(last - 2), String(last - 1), String(last)], 3_600_000);
    const slurmSeconds = (Date.now() - t) / 1000;
    const states = [last - 2, last - 1, last].flatMap((id) => cluster.jobStates(String(id)));
    return {
      bench: 'cluster-demo',
      value: Math.round((slurmSeconds / oneSeconds) * 100) / 100,
      unit: 'x one machine',
      input:
        'invented demo, 655 land cells x 5 years, README Slurm script: 8 shard tasks, 2 merge tasks, assemble (1 CPU each) on a one-node cluster of this machine',
      slurmSeconds: Math.round(slurmSeconds),
      oneMachineSeconds: Math.round(oneSeconds),
      allCompleted: states.length > 0 && states.every((s) => s === 'COMPLETED'),
      byteIdentical: sameTree(join(DIR, 'site-one'), join(DIR, 'site-slurm')),
    };
  } finally {
    cluster.stop();
  }
}

/** The country-size grid's config (data written by bench/scale.bench.ts's layout, same folder names). */
async function countryConfig(): Promise<string> {
  const { writeDemoDataset } = await import('../pipeline/demo/index.ts');
  const { placeGrid } = await import('../pipeline/demo/territory.ts');
  const grid = { nLat: 160, nLon: 160, resolution: 0.1 };
  const data = join(ROOT, '.cache', 'bench', 'scale', 'data-160x160');
  const missing = [2020, 2021].filter((y) => !existsSync(join(data, `era5-demo-${y}.nc`)));
  if (missing.length) await writeDemoDataset({ outDir: data, years: missing, layout: 'legacy', grid, quiet: true });
  const g = placeGrid(grid);
  const south = g.lat[g.lat.length - 1] - 0.05;
  const north = g.lat[0] + 0.05;
  const west = g.lon360[0] - 360 - 0.05;
  const east = g.lon360[g.lon360.length - 1] - 360 + 0.05;
  const features = [];
  for (let i = 0; i < 10; i++) {
    for (let j = 0; j < 10; j++) {
      const s = south + ((north - south) * i) / 10;
      const n = south + ((north - south) * (i + 1)) / 10;
      const w = west + ((east - west) * j) / 10;
      const e = west + ((east - west) * (j + 1)) / 10;
      features.push({
        type: 'Feature',
        properties: { id: `block-${i}-${j}`, name: `Invented block ${i}-${j}` },
        geometry: {
          type: 'Polygon',
          coordinates: [
            [
              [w, s],
              [e, s],
              [e, n],
              [w, n],
              [w, s],
            ],
          ],
        },
      });
    }
  }
  mkdirSync(join(DIR, 'country-regions'), { recursive: true });
  writeFileSync(join(DIR, 'country-regions', 'blocks.geojson'), JSON.stringify({ type: 'FeatureCollection', features }));
  const path = join(DIR, 'country.yaml');
  writeFileSync(
    path,
    `id: country
title: Merge benchmark (invented data)
dataset:
  files: [${data}/era5-demo-2*.nc]
  invented: true
years: [2020, 2021]
baseline: [2020, 2021]
timeZone: Etc/GMT+10
regions: ${join(DIR, 'country-regions')}
output: out
work:
  classesFile: ${join(ROOT, 'content/workload-classes.yaml')}
`,
  );
  return path;
}

async function mergeSplit(): Promise<BenchFigure> {
  const config = await countryConfig();
  const parts = join(DIR, 'country-parts');
  rmSync(parts, { recursive: true, force: true });
  const shardSeconds = cli(['--config', config, '--shard', '1/1', '--partials', parts, '--jobs', '2']);
  const cells = 160 * 160;
  const years = 2;
  const cellHours = cells * years * 8772;
  const times: Record<number, { merge: number; assemble: number }> = {};
  for (const m of [1, 2, 4]) {
    rmSync(join(parts, 'bands'), { recursive: true, force: true });
    const merge = await cliParallel(Array.from({ length: m }, (_, k) => ['--config', config, '--merge', parts, '--tile', `${k + 1}/${m}`, '--jobs', '1']));
    const assemble = cli(['--config', config, '--assemble', parts, '--out', join(DIR, `country-site-${m}`), '--data-only', '--jobs', '2']);
    times[m] = { merge, assemble };
  }
  const same = [2, 4].every((m) => sameTree(join(DIR, 'country-site-1', 'data'), join(DIR, `country-site-${m}`, 'data')));
  // Projection: per-unit costs from the single-task runs (worker-seconds; 2 workers for the shards).
  const computePerCellHour = (shardSeconds * 2) / cellHours;
  const mergePerCellYear = times[1].merge / (cells * years);
  const assemblePerCell = times[1].assemble / cells;
  const C = 300_000;
  const Y = 30;
  const cores = 100 * 4;
  const compute = (C * Y * 8766 * computePerCellHour) / cores;
  const merge = (C * Y * mergePerCellYear) / cores;
  const assemble = C * assemblePerCell;
  return {
    bench: 'merge-split',
    value: Math.round(times[1].merge + times[1].assemble),
    unit: 's (1 merge task)',
    input: `invented 160 x 160 grid (25,600 cells) x 2 years, 100 regions; merge tasks side by side on this 2-core machine, 1 worker each`,
    merge1: Math.round(times[1].merge),
    merge2: Math.round(times[2].merge),
    merge4: Math.round(times[4].merge),
    assemble1: Math.round(times[1].assemble),
    assemble2: Math.round(times[2].assemble),
    assemble4: Math.round(times[4].assemble),
    byteIdenticalFor2And4: same,
    projectionContinentMinutes: Math.round(((compute + merge + assemble) / 60) * 10) / 10,
    projectionModel: `300,000 land cells x 30 years on 100 nodes x 4 cores: compute ${(compute / 60).toFixed(1)} min (${(computePerCellHour * 1e9).toFixed(0)} ns/cell-hour), merge ${(merge / 60).toFixed(1)} min (${(mergePerCellYear * 1e3).toFixed(2)} ms/cell-year), assemble on one node ${(assemble / 60).toFixed(1)} min (${(assemblePerCell * 1e3).toFixed(2)} ms/cell); file system and scheduler not modelled`,
  };
}

export const bench: Bench = {
  names: ['cluster-demo', 'merge-split'],
  async run(only) {
    mkdirSync(DIR, { recursive: true });
    if (!existsSync(join(ROOT, 'compiled', 'cli.js'))) execFileSync('npm', ['run', 'compile'], { cwd: ROOT, stdio: 'ignore' });
    const out: BenchFigure[] = [];
    if (!only || only === 'cluster-demo') out.push(await clusterDemo());
    if (!only || only === 'merge-split') out.push(await mergeSplit());
    return out;
  },
};
