/**
 * Invented rectangular regions for the many-region benchmarks (site-1000-regions,
 * site-10000-regions) and their inputs: the invented small demo grid (8 × 10 cells at 1°, 41 land
 * cells), each land cell (land fraction ≥ 0.5, the config's threshold) cut into `split` × `split`
 * rectangles, inset by 5 % so none touches a cell edge or its neighbour, the first `n` kept.
 * RFC 7946 rings. Ids `r` + a zero-padded number, names "Bench region k (invented)".
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, rmSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { writeDemoDataset } from '../pipeline/demo/index.ts';
import { makeCellClimate } from '../pipeline/demo/cell-climate.ts';
import { SMALL_GRID, placeGrid } from '../pipeline/demo/territory.ts';
import { ensureCompiled } from './compiled-code.ts';

/** This folder (bench/). */
const BENCH_DIR = dirname(fileURLToPath(import.meta.url));

export const BENCH_YEARS = [2021, 2022, 2023];

/** `n` rectangles as a GeoJSON FeatureCollection text; ids padded to `idDigits` digits. */
export function rectangleRegions(n: number, split: number, idDigits = 4): string {
  const grid = placeGrid(SMALL_GRID);
  const cc = makeCellClimate(grid);
  const r = SMALL_GRID.resolution;
  const features: unknown[] = [];
  for (let c = 0; c < cc.nCells && features.length < n; c++) {
    if (cc.landFraction[c] < 0.5) continue;
    const w0 = cc.lon[c] - r / 2;
    const s0 = cc.lat[c] - r / 2;
    const d = r / split;
    for (let i = 0; i < split && features.length < n; i++) {
      for (let j = 0; j < split && features.length < n; j++) {
        const w = +(w0 + j * d + d * 0.05).toFixed(4);
        const e = +(w0 + (j + 1) * d - d * 0.05).toFixed(4);
        const s = +(s0 + i * d + d * 0.05).toFixed(4);
        const nn = +(s0 + (i + 1) * d - d * 0.05).toFixed(4);
        const k = features.length + 1;
        features.push({
          type: 'Feature',
          properties: { id: `r${String(k).padStart(idDigits, '0')}`, name: `Bench region ${k} (invented)` },
          geometry: {
            type: 'Polygon',
            coordinates: [
              [
                [w, s],
                [e, s],
                [e, nn],
                [w, nn],
                [w, s],
              ],
            ],
          },
        });
      }
    }
  }
  if (features.length < n) throw new Error(`only ${features.length} rectangles fit the land cells`);
  return JSON.stringify({ type: 'FeatureCollection', features });
}

/**
 * Writes the inputs of a many-region bench into `dir` (the demo data once, the regions and the
 * atlas configuration every time) and returns the configuration's path. `extra` is appended to
 * the configuration (e.g. `regionWorkbooks: false`).
 */
export async function writeRegionBenchInputs(
  dir: string,
  o: { id: string; title: string; regions: string; classesFile: string; extra?: string },
): Promise<string> {
  const data = join(dir, 'data');
  if (!BENCH_YEARS.every((y) => existsSync(join(data, `era5-demo-${y}.nc`)))) {
    await writeDemoDataset({ outDir: data, years: BENCH_YEARS, layout: 'mixed', grid: 'small', quiet: true });
  }
  mkdirSync(join(dir, 'regions'), { recursive: true });
  writeFileSync(join(dir, 'regions', 'bench-regions.geojson'), o.regions);
  const config = join(dir, 'atlas.yaml');
  writeFileSync(
    config,
    `id: ${o.id}
title: ${o.title}
dataset:
  files: [data/*.nc]
  landSeaMask: { variable: lsm, threshold: 0.5 }
  invented: true
years: [${BENCH_YEARS[0]}, ${BENCH_YEARS[BENCH_YEARS.length - 1]}]
baseline: [2021, 2022]
timeZone: Etc/GMT+10
regions: regions
output: out
work:
  classesFile: ${o.classesFile}
${o.extra ?? ''}`,
  );
  return config;
}

/**
 * Builds the data (`pipeline`) and then the site (`site`) of `config` in child processes of
 * bench/regions-1000-child.mjs, into `dir`/out and `dir`/dist, and removes both afterwards (they
 * hold gigabytes of tables and pages; the inputs stay). Returns each child's report.
 */
export function buildDataAndSite(
  dir: string,
  config: string,
  jobs: number,
  name: string,
): { pipeline: Record<string, unknown>; site: Record<string, unknown> } {
  ensureCompiled();
  const child = (args: string[]): Record<string, unknown> => {
    const r = spawnSync(process.execPath, [join(BENCH_DIR, 'regions-1000-child.mjs'), ...args], {
      encoding: 'utf8',
      maxBuffer: 1 << 26,
      env: { ...process.env, ASTRO_TELEMETRY_DISABLED: '1', HEATHOURS_BUILD_TIME: '2026-01-01T00:00:00.000Z' },
    });
    if (r.status !== 0) throw new Error(`${name} child (${args[0]}) failed: ${r.stderr}`);
    return JSON.parse(r.stdout.trim().split('\n').pop()!);
  };
  const out = join(dir, 'out');
  const dist = join(dir, 'dist');
  rmSync(out, { recursive: true, force: true });
  rmSync(dist, { recursive: true, force: true });
  try {
    const pipeline = child(['pipeline', config, out, String(jobs)]);
    return { pipeline, site: child(['site', out, dist]) };
  } finally {
    rmSync(out, { recursive: true, force: true });
    rmSync(dist, { recursive: true, force: true });
  }
}
