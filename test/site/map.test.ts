/**
 * Browser tests of the map explorer (`/map/`), on a site built from a data folder made by the
 * real pipeline (the invented small demo, test/site/pipeline-data.ts), in Debian's headless
 * Chromium through the harness of browser.ts.
 * Outside references: layer values are read from the published GeoTIFFs with geotiff.js 3.0.5;
 * the colour a value should have is computed with d3-scale-chromatic's own interpolator of the
 * legend's ramp over the legend's domain (not with our renderer); which region holds a cell centre
 * is decided with d3-geo's geoContains, nearest outlines with d3-geo's geoDistance; °F = °C × 9/5
 * + 32 by definition of the Fahrenheit scale.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { fromArrayBuffer } from 'geotiff';
import * as chromatic from 'd3-scale-chromatic';
import { geoArea, geoContains, geoDistance, geoInterpolate } from 'd3-geo';
import type { Feature, MultiPolygon, Polygon, Position } from 'geojson';
import type { Page } from 'playwright-core';
import { buildTestSite, colourDistance, mapPixelAt, parseShownNumber, screenshot, startSiteSession, type SiteSession, type WatchedPage } from './browser.ts';
import { buildPipelineData } from './pipeline-data.ts';
import type { Manifest } from '../../pipeline/publish/manifest.ts';
import type { LayerEntry } from '../../pipeline/publish/atlas-layers.ts';
import type { CellFiguresIndex } from '../../pipeline/publish/cell-figures.ts';
import type { Rgb } from '../../src/components/map/map-colours.ts';
import { readCellTables } from '../helpers/cell-tables.ts';
import { CONTENT_SECURITY_POLICY } from '../../src/lib/content-security-policy.ts';

const MAP = 'explorer-map';

let dataDir = '';
let session: SiteSession;
let manifest: Manifest;
let cellsIndex: CellFiguresIndex;
let landCells: number[] = [];
let regionsGeo: { features: Array<Feature<Polygon | MultiPolygon, { id: string; name: string }>> };
let atlasRows: Array<Record<string, string>> = [];
/** The page most tests share (opened once with JavaScript). */
let shared: WatchedPage;
let distDir = '';

function parseCsv(text: string): Array<Record<string, string>> {
  const [head, ...rows] = text.trim().split('\n');
  const cols = head.split(',');
  return rows.map((r) => Object.fromEntries(r.split(',').map((v, i) => [cols[i], v])));
}

const read = (rel: string) => readFileSync(join(dataDir, rel));

/** The manifest layer with these parts (the one the page must draw). */
function findLayer(figure: string, combo: string, statistic: string, period: string): LayerEntry {
  const l = manifest.layers.find((x) => x.figure === figure && x.combo === combo && x.statistic === statistic && x.period === period);
  if (!l) throw new Error(`no layer ${figure} ${combo} ${statistic} ${period}`);
  return l;
}

/** Values of a layer's GeoTIFF per global cell id (rows run north → south in the file). */
const tifCache = new Map<string, Map<number, number>>();
async function tifValues(layer: LayerEntry): Promise<Map<number, number>> {
  const hit = tifCache.get(layer.id);
  if (hit) return hit;
  const bytes = read(layer.tif);
  const image = await (await fromArrayBuffer(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength))).getImage();
  const [band] = (await image.readRasters()) as unknown as Float32Array[];
  const { nLat, nLon } = cellsIndex.grid;
  const out = new Map<number, number>();
  for (const cell of landCells) {
    const y = Math.floor(cell / nLon);
    out.set(cell, band[(nLat - 1 - y) * nLon + (cell % nLon)]);
  }
  tifCache.set(layer.id, out);
  return out;
}

function cssColour(s: string): Rgb {
  if (s.startsWith('#')) return [1, 3, 5].map((i) => parseInt(s.slice(i, i + 2), 16)) as Rgb;
  const m = s.match(/[\d.]+/g)!;
  return [Math.round(+m[0]), Math.round(+m[1]), Math.round(+m[2])];
}

/** The colour the legend gives a value: d3's interpolator of its ramp over its domain, clamped; or the class colour. */
function legendColour(legend: LayerEntry['legend'], v: number): Rgb {
  if (legend.kind === 'categorical') return cssColour(legend.stops.find((s) => s.value === v)!.color);
  const [lo, hi] = legend.domain!;
  const t = Math.min(1, Math.max(0, (v - lo) / (hi - lo)));
  const name = `interpolate${legend.ramp[0].toUpperCase()}${legend.ramp.slice(1)}` as keyof typeof chromatic;
  const f = chromatic[name] as unknown as (t: number) => string;
  return cssColour(f(legend.reversed ? 1 - t : t));
}

function cellCentre(cell: number): [number, number] {
  const g = cellsIndex.grid;
  return [g.lon0 + (cell % g.nLon) * g.dLon, g.lat0 + Math.floor(cell / g.nLon) * g.dLat];
}

async function waitForLayer(page: Page, layerId: string): Promise<void> {
  await page.waitForSelector(`#${MAP}[data-map-state="idle"][data-layer-id="${layerId}"]`, { timeout: 30_000 });
}

async function choose(page: Page, choice: string, value: string): Promise<void> {
  await page.selectOption(`select[data-choice="${choice}"]`, value);
}

/** Screen rectangles of the map's own controls (zoom buttons, attribution), which cover the layer. */
async function controlRects(page: Page): Promise<Array<{ x0: number; y0: number; x1: number; y1: number }>> {
  return page.$$eval(`#${MAP} .maplibregl-ctrl`, (els) => {
    const canvas = document.querySelector(`#explorer-map canvas`)!.getBoundingClientRect();
    return els.map((e) => {
      const r = e.getBoundingClientRect();
      return { x0: r.left - canvas.left - 2, y0: r.top - canvas.top - 2, x1: r.right - canvas.left + 2, y1: r.bottom - canvas.top + 2 };
    });
  });
}

/** Drawn colour at each land cell's centre that the map's controls do not cover. */
async function landPixels(page: Page): Promise<Map<number, Rgb>> {
  const covered = await controlRects(page);
  const out = new Map<number, Rgb>();
  for (const cell of landCells) {
    const px = await mapPixelAt(page, MAP, cellCentre(cell));
    if (!px.inside || covered.some((r) => px.x >= r.x0 && px.x <= r.x1 && px.y >= r.y0 && px.y <= r.y1)) continue;
    out.set(cell, px.rgb);
  }
  expect(out.size, 'most land cells are visible').toBeGreaterThanOrEqual(landCells.length - 3);
  return out;
}

async function hideOutlines(page: Page): Promise<void> {
  if (await page.isChecked('#map-outlines')) await page.uncheck('#map-outlines');
  await page.evaluate(
    () =>
      new Promise<void>((r) => {
        const m = (globalThis as unknown as { heathoursMaps: Record<string, { once(e: string, f: () => void): void; triggerRepaint(): void }> }).heathoursMaps[
          'explorer-map'
        ];
        m.once('idle', () => r());
        m.triggerRepaint();
      }),
  );
}

/** Screen point [CSS px, page] of a geographic point on the map. */
async function screenPoint(page: Page, lngLat: [number, number]): Promise<{ x: number; y: number }> {
  return page.evaluate((p) => {
    const m = (
      globalThis as unknown as { heathoursMaps: Record<string, { project(p: [number, number]): { x: number; y: number }; getCanvas(): HTMLCanvasElement }> }
    ).heathoursMaps['explorer-map'];
    const r = m.getCanvas().getBoundingClientRect();
    const q = m.project(p);
    return { x: r.left + q.x, y: r.top + q.y };
  }, lngLat);
}

/** The cell panel's table: period → data-key → shown text. */
async function panelTable(page: Page): Promise<Record<string, Record<string, string>>> {
  return page.$$eval('#cell-figures tbody tr', (trs) =>
    Object.fromEntries(
      trs.map((tr) => [
        tr.getAttribute('data-period'),
        Object.fromEntries([...tr.querySelectorAll('td')].map((td) => [td.getAttribute('data-key'), (td.textContent ?? '').trim()])),
      ]),
    ),
  );
}

/** GeoJSON rings are counter-clockwise (RFC 7946); d3-geo wants clockwise exteriors: flip a polygon whose area exceeds a hemisphere. */
function d3Polygon(f: Feature<Polygon | MultiPolygon>): Feature<Polygon | MultiPolygon> {
  const polys = f.geometry.type === 'Polygon' ? [f.geometry.coordinates] : f.geometry.coordinates;
  const fixed = polys.map((rings) => {
    const p: Feature<Polygon> = { type: 'Feature', properties: {}, geometry: { type: 'Polygon', coordinates: rings } };
    return geoArea(p) > 2 * Math.PI ? rings.map((r) => [...r].reverse()) : rings;
  });
  return { ...f, geometry: { type: 'MultiPolygon', coordinates: fixed } };
}

/** Smallest great-circle distance from a point to an outline, edges sampled every ~1/50 [radians]. */
function outlineDistance(f: Feature<Polygon | MultiPolygon>, p: [number, number]): number {
  const polys = f.geometry.type === 'Polygon' ? [f.geometry.coordinates] : f.geometry.coordinates;
  let best = Infinity;
  for (const rings of polys)
    for (const ring of rings)
      for (let i = 0; i + 1 < ring.length; i++) {
        const along = geoInterpolate(ring[i] as [number, number], ring[i + 1] as [number, number]);
        for (let k = 0; k <= 50; k++) best = Math.min(best, geoDistance(p, along(k / 50) as Position as [number, number]));
      }
  return best;
}

beforeAll(async () => {
  dataDir = (await buildPipelineData()).dataDir;
  manifest = JSON.parse(read('data/manifest.json').toString('utf8')) as Manifest;
  cellsIndex = JSON.parse(read('data/cells/index.json').toString('utf8')) as CellFiguresIndex;
  landCells = (JSON.parse(read('data/niche.json').toString('utf8')) as { cells: Array<{ cell: number }> }).cells.map((c) => c.cell);
  regionsGeo = JSON.parse(read('data/regions.geojson').toString('utf8'));
  atlasRows = parseCsv(readCellTables(join(dataDir, 'data')));
  const build = await buildTestSite(dataDir);
  distDir = build.distDir;
  session = await startSiteSession(build.distDir);
  shared = await session.open('/map/');
  process.stderr.write(`map tests: site build ${build.reused ? 'reused' : `took ${(build.buildMs / 1000).toFixed(1)} s`}\n`);
}, 600_000);

afterAll(async () => {
  await session?.close();
});

describe('the map page', () => {
  it('draws the default layer over the offline base map, with its legend and units, and writes a screenshot', async () => {
    const { page } = shared;
    await page.waitForSelector(`#${MAP}[data-map-state="idle"]`, { timeout: 30_000 });
    const id = await page.getAttribute(`#${MAP}`, 'data-layer-id');
    const layer = manifest.layers.find((l) => l.id === id)!;
    expect(layer, 'the drawn layer is a published one').toBeDefined();
    expect(await page.isVisible('#map-controls')).toBe(true);
    expect(await page.textContent('#map-legend .legend-unit')).toBe(' [h]');
    expect(await page.textContent('#map-legend')).toContain('Invented data');
    // Ticks are the legend's stops (every other one labelled), with the legend's labels.
    const ticks = await page.$$eval('#map-legend [data-legend-value]', (els) => els.map((e) => [Number(e.getAttribute('data-legend-value')), e.textContent]));
    expect(ticks.length).toBeGreaterThanOrEqual(5);
    for (const [v, text] of ticks) expect(text).toBe(layer.legend.stops.find((s) => s.value === v)!.label);
    expect(await page.getAttribute('#map-legend a[download]', 'href')).toBe(`/${layer.tif}`);
    await screenshot(page, 'map');
    await page.locator(`#${MAP}`).screenshot({ path: join(process.cwd(), 'test-artifacts/site/map-canvas.png') });
  });

  it("paints every visible land cell in the colour the legend gives that cell's GeoTIFF value, for hours, WBGT, the niche class and person-hours per km²", async () => {
    const { page } = shared;
    await hideOutlines(page);
    const cases: Array<{ figure: string; combo: string; statistic: string; period: string; set: Array<[string, string]> }> = [
      {
        figure: 'hours-lost-shift',
        combo: 'high.acclimatized.sun',
        statistic: 'p90',
        period: '07',
        set: [
          ['figure', 'hours-lost-shift'],
          ['workloadClass', 'high'],
          ['statistic', 'p90'],
          ['period', '07'],
        ],
      },
      {
        figure: 'wbgt-mean',
        combo: 'shade',
        statistic: 'mean',
        period: '03',
        set: [
          ['figure', 'wbgt-mean'],
          ['exposure', 'shade'],
          ['period', '03'],
        ],
      },
      { figure: 'niche-class', combo: 'air', statistic: 'class', period: 'year', set: [['figure', 'niche-class']] },
      {
        figure: 'person-hours-lost-density',
        combo: 'all',
        statistic: 'mean',
        period: '07',
        set: [
          ['figure', 'person-hours-lost-density'],
          ['statistic', 'mean'],
          ['period', '07'],
        ],
      },
    ];
    for (const c of cases) {
      for (const [k, v] of c.set) await choose(page, k, v);
      const layer = findLayer(c.figure, c.combo, c.statistic, c.period);
      await waitForLayer(page, layer.id);
      const values = await tifValues(layer);
      const pixels = await landPixels(page);
      const distinct = new Set<string>();
      for (const [cell, rgb] of pixels) {
        const want = legendColour(layer.legend, values.get(cell)!);
        distinct.add(want.join(','));
        expect(colourDistance(rgb, want), `${layer.id} cell ${cell}: drawn ${rgb} want ${want}`).toBeLessThanOrEqual(4);
      }
      // The layer is not one flat colour, so the comparison can tell cells apart.
      expect(distinct.size, layer.id).toBeGreaterThan(1);
    }
  });

  it("shows the person-hours per km² layer with the people raster's source line (name, year, licence, invented) under its legend, and no class, acclimatization or exposure choice", async () => {
    const page = (await session.open('/map/')).page;
    await page.waitForSelector(`#${MAP}[data-map-state="idle"]`, { timeout: 30_000 });
    // The hours layer made without the raster carries no people source line.
    expect(await page.$('#map-legend-source')).toBeNull();
    await choose(page, 'figure', 'person-hours-lost-density');
    const layer = findLayer('person-hours-lost-density', 'all', 'mean', 'year');
    await waitForLayer(page, layer.id);
    const wf = (manifest as unknown as { workforce: { name: string; year: number; licence: string; invented: boolean } }).workforce;
    const source = (await page.textContent('#map-legend-source'))!;
    expect(source).toContain(`${wf.name} (${wf.year})`);
    expect(source).toContain(wf.licence);
    expect(source).toMatch(/^Invented people\. /);
    expect(await page.textContent('#map-legend .legend-unit')).toBe(' [person-h km-2]');
    for (const key of ['workloadClass', 'acclimatization', 'exposure']) expect(await page.isVisible(`[data-control="${key}"]`), key).toBe(false);
  });

  it('changes colours between months and workload classes exactly where the data change', async () => {
    const { page } = shared;
    await hideOutlines(page);
    await choose(page, 'figure', 'hours-above-limit-shift');
    await choose(page, 'acclimatization', 'acclimatized');
    await choose(page, 'exposure', 'sun');
    await choose(page, 'statistic', 'mean');
    // Pairs of views that differ in one choice, (class, month) → (class, month): a change of month,
    // and the first change of class whose July maps have cells that change and cells that stay.
    const classes = [...new Set(manifest.layers.filter((l) => l.figure === 'hours-above-limit-shift').map((l) => l.combo.split('.')[0]))];
    const julyColours = async (cls: string) => {
      const l = findLayer('hours-above-limit-shift', `${cls}.acclimatized.sun`, 'mean', '07');
      const v = await tifValues(l);
      return new Map(landCells.map((c) => [c, legendColour(l.legend, v.get(c)!)]));
    };
    let classPair: [string, string] | undefined;
    for (let i = 0; i < classes.length && !classPair; i++) {
      for (let j = i + 1; j < classes.length && !classPair; j++) {
        const [ci, cj] = [await julyColours(classes[i]), await julyColours(classes[j])];
        const d = landCells.map((c) => colourDistance(ci.get(c)!, cj.get(c)!));
        if (d.some((x) => x === 0) && d.filter((x) => x > 30).length > 3) classPair = [classes[i], classes[j]];
      }
    }
    expect(classPair, 'two workload classes whose July maps differ in some cells only').toBeDefined();
    const pairs: Array<[[string, string], [string, string]]> = [
      [
        ['moderate', '01'],
        ['moderate', '07'],
      ],
      [
        [classPair![0], '07'],
        [classPair![1], '07'],
      ],
    ];
    for (const [a, b] of pairs) {
      const la = findLayer('hours-above-limit-shift', `${a[0]}.acclimatized.sun`, 'mean', a[1]);
      const lb = findLayer('hours-above-limit-shift', `${b[0]}.acclimatized.sun`, 'mean', b[1]);
      const [va, vb] = [await tifValues(la), await tifValues(lb)];
      await choose(page, 'workloadClass', a[0]);
      await choose(page, 'period', a[1]);
      await waitForLayer(page, la.id);
      const pa = await landPixels(page);
      await choose(page, 'workloadClass', b[0]);
      await choose(page, 'period', b[1]);
      await waitForLayer(page, lb.id);
      const pb = await landPixels(page);
      let changed = 0;
      let kept = 0;
      for (const [cell, rgbA] of pa) {
        const rgbB = pb.get(cell);
        if (!rgbB) continue;
        const wantA = legendColour(la.legend, va.get(cell)!);
        const wantB = legendColour(lb.legend, vb.get(cell)!);
        expect(colourDistance(rgbA, wantA), `${la.id} cell ${cell}`).toBeLessThanOrEqual(4);
        expect(colourDistance(rgbB, wantB), `${lb.id} cell ${cell}`).toBeLessThanOrEqual(4);
        if (colourDistance(wantA, wantB) === 0) {
          kept += 1;
          expect(colourDistance(rgbA, rgbB), `cell ${cell} keeps its colour`).toBeLessThanOrEqual(2);
        } else if (colourDistance(wantA, wantB) > 30) {
          changed += 1;
          expect(colourDistance(rgbA, rgbB), `cell ${cell} changes colour`).toBeGreaterThan(20);
        }
      }
      expect(changed, `${la.id} → ${lb.id}: cells whose value changes`).toBeGreaterThan(3);
      expect(kept, `${la.id} → ${lb.id}: cells whose value stays`).toBeGreaterThan(0);
    }
  });

  it('offers, for each layer, exactly the choices that were published for it', async () => {
    const { page } = shared;
    const parts = (l: LayerEntry): Record<string, string> => {
      const c = l.combo.split('.');
      if (l.figure.startsWith('hours-')) return { workloadClass: c[0], acclimatization: c[1], exposure: c[2] };
      if (l.figure === 'capacity-loss-shift') return { loss: c[0], exposure: c[1] };
      if (l.figure === 'wbgt-mean') return { exposure: c[0] };
      return {};
    };
    // Every layer is a view of the explorer, the trend layers (statistics trend and trend-p) among them (src/data/explorer.ts).
    const mapped = manifest.layers;
    expect(manifest.layers.some((l) => l.statistic === 'trend')).toBe(true);
    expect(manifest.layers.some((l) => l.statistic === 'trend-p')).toBe(true);
    const figures = [...new Set(mapped.map((l) => l.figure))];
    expect(await page.$$eval('select[data-choice="figure"] option', (os) => os.map((o) => (o as HTMLOptionElement).value).sort())).toEqual([...figures].sort());
    for (const figure of figures) {
      await choose(page, 'figure', figure);
      const layers = mapped.filter((l) => l.figure === figure);
      for (const key of ['workloadClass', 'acclimatization', 'exposure', 'loss', 'statistic', 'period']) {
        const want = new Set(
          layers.map((l) => (key === 'statistic' ? l.statistic : key === 'period' ? l.period : parts(l)[key])).filter((v) => v !== undefined),
        );
        const shown = await page.isVisible(`[data-control="${key}"]`);
        expect(shown, `${figure}: ${key} control shown`).toBe(want.size > 0);
        if (want.size === 0) continue;
        const offered = await page.$$eval(`select[data-choice="${key}"] option`, (os) => os.map((o) => (o as HTMLOptionElement).value));
        expect(new Set(offered), `${figure}: ${key}`).toEqual(want);
        expect(await page.isDisabled(`select[data-choice="${key}"]`)).toBe(want.size === 1);
      }
    }
    // Capacity loss has no P90 layers: only the mean is offered; the month player needs months.
    await choose(page, 'figure', 'capacity-loss-shift');
    expect(await page.$$eval('select[data-choice="statistic"] option', (os) => os.map((o) => (o as HTMLOptionElement).value))).toEqual(['mean']);
    await choose(page, 'figure', 'mean-annual-temperature');
    expect(await page.isDisabled('#map-play')).toBe(true);
  });

  it("shows a clicked land cell's monthly figures, equal to its rows of the per-cell tables, with links to its region and the calculator", async () => {
    const { page } = shared;
    await choose(page, 'figure', 'hours-lost-shift');
    await choose(page, 'workloadClass', 'high');
    await choose(page, 'acclimatization', 'unacclimatized');
    await choose(page, 'exposure', 'shade');
    await page.waitForSelector(`#${MAP}[data-map-state="idle"]`);
    // A land cell with non-zero hours inside exactly one region (d3-geo decides "inside").
    const shapes = regionsGeo.features.map((f) => ({ id: f.properties.id, d3: d3Polygon(f), f }));
    const rowsOf = (cell: number) =>
      atlasRows.filter((r) => Number(r.cell_id) === cell && r.workload_class === 'high' && r.acclimatization === 'unacclimatized' && r.exposure === 'shade');
    const cell = landCells.find((c) => shapes.filter((s) => geoContains(s.d3, cellCentre(c))).length === 1 && rowsOf(c).some((r) => Number(r.mean) > 0))!;
    expect(cell).toBeDefined();
    const holder = shapes.find((s) => geoContains(s.d3, cellCentre(cell)))!;
    const at = await screenPoint(page, cellCentre(cell));
    await page.mouse.click(at.x, at.y);
    await page.waitForSelector(`#cell-panel[data-state="ready"][data-cell="${cell}"]`);
    await screenshot(page, 'map-cell-panel');
    const table = await panelTable(page);
    const rows = rowsOf(cell);
    expect(rows).toHaveLength(2 * 13);
    for (const r of rows) {
      const shown = table[r.period];
      expect(shown, `period ${r.period}`).toBeDefined();
      for (const st of ['mean', 'median', 'p90']) {
        const text = shown[`${r.figure}.${st}`];
        if (r[st] === '') expect(text).toBe('–');
        else expect(parseShownNumber(text), `${r.figure} ${r.period} ${st}`).toBe(Number(r[st]));
      }
      expect(Number(shown.years_used)).toBe(Number(r.years_used));
    }
    expect(await page.$$eval('#cell-panel a[data-region-link]', (as) => as.map((a) => a.getAttribute('href')))).toEqual([`/regions/${holder.id}/`]);
    expect(await page.getAttribute('#cell-panel a[data-cell-estimate]', 'href')).toBe(`/estimate/?cell=${cell}`);
    expect(new URL(page.url()).searchParams.get('cell')).toBe(String(cell));
    // The panel's value of the drawn layer is the cell's value in its GeoTIFF (2 decimals).
    const layer = findLayer('hours-lost-shift', 'high.unacclimatized.shade', 'mean', await page.inputValue('select[data-choice="period"]'));
    const shownValue = Number(await page.getAttribute('#cell-panel [data-key="layer-value"] strong', 'data-value'));
    expect(Math.abs(shownValue - (await tifValues(layer)).get(cell)!)).toBeLessThanOrEqual(0.005 + 1e-4);
    // Changing the class re-draws the panel for the new combination.
    await choose(page, 'workloadClass', 'low');
    await page.waitForSelector('#cell-figures[data-combo="low.unacclimatized.shade"]');
    const low = await panelTable(page);
    const julyLow = atlasRows.find(
      (r) =>
        Number(r.cell_id) === cell &&
        r.period === '07' &&
        r.figure === 'hours-lost-shift' &&
        r.workload_class === 'low' &&
        r.acclimatization === 'unacclimatized' &&
        r.exposure === 'shade',
    )!;
    expect(parseShownNumber(low['07']['hours-lost-shift.mean'])).toBe(Number(julyLow.mean));
  });

  it('says a sea cell has no figures and names the region nearest to it, as d3-geo measures', async () => {
    const { page } = shared;
    const shapes = regionsGeo.features.map((f) => ({ id: f.properties.id, d3: d3Polygon(f), f }));
    const { nLat, nLon } = cellsIndex.grid;
    const sea = Array.from({ length: nLat * nLon }, (_, i) => i).filter((i) => !landCells.includes(i) && !shapes.some((s) => geoContains(s.d3, cellCentre(i))));
    expect(sea.length, 'the grid has sea cells outside every region').toBeGreaterThan(2);
    for (const cell of [sea[0], sea[sea.length - 1]]) {
      const nearest = shapes.map((s) => ({ id: s.id, d: outlineDistance(s.f, cellCentre(cell)) })).sort((a, b) => a.d - b.d)[0];
      await page.fill('#cell-lat', String(cellCentre(cell)[1]));
      await page.fill('#cell-lon', String(cellCentre(cell)[0]));
      await page.click('#cell-picker button[type="submit"]');
      await page.waitForSelector(`#cell-panel[data-state="no-data"][data-cell="${cell}"]`);
      expect(await page.textContent('#cell-panel')).toContain('not a land cell');
      expect(await page.$$eval('#cell-panel a[data-region-link]', (as) => as.map((a) => a.getAttribute('href')))).toEqual([`/regions/${nearest.id}/`]);
      const km = Number((await page.textContent('#cell-panel .cell-where'))!.match(/about (\d+) km/)![1]);
      const want = nearest.d * 6371.0088;
      expect(Math.abs(km - want), `cell ${cell}: ${km} km, d3-geo ${want.toFixed(1)} km`).toBeLessThanOrEqual(0.01 * want + 1);
    }
  });

  it('shows a region whose name is HTML as plain text in the cell panel and the region table', async () => {
    const { page } = shared;
    const odd = regionsGeo.features.find((f) => f.properties.id === 'odd-name')!;
    const inside = landCells.find((c) => geoContains(d3Polygon(odd), cellCentre(c)))!;
    await page.fill('#cell-lat', String(cellCentre(inside)[1]));
    await page.fill('#cell-lon', String(cellCentre(inside)[0]));
    await page.click('#cell-picker button[type="submit"]');
    await page.waitForSelector(`#cell-panel[data-state="ready"][data-cell="${inside}"]`);
    expect(await page.textContent('#cell-panel a[data-region-link="odd-name"]')).toBe(odd.properties.name);
    expect(await page.locator('#cell-panel img, #cell-panel script, #region-values img, #region-values script').count()).toBe(0);
    expect(await page.textContent('#region-values tr[data-region-id="odd-name"] a')).toBe(odd.properties.name);
    expect(shared.dialogs).toEqual([]);
  });

  it('moves a cell cursor with the arrow keys and selects the cell with Enter', async () => {
    const { page } = await session.open('/map/');
    await page.waitForSelector(`#${MAP}[data-map-state="idle"]`);
    const centre = await page.evaluate(() => {
      const m = (globalThis as unknown as { heathoursMaps: Record<string, { getCenter(): { lng: number; lat: number } }> }).heathoursMaps['explorer-map'];
      const c = m.getCenter();
      return [c.lng, c.lat] as [number, number];
    });
    const g = cellsIndex.grid;
    const start = Math.round((centre[1] - g.lat0) / g.dLat) * g.nLon + Math.round((centre[0] - g.lon0) / g.dLon);
    expect(await page.getAttribute(`#${MAP} canvas`, 'tabindex')).toBe('0');
    expect(await page.getAttribute(`#${MAP} canvas`, 'aria-label')).toContain('Arrow keys');
    await page.focus(`#${MAP} canvas`);
    await page.keyboard.press('ArrowRight'); // places the cursor on the centre cell
    await page.keyboard.press('ArrowRight');
    await page.keyboard.press('ArrowUp');
    const target = start + 1 + g.nLon;
    expect(await page.textContent('#map-status')).toContain(`grid cell ${target} `);
    await page.keyboard.press('Enter');
    await page.waitForSelector(`#cell-panel[data-cell="${target}"]:is([data-state="ready"], [data-state="no-data"])`);
    expect(await page.getAttribute('#cell-panel', 'data-state')).toBe(landCells.includes(target) ? 'ready' : 'no-data');
  });

  it('keeps the whole view in the URL, and a loaded URL restores it', async () => {
    const { page } = await session.open('/map/');
    await page.waitForSelector(`#${MAP}[data-map-state="idle"]`);
    await choose(page, 'figure', 'hours-above-limit-shift');
    await choose(page, 'workloadClass', 'high');
    await choose(page, 'acclimatization', 'unacclimatized');
    await choose(page, 'exposure', 'shade');
    await choose(page, 'statistic', 'p90');
    await choose(page, 'period', '08');
    const layer = findLayer('hours-above-limit-shift', 'high.unacclimatized.shade', 'p90', '08');
    await waitForLayer(page, layer.id);
    const cell = landCells[Math.floor(landCells.length / 2)];
    await page.fill('#cell-lat', String(cellCentre(cell)[1]));
    await page.fill('#cell-lon', String(cellCentre(cell)[0]));
    await page.click('#cell-picker button[type="submit"]');
    await page.waitForSelector(`#cell-panel[data-state="ready"][data-cell="${cell}"]`);
    await page.evaluate(
      () =>
        new Promise<void>((r) => {
          const m = (globalThis as unknown as { heathoursMaps: Record<string, { jumpTo(o: object): void; once(e: string, f: () => void): void }> })
            .heathoursMaps['explorer-map'];
          m.once('moveend', () => r());
          m.jumpTo({ center: [-146.25, 20.5], zoom: 5.5 });
        }),
    );
    const url = new URL(page.url());
    expect(Object.fromEntries(url.searchParams)).toMatchObject({
      layer: 'hours-above-limit-shift',
      class: 'high',
      accl: 'unacclimatized',
      exposure: 'shade',
      stat: 'p90',
      month: '08',
      cell: String(cell),
      lon: '-146.2500',
      lat: '20.5000',
      zoom: '5.50',
    });
    const again = await session.open(`${url.pathname}${url.search}`);
    await waitForLayer(again.page, layer.id);
    for (const [k, v] of [
      ['figure', 'hours-above-limit-shift'],
      ['workloadClass', 'high'],
      ['acclimatization', 'unacclimatized'],
      ['exposure', 'shade'],
      ['statistic', 'p90'],
      ['period', '08'],
    ]) {
      expect(await again.page.inputValue(`select[data-choice="${k}"]`), k).toBe(v);
    }
    await again.page.waitForSelector(`#cell-panel[data-state="ready"][data-cell="${cell}"]`);
    const view = await again.page.evaluate(() => {
      const m = (globalThis as unknown as { heathoursMaps: Record<string, { getCenter(): { lng: number; lat: number }; getZoom(): number }> }).heathoursMaps[
        'explorer-map'
      ];
      return { lng: m.getCenter().lng, lat: m.getCenter().lat, zoom: m.getZoom() };
    });
    expect(view.lng).toBeCloseTo(-146.25, 3);
    expect(view.lat).toBeCloseTo(20.5, 3);
    expect(view.zoom).toBeCloseTo(5.5, 2);
    expect(new URL(again.page.url()).search).toBe(url.search);
  });

  it('fits the region named by ?region=<id> and outlines it', async () => {
    const id = 'drovan-basin';
    const { page } = await session.open(`/map/?region=${id}`);
    await page.waitForSelector(`#${MAP}[data-map-state="idle"]`);
    const f = regionsGeo.features.find((x) => x.properties.id === id)!;
    const pts = (f.geometry.type === 'Polygon' ? [f.geometry.coordinates] : f.geometry.coordinates).flat(2) as Position[];
    const [w, e] = [Math.min(...pts.map((p) => p[0])), Math.max(...pts.map((p) => p[0]))];
    const [s, n] = [Math.min(...pts.map((p) => p[1])), Math.max(...pts.map((p) => p[1]))];
    const b = await page.evaluate(() => {
      const m = (
        globalThis as unknown as {
          heathoursMaps: Record<string, { getBounds(): { getWest(): number; getEast(): number; getSouth(): number; getNorth(): number } }>;
        }
      ).heathoursMaps['explorer-map'];
      const x = m.getBounds();
      return { w: x.getWest(), e: x.getEast(), s: x.getSouth(), n: x.getNorth() };
    });
    expect(b.w).toBeLessThanOrEqual(w);
    expect(b.e).toBeGreaterThanOrEqual(e);
    expect(b.s).toBeLessThanOrEqual(s);
    expect(b.n).toBeGreaterThanOrEqual(n);
    // Fitted: the region fills most of the view in one direction.
    expect(Math.max((e - w) / (b.e - b.w), (n - s) / (b.n - b.s))).toBeGreaterThan(0.6);
    const filter = await page.evaluate(() =>
      (globalThis as unknown as { heathoursMaps: Record<string, { getFilter(id: string): unknown }> }).heathoursMaps['explorer-map'].getFilter('region-focus'),
    );
    expect(filter).toEqual(['==', ['get', 'id'], id]);
  });

  it('steps through the months with the play button and stops on pause', async () => {
    const { page } = await session.open('/map/?layer=hours-lost-shift&class=moderate&accl=acclimatized&exposure=sun&stat=mean&month=11');
    await waitForLayer(page, findLayer('hours-lost-shift', 'moderate.acclimatized.sun', 'mean', '11').id);
    await page.click('#map-play');
    expect(await page.getAttribute('#map-play', 'aria-pressed')).toBe('true');
    await waitForLayer(page, findLayer('hours-lost-shift', 'moderate.acclimatized.sun', 'mean', '12').id);
    await waitForLayer(page, findLayer('hours-lost-shift', 'moderate.acclimatized.sun', 'mean', '01').id);
    await page.click('#map-play');
    expect(await page.getAttribute('#map-play', 'aria-pressed')).toBe('false');
    const stopped = await page.inputValue('select[data-choice="period"]');
    await page.waitForTimeout(3000);
    expect(await page.inputValue('select[data-choice="period"]')).toBe(stopped);
    expect(new URL(page.url()).searchParams.get('month')).toBe(stopped);
  });

  it('writes the WBGT legend, the region values and the cell panel in °F after the °F switch', async () => {
    const { page } = shared;
    await choose(page, 'figure', 'wbgt-mean');
    await choose(page, 'exposure', 'sun');
    await choose(page, 'period', '07');
    const layer = findLayer('wbgt-mean', 'sun', 'mean', '07');
    await waitForLayer(page, layer.id);
    const ticks = () =>
      page.$$eval('#map-legend [data-legend-value]', (els) => els.map((e) => ({ v: Number(e.getAttribute('data-legend-value')), text: e.textContent ?? '' })));
    for (const { v, text } of await ticks()) expect(parseShownNumber(text)).toBeCloseTo(v, 1);
    // The cell panel (a land cell is selected on this page) writes temperatures in °C too.
    await page.waitForSelector('#cell-panel[data-state="ready"]');
    expect(await page.textContent('#cell-panel [data-key="niche"]')).toMatch(/\d °C/);
    expect(await page.textContent('#map-legend .legend-unit')).toBe(' [°C]');
    await page.click('button[data-unit-choice="F"]');
    try {
      expect(await page.textContent('#map-legend .legend-unit')).toBe(' [°F]');
      const f = await ticks();
      expect(f.length).toBeGreaterThanOrEqual(5);
      for (const { v, text } of f) expect(parseShownNumber(text)).toBeCloseTo((v * 9) / 5 + 32, 1);
      expect(await page.textContent('#cell-panel [data-key="niche"]')).toMatch(/\d °F/);
      expect(await page.textContent('#cell-panel [data-key="niche"]')).not.toMatch(/°C/);
      // The niche class names carry their bands converted too (29 °C = 84.2 °F).
      await choose(page, 'figure', 'niche-class');
      expect(await page.textContent('#map-legend')).toContain('84.2 °F');
      expect(await page.textContent('#map-legend')).not.toContain('°C');
      await choose(page, 'figure', 'wbgt-mean');
      const here = await page.$eval('#cell-panel [data-key="layer-value"] strong', (e) => ({
        c: Number(e.getAttribute('data-value')),
        text: e.textContent ?? '',
      }));
      expect(parseShownNumber(here.text.replace(' °F', ''))).toBeCloseTo((here.c * 9) / 5 + 32, 1);
      const region = await page.$eval('#region-values tbody tr td[data-key="value"]', (td) => ({
        c: Number(td.getAttribute('data-value')),
        text: td.textContent ?? '',
      }));
      expect(region.text).toMatch(/°F$/);
      expect(parseShownNumber(region.text.replace(' °F', ''))).toBeCloseTo((region.c * 9) / 5 + 32, 1);
      expect(await page.textContent('#region-values th[data-key="value"]')).toBe('Value [°F]');
    } finally {
      await page.click('button[data-unit-choice="C"]');
    }
    expect(await page.textContent('#map-legend .legend-unit')).toBe(' [°C]');
  });

  it("rewrites the region table for another layer from that layer's values file, each value its region table's row (the region CSVs)", async () => {
    const { page } = await session.open('/map/');
    await page.waitForSelector(`#${MAP}[data-map-state="idle"]`);
    const fetched: string[] = [];
    page.on('request', (r) => {
      if (r.url().includes('/map/values/')) fetched.push(new URL(r.url()).pathname);
    });
    await choose(page, 'figure', 'hours-above-limit-shift');
    await choose(page, 'workloadClass', 'high');
    await choose(page, 'statistic', 'p90');
    await choose(page, 'period', '08');
    const layer = findLayer('hours-above-limit-shift', 'high.acclimatized.sun', 'p90', '08');
    await waitForLayer(page, layer.id);
    expect(await page.getAttribute('#region-values', 'data-layer-id')).toBe(layer.id);
    expect(fetched).toContain(`/map/values/${manifest.layers.findIndex((l) => l.id === layer.id)}.json`);
    const rows = await page.$$eval('#region-values tbody tr', (trs) =>
      trs.map((tr) => ({ id: tr.getAttribute('data-region-id')!, value: tr.querySelector('td[data-key="value"]')!.getAttribute('data-value') ?? '' })),
    );
    expect(rows.length).toBe(regionsGeo.features.length);
    for (const r of rows) {
      const csv = parseCsv(read(`data/regions/${r.id}.csv`).toString('utf8'));
      const row = csv.find(
        (x) =>
          x.period === '08' &&
          x.figure === 'hours-above-limit-shift' &&
          x.workload_class === 'high' &&
          x.acclimatization === 'acclimatized' &&
          x.exposure === 'sun' &&
          x.method === 'limit' &&
          x.statistic === 'p90',
      )!;
      expect(r.value === '' ? '' : Number(r.value), r.id).toBe(row.value === '' ? '' : Number(row.value));
    }
  });

  it('without JavaScript says the map needs it and still lists each region with its value and links', async () => {
    const { page } = await session.open('/map/', { javaScript: false });
    expect(await page.isVisible('[data-no-js-note]')).toBe(true);
    expect(await page.isVisible('#map-controls')).toBe(false);
    const layerId = (await page.getAttribute('#region-values', 'data-layer-id'))!;
    const layer = manifest.layers.find((l) => l.id === layerId)!;
    expect(layer).toBeDefined();
    const rows = await page.$$eval('#region-values tbody tr', (trs) =>
      trs.map((tr) => ({
        id: tr.getAttribute('data-region-id')!,
        report: tr.querySelector('td a')!.getAttribute('href'),
        map: tr.querySelector('a[data-fit-region]')!.getAttribute('href'),
        value: (tr.querySelector('td[data-key="value"]')!.textContent ?? '').trim(),
      })),
    );
    expect(rows.map((r) => r.id).sort()).toEqual(regionsGeo.features.map((f) => f.properties.id).sort());
    const [cls, accl, exposure] = layer.combo.split('.');
    for (const r of rows) {
      expect(r.report).toBe(`/regions/${r.id}/`);
      expect(r.map).toBe(`/map/?region=${r.id}`);
      const csv = parseCsv(read(`data/regions/${r.id}.csv`).toString('utf8'));
      const row = csv.find(
        (x) =>
          x.period === layer.period &&
          x.figure === layer.figure &&
          x.workload_class === cls &&
          x.acclimatization === accl &&
          x.exposure === exposure &&
          x.method === 'limit' &&
          x.statistic === layer.statistic,
      )!;
      expect(Math.abs(parseShownNumber(r.value.replace(' h', '')) - Number(row.value)), r.id).toBeLessThanOrEqual(0.05 + 1e-9);
    }
  });

  it('is built with the Content-Security-Policy meta tag and no inline script, style or event handler', () => {
    const html = readFileSync(join(distDir, 'map/index.html'), 'utf8');
    expect(html.match(/<meta http-equiv="Content-Security-Policy" content="([^"]*)"/)?.[1].replace(/&#39;/g, "'")).toBe(CONTENT_SECURITY_POLICY);
    for (const tag of html.match(/<script\b[^>]*>/g) ?? []) expect(tag).toMatch(/\bsrc="\/[^"]+"/);
    expect(html).not.toMatch(/<style\b/);
    expect(html).not.toMatch(/\sstyle="/);
    expect(html).not.toMatch(/\son[a-z]+="/);
    expect(html).not.toMatch(/(src|href)="(https?:)?\/\//);
    // The region named with HTML is escaped, never markup.
    expect(html).not.toContain('<img src=x');
    expect(html).toContain('&lt;img src=x onerror=alert(1)&gt;');
  });

  it('made no request beyond 127.0.0.1, and no page logged an error or a CSP violation', async () => {
    for (const w of session.pages) {
      const errors = w.scriptsBlocked ? w.consoleErrors.filter((e) => !/ERR_FAILED \(.*\.m?js\)$/.test(e)) : w.consoleErrors;
      expect(errors, w.page.url()).toEqual([]);
      expect(w.pageErrors, w.page.url()).toEqual([]);
      expect(await w.cspViolations(), w.page.url()).toEqual([]);
    }
    expect(session.pages.length).toBeGreaterThanOrEqual(6);
    expect(session.nonLocalRequests).toEqual([]);
  });
});
