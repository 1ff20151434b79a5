/**
 * Timings of single stages on fixed invented inputs, kept here rather than in the unit tests
 * (a unit test asserts results, never speed: a busy machine would fail it):
 *
 * - layer-render-png, layer-render-tif: median time [ms] of 30 renders of a 40 × 60 layer (0.25°,
 *   30–40 °N) to PNG and to GeoTIFF;
 * - region-weights-1000: time [ms] of the cell weights of 1,000 quadrilateral regions tiling a
 *   40 × 60 grid (parsing and validation reported beside);
 * - region-stats-1000: time [ms] of the statistics of 1,000 regions × 120 fields on that grid;
 * - normals-1m: time [ms] of the normals of 1,000,000 items × 30 years.
 *
 * Each prints a checksum of its results so that a faster run can be seen to compute the same.
 */
import { renderLayerPng } from '../pipeline/publish/layers/render-layer-png.ts';
import { writeGeoTiff } from '../pipeline/publish/layers/geotiff-write.ts';
import { figureStyle } from '../pipeline/publish/layers/figure-style.ts';
import { allRegionCellWeights } from '../pipeline/regions/cell-weights.ts';
import { parseRegionGeoJson } from '../pipeline/regions/parse-regions.ts';
import { regionFieldStats } from '../pipeline/regions/region-stats.ts';
import { computeNormals } from '../pipeline/climate/normals.ts';
import type { HorizontalGrid } from '../pipeline/model/grid.ts';
import type { Bench, BenchFigure } from './types.ts';
import { jitteredLattice } from '../test/regions/helpers.ts';

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
const round = (x: number, d = 3) => Math.round(x * 10 ** d) / 10 ** d;

/** A regular grid of cell centres, `d` degrees apart [°]. */
function grid(lat0: number, nLat: number, lon0: number, nLon: number, d: number): HorizontalGrid {
  return {
    lat: Float64Array.from({ length: nLat }, (_, i) => lat0 + i * d),
    lon: Float64Array.from({ length: nLon }, (_, i) => lon0 + i * d),
  };
}

function layerRender(): BenchFigure[] {
  const ny = 40,
    nx = 60;
  const lat = Float64Array.from({ length: ny }, (_, i) => 30.125 + i * 0.25);
  const lon = Float64Array.from({ length: nx }, (_, i) => 10.125 + i * 0.25);
  const values = new Float32Array(ny * nx);
  for (let y = 0; y < ny; y++) for (let x = 0; x < nx; x++) values[y * nx + x] = ((y * 7 + x * 13) % 50) * (x % 9 === 0 ? NaN : 1);
  const g = { lat, lon, values };
  const style = figureStyle('hoursAboveLimit', [0, 50], 'h');
  renderLayerPng(g, style); // warm-up
  const tPng: number[] = [],
    tTif: number[] = [];
  let bytes = 0;
  for (let i = 0; i < 30; i++) {
    let t0 = performance.now();
    const layer = renderLayerPng(g, style);
    tPng.push(performance.now() - t0);
    t0 = performance.now();
    const tif = writeGeoTiff(g, { units: 'h', description: 'x' });
    tTif.push(performance.now() - t0);
    bytes += layer.png.length + tif.length;
  }
  const input = 'invented 40 x 60 layer, 0.25 deg, 30-40 N, every 9th column no data; median of 30 runs';
  return [
    { bench: 'layer-render-png', value: round(median(tPng)), unit: 'ms', input, checksumBytes: bytes },
    { bench: 'layer-render-tif', value: round(median(tTif)), unit: 'ms', input, checksumBytes: bytes },
  ];
}

function regionWeights(): BenchFigure[] {
  const g = grid(10.125, 40, 30.125, 60, 0.25);
  const tp = performance.now();
  const regions = parseRegionGeoJson(jitteredLattice(), 'lattice.geojson');
  const parseMs = performance.now() - tp;
  const t0 = performance.now();
  const all = allRegionCellWeights(regions, g);
  const ms = performance.now() - t0;
  let checksum = 0;
  for (const w of all) w.cells.forEach((c, k) => (checksum += w.fraction[k] * (c + 1)));
  return [
    {
      bench: 'region-weights-1000',
      value: round(ms, 1),
      unit: 'ms',
      input: '1,000 jittered quadrilaterals tiling a 40 x 60 grid (invented)',
      parseMs: round(parseMs, 1),
      checksum: checksum.toFixed(6),
    },
  ];
}

function regionStats(): BenchFigure[] {
  const g = grid(10.125, 40, 30.125, 60, 0.25);
  const weights = allRegionCellWeights(parseRegionGeoJson(jitteredLattice(), 'lattice.geojson'), g);
  const nFields = 120,
    nCells = 2400;
  const fields = new Float32Array(nFields * nCells).map((_, k) => (k * 2654435761) % 1000);
  const t0 = performance.now();
  let checksum = 0;
  for (const wr of weights) {
    const s = regionFieldStats(wr, fields, nFields, nCells);
    checksum += s.mean[0] + s.max[nFields - 1];
  }
  const ms = performance.now() - t0;
  return [
    {
      bench: 'region-stats-1000',
      value: round(ms, 1),
      unit: 'ms',
      input: '1,000 regions x 120 fields on a 40 x 60 grid (invented)',
      checksum: checksum.toFixed(3),
    },
  ];
}

function normals(): BenchFigure[] {
  const nItems = 1_000_000;
  const years = Array.from({ length: 30 }, (_, i) => 1991 + i);
  const values = new Float64Array(30 * nItems);
  let s = 12345;
  for (let k = 0; k < values.length; k++) {
    s = (s * 1103515245 + 12345) >>> 0;
    values[k] = s % 744;
  }
  const t0 = performance.now();
  const n = computeNormals({ years, values, nItems }, { baseline: [1991, 2020], latestYear: 2020 });
  const ms = performance.now() - t0;
  let checksum = 0;
  for (let i = 0; i < nItems; i += 997) checksum += n.p90[i] + n.median[i];
  return [
    {
      bench: 'normals-1m',
      value: Math.round(ms),
      unit: 'ms',
      input: '1,000,000 items x 30 years (invented counts)',
      itemsPerSecond: Math.round((nItems / ms) * 1000),
      checksum: checksum.toFixed(3),
    },
  ];
}

const RUNS: Record<string, () => BenchFigure[]> = {
  'layer-render-png': layerRender,
  'region-weights-1000': regionWeights,
  'region-stats-1000': regionStats,
  'normals-1m': normals,
};

export const bench: Bench = {
  names: ['layer-render-png', 'layer-render-tif', 'region-weights-1000', 'region-stats-1000', 'normals-1m'],
  async run(only) {
    if (only === 'layer-render-tif') return layerRender();
    if (only) return RUNS[only]();
    return Object.values(RUNS).flatMap((f) => f());
  },
};
