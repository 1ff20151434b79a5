/**
 * Browser tests of the estimate calculator (/estimate/) on a site built from the real pipeline's
 * invented small demo (pipeline-data.ts), in Debian's headless Chromium (browser.ts): the default
 * estimate against the region table, the direction of the answers when clothing, workload and
 * acclimatization change, `?cell=`, the CSV download (a Blob link under the site's CSP), the
 * °C/°F switch, and no request leaves 127.0.0.1, no console error, no CSP violation.
 * Tolerances are those measured in estimate-logic.test.ts (weekday scaling of the histograms).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { buildPipelineData } from './pipeline-data.ts';
import { buildTestSite, parseShownNumber, readDataTable, screenshot, startSiteSession, type SiteSession, type WatchedPage } from './browser.ts';
import { loadEstimateContext } from '../../src/data/estimate.ts';
import type { EstimateContext } from '../../pipeline/schedule/context.ts';
import { parseInputs } from '../../pipeline/schedule/inputs.ts';
import { runEstimate } from '../../src/lib/estimate/estimate.ts';
import { ESTIMATE_COLUMNS, estimateRows } from '../../src/lib/estimate/table.ts';
import { regionTileHistograms } from '../../pipeline/schedule/tiles.ts';
import { CONTENT_SECURITY_POLICY } from '../../src/lib/content-security-policy.ts';

let session: SiteSession;
let distDir = '';
let dataDir = '';
let ctx: EstimateContext;
let page: WatchedPage;

beforeAll(async () => {
  dataDir = (await buildPipelineData()).dataDir;
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
  const lines = text.trim().split('\n').filter((l) => !l.startsWith('#'));
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
  return Object.fromEntries(Object.entries(total).filter(([k]) => k !== 'period').map(([k, v]) => [k, parseShownNumber(v)]));
}

describe('the estimate page', () => {
  it('with a region from ?region= and the atlas settings shows 12 months that equal the pure estimate to the shown decimal and the region CSV within the measured tolerance', async () => {
    const region = ctx.regions.find((r) => r.id === 'tessick-coast') ?? ctx.regions[0];
    page = await session.open(`/estimate/?region=${region.id}`);
    await settled(page.page, 0);
    expect(await page.page.getAttribute('#estimate-app', 'data-state')).toBe('ready');
    expect(await page.page.inputValue('#region')).toBe(region.id);
    const rows = await readDataTable(page.page, '#estimate-table');
    expect(rows.length).toBe(13);
    expect(rows.map((r) => r.period)).toEqual([
      'January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December', 'One year of work months',
    ]);
    // The same code in Node gives the same numbers (to the decimal shown).
    const hist = regionTileHistograms(new Uint8Array(readFileSync(join(dataDir, region.path))), region.path, ctx);
    const expected = estimateRows(runEstimate(hist, parseInputs({ region: region.id }, ctx, 'C'), ctx));
    rows.forEach((row, i) => {
      for (const c of ESTIMATE_COLUMNS) expect(Math.abs(parseShownNumber(row[c.key]) - expected[i].values[c.key]), `${row.period} ${c.key}`).toBeLessThanOrEqual(0.5 * 10 ** -c.digits + 1e-9);
    });
    // The region table of the pipeline (default class moderate, acclimatized, sun).
    const csv = readCsv(readFileSync(join(dataDir, 'data/regions', `${region.id}.csv`), 'utf8'));
    const get = (m: number, figure: string, stat: string) =>
      Number(csv.find((r) => r.period === pad(m) && r.figure === figure && r.workload_class === 'moderate' && r.acclimatization === 'acclimatized' && r.exposure === 'sun' && r.statistic === stat)!.value);
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
    await change(p, () => p.check('input[name="acclimatization"][value="acclimatized"]'));
    await change(p, () => p.selectOption('#work', 'moderate'));
    await change(p, () => p.fill('#crew', '1').then(() => p.press('#crew', 'Tab')));
    expect(await totalRow(p)).toEqual(base);
  });

  it('the CSV download (a Blob link) parses, carries units in its header and the invented-data label, and matches the table shown', async () => {
    const p = page.page;
    const href = await p.getAttribute('#estimate-csv', 'href');
    expect(href).toMatch(/^blob:http:\/\/127\.0\.0\.1/);
    const [download] = await Promise.all([p.waitForEvent('download'), p.click('#estimate-csv')]);
    expect(download.suggestedFilename()).toMatch(/^estimate-.*\.csv$/);
    const text = readFileSync((await download.path())!, 'utf8');
    expect(text).toMatch(/^# .*INVENTED DATA/m);
    expect(text).toMatch(/^# Cautions: /m);
    const csv = readCsv(text);
    const table = await readDataTable(p, '#estimate-table');
    expect(csv.length).toBe(table.length);
    expect(Object.keys(csv[0])).toEqual(['period', 'label', ...ESTIMATE_COLUMNS.map((c) => c.csv)]);
    csv.forEach((row, i) => {
      expect(row.label).toBe(table[i].period);
      for (const c of ESTIMATE_COLUMNS) expect(Math.abs(Number(row[c.csv]) - parseShownNumber(table[i][c.key])), `${row.period} ${c.csv}`).toBeLessThanOrEqual(0.5 * 10 ** -c.digits + 1e-9);
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

  it('?cell=<cell_id> estimates a grid cell (matching data/atlas-cells.csv within the measured tolerance); a sea or unknown cell shows the catalogued error', async () => {
    const cell = ctx.cells!.chunks[0].firstCell;
    const p = await session.open(`/estimate/?cell=${cell}`);
    await settled(p.page, 0);
    expect(await p.page.textContent('#estimate-status')).toContain(`Grid cell ${cell}`);
    expect(await p.page.inputValue('#cell')).toBe(String(cell));
    const rows = await readDataTable(p.page, '#estimate-table');
    const cells = readCsv(readFileSync(join(dataDir, 'data/atlas-cells.csv'), 'utf8'));
    for (let m = 0; m < 12; m++) {
      const r = cells.find((x) => x.cell_id === String(cell) && x.period === pad(m) && x.figure === 'hours-above-limit-shift' && x.workload_class === 'moderate' && x.acclimatization === 'acclimatized' && x.exposure === 'sun')!;
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
    expect(await p.page.textContent('#estimate-summary dd[data-key="place"]')).toBe(`Region ${odd.name} (${odd.id})`);
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
