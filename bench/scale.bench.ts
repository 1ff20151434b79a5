/**
 * Country-size builds (issue: country-size atlases on one machine), on invented demo data on
 * grids of 0.1° (pipeline/demo, `--grid country` and sized grids), built without a land-sea mask
 * so every cell is computed as a land cell would be, with 100 invented rectangular regions:
 * - country-build: the 160 × 160 grid (25,600 cells) × 2 years from the NetCDF files to the built
 *   site, `--no-cache`, with the default memory budget: wall time, peak RSS of the process (all
 *   threads), end-to-end land cell-hours per second; then the same atlas with twice the budget
 *   (other compute groups and merge bands): its region tables must be byte-identical.
 * - memory-vs-cells: peak RSS of a one-year data-only build at 75 × 75, 150 × 150 and 300 × 300
 *   cells (5,625 / 22,500 / 90,000): flat within ±20 % when memory is bounded by a tile.
 * - read-vs-width: read time per land cell-hour on grids of 34, 150 and 300 columns with about
 *   the same number of cells (176 × 34, 40 × 150, 20 × 300), one year: within ±25 %.
 * Data are written once under .cache/bench/scale (about 30 GB for all three figures). Each build
 * runs in a child process (bench/pipeline-child.mjs).
 */
import { existsSync, mkdirSync, writeFileSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { writeDemoDataset } from '../pipeline/demo/index.ts';
import { placeGrid } from '../pipeline/demo/territory.ts';
import { buildInChild, type ChildReport } from './pipeline-runs.ts';
import type { Bench, BenchFigure } from './types.ts';

const ROOT = fileURLToPath(new URL('../', import.meta.url));
const DIR = join(ROOT, '.cache', 'bench', 'scale');

interface Grid {
  nLat: number;
  nLon: number;
  resolution: number;
}

/** Writes the grid's years (once) and an atlas config over them with `regions` rectangles; returns the config path. */
async function prepare(name: string, grid: Grid, years: number[], memory?: string): Promise<string> {
  const data = join(DIR, `data-${grid.nLat}x${grid.nLon}`);
  const missing = years.filter((y) => !existsSync(join(data, `era5-demo-${y}.nc`)));
  if (missing.length > 0) {
    process.stderr.write(`scale bench: writing invented ${grid.nLat} × ${grid.nLon} data for ${missing.join(', ')}\n`);
    await writeDemoDataset({ outDir: data, years: missing, layout: 'legacy', grid, quiet: true });
  }
  const regions = join(DIR, `regions-${grid.nLat}x${grid.nLon}`);
  mkdirSync(regions, { recursive: true });
  writeFileSync(join(regions, 'rectangles.geojson'), JSON.stringify(rectangles(grid, 10, 10)));
  const path = join(DIR, `${name}.yaml`);
  writeFileSync(
    path,
    `id: scale
title: Scale benchmark (invented data)
dataset:
  files: [${data}/era5-demo-2*.nc]
  invented: true
years: [${years[0]}, ${years[years.length - 1]}]
baseline: [${years[0]}, ${years[years.length - 1]}]
timeZone: Etc/GMT+10
regions: ${regions}
output: out
work:
  classesFile: ${join(ROOT, 'content/workload-classes.yaml')}
${memory ? `memory: ${memory}\n` : ''}`,
  );
  return path;
}

/** Invented rectangular regions tiling the grid's extent, `rows` × `cols` of them. */
function rectangles(spec: Grid, rows: number, cols: number) {
  const g = placeGrid(spec);
  const r = spec.resolution;
  const south = g.lat[g.lat.length - 1] - r / 2;
  const north = g.lat[0] + r / 2;
  const west = g.lon360[0] - 360 - r / 2;
  const east = g.lon360[g.lon360.length - 1] - 360 + r / 2;
  const features = [];
  for (let i = 0; i < rows; i++) {
    for (let j = 0; j < cols; j++) {
      const s = south + ((north - south) * i) / rows;
      const n = south + ((north - south) * (i + 1)) / rows;
      const w = west + ((east - west) * j) / cols;
      const e = west + ((east - west) * (j + 1)) / cols;
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
  return { type: 'FeatureCollection', features };
}

const mb = (r: ChildReport) => Math.round(r.maxRssKb / 1024);

export const bench: Bench = {
  names: ['country-build', 'memory-vs-cells', 'read-vs-width'],
  async run(only) {
    mkdirSync(DIR, { recursive: true });
    const jobs = availableParallelism();
    const out: BenchFigure[] = [];
    if (!only || only === 'country-build') {
      const grid = { nLat: 160, nLon: 160, resolution: 0.1 };
      const config = await prepare('country', grid, [2020, 2021]);
      const full = buildInChild(config, join(DIR, 'out-country'), jobs, { cache: false, dataOnly: false });
      const other = await prepare('country-6g', grid, [2020, 2021], '6G');
      const second = buildInChild(other, join(DIR, 'out-country-6g'), jobs, { cache: false });
      out.push({
        bench: 'country-build',
        value: Math.round(full.totalSeconds),
        unit: 's',
        input: `invented 160 x 160 grid at 0.1 deg (25,600 cells, no land-sea mask) x 2 years, 100 regions, --no-cache, site included, ${jobs} workers`,
        peakRssMB: mb(full),
        cellHoursPerSecond: Math.round(full.cellHours / full.totalSeconds),
        computeSeconds: Math.round(full.computeSeconds),
        mergeSeconds: Math.round(full.mergeSeconds),
        publishSeconds: Math.round(full.publishSeconds),
        estimatedSeconds: Math.round(full.estimate.seconds.total),
        readNsPerCellHour: Math.round(full.perCellHour.read),
        checksum: full.checksum,
        sameTablesWithBudget6G: second.checksum === full.checksum,
        peakRssMB6G: mb(second),
      });
    }
    if (!only || only === 'memory-vs-cells') {
      // One budget for the three grids, small enough that even the smallest is cut into tiles (1.5 G is too small to merge four rows of the 300-column grid):
      // with the default 3 G the 75 × 75 grid fits whole and simply uses less, which says nothing
      // about whether memory grows with the grid.
      const budget = '2G';
      const sizes = [75, 150, 300];
      const rss: number[] = [];
      for (const n of sizes) {
        const config = await prepare(`cells-${n}`, { nLat: n, nLon: n, resolution: 0.1 }, [2021], budget);
        rss.push(mb(buildInChild(config, join(DIR, `out-cells-${n}`), jobs, { cache: false })));
      }
      const mean = rss.reduce((a, b) => a + b, 0) / rss.length;
      out.push({
        bench: 'memory-vs-cells',
        value: Math.round((100 * (Math.max(...rss) - Math.min(...rss))) / mean),
        unit: '% spread',
        input: `one year, data only, ${sizes.map((n) => `${n * n} cells`).join(' / ')}, memory budget ${budget}, ${jobs} workers`,
        peakRssMB: rss.join(' / '),
        flatWithin20Percent: rss.every((x) => Math.abs(x - mean) <= 0.2 * mean),
      });
    }
    if (!only || only === 'read-vs-width') {
      const shapes: Array<[number, number]> = [
        [176, 34],
        [40, 150],
        [20, 300],
      ];
      const ns: number[] = [];
      for (const [nLat, nLon] of shapes) {
        const config = await prepare(`width-${nLon}`, { nLat, nLon, resolution: 0.1 }, [2021]);
        ns.push(Math.round(buildInChild(config, join(DIR, `out-width-${nLon}`), jobs, { cache: false }).perCellHour.read));
      }
      const mean = ns.reduce((a, b) => a + b, 0) / ns.length;
      out.push({
        bench: 'read-vs-width',
        value: Math.round((100 * (Math.max(...ns) - Math.min(...ns))) / mean),
        unit: '% spread',
        input: `one year, ${shapes.map(([a, b]) => `${a} x ${b}`).join(', ')} cells (34, 150, 300 columns), legacy NetCDF-3`,
        readNsPerCellHour: ns.join(' / '),
        within25Percent: ns.every((x) => Math.abs(x - mean) <= 0.25 * mean),
      });
    }
    return out;
  },
};
