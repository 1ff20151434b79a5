/**
 * workforce-aggregate (issue 17): the time to stream an INVENTED people raster of a country at
 * about 1 km (2,000 × 2,000 pixels of 0.0083°, about 0.92 km; Float32, tiled, written by our
 * GeoTIFF writer) onto a 0.1° country-size grid (160 × 160 cells, 16° × 16°, the size of
 * pipeline/demo COUNTRY_GRID) with pipeline/run/workforce-aggregate.ts, the build's own code path:
 * read strip by strip, pixels split across cells by area on the sphere. The land cells are those
 * of an invented round country (about 62 % of the grid), so people over sea are counted apart.
 * The pixel size is no divisor of the cell size, so pixels straddle cell edges.
 *
 * Figures: wall time of the fastest of three runs (aim < 5 s), CPU time of that run, pixels per
 * second; checksums: the people on land + off land against the raster's people inside the grid's
 * extent summed here pixel by pixel (conservation; the split in degrees against the aggregator's
 * on the sphere), and the people on land.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { writeGeoTiff } from '../pipeline/publish/layers/geotiff-write.ts';
import { aggregateRasterFile } from '../pipeline/run/workforce-aggregate.ts';
import type { HorizontalGrid } from '../pipeline/model/grid.ts';
import type { Bench, BenchFigure } from './types.ts';

const ROOT = fileURLToPath(new URL('../', import.meta.url));
const DIR = join(ROOT, '.cache', 'bench', 'workforce');

/** The invented raster: pixels [count], west and north edges [° E, ° N], pixel size [°]. */
const RASTER = { width: 2000, height: 2000, west: 29.71, north: 16.29, d: 0.0083 } as const;
/** The grid: 160 × 160 cells of 0.1°, edges 30…46 °E, 0…16 °N (inside the raster). */
const N = 160;
const GRID: HorizontalGrid = {
  lat: Float64Array.from({ length: N }, (_, j) => 0.05 + j * 0.1),
  lon: Float64Array.from({ length: N }, (_, i) => 30.05 + i * 0.1),
};

/** Invented people per pixel, rows south to north: a rural floor, a coast gradient, towns. */
function inventedPeople(): Float32Array {
  const { width, height } = RASTER;
  const v = new Float32Array(width * height);
  const towns = [
    [0.3, 0.4, 9000, 0.002],
    [0.62, 0.7, 4000, 0.004],
    [0.8, 0.25, 2500, 0.003],
    [0.45, 0.85, 1500, 0.006],
  ] as const;
  for (let j = 0; j < height; j++) {
    const y = j / height;
    for (let i = 0; i < width; i++) {
      const x = i / width;
      let p = 5 + 40 * x + 10 * Math.sin(23 * x) * Math.cos(17 * y);
      for (const [tx, ty, peak, s] of towns) p += peak * Math.exp(-((x - tx) ** 2 + (y - ty) ** 2) / s);
      v[j * width + i] = Math.max(0, p);
    }
  }
  return v;
}

/** Land cells: inside an invented round country centred on the grid (global indices, ascending). */
function landCells(): Int32Array {
  const out: number[] = [];
  for (let y = 0; y < N; y++) for (let x = 0; x < N; x++) if ((x - 80) ** 2 + ((y - 80) * 1.1) ** 2 < 72 ** 2) out.push(y * N + x);
  return Int32Array.from(out);
}

export const bench: Bench = {
  names: ['workforce-aggregate'],
  async run(): Promise<BenchFigure[]> {
    mkdirSync(DIR, { recursive: true });
    const path = join(DIR, 'invented-people-2000x2000.tif');
    const values = inventedPeople();
    // The people inside the grid's extent, each pixel by the share of its width and height inside (in
    // degrees; the aggregator splits by area on the sphere, which differs by far less than 1e-6 for pixels this small).
    const inside = (a0: number, a1: number, b0: number, b1: number) => Math.max(0, Math.min(a1, b1) - Math.max(a0, b0)) / (a1 - a0);
    const [gw, ge, gs, gn] = [30, 46, 0, 16];
    const fx = Float64Array.from({ length: RASTER.width }, (_, i) => inside(RASTER.west + i * RASTER.d, RASTER.west + (i + 1) * RASTER.d, gw, ge));
    let insideGrid = 0;
    for (let j = 0; j < RASTER.height; j++) {
      const south = RASTER.north - (RASTER.height - j) * RASTER.d;
      const fy = inside(south, south + RASTER.d, gs, gn);
      if (fy === 0) continue;
      for (let i = 0; i < RASTER.width; i++) insideGrid += values[j * RASTER.width + i] * fx[i] * fy;
    }
    const lat = Float64Array.from({ length: RASTER.height }, (_, j) => RASTER.north - (RASTER.height - 1 - j + 0.5) * RASTER.d);
    const lon = Float64Array.from({ length: RASTER.width }, (_, i) => RASTER.west + (i + 0.5) * RASTER.d);
    writeFileSync(path, writeGeoTiff({ lat, lon, values }, { units: 'people', description: 'INVENTED people per pixel (benchmark)' }));
    const cells = landCells();
    let best = Infinity;
    let bestCpu = 0;
    let out: Awaited<ReturnType<typeof aggregateRasterFile>> | undefined;
    for (let run = 0; run < 3; run++) {
      const cpu0 = process.cpuUsage();
      const t0 = performance.now();
      const r = await aggregateRasterFile(path, GRID, cells);
      const s = (performance.now() - t0) / 1000;
      const cpu = process.cpuUsage(cpu0);
      if (s < best) {
        best = s;
        bestCpu = (cpu.user + cpu.system) / 1e6;
        out = r;
      }
    }
    let onLand = 0;
    for (const p of out!.people) onLand += p;
    const onGrid = onLand + out!.offLand;
    return [
      {
        bench: 'workforce-aggregate',
        value: best,
        unit: 's',
        aimSeconds: 5,
        cpuSeconds: Number(bestCpu.toFixed(3)),
        pixels: out!.pixels,
        megapixelsPerSecond: Number((out!.pixels / best / 1e6).toFixed(2)),
        strips: out!.strips,
        peakStripPixels: out!.peakStripPixels,
        gridCells: N * N,
        landCells: cells.length,
        peopleOnLand: Math.round(onLand),
        peopleOffLand: Math.round(out!.offLand),
        peopleInsideGrid: Math.round(insideGrid),
        conservationRelError: Number(Math.abs(onGrid / insideGrid - 1).toExponential(2)),
      },
    ];
  },
};
