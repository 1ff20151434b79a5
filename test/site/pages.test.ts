/**
 * Browser tests of the home and data inventory pages, built once from the invented fixture
 * (test/fixtures/site) and served on 127.0.0.1, in Debian's headless Chromium.
 * External checks: the land/sea pixels are checked against Natural Earth outlines from
 * world-atlas 2.0.2 with d3-geo's `geoContains` (a general-purpose reference library); the
 * escaping check follows the HTML standard (text content is never parsed as markup).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { geoContains } from 'd3-geo';
import { feature } from 'topojson-client';
import type { Topology, GeometryObject } from 'topojson-specification';
import type { DatasetInventory } from '../../pipeline/publish/inventory-types.ts';
import {
  FIXTURE_DATA_DIR,
  PROJECT_ROOT,
  buildTestSite,
  colourDistance,
  htmlFiles,
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
import { CONTENT_SECURITY_POLICY } from '../../src/lib/content-security-policy.ts';
import { CAUTIONS } from '../../src/lib/cautions.ts';
import { FORMAT_LABELS, LAYOUT_LABELS } from '../../src/lib/labels.ts';
import { formatBytes, formatUnits, formatUtc } from '../../src/lib/format.ts';

const inventory = JSON.parse(readFileSync(join(FIXTURE_DATA_DIR, 'data/inventory.json'), 'utf8')) as DatasetInventory;
const regions = JSON.parse(readFileSync(join(FIXTURE_DATA_DIR, 'data/regions.geojson'), 'utf8')) as {
  features: Array<{ properties: { id: string; name: string } }>;
};
const HOSTILE_NAME = '<img src=x onerror=alert(1)><script>alert(2)</script>';

let build: TestSiteBuild;
let session: SiteSession;
/** One visit of each page with JavaScript, shared by the tests that only read it. */
let home: WatchedPage;
let inventoryPage: WatchedPage;

beforeAll(async () => {
  build = await buildTestSite();
  session = await startSiteSession(build.distDir);
  [home, inventoryPage] = await Promise.all([session.open('/'), session.open('/inventory/')]);
  process.stderr.write(`site tests: build ${build.reused ? 'reused' : `took ${(build.buildMs / 1000).toFixed(1)} s`}\n`);
});

afterAll(async () => {
  await session?.close();
});

/** Shown values are rounded to the printed decimals; within half the last digit (+ float slack). */
function expectShown(text: string, value: number): void {
  const decimals = (text.split('.')[1] ?? '').replace(/\D/g, '').length;
  expect(Math.abs(parseShownNumber(text) - value)).toBeLessThanOrEqual(0.5 * 10 ** -decimals + 1e-9);
}

describe('the home page', () => {
  it('states the atlas title, years, baseline, grid extent, the invented-data label and the attribution from the inventory', async () => {
    const { page } = home;
    expect(await page.textContent('h1')).toBe(inventory.atlas.title);
    const facts = await page.$$eval('#coverage dd[data-key]', (dds) => Object.fromEntries(dds.map((d) => [d.getAttribute('data-key'), (d.textContent ?? '').trim()])));
    expect(facts.years).toBe(`${inventory.atlas.years[0]}–${inventory.atlas.years[1]}`);
    expect(facts.baseline).toBe(`${inventory.atlas.baseline[0]}–${inventory.atlas.baseline[1]}`);
    // Outer edges = cell centres ± half a step (9.75–14.25° N, 59.75–64.25° E for the fixture).
    expect(facts.extent).toContain('9.75° N to 14.25° N, 59.75° E to 64.25° E');
    expect(facts.grid).toContain(`${inventory.grid.nLat} × ${inventory.grid.nLon} cells`);
    expect(facts.source).toContain('Invented data');
    expect(facts.attribution).toBe(inventory.atlas.attribution);
    expect(await page.isVisible('[data-invented]')).toBe(true);
    expect(await page.getAttribute('a[href="/inventory/"] >> nth=-1', 'href')).toBe('/inventory/');
    await screenshot(page, 'home');
  });

  it('lists every region by name and id, and carries all six cautions in full and in the footer', async () => {
    const { page } = home;
    const shown = await page.$$eval('#regions li', (lis) => lis.map((li) => ({ id: li.getAttribute('data-region-id'), name: li.querySelector('.region-name')?.textContent })));
    expect(shown).toHaveLength(regions.features.length);
    for (const f of regions.features) expect(shown).toContainEqual({ id: f.properties.id, name: f.properties.name });
    const cautionIds = await page.$$eval('.cautions li', (lis) => lis.map((li) => li.getAttribute('data-caution')));
    expect(cautionIds).toEqual(CAUTIONS.map((c) => c.id));
    const footer = (await page.textContent('.site-footer')) ?? '';
    for (const c of CAUTIONS) expect(footer).toContain(c.short);
    // The cautions of DESIGN.md §7, by their key words.
    const text = (await page.textContent('.cautions')) ?? '';
    for (const words of ['screening', 'acclimatized', 'grid box', 'protective equipment', 'Local regulations', 'competent person', 'heat illness', 'medical help']) {
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
      expect(r.sourceUnits).toBe(v.sourceUnits);
      expectShown(r.min, v.min);
      expectShown(r.max, v.max);
      expectShown(r.mean, v.mean);
      expect(parseShownNumber(r.fillCount)).toBe(v.fillCount);
    });
    // A negative value keeps its sign: the fixture's dew-point minimum is −3.75 °C.
    expect(rows[1].min).toBe('\u22123.75');
  });

  it('shows the provenance of every file: name, size, full SHA-256, format, layout, time range, variables', async () => {
    const { page } = inventoryPage;
    const rows = await readDataTable(page, '#files');
    expect(rows).toHaveLength(inventory.files.length);
    inventory.files.forEach((f, i) => {
      const r = rows[i];
      expect(r.name).toBe(f.name);
      expect(r.bytes).toBe(formatBytes(f.bytes));
      expect(r.sha256).toBe(f.sha256);
      expect(r.format).toBe(FORMAT_LABELS[f.format]);
      expect(r.layout).toBe(LAYOUT_LABELS[f.layout]);
      expect(r.timeStart).toBe(formatUtc(f.timeStart));
      expect(r.timeEnd).toBe(formatUtc(f.timeEnd));
      expect(r.variables.split(', ')).toEqual(f.variables);
    });
  });

  it('shows the grid and the time coverage, and all tables are there without JavaScript', async () => {
    const { page } = await session.open('/inventory/', { javaScript: false });
    const grid = await readKeyValueTable(page, '#grid-summary');
    expect(grid['lat-range']).toBe('10.000° N to 14.000° N');
    expect(grid['lon-range']).toBe('60.000° E to 64.000° E');
    expect(grid.spacing).toBe('0.500° latitude × 0.500° longitude');
    expect(grid.cells).toBe(`${inventory.grid.nLat} rows × ${inventory.grid.nLon} columns = ${inventory.grid.nLat * inventory.grid.nLon}`);
    expect(parseShownNumber(grid['land-cells'])).toBe(inventory.grid.landCells);
    const time = await readKeyValueTable(page, '#time-coverage');
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
    // Test points, classified by world-atlas itself: the horn of Africa and peninsular India are
    // land, the open Arabian Sea south-east of the grid is sea.
    const landPoints: Array<[number, number]> = [[45, 8], [76, 15]];
    const seaPoint: [number, number] = [66, 6];
    for (const p of landPoints) expect(geoContains(land, p)).toBe(true);
    expect(geoContains(land, seaPoint)).toBe(false);

    // The grid's central cell (62° E, 12° N) is away from cell edges and region outlines.
    const centre = await mapPixelAt(page, 'inventory-map', [62, 12]);
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

describe('safety of the built pages', () => {
  it('shows a region named with HTML as plain text, and nothing in it runs', async () => {
    const watched = home;
    const { page } = watched;
    const item = page.locator('#regions li[data-region-id="odd-name"] .region-name');
    expect(await item.textContent()).toBe(HOSTILE_NAME);
    expect(await item.locator('img, script').count()).toBe(0);
    expect(await page.locator('main img').count()).toBe(0);
    // Give an injected handler time to fire, if there were one.
    await page.waitForTimeout(300);
    expect(watched.dialogs).toEqual([]);
    const raw = readFileSync(join(build.distDir, 'index.html'), 'utf8');
    expect(raw).not.toContain(HOSTILE_NAME);
    expect(raw).toContain('&lt;img src=x onerror=alert(1)&gt;&lt;script&gt;alert(2)&lt;/script&gt;');
  });

  it('puts the Content-Security-Policy meta tag on every page and no inline script, style or event handler anywhere', () => {
    const pages = htmlFiles(build.distDir);
    expect(pages.sort()).toEqual(['estimate/index.html', 'index.html', 'inventory/index.html', 'map/index.html']);
    for (const rel of pages) {
      const html = readFileSync(join(build.distDir, rel), 'utf8');
      const meta = html.match(/<meta http-equiv="Content-Security-Policy" content="([^"]*)"/);
      expect(meta?.[1].replace(/&#39;/g, "'"), rel).toBe(CONTENT_SECURITY_POLICY);
      for (const tag of html.match(/<script\b[^>]*>/g) ?? []) {
        expect(/\bsrc="\/[^"]+"/.test(tag) || /type="application\/json"/.test(tag), `${rel}: ${tag}`).toBe(true);
      }
      expect(html.match(/<script\b[^>]*\bsrc=[^>]*>([\s\S]*?)<\/script>/g)?.every((s) => /><\/script>$/.test(s)) ?? true).toBe(true);
      expect(html, rel).not.toMatch(/<style\b/);
      expect(html, rel).not.toMatch(/\sstyle="/);
      expect(html, rel).not.toMatch(/\son[a-z]+="/);
      expect(html, rel).not.toMatch(/(src|href)="(https?:)?\/\//);
    }
  });

  it('has its Content-Security-Policy in force: an injected inline script and a remote image are blocked and reported', async () => {
    // A page outside session.pages, so the violations provoked here do not count against the site.
    const page = await session.context.newPage();
    await page.goto(session.baseUrl, { waitUntil: 'load' });
    const ran = await page.evaluate(async () => {
      const s = document.createElement('script');
      s.textContent = 'globalThis.__inlineRan = true;';
      document.head.append(s);
      const img = document.createElement('img');
      img.src = 'https://example.org/x.png';
      document.body.append(img);
      await new Promise((r) => setTimeout(r, 200));
      return (globalThis as unknown as { __inlineRan?: boolean }).__inlineRan === true;
    });
    expect(ran).toBe(false);
    const violations = await page.evaluate(() => (globalThis as unknown as { __cspViolations: string[] }).__cspViolations);
    expect(violations.some((v) => v.startsWith('script-src'))).toBe(true);
    expect(violations.some((v) => v.startsWith('img-src'))).toBe(true);
    await page.close();
  });

  it('loads MapLibre only on the page with a map', () => {
    const homeHtml = readFileSync(join(build.distDir, 'index.html'), 'utf8');
    const inventoryHtml = readFileSync(join(build.distDir, 'inventory/index.html'), 'utf8');
    // The script files a page loads, with the chunks they import (Vite's static imports).
    const scriptGraph = (html: string): string => {
      const seen = new Set<string>();
      const queue = [...html.matchAll(/<script[^>]*\bsrc="([^"]+)"/g)].map((m) => m[1]);
      let code = '';
      while (queue.length > 0) {
        const src = queue.shift()!;
        if (seen.has(src)) continue;
        seen.add(src);
        const text = readFileSync(join(build.distDir, src), 'utf8');
        code += text;
        for (const m of text.matchAll(/from\s*"\.\/([^"]+\.js)"/g)) queue.push(`/assets/${m[1]}`);
      }
      return code;
    };
    expect(scriptGraph(homeHtml)).not.toMatch(/maplibre/i);
    expect(scriptGraph(homeHtml).length, 'the home page loads only the small unit switch').toBeLessThan(20_000);
    expect(scriptGraph(inventoryHtml)).toMatch(/maplibre/i);
  });

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
    expect(readFileSync(join(build.distDir, 'data/inventory.json'), 'utf8')).toBe(readFileSync(join(FIXTURE_DATA_DIR, 'data/inventory.json'), 'utf8'));
    expect(readFileSync(join(build.distDir, 'data/regions.geojson'), 'utf8')).toBe(readFileSync(join(FIXTURE_DATA_DIR, 'data/regions.geojson'), 'utf8'));
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
