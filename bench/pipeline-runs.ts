/**
 * What the whole-build benches share (bench/pipeline.bench.ts, bench/rebuild.bench.ts): the
 * invented 5-year demo dataset they both read (written once to .cache/bench/pipeline/data), and
 * one build in a child process (bench/pipeline-child.mjs) with its report.
 */
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { writeDemoDataset } from '../pipeline/demo/index.ts';
import { ensureCompiled } from './compiled-code.ts';
import type { BuildReport } from '../pipeline/run/build-atlas.ts';

export const BENCH_ROOT = fileURLToPath(new URL('../', import.meta.url));
/** The demo years [year] and where their files are. */
export const DEMO_YEARS = [2020, 2021, 2022, 2023, 2024];
export const DEMO_DATA_DIR = join(BENCH_ROOT, '.cache', 'bench', 'pipeline', 'data');

/** Writes the demo dataset (mixed layouts, default grid) unless every year's file is there. */
export async function ensureDemoData(): Promise<void> {
  if (!DEMO_YEARS.every((y) => existsSync(join(DEMO_DATA_DIR, `era5-demo-${y}.nc`)))) {
    await writeDemoDataset({ outDir: DEMO_DATA_DIR, years: DEMO_YEARS, layout: 'mixed', quiet: true });
  }
}

/** A child build's report: the build report, the process's peak RSS [kB], a checksum of the region tables. */
export type ChildReport = BuildReport & { maxRssKb: number; checksum: string };

/**
 * Runs one `build --data-only` of `config` into `out` in a child process; `options` go to
 * buildAtlas (default: no cache). `code`: the shipped compiled JavaScript (default, what
 * `heathours build` runs) or the TypeScript sources under tsx.
 */
export function buildInChild(
  config: string,
  out: string,
  jobs: number,
  options?: Record<string, unknown>,
  code: 'compiled' | 'sources' = 'compiled',
): ChildReport {
  if (code === 'compiled') ensureCompiled();
  const args = [join(BENCH_ROOT, 'bench/pipeline-child.mjs'), config, out, String(jobs), ...(options ? [JSON.stringify(options)] : [])];
  const env = { ...process.env, HEATHOURS_BENCH_CODE: code };
  const r = spawnSync(process.execPath, args, { encoding: 'utf8', maxBuffer: 1 << 24, env });
  if (r.status !== 0) throw new Error(`bench build child failed (${config}): ${r.stderr}`);
  return JSON.parse(r.stdout.trim().split('\n').pop()!) as ChildReport;
}
