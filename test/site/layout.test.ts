/**
 * Pages that fit: every built page of the pipeline-made test atlas, in Chromium at 1366 px (a
 * laptop) and 390 px (a phone) wide, scrolls only up and down. Nothing sticks out past the
 * window's right edge unless it sits in a box that scrolls sideways itself (the wide tables'
 * `.table-scroll`), and such boxes really scroll (the region report's hour table at 390 px); at
 * 1366 px no table even needs its box to scroll (the home ranking, the report's hour ranges and the
 * inventory's file list were clipped there).
 * The downloads page folds its many files: far shorter than the 23,328 px it was.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildTestSite, htmlFiles, screenshot, startSiteSession, type SiteSession } from './browser.ts';
import { buildPipelineData } from './pipeline-data.ts';

let distDir = '';
const sessions: SiteSession[] = [];

beforeAll(async () => {
  distDir = (await buildTestSite((await buildPipelineData()).dataDir)).distDir;
}, 900_000);

afterAll(async () => {
  for (const s of sessions) await s.close();
});

/** Runs in the page: the document's width, and every element that sticks out past the window without a sideways-scrolling box around it. */
const PROBE = `(() => {
  const vw = document.documentElement.clientWidth;
  const scrolls = (el) => {
    for (let e = el; e && e !== document.body; e = e.parentElement) {
      const ox = getComputedStyle(e).overflowX;
      if (ox === 'auto' || ox === 'scroll') return true;
    }
    return false;
  };
  const out = [];
  for (const el of document.body.querySelectorAll('*')) {
    const b = el.getBoundingClientRect();
    if (b.width === 0 || b.height === 0) continue;
    if (b.right > vw + 1 && !scrolls(el.parentElement)) out.push(el.tagName.toLowerCase() + (el.id ? '#' + el.id : '') + (el.className && typeof el.className === 'string' ? '.' + el.className.split(' ')[0] : '') + ' reaches ' + Math.round(b.right) + ' px');
  }
  return { documentWidth: document.documentElement.scrollWidth, windowWidth: vw, sticking: out.slice(0, 10) };
})()`;

/** Runs in the page: the visible sideways-scrolling boxes whose table is wider than the box. */
const HIDDEN_COLUMNS = `[...document.querySelectorAll('.table-scroll')]
  .filter((b) => b.offsetParent !== null && b.scrollWidth > b.clientWidth + 1)
  .map((b) => (b.querySelector('table') && (b.querySelector('table').id || b.querySelector('table').className)) + ' ' + b.scrollWidth + ' > ' + b.clientWidth + ' px')`;

const pagePath = (f: string) => `/${f.replace(/index\.html$/, '')}`;

describe('no page scrolls sideways', () => {
  for (const width of [1366, 390]) {
    it(`at ${width} px: every page is as wide as the window, and only wide tables scroll, inside their own box`, async () => {
      const session = await startSiteSession(distDir, { width, height: 900 });
      sessions.push(session);
      const pages = htmlFiles(distDir).map(pagePath);
      expect(pages.length).toBeGreaterThanOrEqual(13);
      const problems: string[] = [];
      for (const path of pages) {
        const { page } = await session.open(path);
        if (path === '/map/') await page.waitForSelector('#explorer-map[data-map-state="idle"]', { timeout: 30_000 });
        if (path === '/estimate/') await page.waitForTimeout(500);
        const r = (await page.evaluate(PROBE)) as { documentWidth: number; windowWidth: number; sticking: string[] };
        if (r.documentWidth > r.windowWidth || r.sticking.length > 0)
          problems.push(`${path}: ${r.documentWidth} px wide in a ${r.windowWidth} px window; ${r.sticking.join(', ')}`);
        if (width === 1366) {
          // On a laptop no table hides columns (or its caption) behind its own scroll bar.
          const hidden = (await page.evaluate(HIDDEN_COLUMNS)) as string[];
          if (hidden.length > 0) problems.push(`${path}: tables wider than their box: ${hidden.join(', ')}`);
        }
        if (width === 390 && (path === '/' || path.startsWith('/regions/sollent-coast/')))
          await screenshot(page, `layout-390${path.replace(/\//g, '-').replace(/-$/, '')}`);
        await page.close();
      }
      expect(problems).toEqual([]);
    }, 300_000);
  }

  it("at 390 px the region report's hour table scrolls inside its own box, which the page does not", async () => {
    const session = await startSiteSession(distDir, { width: 390, height: 900 });
    sessions.push(session);
    const { page } = await session.open('/regions/sollent-coast/');
    const box = await page.$eval('#hour-table', (t) => {
      const s = t.closest('.table-scroll')!;
      return { scrollWidth: s.scrollWidth, clientWidth: s.clientWidth, overflowX: getComputedStyle(s).overflowX };
    });
    expect(box.overflowX).toBe('auto');
    expect(box.scrollWidth).toBeGreaterThan(box.clientWidth);
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBe(390);
  });

  it('the downloads page folds the map layers and the tiles by purpose: under 6,000 px long at 1366 px (it was 23,328 px), every file still linked', async () => {
    const session = await startSiteSession(distDir, { width: 1366, height: 900 });
    sessions.push(session);
    const { page } = await session.open('/downloads/');
    const height = await page.evaluate(() => document.documentElement.scrollHeight);
    process.stderr.write(`downloads page: ${height} px at 1366 px wide\n`);
    expect(height).toBeLessThan(6000);
    const groups = await page.$$eval('details.file-group', (ds) =>
      ds.map((d) => ({ id: d.getAttribute('data-file-group'), open: (d as HTMLDetailsElement).open, rows: d.querySelectorAll('tbody tr').length })),
    );
    expect(groups.map((g) => g.id)).toEqual(['site', 'region-summaries', 'region-tiles', 'cell-tiles', 'cell-figures']);
    expect(groups.filter((g) => g.open).map((g) => g.id)).toEqual(['site']);
    for (const g of groups) expect(g.rows, g.id!).toBeGreaterThan(0);
    expect(await page.$$eval('details.layer-figure-combos', (ds) => ds.every((d) => !(d as HTMLDetailsElement).open))).toBe(true);
  });
});
