/**
 * The per-cell trend of a record long enough for one (16 years built, 2016–2031, of which at least
 * the 15 a trend needs have a value: one year of this invented weather has too many rejected hours
 * to count), built end to end on a small invented grid (3 × 4 cells at 1°, invented data): the
 * `trend-year` and `trend-p-year` layers carry the Theil–Sen slope and the Mann–Kendall p-value of
 * each land cell, the map's catalogue shows them without the "needs 15 years" note, and for a
 * region drawn inside one cell (so its area-weighted value is that cell's) the layers agree with
 * the region table's `trend` and `trend-p` rows, whose values are checked against SciPy's
 * theilslopes and kendalltau in test/publish/region-table-trend.test.ts (the per-cell path's own
 * SciPy check is in test/climate/trend.test.ts). Outside reader: geotiff.js 3.0.5 for the layers.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fromArrayBuffer } from 'geotiff';
import { writeDemoDataset } from '../../pipeline/demo/index.ts';
import { placeGrid } from '../../pipeline/demo/territory.ts';
import { makeCellClimate } from '../../pipeline/demo/cell-climate.ts';
import { buildAtlas } from '../../pipeline/run/build-atlas.ts';
import { MIN_TREND_YEARS } from '../../pipeline/climate/trend.ts';
import type { Manifest } from '../../pipeline/publish/manifest.ts';

const ROOT = new URL('../../', import.meta.url).pathname;
const GRID = { nLat: 3, nLon: 4, resolution: 1 };
const Y0 = 2016;
const Y1 = Y0 + MIN_TREND_YEARS;
let dir = '';
let data = '';
let manifest: Manifest;
let regionCell = -1;

/** The value of a layer's GeoTIFF at a global cell id (latitude ascending; rows run north → south in the file). */
async function tifValue(rel: string, cell: number): Promise<number> {
  const bytes = readFileSync(join(dir, 'out', rel));
  const image = await (await fromArrayBuffer(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength))).getImage();
  const [band] = (await image.readRasters()) as unknown as Float32Array[];
  expect([image.getWidth(), image.getHeight()]).toEqual([GRID.nLon, GRID.nLat]);
  const y = Math.floor(cell / GRID.nLon);
  return band[(GRID.nLat - 1 - y) * GRID.nLon + (cell % GRID.nLon)];
}

function regionRows(): Array<Record<string, string>> {
  const [head, ...rows] = readFileSync(join(data, 'regions/one-cell.csv'), 'utf8').trim().split('\n');
  const cols = head.split(',');
  return rows.map((r) => Object.fromEntries(r.split(',').map((v, i) => [cols[i], v])));
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'hh-cell-trend-'));
  process.env.HEATHOURS_BUILD_TIME ??= '2026-01-01T00:00:00.000Z';
  // Local time is UTC, so each year of the atlas is one whole UTC year of the inputs.
  const years = Array.from({ length: Y1 - Y0 + 1 }, (_, i) => Y0 + i);
  await writeDemoDataset({ outDir: join(dir, 'inputs'), years, layout: 'legacy', grid: GRID, quiet: true, jobs: 2 });
  // One region: a square of ±0.2° around the centre of the landiest cell, so it holds that cell only.
  const cc = makeCellClimate(placeGrid(GRID));
  let best = 0;
  for (let i = 1; i < cc.nCells; i++) if (cc.landFraction[i] > cc.landFraction[best]) best = i;
  expect(cc.landFraction[best]).toBeGreaterThan(0.9);
  const [lon, lat] = [cc.lon[best], cc.lat[best]];
  const ring = [
    [lon - 0.2, lat - 0.2],
    [lon + 0.2, lat - 0.2],
    [lon + 0.2, lat + 0.2],
    [lon - 0.2, lat + 0.2],
    [lon - 0.2, lat - 0.2],
  ];
  mkdirSync(join(dir, 'regions'));
  writeFileSync(
    join(dir, 'regions/one-cell.geojson'),
    JSON.stringify({
      type: 'FeatureCollection',
      features: [{ type: 'Feature', properties: { id: 'one-cell', name: 'One cell (invented)' }, geometry: { type: 'Polygon', coordinates: [ring] } }],
    }),
  );
  writeFileSync(
    join(dir, 'atlas.yaml'),
    `id: trend15
title: Fifteen-year trend test (invented data)
dataset:
  files: [inputs/*.nc]
  landSeaMask: { variable: lsm, threshold: 0.5 }
  invented: true
years: [${Y0}, ${Y1}]
baseline: [${Y0}, ${Y1}]
timeZone: Etc/UTC
regions: regions
output: out
work:
  classesFile: ${join(ROOT, 'content/workload-classes.yaml')}
`,
  );
  await buildAtlas({ configPath: join(dir, 'atlas.yaml'), outDir: join(dir, 'out'), jobs: 2, quiet: true, dataOnly: true, cache: false });
  data = join(dir, 'out/data');
  manifest = JSON.parse(readFileSync(join(data, 'manifest.json'), 'utf8')) as Manifest;
  const summary = JSON.parse(readFileSync(join(data, 'regions/one-cell.json'), 'utf8')) as { cells: number[] };
  expect(summary.cells).toHaveLength(1);
  regionCell = summary.cells[0];
}, 600_000);

afterAll(() => {
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe('the per-cell trend of a record of 15 years and more', () => {
  it('publishes a trend-p-year layer beside every trend-year layer, in 1 on the fixed domain 0–1 with the probability colours', () => {
    const slopes = manifest.layers.filter((l) => l.statistic === 'trend');
    const ps = manifest.layers.filter((l) => l.statistic === 'trend-p');
    expect(slopes.length).toBeGreaterThan(0);
    expect(ps.map((l) => l.id)).toEqual(slopes.map((l) => l.id.replace(/\/trend-year$/, '/trend-p-year')));
    for (const l of ps) {
      expect(l.units).toBe('1');
      expect(l.period).toBe('year');
      expect(l.legend.domain).toEqual([0, 1]);
      expect(l.legend.ramp).toBe('Purples');
    }
  });

  it("gives the one-cell region's cell the slope and p-value of the region table's trend rows (3 significant digits there), for hours above the limit and hours lost, every combination", async () => {
    const rows = regionRows();
    let compared = 0;
    let withValue = 0;
    for (const l of manifest.layers.filter((x) => x.statistic === 'trend' || x.statistic === 'trend-p')) {
      const [cls, accl, exposure] = l.combo.split('.');
      const row = rows.find(
        (r) =>
          r.period === 'year' &&
          r.figure === l.figure &&
          r.workload_class === cls &&
          r.acclimatization === accl &&
          r.exposure === exposure &&
          r.statistic === l.statistic,
      );
      expect(row, l.id).toBeDefined();
      expect(Number(row!.years_used)).toBeGreaterThanOrEqual(MIN_TREND_YEARS);
      const cell = await tifValue(l.tif, regionCell);
      expect(Number.isFinite(cell), l.id).toBe(true);
      const table = Number(row!.value);
      if (l.statistic === 'trend-p') {
        expect(cell).toBeGreaterThanOrEqual(0);
        expect(cell).toBeLessThanOrEqual(1);
      }
      // The table rounds (to 3 significant digits, or 2 decimals of hours); the GeoTIFF holds float32.
      expect(Math.abs(cell - table), `${l.id}: cell ${cell}, table ${table}`).toBeLessThanOrEqual(Math.max(Math.abs(table) * 5e-3, 5e-3));
      compared++;
      if (table !== 0 && table !== 1) withValue++;
    }
    expect(compared).toBe(manifest.layers.filter((x) => x.statistic === 'trend' || x.statistic === 'trend-p').length);
    // Not every series is flat: some slopes and p-values are neither 0 nor 1.
    expect(withValue).toBeGreaterThan(0);
  });

  it('shows the trend layers on the map without the "needs 15 years" note, with the region\'s values', async () => {
    const { loadExplorerCatalogue, loadExplorerValues } = await import('../../src/data/explorer.ts');
    const { trendNote } = await import('../../src/components/map/explorer/describe-view.ts');
    const catalogue = loadExplorerCatalogue(join(dir, 'out'));
    expect(catalogue.years).toEqual([Y0, Y1]);
    const trendLayers = catalogue.layers.filter((l) => l.statistic === 'trend' || l.statistic === 'trend-p');
    expect(trendLayers.length).toBe(manifest.layers.filter((x) => x.statistic === 'trend' || x.statistic === 'trend-p').length);
    expect(catalogue.choices.statistic.map((c) => c.id)).toEqual(expect.arrayContaining(['trend', 'trend-p']));
    for (const l of trendLayers) expect(trendNote(catalogue, l)).toBeNull();
    // A record of 14 years built gets the note, naming both numbers.
    expect(trendNote({ ...catalogue, years: [Y0 + 2, Y1] }, trendLayers[0])).toBe(
      `A trend needs at least ${MIN_TREND_YEARS} years; this record has ${MIN_TREND_YEARS - 1} (${Y0 + 2}–${Y1}), so the layer has no values.`,
    );
    const values = loadExplorerValues(join(dir, 'out'));
    const rows = regionRows();
    const p = trendLayers.find((l) => l.statistic === 'trend-p' && l.figure === 'hours-lost-shift')!;
    const row = rows.find(
      (r) =>
        r.period === 'year' &&
        r.figure === 'hours-lost-shift' &&
        r.workload_class === p.view.workloadClass &&
        r.acclimatization === p.view.acclimatization &&
        r.exposure === p.view.exposure &&
        r.statistic === 'trend-p',
    )!;
    expect(values[p.id]).toEqual([Number(row.value)]);
  });
});
