/**
 * The what-if climates and the record's trend on the map explorer and the home page's ranking,
 * in Debian's headless Chromium (browser.ts), on the test atlas with one uniform warming of 2 K
 * that the pipeline built (test/site/pipeline-data.ts; invented data, 3 years built).
 * Outside references: the drawn colour of a cell is computed from the scenario's own GeoTIFF
 * (read with geotiff.js 3.0.5) through d3-scale-chromatic's interpolator of its legend's ramp;
 * region values and rankings are read from the scenario's region CSVs; the caveat is the
 * manifest's `scenarioCaveat` (pipeline/scenario/describe.ts).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { fromArrayBuffer } from 'geotiff';
import * as chromatic from 'd3-scale-chromatic';
import type { Page } from 'playwright-core';
import { buildTestSite, colourDistance, mapPixelAt, screenshot, startSiteSession, type SiteSession, type WatchedPage } from './browser.ts';
import { buildPipelineData, PIPELINE_DATA_SCENARIO } from './pipeline-data.ts';
import type { Manifest } from '../../pipeline/publish/manifest.ts';
import type { LayerEntry } from '../../pipeline/publish/atlas-layers.ts';
import type { Rgb } from '../../src/components/map/map-colours.ts';
import { firstViewBytes } from '../../bench/first-view.mjs';

const MAP = 'explorer-map';
const SID = PIPELINE_DATA_SCENARIO.id;
const DEFAULT_LAYER = 'hours-lost-shift/moderate.acclimatized.sun/mean-year';

let dataDir = '';
let session: SiteSession;
let manifest: Manifest;
let scenario: NonNullable<Manifest['scenarios']>[number];
let distDir = '';

const read = (rel: string) => readFileSync(join(dataDir, rel));

function csvRows(rel: string): Array<Record<string, string>> {
  const [head, ...rows] = read(rel).toString('utf8').trim().split('\n');
  const cols = head.split(',');
  return rows.map((r) => Object.fromEntries(r.split(',').map((v, i) => [cols[i], v])));
}

/** The year's mean shift hours lost per worker of a region, in the record or the scenario. */
function annualLost(region: string, scenarioId: string | null, cls = 'moderate', accl = 'acclimatized', exposure = 'sun'): number {
  const rows = csvRows(scenarioId ? `data/scenarios/${scenarioId}/regions/${region}.csv` : `data/regions/${region}.csv`);
  const r = rows.find(
    (x) =>
      x.period === 'year' &&
      x.figure === 'hours-lost-shift' &&
      x.workload_class === cls &&
      x.acclimatization === accl &&
      x.exposure === exposure &&
      x.statistic === 'mean',
  )!;
  return Number(r.value);
}

async function tifValues(layer: LayerEntry): Promise<Float32Array> {
  const bytes = read(layer.tif);
  const image = await (await fromArrayBuffer(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength))).getImage();
  return ((await image.readRasters()) as unknown as Float32Array[])[0];
}

function legendColour(legend: LayerEntry['legend'], v: number): Rgb {
  const [lo, hi] = legend.domain!;
  const t = Math.min(1, Math.max(0, (v - lo) / (hi - lo)));
  const f = chromatic[`interpolate${legend.ramp}` as keyof typeof chromatic] as unknown as (t: number) => string;
  const s = f(legend.reversed ? 1 - t : t);
  if (s.startsWith('#')) return [1, 3, 5].map((i) => parseInt(s.slice(i, i + 2), 16)) as Rgb;
  return s
    .match(/[\d.]+/g)!
    .slice(0, 3)
    .map((x) => Math.round(+x)) as Rgb;
}

async function waitForView(page: Page, layerId: string, climate: string): Promise<void> {
  await page.waitForSelector(`#${MAP}[data-map-state="idle"][data-layer-id="${layerId}"][data-scenario="${climate}"]`, { timeout: 60_000 });
}

/** Values of the region table's shown rows, by region id. */
async function tableValues(page: Page): Promise<Map<string, number | null>> {
  const rows = await page.$$eval('#region-values tbody tr', (trs) =>
    trs.map((tr) => [tr.getAttribute('data-region-id')!, tr.querySelector('td[data-key="value"]')!.getAttribute('data-value')!] as const),
  );
  return new Map(rows.map(([id, v]) => [id, v === '' ? null : Number(v)]));
}

beforeAll(async () => {
  ({ dataDir } = await buildPipelineData({ withScenario: true }));
  manifest = JSON.parse(read('data/manifest.json').toString('utf8')) as Manifest;
  scenario = manifest.scenarios![0];
  const build = await buildTestSite(dataDir);
  distDir = build.distDir;
  session = await startSiteSession(build.distDir);
  process.stderr.write(`map scenario tests: site build ${build.reused ? 'reused' : `took ${(build.buildMs / 1000).toFixed(1)} s`}\n`);
}, 1_200_000);

afterAll(async () => {
  await session?.close();
});

describe("the map explorer's climate switch", () => {
  let map: WatchedPage;
  const requests: string[] = [];

  beforeAll(async () => {
    map = await session.open('/map/');
    map.page.on('request', (r) => requests.push(new URL(r.url()).pathname));
    await waitForView(map.page, DEFAULT_LAYER, 'baseline');
  }, 120_000);

  it('opens on the record and fetches nothing of a scenario until one is chosen', async () => {
    const options = await map.page.$$eval('#map-scenario option', (os) => os.map((o) => [(o as HTMLOptionElement).value, o.textContent!.trim()]));
    expect(options).toEqual([
      ['', 'The record (baseline)'],
      [SID, `What-if: ${scenario.name}`],
    ]);
    expect(await map.page.isHidden('#map-scenario-about')).toBe(true);
    // Requests made before the page script wired its listener are in the first view; none of them is a scenario's.
    const firstView = await map.page.evaluate(() => performance.getEntriesByType('resource').map((e) => new URL(e.name).pathname));
    expect([...firstView, ...requests].filter((p) => p.includes('/scenarios/'))).toEqual([]);
    // The first-view counter (bench/first-view.mjs) counts no scenario file either.
    const counted = firstViewBytes(distDir, 'map/');
    expect(counted.paths.length).toBeGreaterThan(5);
    expect(counted.paths.filter((p: string) => p.includes('scenarios/'))).toEqual([]);
    process.stderr.write(`map first view with one scenario: ${counted.files} files, ${counted.bytes} B, ${counted.gzipBytes} B gzip\n`);
  });

  it("draws the scenario's layer in its legend's colours, shows its words and the caveat, and fills the region table from its own tables", async () => {
    const page = map.page;
    const baseValues = await tableValues(page);
    await page.selectOption('#map-scenario', SID);
    await waitForView(page, DEFAULT_LAYER, SID);
    expect(new URL(page.url()).searchParams.get('scenario')).toBe(SID);
    // What was fetched: the scenario's layers file, the layer's values file and image, under the scenario.
    expect(requests).toContain(`/map/scenarios/${SID}.json`);
    expect(requests.some((p) => new RegExp(`^/map/scenarios/${SID}/values/\\d+\\.json$`).test(p))).toBe(true);
    const layer = scenario.layers.find((l) => l.id === DEFAULT_LAYER)!;
    expect(requests).toContain(`/${layer.png}`);
    // The words: the scenario's kind, what it changes and its source, and the what-if caveat.
    expect(await page.isVisible('#map-scenario-about')).toBe(true);
    const about = (await page.textContent(`#map-scenario-about [data-scenario-about="${SID}"]`))!;
    for (const w of [scenario.name, scenario.words.kind, scenario.words.what, scenario.words.source]) expect(about).toContain(w);
    expect((await page.textContent('#map-scenario-about [data-scenario-caveat]'))!).toContain(manifest.scenarioCaveat!);
    expect(manifest.scenarioCaveat!).toMatch(/^A what-if, not a forecast/);
    expect((await page.textContent('#map-legend-scenario'))!).toBe(`What-if climate: ${scenario.name} (${scenario.words.kind}), not a forecast.`);
    // The region table: each region's value from the scenario's region CSV, never below the record's.
    const values = await tableValues(page);
    expect(values.size).toBeGreaterThan(0);
    let warmer = 0;
    for (const [id, v] of values) {
      expect(v, id).toBe(annualLost(id, SID));
      expect(v!).toBeGreaterThanOrEqual(baseValues.get(id)!);
      if (v! > baseValues.get(id)!) warmer++;
    }
    expect(warmer).toBeGreaterThan(0);
    // The drawn colours: the scenario GeoTIFF's value at each land cell through the legend's ramp.
    if (await page.isChecked('#map-outlines')) await page.uncheck('#map-outlines');
    await page.evaluate(
      () =>
        new Promise<void>((r) => {
          const m = (globalThis as unknown as { heathoursMaps: Record<string, { once(e: string, f: () => void): void; triggerRepaint(): void }> })
            .heathoursMaps['explorer-map'];
          m.once('idle', () => r());
          m.triggerRepaint();
        }),
    );
    const cellsIndex = JSON.parse(read('data/cells/index.json').toString('utf8')) as {
      grid: { nLat: number; nLon: number; lat0: number; lon0: number; dLat: number; dLon: number };
    };
    const g = cellsIndex.grid;
    const band = await tifValues(layer as unknown as LayerEntry);
    const baseBand = await tifValues(manifest.layers.find((l) => l.id === DEFAULT_LAYER)!);
    let checked = 0;
    let differs = 0;
    for (let y = 0; y < g.nLat; y++) {
      for (let x = 0; x < g.nLon; x++) {
        const v = band[(g.nLat - 1 - y) * g.nLon + x];
        if (!Number.isFinite(v) || v === -9999) continue;
        const px = await mapPixelAt(page, MAP, [g.lon0 + x * g.dLon, g.lat0 + y * g.dLat]);
        if (!px.inside) continue;
        expect(colourDistance(px.rgb, legendColour(layer.legend as LayerEntry['legend'], v)), `cell ${y * g.nLon + x}`).toBeLessThanOrEqual(6);
        checked++;
        if (
          colourDistance(
            legendColour(layer.legend as LayerEntry['legend'], v),
            legendColour(layer.legend as LayerEntry['legend'], baseBand[(g.nLat - 1 - y) * g.nLon + x]),
          ) > 6
        )
          differs++;
      }
    }
    expect(checked).toBeGreaterThan(20);
    expect(differs).toBeGreaterThan(0);
    await screenshot(page, 'map-scenario');
  });

  it("keeps the scenario across a change of view and shows a selected cell's figures of the scenario, then returns to the record", async () => {
    const page = map.page;
    await page.selectOption('select[data-choice="period"]', '07');
    const july = 'hours-lost-shift/moderate.acclimatized.sun/mean-07';
    await waitForView(page, july, SID);
    // A land cell: the first of the scenario's per-cell chunks.
    const scIndex = JSON.parse(read(`data/scenarios/${SID}/cells/index.json`).toString('utf8')) as {
      chunks: Array<{ id: string }>;
      figures: Array<{ id: string; combos: string[] }>;
      periods: string[];
    };
    const chunk = JSON.parse(read(`data/scenarios/${SID}/cells/${scIndex.chunks[0].id}.json`).toString('utf8')) as {
      cells: Array<{ cell: number; figures: Record<string, number[][][]> }>;
    };
    const rec = chunk.cells[0];
    const nLon = JSON.parse(read('data/cells/index.json').toString('utf8')).grid.nLon as number;
    const url = new URL(page.url());
    url.searchParams.set('cell', String(rec.cell));
    const again = await session.open(`/map/${url.search}`);
    await waitForView(again.page, july, SID);
    await again.page.waitForSelector(`#cell-panel[data-state="ready"][data-cell="${rec.cell}"]`, { timeout: 30_000 });
    expect((await again.page.textContent('#cell-figures caption'))!).toContain(`What-if climate “${scenario.name}” (not a forecast)`);
    const k = scIndex.figures.find((f) => f.id === 'hours-lost-shift')!.combos.indexOf('moderate.acclimatized.sun');
    const p = scIndex.periods.indexOf('07');
    const shown = await again.page.textContent('#cell-figures tr[data-period="07"] td[data-key="hours-lost-shift.mean"]');
    expect(Number(shown)).toBeCloseTo(rec.figures['hours-lost-shift'][k][p][0], 2);
    // Back to the record: the record's per-cell figures.
    await again.page.selectOption('#map-scenario', '');
    await waitForView(again.page, july, 'baseline');
    await again.page.waitForSelector('#cell-panel[data-state="ready"]');
    expect((await again.page.textContent('#cell-figures caption'))!).not.toContain('What-if');
    const baseIndex = JSON.parse(read('data/cells/index.json').toString('utf8')) as { chunks: Array<{ id: string }> };
    const baseChunk = JSON.parse(read(`data/cells/${baseIndex.chunks[0].id}.json`).toString('utf8')) as typeof chunk;
    const baseRec = baseChunk.cells.find((c) => c.cell === rec.cell)!;
    const baseShown = await again.page.textContent('#cell-figures tr[data-period="07"] td[data-key="hours-lost-shift.mean"]');
    expect(Number(baseShown)).toBeCloseTo(baseRec.figures['hours-lost-shift'][k][p][0], 2);
    expect(new URL(again.page.url()).searchParams.get('scenario')).toBeNull();
    expect(await again.page.isHidden('#map-scenario-about')).toBe(true);
    expect(nLon).toBeGreaterThan(0);
    for (const w of [map, again]) {
      expect(w.pageErrors).toEqual([]);
      expect(w.consoleErrors).toEqual([]);
      expect(await w.cspViolations()).toEqual([]);
    }
  });

  it('shows the trend layers with the note that a trend needs 15 years when the record has 3, and the p-value layer on its 0–1 legend', async () => {
    const w = await session.open(`/map/?stat=trend&scenario=${SID}`);
    const trend = 'hours-lost-shift/moderate.acclimatized.sun/trend-year';
    await waitForView(w.page, trend, SID);
    expect((await w.page.textContent('#map-trend-note'))!).toBe('A trend needs at least 15 years; this record has 3 (2021–2023), so the layer has no values.');
    await w.page.selectOption('#map-scenario', '');
    await waitForView(w.page, trend, 'baseline');
    expect(await w.page.isVisible('#map-trend-note')).toBe(true);
    await w.page.selectOption('select[data-choice="statistic"]', 'trend-p');
    await waitForView(w.page, 'hours-lost-shift/moderate.acclimatized.sun/trend-p-year', 'baseline');
    expect((await w.page.textContent('#map-legend-range'))!).toContain('Unit: probability from 0 to 1 (Mann–Kendall p-value of the trend).');
    expect(await w.page.$$eval('#map-legend [data-legend-value]', (els) => els.map((e) => e.getAttribute('data-legend-value')))).toContain('1');
    // Every region's trend value is empty below 15 years.
    for (const v of (await tableValues(w.page)).values()) expect(v).toBeNull();
    expect(w.pageErrors).toEqual([]);
  });
});

describe("the home page's ranking by climate", () => {
  it("ranks by the record by default and, when a what-if climate is chosen, by that climate's own tables with its words and the caveat", async () => {
    const home = await session.open('/');
    const page = home.page;
    await page.waitForSelector('#ranking-scenario-control:not([hidden])');
    expect(await page.isVisible('[data-ranking-scenario=""] #ranking')).toBe(true);
    expect(await page.isHidden(`[data-ranking-scenario="${SID}"]`)).toBe(true);
    expect(await page.isHidden('#ranking-scenario-about')).toBe(true);
    const ids = await page.$$eval('#ranking tbody tr', (trs) => trs.map((tr) => tr.getAttribute('data-region-id')!));
    await page.selectOption('#ranking-scenario', SID);
    expect(await page.isHidden('[data-ranking-scenario=""]')).toBe(true);
    expect(await page.isVisible(`#ranking-${SID}`)).toBe(true);
    expect((await page.textContent(`#ranking-scenario-about [data-scenario-about="${SID}"]`))!).toContain(scenario.words.source);
    expect((await page.textContent('#ranking-scenario-about [data-scenario-caveat]'))!).toContain(manifest.scenarioCaveat!);
    expect((await page.textContent(`#ranking-${SID} caption`))!).toContain(`What-if climate “${scenario.name}” (not a forecast)`);
    const rows = await page.$$eval(`#ranking-${SID} tbody tr`, (trs) =>
      trs.map((tr) => [tr.getAttribute('data-region-id')!, tr.querySelector('td.sorted')!.getAttribute('data-value')!] as const),
    );
    expect(rows.map(([id]) => id).sort()).toEqual([...ids].sort());
    const want = rows.map(([id]) => annualLost(id, SID));
    rows.forEach(([id, v], i) => expect(v === '' ? NaN : Number(v), id).toBe(want[i]));
    // Ranked most hours first.
    for (let i = 1; i < want.length; i++) if (Number.isFinite(want[i])) expect(want[i - 1]).toBeGreaterThanOrEqual(want[i]);
    await screenshot(page, 'home-ranking-scenario');
    // Back to the record.
    await page.selectOption('#ranking-scenario', '');
    expect(await page.isVisible('#ranking')).toBe(true);
    expect(await page.isHidden('#ranking-scenario-about')).toBe(true);
    expect(home.pageErrors).toEqual([]);
  });

  it("without JavaScript shows every climate's ranking, each captioned, with the words and the caveat", async () => {
    const home = await session.open('/', { javaScript: false });
    expect(await home.page.isVisible('#ranking')).toBe(true);
    expect(await home.page.isVisible(`#ranking-${SID}`)).toBe(true);
    expect(await home.page.isVisible('#ranking-scenario-about')).toBe(true);
    expect(await home.page.isHidden('#ranking-scenario-control')).toBe(true);
  });
});
