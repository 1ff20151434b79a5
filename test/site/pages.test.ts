/**
 * Browser tests of the home and data inventory pages, built once from the data folder the real
 * pipeline makes for the site tests (pipeline-data.ts: the invented small demo) and served on
 * 127.0.0.1, in Debian's headless Chromium. Expected values come from that folder's
 * inventory.json and regions.geojson.
 * External checks: the land/sea pixels are checked against Natural Earth outlines from
 * world-atlas 2.0.2 with d3-geo's `geoContains` (a general-purpose reference library).
 * Escaping, the CSP and budgets of every page: safety.test.ts and budgets.test.ts.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { geoContains } from 'd3-geo';
import { feature } from 'topojson-client';
import type { Topology, GeometryObject } from 'topojson-specification';
import type { DatasetInventory } from '../../pipeline/read/inventory-types.ts';
import {
  PROJECT_ROOT,
  buildTestSite,
  colourDistance,
  mapPixelAt,
  parseShownNumber,
  readDataTable,
  readKeyValueTable,
  screenshot,
  startSiteSession,
  waitForMapIdle,
  type SiteSession,
  type TestSiteBuild,
  type WatchedPage,
} from './browser.ts';
import { GRID_FILL_OPACITY, MAP_COLOURS, blendOver } from '../../src/components/map/map-colours.ts';
import { gridEdges } from '../../src/components/map/grid-geometry.ts';
import { CAUTIONS } from '../../src/lib/cautions.ts';
import { FORMAT_LABELS, LAYOUT_LABELS } from '../../src/lib/labels.ts';
import { formatBytes, formatCount, formatFixed, formatLat, formatLon, formatUnits, formatUtc } from '../../src/lib/format.ts';
import { buildPipelineData } from './pipeline-data.ts';

let dataDir: string;
let inventory: DatasetInventory;
let regions: { features: Array<{ properties: { id: string; name: string } }> };
let build: TestSiteBuild;
let session: SiteSession;
/** One visit of each page with JavaScript, shared by the tests that only read it. */
let home: WatchedPage;
let inventoryPage: WatchedPage;

beforeAll(async () => {
  dataDir = (await buildPipelineData()).dataDir;
  inventory = JSON.parse(readFileSync(join(dataDir, 'data/inventory.json'), 'utf8')) as DatasetInventory;
  regions = JSON.parse(readFileSync(join(dataDir, 'data/regions.geojson'), 'utf8'));
  build = await buildTestSite(dataDir);
  session = await startSiteSession(build.distDir);
  [home, inventoryPage] = await Promise.all([session.open('/'), session.open('/inventory/')]);
  process.stderr.write(`site tests: build ${build.reused ? 'reused' : `took ${(build.buildMs / 1000).toFixed(1)} s`}\n`);
});

afterAll(async () => {
  await session?.close();
});

/** Shown values are rounded to the printed decimals; within half the last digit (+ float slack). */
function expectShown(text: string, value: number): void {
  const number = text.replace(/\s*°C$/, '');
  const decimals = (number.split('.')[1] ?? '').replace(/\D/g, '').length;
  expect(Math.abs(parseShownNumber(number) - value)).toBeLessThanOrEqual(0.5 * 10 ** -decimals + 1e-9);
}

describe('the home page', () => {
  it('states the atlas title, years, baseline, grid extent, the invented-data label and the attribution from the inventory', async () => {
    const { page } = home;
    expect(await page.textContent('h1')).toBe(inventory.atlas.title);
    const facts = await page.$$eval('#coverage dd[data-key]', (dds) =>
      Object.fromEntries(dds.map((d) => [d.getAttribute('data-key'), (d.textContent ?? '').trim()])),
    );
    expect(facts.years).toBe(`${inventory.atlas.years[0]}–${inventory.atlas.years[1]}`);
    expect(facts.baseline).toBe(
      `${inventory.atlas.baseline[0]}–${inventory.atlas.baseline[1]} (${inventory.atlas.baseline[1] - inventory.atlas.baseline[0] + 1} years)`,
    );
    // Etc/GMT+10 is ten hours behind UTC (POSIX signs of the tz database's Etc zones).
    expect(facts['time-zone']).toBe('UTC\u221210:00 (Etc/GMT+10)');
    // The test atlas's 2-year baseline is too short for a 1-in-10 year: the page says so.
    expect(await page.textContent('#coverage ~ [data-baseline-warning]')).toMatch(/rest on 2 years \(2021–2022\), fewer than the 10/);
    // Outer edges = cell centres ± half a step.
    const [west, south, east, north] = gridEdges(inventory.grid);
    expect(west).toBe(inventory.grid.lonMin - inventory.grid.dLon / 2);
    expect(facts.extent).toContain(`${formatLat(south)} to ${formatLat(north)}, ${formatLon(west)} to ${formatLon(east)}`);
    expect(facts.grid).toContain(`${inventory.grid.nLat} × ${inventory.grid.nLon} cells`);
    expect(facts.source).toContain('Invented data');
    expect(facts.attribution).toBe(inventory.atlas.attribution);
    expect(await page.isVisible('[data-invented]')).toBe(true);
    expect(await page.getAttribute('a[href="/inventory/"] >> nth=-1', 'href')).toBe('/inventory/');
    await screenshot(page, 'home');
  });

  it('lists every region by name and id, and carries all six cautions in full and in the footer', async () => {
    const { page } = home;
    const shown = await page.$$eval('#regions li', (lis) =>
      lis.map((li) => ({ id: li.getAttribute('data-region-id'), name: li.querySelector('.region-name')?.textContent })),
    );
    expect(shown).toHaveLength(regions.features.length);
    for (const f of regions.features) expect(shown).toContainEqual({ id: f.properties.id, name: f.properties.name });
    const cautionIds = await page.$$eval('.cautions li', (lis) => lis.map((li) => li.getAttribute('data-caution')));
    expect(cautionIds).toEqual(CAUTIONS.map((c) => c.id));
    const footer = (await page.textContent('.site-footer')) ?? '';
    for (const c of CAUTIONS) expect(footer).toContain(c.short);
    // The cautions of DESIGN.md §7, by their key words.
    const text = (await page.textContent('.cautions')) ?? '';
    for (const words of [
      'screening',
      'acclimatized',
      'grid box',
      'protective equipment',
      'Local regulations',
      'competent person',
      'heat illness',
      'medical help',
    ]) {
      expect(text.toLowerCase()).toContain(words.toLowerCase().replace('acclimatized', 'used to the heat'));
    }
  });
});

describe('the data inventory page', () => {
  it('shows every variable of the inventory with its names, units, decoded min/max/mean and fill count', async () => {
    const { page } = inventoryPage;
    const rows = await readDataTable(page, '#variables');
    expect(rows).toHaveLength(inventory.variables.length);
    inventory.variables.forEach((v, i) => {
      const r = rows[i];
      expect(r.name).toBe(v.name);
      expect(r.long_name).toBe(v.long_name);
      expect(r.source).toBe(v.source);
      expect(r.units).toBe(formatUnits(v.units));
      // Temperatures carry their unit (the °C/°F convention); other values are bare numbers.
      if (v.units === 'degC') expect(r.min).toMatch(/ °C$/);
      else expect(r.min).not.toMatch(/°/);
      expect(r.sourceUnits).toBe(v.sourceUnits);
      expectShown(r.min, v.min);
      expectShown(r.max, v.max);
      expectShown(r.mean, v.mean);
      expect(parseShownNumber(r.fillCount)).toBe(v.fillCount);
    });
  });

  it('shows the provenance of every file: name, size, full SHA-256, format, layout, time range, variables', async () => {
    const { page } = inventoryPage;
    const rows = await readDataTable(page, '#files');
    expect(rows).toHaveLength(inventory.files.length);
    expect(inventory.files.some((f) => f.timeStart === '')).toBe(true);
    inventory.files.forEach((f, i) => {
      const r = rows[i];
      expect(r.name).toBe(f.name);
      expect(r.bytes).toBe(formatBytes(f.bytes));
      expect(r.sha256).toBe(f.sha256);
      expect(r.format).toBe(FORMAT_LABELS[f.format]);
      expect(r.layout).toBe(LAYOUT_LABELS[f.layout]);
      // The land-sea mask file has no time axis.
      const when = (t: string) => (t === '' ? 'static (no time axis)' : formatUtc(t));
      expect(r.timeStart).toBe(when(f.timeStart));
      expect(r.timeEnd).toBe(when(f.timeEnd));
      expect(r.variables.split(', ')).toEqual(f.variables);
    });
  });

  it('shows the grid and the time coverage, and all tables are there without JavaScript', async () => {
    const { page } = await session.open('/inventory/', { javaScript: false });
    const grid = await readKeyValueTable(page, '#grid-summary');
    const g = inventory.grid;
    expect(grid['lat-range']).toBe(`${formatLat(g.latMin, 3)} to ${formatLat(g.latMax, 3)}`);
    expect(grid['lon-range']).toBe(`${formatLon(g.lonMin, 3)} to ${formatLon(g.lonMax, 3)}`);
    expect(grid.spacing).toBe(`${formatFixed(g.dLat, 3)}° latitude × ${formatFixed(g.dLon, 3)}° longitude`);
    expect(grid.cells).toBe(`${g.nLat} rows × ${g.nLon} columns = ${formatCount(g.nLat * g.nLon)}`);
    expect(parseShownNumber(grid['land-cells'])).toBe(g.landCells);
    const time = await readKeyValueTable(page, '#time-coverage');
    // The invented demo's three years, as hour-end stamps (ERA5 convention).
    expect(time.start).toBe(formatUtc(inventory.time.start));
    expect(time.start).toBe('2021-01-01 01:00 UTC');
    expect(time.end).toBe('2024-01-01 00:00 UTC');
    expect(parseShownNumber(time.hours)).toBe(inventory.time.hours);
    expect(await readDataTable(page, '#variables')).toHaveLength(inventory.variables.length);
    expect(await readDataTable(page, '#files')).toHaveLength(inventory.files.length);
    // No script ran, so the map never started.
    expect(await page.getAttribute('#inventory-map', 'data-map-state')).toBeNull();
  });

  it('draws the grid extent over the sea and Natural Earth land on the map', async () => {
    const { page } = inventoryPage;
    await waitForMapIdle(page, 'inventory-map');
    const land = feature(
      JSON.parse(readFileSync(join(PROJECT_ROOT, 'node_modules/world-atlas/land-110m.json'), 'utf8')) as Topology,
      (JSON.parse(readFileSync(join(PROJECT_ROOT, 'node_modules/world-atlas/land-110m.json'), 'utf8')) as Topology).objects.land as GeometryObject,
    );
    // Test points, classified by world-atlas itself: the island of Hawaii, west of the invented
    // territory, is land (three points well inside its 1:110m outline); the open Pacific south-east
    // of the grid is sea.
    const landPoints: Array<[number, number]> = [
      [-155.5, 19.6],
      [-155.6, 19.5],
      [-155.3, 19.7],
    ];
    const seaPoint: [number, number] = [-137.5, 15];
    for (const p of landPoints) expect(geoContains(land, p)).toBe(true);
    expect(geoContains(land, seaPoint)).toBe(false);

    // A point in the grid's north-east cell, away from the cell edges and the region outlines.
    const g = inventory.grid;
    const inGrid: [number, number] = [g.lonMax + 0.2 * g.dLon, g.latMax + 0.2 * g.dLat];
    expect(inGrid[0] < g.lonMax + g.dLon / 2 && inGrid[1] < g.latMax + g.dLat / 2).toBe(true);
    const centre = await mapPixelAt(page, 'inventory-map', inGrid);
    const sea = await mapPixelAt(page, 'inventory-map', seaPoint);
    expect(centre.inside && sea.inside).toBe(true);
    expect(colourDistance(sea.rgb, MAP_COLOURS.sea)).toBeLessThanOrEqual(3);
    expect(colourDistance(centre.rgb, blendOver(MAP_COLOURS.gridFill, MAP_COLOURS.sea, GRID_FILL_OPACITY))).toBeLessThanOrEqual(4);
    expect(colourDistance(centre.rgb, sea.rgb)).toBeGreaterThan(40);
    for (const p of landPoints) {
      const px = await mapPixelAt(page, 'inventory-map', p);
      expect(px.inside).toBe(true);
      expect(colourDistance(px.rgb, MAP_COLOURS.land)).toBeLessThanOrEqual(3);
    }
    await screenshot(page, 'inventory');
    await page.locator('#inventory-map').screenshot({ path: join(PROJECT_ROOT, 'test-artifacts/site/inventory-map.png') });
  });
});

describe('the built site as a whole', () => {
  it('prints without the navigation and the map controls (print style)', async () => {
    const page = inventoryPage.page;
    await page.emulateMedia({ media: 'print' });
    try {
      expect(await page.isVisible('.site-header nav')).toBe(false);
      expect(await page.isVisible('.maplibregl-ctrl-zoom-in')).toBe(false);
      expect(await page.isVisible('#variables')).toBe(true);
      expect(await page.isVisible('.site-footer .cautions-short')).toBe(true);
      await screenshot(page, 'inventory-print');
    } finally {
      await page.emulateMedia({ media: 'screen' });
    }
  });

  it('publishes the data folder under data/ and nothing of the build machinery', () => {
    for (const rel of ['data/manifest.json', 'data/inventory.json', 'data/regions.geojson']) {
      expect(readFileSync(join(build.distDir, rel), 'utf8'), rel).toBe(readFileSync(join(dataDir, rel), 'utf8'));
    }
    expect(() => readFileSync(join(build.distDir, 'content-assets.mjs'))).toThrow();
  });

  it('made no request beyond 127.0.0.1, and no page logged an error or a CSP violation', async () => {
    if (session.pages.length === 0) await session.open('/');
    for (const w of session.pages) {
      const where = w.page.url();
      // A page opened without JavaScript reports its aborted script files; nothing else may fail.
      const errors = w.scriptsBlocked ? w.consoleErrors.filter((e) => !/ERR_FAILED \(.*\.m?js\)$/.test(e)) : w.consoleErrors;
      expect(errors, where).toEqual([]);
      expect(w.pageErrors, where).toEqual([]);
      expect(await w.cspViolations(), where).toEqual([]);
    }
    expect(session.pages.length).toBeGreaterThanOrEqual(3);
    expect(session.nonLocalRequests).toEqual([]);
  });
});
