/**
 * An atlas of 300 regions (invented rectangles on the invented small demo grid, the inputs of the
 * site-10000-regions benchmark at a size a test can build; bench/rectangle-regions.ts), built with
 * `regionWorkbooks: false`: every region gets its tables and pages, no workbook; the map's
 * catalogue carries no value per region and layer, each layer's values file has one value per
 * region equal to the region tables (the region CSVs, read here with our CSV parser), and the
 * map page's first view stays bounded (bench/first-view.mjs). The 10,000-region build is the
 * benchmark's.
 */
import { existsSync, mkdirSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { buildAtlas } from '../../pipeline/run/build-atlas.ts';
import { rectangleRegions, writeRegionBenchInputs } from '../../bench/rectangle-regions.ts';
import { firstViewBytes } from '../../bench/first-view.mjs';
import { parseCsvObjects } from '../../src/lib/csv-parse.ts';
import { PROJECT_ROOT, buildTestSite } from './browser.ts';
import type { ExplorerCatalogue } from '../../src/components/map/explorer/catalogue.ts';

const N = 300;
const DIR = join(PROJECT_ROOT, 'test-artifacts', 'many-regions');
let dataDir = '';
let dist = '';
let ids: string[] = [];

beforeAll(async () => {
  mkdirSync(DIR, { recursive: true });
  const regions = rectangleRegions(N, 16, 5);
  ids = (JSON.parse(regions) as { features: Array<{ properties: { id: string } }> }).features.map((f) => f.properties.id);
  const config = await writeRegionBenchInputs(DIR, {
    id: 'many-regions',
    title: 'Test atlas of 300 regions (invented data)',
    regions,
    classesFile: join(PROJECT_ROOT, 'content/workload-classes.yaml'),
    extra: 'regionWorkbooks: false\n',
  });
  dataDir = join(DIR, 'out');
  // Built afresh each run (about a minute of CPU); the site is reused when the data are the same.
  process.env.HEATHOURS_BUILD_TIME ??= '2026-01-01T00:00:00.000Z';
  await buildAtlas({ configPath: config, outDir: dataDir, jobs: 2, quiet: true, dataOnly: true, cache: false });
  dist = (await buildTestSite(dataDir)).distDir;
}, 1_800_000);

describe(`an atlas of ${N} regions`, () => {
  it('publishes each region its tables, summary and tile, and with regionWorkbooks false no workbook', () => {
    const files = new Set(readdirSync(join(dataDir, 'data', 'regions')));
    for (const id of ids) for (const ext of ['csv', 'wide.csv', 'json']) expect(files.has(`${id}.${ext}`), `${id}.${ext}`).toBe(true);
    expect([...files].filter((f) => f.endsWith('.xlsx'))).toEqual([]);
    expect(ids.every((id) => existsSync(join(dataDir, 'data', 'calculator', `${id}.bin`)))).toBe(true);
  });

  it('builds a report and a one-page summary for every region', () => {
    for (const id of ids) {
      expect(existsSync(join(dist, 'regions', id, 'index.html')), id).toBe(true);
      expect(existsSync(join(dist, 'regions', id, 'summary', 'index.html')), id).toBe(true);
    }
  });

  it("holds no value per region in the map's catalogue; each layer's values file has one value per region, equal to the region tables", () => {
    const catalogue = JSON.parse(readFileSync(join(dist, 'map', 'explorer.json'), 'utf8')) as ExplorerCatalogue & { regionValues?: unknown };
    expect(catalogue.regionValues).toBeUndefined();
    expect(catalogue.regions.map((r) => r.id).sort()).toEqual([...ids].sort());
    const layers = catalogue.layers.filter((l) => l.figure === 'hours-lost-shift' && l.statistic === 'mean').slice(0, 3);
    expect(layers.length).toBe(3);
    for (const l of catalogue.layers) expect(existsSync(join(dist, l.values)), l.values).toBe(true);
    for (const l of layers) {
      const values = JSON.parse(readFileSync(join(dist, l.values), 'utf8')) as Array<number | null>;
      expect(values).toHaveLength(N);
      catalogue.regions.forEach((r, i) => {
        if (i % 25 !== 0) return;
        const rows = parseCsvObjects(readFileSync(join(dataDir, 'data', 'regions', `${r.id}.csv`), 'utf8'));
        const row = rows.find((x) => x.period === l.period && x.figure === l.figure && x.statistic === l.statistic && x.workload_class === l.view.workloadClass && x.acclimatization === l.view.acclimatization && x.exposure === l.view.exposure && x.method === 'limit')!;
        expect(values[i], `${r.id} ${l.id}`).toBe(row.value === '' ? null : Number(row.value));
      });
    }
  });

  it('keeps the map catalogue to the layers plus under 200 bytes a region, and the map page first view under 2 MB as gzip sends it', () => {
    const catalogue = JSON.parse(readFileSync(join(dist, 'map', 'explorer.json'), 'utf8')) as ExplorerCatalogue;
    const withoutRegions = JSON.stringify({ ...catalogue, regions: [] }).length;
    expect((statSync(join(dist, 'map', 'explorer.json')).size - withoutRegions) / N).toBeLessThan(200);
    const view = firstViewBytes(dist, 'map/');
    expect(view.gzipBytes).toBeLessThan(2e6);
    process.stdout.write(`many-regions: map first view ${view.bytes} B stored, ${view.gzipBytes} B gzip; largest ${view.largest.join('; ')}\n`);
  });
});
