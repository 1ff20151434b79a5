/**
 * Browser tests of the region report pages, on a site built from the data folder the real
 * pipeline makes (test/site/pipeline-data.ts: the invented small demo plus a region whose name is
 * HTML and script, with one scenario, a uniform warming of 2 K), served on 127.0.0.1 in Debian's headless Chromium.
 * External checks: the limits against docs/methods.md §8.2's check values (NIOSH 2016 REL/RAL,
 * 300 W → 28.21 / 24.97 °C); the typical WBGT against a median found by bisection on the
 * piecewise-linear cumulative hours (a different algorithm from the page's walk through the
 * bins); °F = °C × 9/5 + 32 (definition of the scale); escaping per the HTML standard.
 */
import { readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { decodeHistogramTile } from '../../pipeline/publish/histogram-tiles.ts';
import { CAUTIONS } from '../../src/lib/cautions.ts';
import { buildPipelineData, PIPELINE_DATA_SCENARIO } from './pipeline-data.ts';
import {
  ARTIFACTS_DIR,
  buildTestSite,
  htmlFiles,
  parseShownNumber,
  screenshot,
  startSiteSession,
  type SiteSession,
  type TestSiteBuild,
  type WatchedPage,
} from './browser.ts';

const REGION = 'drovan-basin';
const ODD = 'odd-name';
const HOSTILE = '<img src=x onerror=alert(1)><script>alert(2)</script>';

let dataDir: string;
let build: TestSiteBuild;
let session: SiteSession;
let report: WatchedPage;
let manifest: {
  baseline: [number, number];
  work: { classes: Array<{ id: string; name: string; metabolicRate: number }>; acclimatization: string[]; exposures: string[]; clothingAdjustment: number };
};

/** The region's CSV, read here with a plain split (the tables hold no quoted fields). */
function csvRows(id: string, scenario?: string): Array<Record<string, string>> {
  const lines = readFileSync(join(dataDir, 'data', ...(scenario ? ['scenarios', scenario] : []), 'regions', `${id}.csv`), 'utf8')
    .trim()
    .split('\n');
  const head = lines[0].split(',');
  return lines.slice(1).map((l) => Object.fromEntries(l.split(',').map((v, i) => [head[i], v])));
}

function csvValue(rows: Array<Record<string, string>>, k: { period: string; figure: string; cls: string; acc: string; exp: string; stat: string }): string {
  const r = rows.find(
    (x) =>
      x.period === k.period &&
      x.figure === k.figure &&
      x.workload_class === k.cls &&
      x.acclimatization === k.acc &&
      x.exposure === k.exp &&
      x.statistic === k.stat,
  );
  if (!r) throw new Error(`no CSV row for ${JSON.stringify(k)}`);
  return r.value;
}

/** Shown values are rounded to their printed decimals: within half the last digit. */
function expectShown(text: string, value: number): void {
  const decimals = (text.split('.')[1] ?? '').replace(/\D/g, '').length;
  expect(Math.abs(parseShownNumber(text) - value)).toBeLessThanOrEqual(0.5 * 10 ** -decimals + 1e-9);
}

/** A table whose header cells carry `data-key` (over one or two header rows) and whose rows start with a row header. */
async function readKeyedTable(
  page: Page,
  selector: string,
): Promise<{ keys: string[]; rows: Array<{ attrs: Record<string, string>; cells: Array<{ text: string; value: string | null }> }> }> {
  return page.$eval(selector, (table) => {
    const keys = [...table.querySelectorAll('thead th[data-key]')].map((th) => th.getAttribute('data-key') ?? '');
    const rows = [...table.querySelectorAll('tbody tr')].map((tr) => ({
      attrs: Object.fromEntries([...tr.attributes].map((a) => [a.name, a.value])),
      cells: [...tr.querySelectorAll('th, td')].map((c) => ({ text: (c.textContent ?? '').trim(), value: c.getAttribute('data-value') })),
    }));
    return { keys, rows };
  });
}

beforeAll(async () => {
  ({ dataDir } = await buildPipelineData({ withScenario: true }));
  manifest = JSON.parse(readFileSync(join(dataDir, 'data/manifest.json'), 'utf8'));
  build = await buildTestSite(dataDir);
  session = await startSiteSession(build.distDir);
  report = await session.open(`/regions/${REGION}/`);
  process.stderr.write(`region report tests: site build ${build.reused ? 'reused' : `took ${(build.buildMs / 1000).toFixed(1)} s`}\n`);
}, 900_000);

afterAll(async () => {
  await session?.close();
});

describe('the region report page', () => {
  it('exists for every region of the data folder, titled with the region name', async () => {
    const regions = JSON.parse(readFileSync(join(dataDir, 'data/regions.geojson'), 'utf8')).features.map(
      (f: { properties: { id: string } }) => f.properties.id,
    );
    const pages = htmlFiles(build.distDir).filter((f) => f.startsWith('regions/'));
    // A report and its one-page summary for a bid file per region.
    expect(pages.sort()).toEqual(regions.flatMap((id: string) => [`regions/${id}/index.html`, `regions/${id}/summary/index.html`]).sort());
    const name = JSON.parse(readFileSync(join(dataDir, 'data/regions', `${REGION}.json`), 'utf8')).name;
    expect(await report.page.textContent('h1')).toBe(name);
    await screenshot(report.page, 'region-report');
  });

  it("the region page's monthly tables equal its CSV, for every class, exposure, acclimatization, month and the year", async () => {
    const rows = csvRows(REGION);
    const ids = await report.page.$$eval('table.monthly-table', (ts) => ts.map((t) => t.id));
    expect(ids).toHaveLength(manifest.work.classes.length * manifest.work.exposures.length);
    for (const id of ids) {
      const [cls, exp] = await report.page.$eval(`#${id}`, (t) => [t.getAttribute('data-class')!, t.getAttribute('data-exposure')!]);
      const t = await readKeyedTable(report.page, `#${id}`);
      expect(t.keys[0]).toBe('period');
      expect(t.rows.map((r) => r.attrs['data-period'])).toEqual(['01', '02', '03', '04', '05', '06', '07', '08', '09', '10', '11', '12', 'year']);
      for (const r of t.rows) {
        t.keys.slice(1).forEach((key, i) => {
          const [what, acc, stat] = key.match(/^(above|lost)-(acclimatized|unacclimatized)-(mean|p90)$/)!.slice(1);
          const figure = what === 'above' ? 'hours-above-limit-shift' : 'hours-lost-shift';
          const want = csvValue(rows, { period: r.attrs['data-period'], figure, cls, acc, exp, stat });
          const cell = r.cells[i + 1];
          expect(cell.value).toBe(want);
          expectShown(cell.text, Number(want));
        });
      }
    }
    // The default class is open, the others are in closed <details>.
    expect(await report.page.getAttribute('[data-default-class]', 'data-class')).toBe('moderate');
    expect(await report.page.$$eval('details.class-tables', (ds) => ds.map((d) => [d.getAttribute('data-class'), (d as HTMLDetailsElement).open]))).toEqual(
      manifest.work.classes.filter((c) => c.id !== 'moderate').map((c) => [c.id, false]),
    );
  });

  it('the summary gives each class its annual hours lost from the CSV and names the worst months by the CSV monthly means', async () => {
    const rows = csvRows(REGION);
    const t = await readKeyedTable(report.page, '#annual-hours-lost');
    expect(t.rows.map((r) => r.attrs['data-class'])).toEqual(manifest.work.classes.map((c) => c.id));
    for (const r of t.rows) {
      t.keys.slice(1).forEach((key, i) => {
        const [acc, exp] = key.split('-');
        const want = csvValue(rows, { period: 'year', figure: 'hours-lost-shift', cls: r.attrs['data-class'], acc, exp, stat: 'mean' });
        expect(r.cells[i + 1].value).toBe(want);
        expectShown(r.cells[i + 1].text, Number(want));
      });
    }
    for (const acc of manifest.work.acclimatization) {
      const months = ['01', '02', '03', '04', '05', '06', '07', '08', '09', '10', '11', '12']
        .map((p) => ({ p, v: Number(csvValue(rows, { period: p, figure: 'hours-lost-shift', cls: 'moderate', acc, exp: 'sun', stat: 'mean' })) }))
        .filter((m) => m.v > 0)
        .sort((a, b) => b.v - a.v)
        .slice(0, 3)
        .map((m) => m.p);
      expect(await report.page.$$eval(`#worst-months li[data-state="${acc}"] [data-month]`, (els) => els.map((e) => e.getAttribute('data-month')))).toEqual(
        months,
      );
    }
  });

  it("shows the region's people from its summary JSON, the raster's name, year and licence (marked invented), and per class person-hours, FTE and share of outdoor time lost equal to its CSV", async () => {
    const rows = csvRows(REGION);
    const summary = JSON.parse(readFileSync(join(dataDir, 'data/regions', `${REGION}.json`), 'utf8'));
    const wf = (manifest as unknown as { workforce: { name: string; year: number; licence: string; invented: boolean } }).workforce;
    expect(wf.invented).toBe(true);
    // The source line names the raster as the manifest does, and says the people are invented.
    const source = (await report.page.textContent('#workforce-source'))!.replace(/\s+/g, ' ');
    expect(source).toContain(`${wf.name} (${wf.year})`);
    expect(source).toContain(wf.licence);
    expect(source).toMatch(/Invented people/);
    // People: data/regions/<id>.json workforce.people (the conservation against GDAL is test/run/workforce-build.test.ts).
    expect(Number(await report.page.getAttribute('#workforce-facts tr[data-key="people"] td', 'data-value'))).toBe(summary.workforce.people);
    expectShown((await report.page.textContent('#workforce-facts tr[data-key="people"] td'))!.split(' (')[0], Math.round(summary.workforce.people));
    const figureOf: Record<string, string> = {
      above: 'person-hours-above-limit-shift',
      lost: 'person-hours-lost-shift',
      fte: 'full-time-equivalents-lost',
      share: 'outdoor-work-time-lost',
    };
    const check = async (selector: string, period: (r: Record<string, string>) => string, cls: (r: Record<string, string>) => string, nRows: number) => {
      const t = await readKeyedTable(report.page, selector);
      expect(t.rows).toHaveLength(nRows);
      expect(t.keys.slice(1)).toEqual(['above-mean', 'above-p90', 'lost-mean', 'lost-p90', 'fte-mean', 'fte-p90', 'share-mean', 'share-p90']);
      for (const r of t.rows) {
        t.keys.slice(1).forEach((key, i) => {
          const [what, stat] = key.split('-');
          const want = csvValue(rows, { period: period(r.attrs), figure: figureOf[what], cls: cls(r.attrs), acc: 'by-shares', exp: 'by-shares', stat });
          expect(r.cells[i + 1].value, `${selector} ${r.attrs['data-row']} ${key}`).toBe(want);
          expectShown(r.cells[i + 1].text, Number(want));
        });
      }
    };
    await check(
      '#workforce-by-class',
      () => 'year',
      (a) => a['data-row'],
      manifest.work.classes.length + 1,
    );
    await check(
      '#workforce-by-month',
      (a) => a['data-row'],
      () => 'all',
      13,
    );
    // FTE = person-hours lost / the hours of a year of the shift pattern (Mon–Sat 07–17: 10 h × 6 days × 52 weeks = 3,120 h, by hand).
    const lost = Number(csvValue(rows, { period: 'year', figure: 'person-hours-lost-shift', cls: 'all', acc: 'by-shares', exp: 'by-shares', stat: 'mean' }));
    const fte = Number(csvValue(rows, { period: 'year', figure: 'full-time-equivalents-lost', cls: 'all', acc: 'by-shares', exp: 'by-shares', stat: 'mean' }));
    expect(summary.workforce.annualHours).toBe(3120);
    expect(fte).toBeCloseTo(lost / 3120, 1);
  });

  it("every region's report carries the workforce section with the raster's source line (the odd-name region takes the default shares)", () => {
    for (const f of htmlFiles(build.distDir).filter((x) => /^regions\/[^/]+\/index\.html$/.test(x))) {
      expect(readFileSync(join(build.distDir, f), 'utf8'), f).toContain('id="workforce-source"');
    }
  });

  it('shows the baseline and the scenario side by side for the worst months and the year, equal to the two CSVs, and says what the scenario is and that it is a what-if, not a forecast', async () => {
    const sc = PIPELINE_DATA_SCENARIO.id;
    const base = csvRows(REGION);
    const warm = csvRows(REGION, sc);
    const t = await report.page.$eval('#scenario-table', (table) => ({
      columns: [...table.querySelectorAll('thead th[data-column]')].map((th) => th.getAttribute('data-column')),
      rows: [...table.querySelectorAll('tbody tr')].map((tr) => ({
        period: tr.getAttribute('data-period'),
        values: [...tr.querySelectorAll('td')].map((td) => td.getAttribute('data-value')),
      })),
    }));
    expect(t.columns).toEqual(['baseline', sc]);
    expect(t.rows.at(-1)!.period).toBe('year');
    expect(t.rows.length).toBeGreaterThanOrEqual(2);
    for (const r of t.rows) {
      const k = { period: r.period!, figure: 'hours-lost-shift', cls: 'moderate', acc: 'acclimatized', exp: 'sun', stat: 'mean' };
      expect(r.values).toEqual([csvValue(base, k), csvValue(warm, k)]);
      // The warmer what-if never loses fewer hours.
      expect(Number(r.values[1])).toBeGreaterThanOrEqual(Number(r.values[0]));
    }
    const text = (await report.page.textContent('#scenarios'))!.replace(/\s+/g, ' ');
    expect(text).toContain(PIPELINE_DATA_SCENARIO.name);
    expect(text).toContain('uniform warming');
    expect(text).toMatch(/what-if, not a forecast/i);
    expect(text).toMatch(/day-to-day and hour-to-hour weather is kept and only monthly means change/);
    // The words are the shared block (src/components/ScenarioWords.astro) the map and home use.
    expect(await report.page.textContent('#scenarios #region-scenario-about.scenario-words [data-scenario-caveat]')).toMatch(/what-if, not a forecast/i);
    expect(await report.page.$$eval('#region-scenario-about [data-scenario-about]', (lis) => lis.map((li) => li.getAttribute('data-scenario-about')))).toEqual([
      PIPELINE_DATA_SCENARIO.id,
    ]);
  });

  it('the scenario switch shows the baseline beside the chosen scenario alone, and every scenario again; without JavaScript the switch is hidden and all columns show', async () => {
    const page = report.page;
    const sc = PIPELINE_DATA_SCENARIO.id;
    expect(await page.isVisible('[data-scenario-switch]')).toBe(true);
    const visibleColumns = () =>
      page.$$eval('#scenario-table thead th[data-column]', (ths) =>
        ths.filter((th) => (th as HTMLElement).offsetParent !== null).map((th) => th.getAttribute('data-column')),
      );
    await page.selectOption('#scenario-choice', sc);
    expect(await visibleColumns()).toEqual(['baseline', sc]);
    expect(await page.getAttribute('#scenarios', 'data-scenario')).toBe(sc);
    expect(await page.isVisible(`[data-scenario-about="${sc}"]`)).toBe(true);
    await page.selectOption('#scenario-choice', 'all');
    expect(await visibleColumns()).toEqual(['baseline', sc]);
    const noJs = await session.open(`/regions/${REGION}/`, { javaScript: false });
    expect(await noJs.page.isVisible('[data-scenario-switch]')).toBe(false);
    expect(await noJs.page.$$eval('#scenario-table thead th[data-column]', (ths) => ths.length)).toBe(2);
  });

  it('says that the trend of the record needs at least 15 years: the test atlas has 3', async () => {
    expect(await report.page.getAttribute('#trend', 'data-trend-enough')).toBe('no');
    const text = (await report.page.textContent('#trend-short'))!.replace(/\s+/g, ' ');
    expect(text).toContain('needs at least 15 years; this atlas has 3 (2021–2023)');
    // The CSV agrees: the trend rows are there, empty, with the years that had a value.
    const rows = csvRows(REGION).filter((r) => r.statistic === 'trend' && r.figure === 'hours-lost-shift');
    expect(rows.length).toBeGreaterThan(0);
    for (const r of rows) expect([r.period, r.value, r.unit, r.years_used, r.baseline]).toEqual(['year', '', 'h decade-1', '3', '2021-2023']);
  });

  it('the limits are the NIOSH 2016 REL/RAL check values of docs/methods.md §8.2 for the default work rates', async () => {
    const t = await readKeyedTable(report.page, '#limits');
    const check: Record<number, [number, number]> = { 180: [30.76, 28.1], 300: [28.21, 24.97], 415: [26.59, 22.99], 520: [25.47, 21.6] };
    expect(manifest.work.clothingAdjustment).toBe(0);
    for (const r of t.rows) {
      const rate = parseShownNumber(r.cells[1].text);
      expect(Number(r.cells[2].value)).toBeCloseTo(check[rate][0], 2);
      expect(Number(r.cells[3].value)).toBeCloseTo(check[rate][1], 2);
      expectShown(r.cells[2].text.replace(' °C', ''), check[rate][0]);
    }
  });

  it("the hour table's typical WBGT is the median of the pooled baseline hours of the region's histogram tile, in the sun", async () => {
    const index = JSON.parse(readFileSync(join(dataDir, 'data/calculator/index.json'), 'utf8'));
    const tiles = decodeHistogramTile(new Uint8Array(readFileSync(join(dataDir, 'data/calculator', `${REGION}.bin`))), index.years.length);
    const edges: number[] = index.bins.edges;
    const nBins = edges.length + 1;
    const use = index.years
      .map((y: number, i: number) => [y, i])
      .filter(([y]: number[]) => y >= index.baseline[0] && y <= index.baseline[1])
      .map(([, i]: number[]) => i);
    /** Median by bisection on the cumulative hours, hours spread evenly in each closed bin. */
    function median(m: number, h: number): number {
      const counts = new Array(nBins).fill(0);
      for (const y of use) for (let b = 0; b < nBins; b++) counts[b] += tiles[y][((m * 24 + h) * 2 + 0) * nBins + b];
      const total = counts.reduce((s, c) => s + c, 0);
      const cdf = (x: number) =>
        counts.reduce(
          (s, c, b) => (b === 0 || b === nBins - 1 ? s + (b === 0 ? c : 0) : s + c * Math.min(1, Math.max(0, (x - edges[b - 1]) / (edges[b] - edges[b - 1])))),
          0,
        );
      let lo = edges[0];
      let hi = edges[edges.length - 1];
      for (let k = 0; k < 60; k++) {
        const mid = (lo + hi) / 2;
        if (cdf(mid) >= total / 2) hi = mid;
        else lo = mid;
      }
      return hi;
    }
    const shown = await report.page.$$eval('#hour-table tbody tr', (trs) =>
      trs.map((tr) => [...tr.querySelectorAll('td [data-temp-c]')].map((s) => Number(s.getAttribute('data-temp-c')))),
    );
    expect(shown).toHaveLength(24);
    for (let h = 0; h < 24; h++) for (let m = 0; m < 12; m++) expect(shown[h][m]).toBeCloseTo(median(m, h), 2);
  });

  it('marks, without JavaScript, the cells above the limit of the default class for acclimatized workers (WBGT + clothing adjustment > 28.21 °C)', async () => {
    const noJs = await session.open(`/regions/${REGION}/`, { javaScript: false });
    const cells = await noJs.page.$$eval('#hour-table tbody td', (tds) =>
      tds.map((td) => ({ above: td.classList.contains('above'), c: Number(td.querySelector('[data-temp-c]')!.getAttribute('data-temp-c')) })),
    );
    const limit = 56.7 - 11.5 * Math.log10(300); // NIOSH REL, docs/methods.md §8.2
    let marked = 0;
    for (const x of cells) {
      if (Math.abs(x.c - limit) < 0.002) continue; // the attribute is rounded to 0.001 °C
      expect(x.above).toBe(x.c + manifest.work.clothingAdjustment > limit);
      if (x.above) marked++;
    }
    expect(marked).toBeGreaterThan(0);
    expect(await noJs.page.isVisible('[data-mark-control]')).toBe(false);
    // The planning table lists the same hours for that class.
    const july = await noJs.page.textContent('#hour-ranges tr[data-month="07"] td:nth-of-type(3)');
    expect(july).toMatch(/^\d\d:00–\d\d:00/);
  });

  it('works without JavaScript: every table is server-rendered and the charts are SVG drawn at build time', async () => {
    const noJs = await session.open(`/regions/${REGION}/`, { javaScript: false });
    const { page } = noJs;
    expect(await page.$$eval('#monthly-moderate-sun tbody tr', (r) => r.length)).toBe(13);
    expect(await page.$$eval('#hour-table tbody td', (r) => r.length)).toBe(288);
    expect(await page.$$eval('#hour-ranges tbody tr', (r) => r.length)).toBe(12);
    expect(await page.$$eval('svg.monthly-bars .bars rect', (r) => r.length)).toBe(12 * manifest.work.acclimatization.length);
    expect(await page.$$eval('svg.heat-map .cells path', (ps) => ps.reduce((n, p) => n + (p.getAttribute('d')!.match(/M/g) ?? []).length, 0))).toBe(288);
    expect(await page.$$eval('svg.niche-strip .bands rect', (r) => r.length)).toBeGreaterThanOrEqual(5);
    expect(await page.isVisible('svg.heat-map')).toBe(true);
    // Bars are the CSV means: the July bar of acclimatized workers.
    const july = await page.getAttribute('svg.monthly-bars rect[data-series="acclimatized"][data-category="Jul"]', 'data-value');
    expect(Number(july)).toBeCloseTo(
      Number(csvValue(csvRows(REGION), { period: '07', figure: 'hours-lost-shift', cls: 'moderate', acc: 'acclimatized', exp: 'sun', stat: 'mean' })),
      3,
    );
    expect(noJs.pageErrors).toEqual([]);
  });

  it('the class switch marks exactly the cells whose typical WBGT is above the chosen class and state', async () => {
    const { page } = report;
    await page.selectOption('[data-mark-control] select', 'high');
    await page.check('[data-mark-control] input[value="unacclimatized"]');
    const cells = await page.$$eval('#hour-table tbody td', (tds) =>
      tds.map((td) => ({ above: td.classList.contains('above'), c: Number(td.querySelector('[data-temp-c]')!.getAttribute('data-temp-c')) })),
    );
    const limit = 59.9 - 14.1 * Math.log10(415); // NIOSH RAL, docs/methods.md §8.2 (415 W → 22.99 °C)
    for (const x of cells) if (Math.abs(x.c - limit) >= 0.002) expect(x.above).toBe(x.c > limit);
    expect(await page.textContent('[data-mark-label]')).toBe('High work rate, unacclimatized workers');
    // Back to the default, as the other tests expect.
    await page.selectOption('[data-mark-control] select', 'moderate');
    await page.check('[data-mark-control] input[value="acclimatized"]');
  });

  it('converts every temperature to °F with the header switch (°F = °C × 9/5 + 32), the SVG legends included', async () => {
    const page = (await session.open(`/regions/${REGION}/?units=F`)).page;
    const spans = await page.$$eval('[data-temp-c]', (els) =>
      els.map((e) => [e.getAttribute('data-temp-c'), e.getAttribute('data-digits'), (e.textContent ?? '').trim()]),
    );
    expect(spans.length).toBeGreaterThan(300);
    for (const [c, digits, shownText] of spans) {
      if (c === 'NaN') continue;
      const text = shownText ?? '';
      expect(text.endsWith('°F')).toBe(true);
      expectShown(text.replace(' °F', ''), (Number(c) * 9) / 5 + 32);
      expect((text.replace(' °F', '').split('.')[1] ?? '').length).toBe(Number(digits));
    }
    expect(await page.$$eval('svg.heat-map text[data-temp-c]', (t) => t.every((x) => (x.textContent ?? '').endsWith('°F')))).toBe(true);
  });

  it('places the region against the niche from its summary JSON, with the grid-box caveat', async () => {
    const detail = JSON.parse(readFileSync(join(dataDir, 'data/regions', `${REGION}.json`), 'utf8'));
    const { page } = report;
    expect(Number(await page.getAttribute('#niche-values tr[data-key="baseline"] [data-temp-c]', 'data-temp-c'))).toBeCloseTo(detail.niche.baselineMat, 3);
    expect(Number(await page.getAttribute('#niche-values tr[data-key="latest"] [data-temp-c]', 'data-temp-c'))).toBeCloseTo(detail.niche.latestMat, 3);
    // The class name follows the °C/°F switch; in °C it is the summary's label.
    expect(await page.getAttribute('#niche-values tr[data-key="baseline"] [data-temp-text]', 'data-temp-text')).toBe(
      detail.niche.labels[detail.niche.baselineClass],
    );
    expect(Number(await page.getAttribute('svg.niche-strip [data-marker="baseline"]', 'data-value'))).toBeCloseTo(detail.niche.baselineMat, 3);
    expect(await page.textContent('#niche-caveat')).toContain('not a value at a point');
    const bands = await page.$$eval('svg.niche-strip .bands rect', (rs) => rs.map((r) => [r.getAttribute('data-band'), Number(r.getAttribute('data-from'))]));
    expect(bands.filter(([, from]) => [11, 15, 20, 25, 29].includes(from as number)).map(([b]) => b)).toEqual([
      'core',
      'margin',
      'second',
      'margin',
      'outside',
    ]);
  });

  it('offers the region CSV and the annual GeoTIFF layers, each link served with the size the page states', async () => {
    const { page } = report;
    const links = await page.$$eval('#downloads tbody tr', (trs) =>
      trs.map((tr) => [tr.querySelector('a')!.getAttribute('href')!, Number(tr.querySelector('[data-bytes]')!.getAttribute('data-bytes'))] as const),
    );
    const hrefs = links.map(([h]) => h);
    expect(hrefs).toContain(`/data/regions/${REGION}.csv`);
    const tifs = hrefs.filter((h) => h.endsWith('.tif'));
    expect(tifs).toContain('/data/layers/hours-lost-shift/moderate.acclimatized.sun/mean-year.tif');
    // The default class's annual layers: 2 figures × 2 statistics × every acclimatization × exposure, and the climate layers.
    for (const fig of ['hours-lost-shift', 'hours-above-limit-shift']) {
      for (const acc of manifest.work.acclimatization) {
        for (const exp of manifest.work.exposures) {
          for (const stat of ['mean', 'p90']) expect(tifs).toContain(`/data/layers/${fig}/moderate.${acc}.${exp}/${stat}-year.tif`);
        }
      }
    }
    expect(tifs).toContain('/data/layers/mean-annual-temperature/air/baseline-year.tif');
    expect(tifs.filter((t) => /\/(low|high|very-high)\./.test(t))).toEqual([]);
    expect(await page.getAttribute('#more-layers a', 'href')).toBe('/downloads/');
    for (const [href, bytes] of links) {
      expect(statSync(join(build.distDir, href)).size).toBe(bytes);
    }
    for (const [href, bytes] of links.slice(0, 4)) {
      const res = await fetch(new URL(href.slice(1), session.baseUrl));
      expect(res.status).toBe(200);
      expect((await res.arrayBuffer()).byteLength).toBe(bytes);
    }
    expect(await page.textContent('#region-files')).toContain('degC');
  });

  it('links to the calculator and the map for this region, and carries every caution', async () => {
    const { page } = report;
    expect(await page.getAttribute('a[data-link="estimate"]', 'href')).toBe(`/estimate/?region=${REGION}`);
    expect(await page.getAttribute('a[data-link="map"]', 'href')).toBe(`/map/?region=${REGION}`);
    expect(await page.$$eval('.cautions li', (lis) => lis.map((li) => li.getAttribute('data-caution')))).toEqual(CAUTIONS.map((c) => c.id));
    expect(await page.isVisible('[data-invented]')).toBe(true);
  });

  it('prints cleanly: no navigation, switches or controls; the default class, the charts, the hour table and a source line with full addresses kept (pages and words: print.test.ts)', async () => {
    const page = (await session.open(`/regions/${REGION}/`)).page;
    await page.emulateMedia({ media: 'print' });
    for (const sel of ['.site-header nav', '.unit-switch', '.report-actions', '[data-mark-control]', '.site-footer'])
      expect(await page.isVisible(sel), sel).toBe(false);
    expect(await page.isVisible('#print-source')).toBe(true);
    expect(await page.textContent('[data-page-url]')).toBe(new URL(`regions/${REGION}/`, session.baseUrl).href);
    for (const sel of ['svg.monthly-bars', 'svg.heat-map', 'svg.niche-strip', '#monthly-moderate-sun', '#hour-table', '#hour-ranges'])
      expect(await page.isVisible(sel), sel).toBe(true);
    expect(await page.isVisible('#monthly-high-sun')).toBe(false);
    expect(await page.$eval('#hour-table', (t) => getComputedStyle(t).breakInside)).toBe('avoid');
    // The workforce view is left to the web page (the four printed pages are full); the printed note says so.
    expect(await page.isVisible('#workforce')).toBe(false);
    expect(await page.isVisible('#print-workforce')).toBe(true);
    // Nothing is wider than an A4 page inside the printed margins: 210 − 2 × 11 mm = 188 mm = 710 px at 96 px/in.
    await page.setViewportSize({ width: 710, height: 1000 });
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(710);
    const pdf = await page.pdf({ path: join(ARTIFACTS_DIR, 'region-report.pdf'), format: 'A4', preferCSSPageSize: true });
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
    await page.emulateMedia({ media: 'screen' });
    expect(await page.isVisible('.report-actions')).toBe(true);
    expect(await page.isVisible('#print-source')).toBe(false);
  });

  it('the odd-name region renders its HTML-and-script name as text and nothing executes', async () => {
    const odd = await session.open(`/regions/${ODD}/`);
    const { page } = odd;
    const name = JSON.parse(readFileSync(join(dataDir, 'data/regions', `${ODD}.json`), 'utf8')).name as string;
    expect(name).toContain(HOSTILE);
    expect(await page.textContent('h1')).toBe(name);
    expect(await page.title()).toContain(HOSTILE);
    expect(await page.$$('main img')).toHaveLength(0);
    const inlineScripts = await page.$$eval('script', (ss) => ss.filter((s) => !s.getAttribute('src')).length);
    expect(inlineScripts).toBe(0);
    await page.waitForTimeout(200);
    expect(odd.dialogs).toEqual([]);
    expect(odd.pageErrors).toEqual([]);
    await screenshot(page, 'region-report-odd-name');
  });

  it('loads under 300 kB in all (HTML, CSS, scripts, images), with no request beyond 127.0.0.1, no errors and no CSP violation', async () => {
    const page = await session.context.newPage();
    const sizes: Array<[string, number]> = [];
    page.on('response', async (r) => {
      sizes.push([r.url(), (await r.body().catch(() => Buffer.alloc(0))).length]);
    });
    await page.goto(new URL(`regions/${REGION}/`, session.baseUrl).href, { waitUntil: 'networkidle' });
    await page.waitForTimeout(100);
    const total = sizes.reduce((s, [, n]) => s + n, 0);
    process.stderr.write(`region page: ${sizes.length} files, ${(total / 1000).toFixed(1)} kB\n`);
    expect(sizes.some(([u]) => u.endsWith(`/regions/${REGION}/`))).toBe(true);
    expect(sizes.some(([u]) => u.endsWith('.css'))).toBe(true);
    expect(total).toBeLessThan(300_000);
    expect(sizes.some(([u]) => /maplibre|GridExtentMap/.test(u))).toBe(false);
    await page.close();
    expect(session.nonLocalRequests).toEqual([]);
    for (const p of session.pages) {
      // Pages opened without JavaScript report their aborted script files; nothing else may show.
      expect(p.consoleErrors.filter((e) => !(p.scriptsBlocked && /ERR_FAILED.*\.js\)$/.test(e)))).toEqual([]);
      expect(p.pageErrors).toEqual([]);
      expect(await p.cspViolations()).toEqual([]);
    }
  });

  it('fits the window: nothing but the wide tables scrolls sideways', async () => {
    const { page } = report;
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(1200);
  });
});
