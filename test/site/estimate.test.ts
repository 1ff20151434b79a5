/**
 * Browser tests of the estimate calculator (/estimate/) on a site built from the real pipeline's
 * invented small demo with its one scenario (pipeline-data.ts `withScenario`: a uniform warming
 * of 2 K), in Debian's headless Chromium (browser.ts): the default
 * estimate against the region table, the direction of the answers when clothing, workload and
 * acclimatization change, `?cell=`, the CSV download (a Blob link under the site's CSP), the
 * °C/°F switch, and no request leaves 127.0.0.1, no console error, no CSP violation.
 * Tolerances are those measured in estimate-logic.test.ts (weekday scaling of the histograms).
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { buildPipelineData, PIPELINE_DATA_SCENARIO } from './pipeline-data.ts';
import { SCENARIO_LINES } from '../../src/scripts/estimate/render-bid.ts';
import { ARTIFACTS_DIR, buildTestSite, parseShownNumber, readDataTable, screenshot, startSiteSession, type SiteSession, type WatchedPage } from './browser.ts';
import { loadEstimateContext } from '../../src/data/estimate.ts';
import type { EstimateContext } from '../../pipeline/schedule/context.ts';
import { JOB_DEFAULTS, parseInputs } from '../../pipeline/schedule/inputs.ts';
import { runEstimate } from '../../src/lib/estimate/estimate.ts';
import { ESTIMATE_COLUMNS, estimateRows } from '../../src/lib/estimate/table.ts';
import { regionTileHistograms } from '../../pipeline/schedule/tiles.ts';
import { readCellTables } from '../helpers/cell-tables.ts';
import { CONTENT_SECURITY_POLICY } from '../../src/lib/content-security-policy.ts';
import { runEstimateCommand } from '../../pipeline/commands/estimate.ts';
import type { BidJson } from '../../pipeline/schedule/bid-json.ts';
import { SCHEDULE_ROWS, STATISTICS, scheduleValue, showValue } from '../../pipeline/schedule/bid-table.ts';
import { cellCentre } from '../../pipeline/schedule/inputs.ts';
import { parsePointChunk } from '../../pipeline/publish/point-tile-codec.ts';

let session: SiteSession;
let distDir = '';
let dataDir = '';
let ctx: EstimateContext;
let page: WatchedPage;

beforeAll(async () => {
  dataDir = (await buildPipelineData({ withScenario: true })).dataDir;
  ctx = loadEstimateContext(dataDir)!.ctx;
  const build = await buildTestSite(dataDir);
  distDir = build.distDir;
  session = await startSiteSession(build.distDir);
  process.stderr.write(`estimate tests: site build ${build.reused ? 'reused' : `took ${(build.buildMs / 1000).toFixed(1)} s`}\n`);
}, 600_000);

afterAll(async () => {
  await session?.close();
});

const pad = (m: number) => String(m + 1).padStart(2, '0');

function readCsv(text: string): Array<Record<string, string>> {
  const lines = text
    .replace(/^\uFEFF/, '')
    .trim()
    .split('\n')
    .filter((l) => !l.startsWith('#'));
  const head = lines[0].split(',');
  return lines.slice(1).map((l) => Object.fromEntries(l.split(',').map((v, i) => [head[i], v])));
}

/** Waits for the run after `before` to finish; returns the new run count. */
async function settled(p: Page, before: number): Promise<number> {
  await p.waitForFunction((n) => {
    const app = document.getElementById('estimate-app');
    return app !== null && Number(app.dataset.run ?? 0) > n && app.dataset.state !== 'loading';
  }, before);
  return Number(await p.getAttribute('#estimate-app', 'data-run'));
}

/** The page's JSON download, parsed. */
async function downloadJson(p: Page): Promise<BidJson> {
  const [download] = await Promise.all([p.waitForEvent('download'), p.click('#bid-json')]);
  expect(download.suggestedFilename()).toMatch(/^bid-.*\.json$/);
  return JSON.parse(readFileSync((await download.path())!, 'utf8')) as BidJson;
}

async function runCount(p: Page): Promise<number> {
  return Number((await p.getAttribute('#estimate-app', 'data-run')) ?? 0);
}

/** Changes the form with `act` and waits for the new estimate. */
async function change(p: Page, act: () => Promise<unknown>): Promise<void> {
  const before = await runCount(p);
  await act();
  await settled(p, before);
  expect(await p.getAttribute('#estimate-app', 'data-state')).toBe('ready');
}

async function totalRow(p: Page): Promise<Record<string, number>> {
  const rows = await readDataTable(p, '#estimate-table');
  const total = rows[rows.length - 1];
  return Object.fromEntries(
    Object.entries(total)
      .filter(([k]) => k !== 'period')
      .map(([k, v]) => [k, parseShownNumber(v)]),
  );
}

describe('the estimate page', () => {
  it('with a region from ?region= and the atlas settings shows 12 months that equal the pure estimate to the shown decimal and the region CSV within the measured tolerance', async () => {
    const region = ctx.regions.find((r) => r.id === 'tessick-coast') ?? ctx.regions[0];
    page = await session.open(`/estimate/?region=${region.id}`);
    await settled(page.page, 0);
    // The monthly table is a detail, folded by default, and computed when opened (its code is loaded then).
    expect(await page.page.isVisible('#estimate-table')).toBe(false);
    expect(await page.page.locator('#estimate-table tbody tr').count()).toBe(0);
    const before = await runCount(page.page);
    await page.page.click('.estimate-monthly > summary');
    await settled(page.page, before);
    expect(await page.page.getAttribute('#estimate-app', 'data-state')).toBe('ready');
    expect(await page.page.inputValue('#region')).toBe(region.id);
    const rows = await readDataTable(page.page, '#estimate-table');
    expect(rows.length).toBe(13);
    expect(rows.map((r) => r.period)).toEqual([
      'January',
      'February',
      'March',
      'April',
      'May',
      'June',
      'July',
      'August',
      'September',
      'October',
      'November',
      'December',
      'One year of work months',
    ]);
    // The same code in Node gives the same numbers (to the decimal shown).
    const hist = regionTileHistograms(new Uint8Array(readFileSync(join(dataDir, region.path))), region.path, ctx);
    const expected = estimateRows(runEstimate(hist, parseInputs({ region: region.id }, ctx, 'C'), ctx));
    rows.forEach((row, i) => {
      for (const c of ESTIMATE_COLUMNS)
        expect(Math.abs(parseShownNumber(row[c.key]) - expected[i].values[c.key]), `${row.period} ${c.key}`).toBeLessThanOrEqual(0.5 * 10 ** -c.digits + 1e-9);
    });
    // The region table of the pipeline (default class moderate, acclimatized, sun).
    const csv = readCsv(readFileSync(join(dataDir, 'data/regions', `${region.id}.csv`), 'utf8'));
    const get = (m: number, figure: string, stat: string) =>
      Number(
        csv.find(
          (r) =>
            r.period === pad(m) &&
            r.figure === figure &&
            r.workload_class === 'moderate' &&
            r.acclimatization === 'acclimatized' &&
            r.exposure === 'sun' &&
            r.statistic === stat,
        )!.value,
      );
    let positive = 0;
    for (let m = 0; m < 12; m++) {
      const shift = parseShownNumber(rows[m].shift_hours);
      const tol = (share: number) => share * shift + 0.05;
      expect(Math.abs(parseShownNumber(rows[m].above_mean) - get(m, 'hours-above-limit-shift', 'mean'))).toBeLessThanOrEqual(tol(0.012));
      expect(Math.abs(parseShownNumber(rows[m].above_p90) - get(m, 'hours-above-limit-shift', 'p90'))).toBeLessThanOrEqual(tol(0.019));
      expect(Math.abs(parseShownNumber(rows[m].lost_mean) - get(m, 'hours-lost-shift', 'mean'))).toBeLessThanOrEqual(tol(0.006));
      expect(Math.abs(parseShownNumber(rows[m].lost_p90) - get(m, 'hours-lost-shift', 'p90'))).toBeLessThanOrEqual(tol(0.011));
      if (get(m, 'hours-above-limit-shift', 'mean') > 1) positive++;
    }
    expect(positive, 'the region has months with hours above the limit').toBeGreaterThan(2);
    // The settings say what was computed, and the page says these are screening estimates.
    expect(await page.page.textContent('#estimate-summary dd[data-key="place"]')).toContain(region.name);
    expect(await page.page.textContent('#estimate-screening')).toContain('Screening estimates only');
    expect(await page.page.locator('.cautions li').count()).toBeGreaterThanOrEqual(5);
    expect(await page.page.getAttribute('nav a[href="/estimate/"]', 'aria-current')).toBe('page');
  });

  it('more clothing or heavier work gives more hours above the limit and lost; acclimatized workers have fewer than unacclimatized ones', async () => {
    const p = page.page;
    const base = await totalRow(p);
    expect(base.above_mean).toBeGreaterThan(0);
    await change(p, () => p.selectOption('#clothing', 'double-layer-woven'));
    const clothed = await totalRow(p);
    expect(clothed.above_mean).toBeGreaterThan(base.above_mean);
    expect(clothed.lost_mean).toBeGreaterThan(base.lost_mean);
    await change(p, () => p.selectOption('#clothing', 'work-clothes'));
    expect((await totalRow(p)).above_mean).toBe(base.above_mean);
    await change(p, () => p.selectOption('#work', 'high'));
    const heavy = await totalRow(p);
    expect(heavy.above_mean).toBeGreaterThan(base.above_mean);
    expect(heavy.lost_mean).toBeGreaterThan(base.lost_mean);
    await change(p, () => p.check('input[name="acclimatization"][value="unacclimatized"]'));
    const unacc = await totalRow(p);
    expect(heavy.above_mean).toBeLessThan(unacc.above_mean);
    expect(heavy.lost_mean).toBeLessThan(unacc.lost_mean);
    // Crew columns scale with the crew.
    await change(p, () => p.fill('#crew', '8').then(() => p.press('#crew', 'Tab')));
    const crew = await totalRow(p);
    expect(crew.crew_lost_mean).toBeCloseTo(8 * unacc.lost_mean, 0);
    expect(unacc.crew_lost_mean).toBeCloseTo(Number(JOB_DEFAULTS.crew) * unacc.lost_mean, 0);
    await change(p, () => p.check('input[name="acclimatization"][value="acclimatized"]'));
    await change(p, () => p.selectOption('#work', 'moderate'));
    await change(p, () => p.fill('#crew', JOB_DEFAULTS.crew).then(() => p.press('#crew', 'Tab')));
    expect(await totalRow(p)).toEqual(base);
  });

  it('the monthly CSV download (a Blob link) starts with a byte order mark, parses, carries units in its header, the invented-data label as a #,"text" line, and matches the table shown', async () => {
    const p = page.page;
    const href = await p.getAttribute('#estimate-csv', 'href');
    expect(href).toMatch(/^blob:http:\/\/127\.0\.0\.1/);
    const [download] = await Promise.all([p.waitForEvent('download'), p.click('#estimate-csv')]);
    expect(download.suggestedFilename()).toMatch(/^monthly-.*\.csv$/);
    const text = readFileSync((await download.path())!, 'utf8');
    expect(text.charCodeAt(0)).toBe(0xfeff);
    expect(text).toMatch(/^#,.*INVENTED DATA/m);
    expect(text).toMatch(/^#,"?Cautions: /m);
    const csv = readCsv(text);
    const table = await readDataTable(p, '#estimate-table');
    expect(csv.length).toBe(table.length);
    expect(Object.keys(csv[0])).toEqual(['period', 'label', ...ESTIMATE_COLUMNS.map((c) => c.csv)]);
    csv.forEach((row, i) => {
      expect(row.label).toBe(table[i].period);
      for (const c of ESTIMATE_COLUMNS)
        expect(Math.abs(Number(row[c.csv]) - parseShownNumber(table[i][c.key])), `${row.period} ${c.csv}`).toBeLessThanOrEqual(0.5 * 10 ** -c.digits + 1e-9);
    });
    expect(await page.cspViolations()).toEqual([]);
  });

  it('the °C/°F switch converts the typed clothing adjustment (as a difference), the rest-area WBGT and the limit shown, and leaves the hours alone', async () => {
    const p = page.page;
    await change(p, () => p.selectOption('#clothing', 'custom'));
    await change(p, () => p.fill('#cav', '1').then(() => p.press('#cav', 'Tab')));
    await change(p, () => p.check('input[name="rest"][value="fixed"]'));
    await change(p, () => p.fill('#rest-wbgt', '25').then(() => p.press('#rest-wbgt', 'Tab')));
    const inC = await readDataTable(p, '#estimate-table');
    const limitC = parseShownNumber((await p.textContent('#estimate-summary dd[data-key="limit"] [data-temp-c]'))!.replace(/°C/, ''));
    expect(await p.textContent('#estimate-summary dd[data-key="clothing"]')).toContain('+1.0 °C');
    await p.click('button[data-unit-choice="F"]');
    await p.waitForFunction(() => document.documentElement.dataset.units === 'F');
    expect(await p.inputValue('#cav')).toBe('1.8');
    expect(await p.inputValue('#rest-wbgt')).toBe('77.0');
    const limitF = (await p.textContent('#estimate-summary dd[data-key="limit"] [data-temp-c]'))!;
    expect(limitF).toMatch(/°F$/);
    expect(parseShownNumber(limitF.replace(/°F/, ''))).toBeCloseTo((limitC * 9) / 5 + 32, 0);
    expect(await p.textContent('#estimate-summary dd[data-key="clothing"]')).toContain('+1.8 °F');
    expect(await p.textContent('#clothing option[value="double-layer-woven"]')).toContain('+5.4 °F');
    expect(await p.textContent('label[for="cav"]')).toContain('°F');
    // A new run with the values in °F gives the same hours.
    await change(p, () => p.click('button[type="submit"]'));
    expect(await readDataTable(p, '#estimate-table')).toEqual(inC);
    await p.click('button[data-unit-choice="C"]');
    await p.waitForFunction(() => document.documentElement.dataset.units === 'C');
    expect(await p.inputValue('#cav')).toBe('1.0');
    await screenshot(p, 'estimate');
  });

  it('?cell=<cell_id> estimates a grid cell (matching its per-cell table within the measured tolerance); a sea or unknown cell shows the catalogued error', async () => {
    const cell = ctx.cells!.chunks[0].firstCell;
    const p = await session.open(`/estimate/?cell=${cell}`);
    await settled(p.page, 0);
    expect(await p.page.textContent('#estimate-status')).toContain(`Grid cell ${cell}`);
    const before = await runCount(p.page);
    await p.page.click('.estimate-monthly > summary');
    await settled(p.page, before);
    expect(await p.page.inputValue('#cell')).toBe(String(cell));
    const rows = await readDataTable(p.page, '#estimate-table');
    const cells = readCsv(readCellTables(join(dataDir, 'data')));
    for (let m = 0; m < 12; m++) {
      const r = cells.find(
        (x) =>
          x.cell_id === String(cell) &&
          x.period === pad(m) &&
          x.figure === 'hours-above-limit-shift' &&
          x.workload_class === 'moderate' &&
          x.acclimatization === 'acclimatized' &&
          x.exposure === 'sun',
      )!;
      expect(Math.abs(parseShownNumber(rows[m].above_mean) - Number(r.mean))).toBeLessThanOrEqual(0.035 * parseShownNumber(rows[m].shift_hours) + 0.05);
    }
    const bad = await session.open('/estimate/?cell=99999');
    await settled(bad.page, 0);
    expect(await bad.page.getAttribute('#estimate-app', 'data-state')).toBe('error');
    expect(await bad.page.textContent('#estimate-error')).toContain('The grid cell is not a land cell of this atlas');
    expect(await bad.page.isVisible('#estimate-output')).toBe(false);
  });

  it('a region whose name is markup and script is shown as text in the status and the settings, and runs nothing', async () => {
    const odd = ctx.regions.find((r) => r.id === 'odd-name')!;
    const p = await session.open(`/estimate/?region=${odd.id}`);
    await settled(p.page, 0);
    expect(await p.page.getAttribute('#estimate-app', 'data-state')).toBe('ready');
    expect(await p.page.textContent('#bid-settings dd[data-key="place"]')).toBe(`Region ${odd.name} (${odd.id})`);
    expect(await p.page.textContent('#estimate-status')).toContain(odd.name);
    expect(await p.page.locator('#estimate-result img, #estimate-result script').count()).toBe(0);
    expect(p.dialogs).toEqual([]);
  });

  it('as built, the page has no inline script, style or event handler, hands its data over in a data attribute, and tells readers without JavaScript where the tables are', () => {
    const html = readFileSync(join(distDir, 'estimate/index.html'), 'utf8');
    for (const tag of html.match(/<script\b[^>]*>/g) ?? []) expect(tag).toMatch(/\bsrc="\/[^"]+"/);
    expect(html).not.toMatch(/<style\b/);
    expect(html).not.toMatch(/\sstyle="/);
    expect(html).not.toMatch(/\son[a-z]+="/);
    expect(html).not.toMatch(/(src|href)="(https?:)?\/\//);
    expect(html).toMatch(/<div id="estimate-app"[^>]*data-context="\{/);
    // The region named with markup stays text, in the form and in the data attribute.
    expect(html).not.toContain('<img src=x onerror=alert(1)>');
    expect(html).toMatch(/<noscript>[\s\S]*needs JavaScript[\s\S]*data\/regions\/[a-z-]+\.csv/);
  });

  it('the job’s schedule on the page equals `heathours estimate` for the same inputs: the JSON download field for field, and every shown figure', async () => {
    const q =
      'region=sollent-coast&start=2027-05-03&work-hours=20000&crew=20&rate=35&daily-cost=1500&currency=EUR&compare=05%3A00-11%3A00%2C+15%3A00-19%3A00&compare=20%3A00-04%3A00&deadline=2027-09-15';
    const w = await session.open(`/estimate/?${q}`);
    const p = w.page;
    await settled(p, 0);
    expect(await p.getAttribute('#estimate-app', 'data-state')).toBe('ready');
    const fromPage = await downloadJson(p);
    // The page replays every scenario of the atlas unless the reader unticks it; the CLI when asked (--scenarios all).
    const fromCli = await runEstimateCommand({
      atlas: dataDir,
      region: 'sollent-coast',
      start: '2027-05-03',
      workHours: '20000',
      crew: '20',
      rate: '35',
      dailyCost: '1500',
      currency: 'EUR',
      compareShift: ['05:00-11:00, 15:00-19:00', '20:00-04:00'],
      deadline: '2027-09-15',
      scenarios: 'all',
    });
    expect(fromCli.scenarios.map((s) => s.id)).toEqual([PIPELINE_DATA_SCENARIO.id]);
    expect(fromPage).toEqual(fromCli);
    expect(fromPage.crewForDeadline).not.toBeNull();
    // The schedule table shows the JSON's numbers with the table's decimals.
    const shown = await p.$$eval('#bid-schedule tbody tr', (trs) =>
      trs.map((tr) => ({ key: tr.getAttribute('data-row'), cells: [...tr.querySelectorAll('td')].map((td) => td.textContent ?? '') })),
    );
    expect(shown.map((r) => r.key)).toEqual(SCHEDULE_ROWS.map((r) => r.key));
    for (const r of shown) {
      const row = SCHEDULE_ROWS.find((x) => x.key === r.key)!;
      expect(r.cells.slice(0, 3)).toEqual(STATISTICS.map((st) => showValue(scheduleValue(fromCli, row, st.key), row)));
    }
    expect(await p.textContent('#bid-headline')).toContain(fromCli.finishDate.p90);
    expect(await p.textContent('#bid-crew')).toContain(`${fromCli.crewForDeadline!.crew} workers`);
    expect(await p.locator('#bid-start-months tbody tr').count()).toBe(12);
    expect(await p.locator('#bid-start-chart rect').count()).toBe(12);
    expect(await p.locator('#bid-shifts thead th').count()).toBe(4);
    expect(await p.textContent('#bid-settings')).toContain('invented data');
    await screenshot(p, 'estimate-bid');
  });

  it('a scenario on the page gives the numbers of `heathours estimate --scenario`: the JSON field for field and the side-by-side table, with what the scenario is and that it is a what-if, not a forecast', async () => {
    const id = PIPELINE_DATA_SCENARIO.id;
    const w = await session.open(
      `/estimate/?region=tessick-coast&start=2027-04-05&work-hours=30000&crew=12&rate=40&daily-cost=900&currency=EUR&scenario=${id}`,
    );
    const p = w.page;
    await settled(p, 0);
    expect(await p.getAttribute('#estimate-app', 'data-state')).toBe('ready');
    const fromPage = await downloadJson(p);
    const fromCli = await runEstimateCommand({
      atlas: dataDir,
      region: 'tessick-coast',
      start: '2027-04-05',
      workHours: '30000',
      crew: '12',
      rate: '40',
      dailyCost: '900',
      currency: 'EUR',
      scenario: [id],
    });
    expect(fromPage).toEqual(fromCli);
    const sc = fromCli.scenarios[0];
    expect(sc.id).toBe(id);
    expect(sc.kind).toBe('uniform warming');
    expect(sc.caveat).toMatch(/what-if, not a forecast/);
    expect(sc.caveat).toMatch(/day-to-day/);
    expect(sc.startMonths).toHaveLength(12);
    // Heat that is 2 K warmer never lets the job finish earlier, and here it adds days.
    expect(sc.finishDate.p90 >= fromCli.finishDate.p90).toBe(true);
    expect(sc.addedWorkingDays.mean).toBeGreaterThan(fromCli.addedWorkingDays.mean);
    expect(await p.isVisible('#bid-scenarios')).toBe(true);
    const rows = await p.$$eval('#bid-scenario-table tbody tr', (trs) =>
      trs.map((tr) => ({ key: tr.getAttribute('data-row'), cells: [...tr.querySelectorAll('td')].map((td) => td.textContent ?? '') })),
    );
    expect(rows.map((r) => r.key)).toEqual(SCENARIO_LINES.map((l) => l.key));
    rows.forEach((r, i) => expect(r.cells).toEqual([SCENARIO_LINES[i].value(fromCli), SCENARIO_LINES[i].value(sc)]));
    const words = (await p.textContent('#bid-scenarios'))!;
    expect(words).toContain(sc.what);
    expect(words).toContain(sc.source);
    expect(words).toMatch(/what-if, not a forecast/);
    expect(words).toMatch(/monthly means/);
    expect(await p.textContent('#scenario-choice')).toMatch(/what-if, not a forecast/);
    // Unticked: no scenario run, the table hidden, the link says so and reproduces it.
    await change(p, () => p.uncheck(`input[name="scenario"][value="${id}"]`));
    expect(await p.isVisible('#bid-scenarios')).toBe(false);
    expect(p.url()).toContain('scenario=none');
    const none = await downloadJson(p);
    expect(none.scenarios).toEqual([]);
    const again = await session.open(p.url().replace(/^https?:\/\/[^/]+/, ''));
    await settled(again.page, 0);
    expect(await again.page.isChecked(`input[name="scenario"][value="${id}"]`)).toBe(false);
    expect(await downloadJson(again.page)).toEqual(none);
  });

  it('a link with a scenario the atlas does not have shows the catalogued error, its hint listing the scenarios', async () => {
    const w = await session.open('/estimate/?region=tessick-coast&scenario=plus-9k');
    await settled(w.page, 0);
    expect(await w.page.getAttribute('#estimate-app', 'data-state')).toBe('error');
    expect(await w.page.getAttribute('#estimate-error', 'data-code')).toBe('EstimateScenarioUnknown');
    expect(await w.page.textContent('#estimate-error')).toMatch(new RegExp(`plus-9k[\\s\\S]*What to do: use one of: ${PIPELINE_DATA_SCENARIO.id}`));
  });

  it('the address bar reproduces the estimate: a link made after changing the form gives the same JSON in a new page', async () => {
    const w = await session.open('/estimate/?region=tessick-coast');
    const p = w.page;
    await settled(p, 0);
    await change(p, () => p.fill('#crew', '14').then(() => p.press('#crew', 'Tab')));
    await change(p, () => p.fill('#holidays', '2027-01-06\n2027-04-02').then(() => p.press('#holidays', 'Tab')));
    await change(p, () => p.fill('#shifts', '06:00-10:00, 15:30-19:30').then(() => p.press('#shifts', 'Tab')));
    await change(p, () => p.uncheck('input[name="days"][value="sat"]'));
    await change(p, () => p.check('input[name="rest"][value="shade"]'));
    const url = p.url();
    expect(url).toContain('crew=14');
    expect(url).toContain('rest=shade');
    const first = await downloadJson(p);
    expect(first.job.holidays).toEqual(['2027-01-06', '2027-04-02']);
    expect(first.job.days).not.toContain('sat');
    const again = await session.open(url.replace(/^https?:\/\/[^/]+/, ''));
    await settled(again.page, 0);
    expect(await downloadJson(again.page)).toEqual(first);
  });

  it('a point on a sea cell maps to the nearest land cell, and the page says which and how far (as the CLI does)', async () => {
    const g = ctx.cells!.grid;
    const land = new Set<number>();
    for (const c of ctx.cells!.chunks) for (const id of parsePointChunk(new Uint8Array(readFileSync(join(dataDir, c.path))), c.path).cells) land.add(id);
    const sea = [...Array(g.nLat * g.nLon).keys()].find((c) => !land.has(c) && [c - 1, c + 1, c - g.nLon, c + g.nLon].some((n) => land.has(n)))!;
    const pt = cellCentre(g, sea);
    const w = await session.open(`/estimate/?lat=${pt.lat}&lon=${pt.lon}`);
    await settled(w.page, 0);
    expect(await w.page.getAttribute('#estimate-app', 'data-state')).toBe('ready');
    const text = (await w.page.textContent('#bid-place'))!;
    expect(text).toMatch(/lies on a sea cell; nearest land grid cell \d+ .* km from the point/);
    const cli = await runEstimateCommand({ atlas: dataDir, cell: `${pt.lat},${pt.lon}` });
    expect(text).toBe(cli.settings.place);
  });

  it('prints a one-page A4 bid summary with the inputs, the results, the build and data, and the cautions; the form and the notes stay off the paper', async () => {
    const w = await session.open('/estimate/?region=sollent-coast&start=2027-05-03&crew=20&rate=35&daily-cost=1500&currency=EUR');
    const p = w.page;
    await settled(p, 0);
    await p.emulateMedia({ media: 'print' });
    for (const sel of [
      '#bid-headline',
      '#bid-schedule',
      '#bid-settings',
      '#bid-build',
      '#bid-start-months',
      '#bid-shifts',
      '.bid-print-cautions',
      '.bid-print-title',
    ])
      expect(await p.isVisible(sel), sel).toBe(true);
    // The what-if table stays on the screen: with it the summary would not fit one page.
    for (const sel of ['#estimate-form', '.estimate-notes', '#bid-start-chart', '#estimate-table', '#bid-csv', '#bid-scenarios'])
      expect(await p.isVisible(sel), sel).toBe(false);
    expect(await p.textContent('.bid-print-title')).toContain('INVENTED DATA');
    expect(await p.textContent('#bid-build')).toContain(ctx.build.buildTime);
    await p.screenshot({ path: join(ARTIFACTS_DIR, 'estimate-print.png'), fullPage: true });
    const pdf = await p.pdf({ format: 'A4', printBackground: false });
    writeFileSync(join(ARTIFACTS_DIR, 'estimate-print.pdf'), pdf);
    const pages = (pdf.toString('latin1').match(/\/Type\s*\/Page(?!s)/g) ?? []).length;
    expect(pages).toBe(1);
    await p.emulateMedia({ media: 'screen' });
  });

  it('bad job inputs show the catalogued error with its hint, and a deadline that cannot be met is said in the crew line without losing the schedule', async () => {
    // (A date field cannot hold 30 February; the holiday list can.)
    const w = await session.open('/estimate/?region=sollent-coast&holidays=2027-06-01%0A2027-02-30');
    await settled(w.page, 0);
    expect(await w.page.getAttribute('#estimate-app', 'data-state')).toBe('error');
    expect(await w.page.getAttribute('#estimate-error', 'data-code')).toBe('ScheduleHolidayInvalid');
    expect(await w.page.textContent('#estimate-error')).toMatch(/line 2[\s\S]*What to do: list one non-working date per line/);
    const d = await session.open('/estimate/?region=sollent-coast&start=2027-05-03&deadline=2027-05-01');
    await settled(d.page, 0);
    expect(await d.page.getAttribute('#estimate-app', 'data-state')).toBe('ready');
    expect(await d.page.textContent('#bid-crew')).toMatch(/before the start/);
    const n = await session.open('/estimate/?region=sollent-coast&work-hours=-5');
    await settled(n.page, 0);
    expect(await n.page.getAttribute('#estimate-error', 'data-code')).toBe('ScheduleNumberInvalid');
    expect(await n.page.textContent('body')).not.toMatch(/NaN/);
  });

  it('made no request off 127.0.0.1, logged no console or page error, and reported no CSP violation; the page carries the site CSP', async () => {
    expect(session.pages.length).toBeGreaterThanOrEqual(3);
    for (const w of session.pages) {
      expect(w.consoleErrors, w.page.url()).toEqual([]);
      expect(w.pageErrors, w.page.url()).toEqual([]);
      expect(w.dialogs).toEqual([]);
      expect(await w.cspViolations(), w.page.url()).toEqual([]);
    }
    expect(session.nonLocalRequests).toEqual([]);
    expect(await page.page.getAttribute('meta[http-equiv="Content-Security-Policy"]', 'content')).toBe(CONTENT_SECURITY_POLICY);
  });
});
