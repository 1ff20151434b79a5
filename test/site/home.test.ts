/**
 * Browser tests of the home page's region figures (the build-time SVG map and the ranking), on a
 * site built from the data folder the real pipeline makes (test/site/pipeline-data.ts), served on
 * 127.0.0.1 in Debian's headless Chromium. The ranking is checked against the regions' CSV files
 * read here; the map's colours against d3-scale-chromatic's Reds, the hours ramp (more hours darker),
 * by relative luminance (WCAG 2 definition) falling as the hours rise.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildPipelineData } from './pipeline-data.ts';
import { buildTestSite, parseShownNumber, screenshot, startSiteSession, type SiteSession, type WatchedPage } from './browser.ts';

const HOSTILE = '<img src=x onerror=alert(1)><script>alert(2)</script>';

let dataDir: string;
let session: SiteSession;
let home: WatchedPage;
let regions: Array<{ id: string; name: string }>;
let classes: Array<{ id: string; name: string }>;

/** A region's annual baseline-mean shift hours lost, from its CSV (plain split: no quoted fields). */
function annualHoursLost(id: string, cls: string, acc: string, exp = 'sun'): number {
  const line = readFileSync(join(dataDir, 'data/regions', `${id}.csv`), 'utf8')
    .split('\n')
    .find((l) => l.startsWith(`${id},year,hours-lost-shift,${cls},${acc},${exp},limit,mean,`));
  if (!line) throw new Error(`no annual row for ${id} ${cls} ${acc}`);
  return Number(line.split(',')[8]);
}

/** A region's annual workforce value (all outdoor work) from its CSV, e.g. `person-hours-lost-shift`, `p90`. */
function annualWorkforce(id: string, figure: string, stat: string): number {
  const line = readFileSync(join(dataDir, 'data/regions', `${id}.csv`), 'utf8')
    .split('\n')
    .find((l) => l.startsWith(`${id},year,${figure},all,by-shares,by-shares,limit,${stat},`));
  if (!line) throw new Error(`no annual ${figure} ${stat} row for ${id}`);
  return Number(line.split(',')[8]);
}

/** The order the ranking must have: most hours first, equal values by name. */
function expectedOrder(cls: string, acc: string): string[] {
  return [...regions]
    .map((r) => ({ ...r, v: annualHoursLost(r.id, cls, acc) }))
    .sort((a, b) => b.v - a.v || a.name.localeCompare(b.name))
    .map((r) => r.id);
}

async function ranking(page: WatchedPage['page'], key: string): Promise<Array<{ id: string; rank: string; shown: string; value: string }>> {
  return page.$$eval(
    '#ranking tbody tr',
    (trs, k) =>
      trs.map((tr) => ({
        id: tr.getAttribute('data-region-id')!,
        rank: (tr.querySelector('td.rank')?.textContent ?? '').trim(),
        shown: (tr.querySelector(`td[data-col="${k}"]`)?.textContent ?? '').trim(),
        value: tr.querySelector(`td[data-col="${k}"]`)?.getAttribute('data-value') ?? '',
      })),
    key,
  );
}

/** Relative luminance of `#rrggbb` (WCAG 2.x). */
function luminance(hex: string): number {
  const [r, g, b] = [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16) / 255).map((c) => (c <= 0.03928 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4));
  return 0.2126 * r + 0.7152 * g + 0.0722 * b;
}

beforeAll(async () => {
  ({ dataDir } = await buildPipelineData());
  regions = JSON.parse(readFileSync(join(dataDir, 'data/regions.geojson'), 'utf8')).features.map(
    (f: { properties: { id: string; name: string } }) => f.properties,
  );
  classes = JSON.parse(readFileSync(join(dataDir, 'data/manifest.json'), 'utf8')).work.classes;
  const build = await buildTestSite(dataDir);
  session = await startSiteSession(build.distDir);
  home = await session.open('/');
});

afterAll(async () => {
  await session?.close();
});

describe('the home page with the atlas figures', () => {
  it('the ranking on home equals the CSV annual values in order (moderate work, acclimatized, in the sun)', async () => {
    const rows = await ranking(home.page, 'moderate.acclimatized.sun');
    expect(rows.map((r) => r.id)).toEqual(expectedOrder('moderate', 'acclimatized'));
    rows.forEach((r, i) => {
      expect(r.rank).toBe(String(i + 1));
      const want = annualHoursLost(r.id, 'moderate', 'acclimatized');
      expect(Number(r.value)).toBe(want);
      expect(Math.abs(parseShownNumber(r.shown) - want)).toBeLessThanOrEqual(0.5);
    });
    // Every class and acclimatization state has its column.
    const keys = await home.page.$$eval('#ranking thead th[data-key]', (ths) => ths.map((t) => t.getAttribute('data-key')));
    expect(keys).toEqual(['rank', 'region', ...classes.flatMap((c) => ['acclimatized', 'unacclimatized'].map((a) => `${c.id}.${a}.sun`))]);
    await screenshot(home.page, 'home-figures');
  });

  it('ranks by another class and state when the reader picks it, in the CSV order of that column', async () => {
    const page = (await session.open('/')).page;
    await page.selectOption('[data-ranking-control] select', 'very-high.unacclimatized.sun');
    const rows = await ranking(page, 'very-high.unacclimatized.sun');
    expect(rows.map((r) => r.id)).toEqual(expectedOrder('very-high', 'unacclimatized'));
    expect(rows.map((r) => r.rank)).toEqual(rows.map((_, i) => String(i + 1)));
    expect(await page.getAttribute('#ranking', 'data-sort-key')).toBe('very-high.unacclimatized.sun');
  });

  it('draws the map as SVG at build time: one outline per region, linked to its report and darker for more hours lost', async () => {
    const noJs = await session.open('/', { javaScript: false });
    const shapes = await noJs.page.$$eval('#region-map a[data-region-id]', (as) =>
      as.map((a) => ({
        id: a.getAttribute('data-region-id')!,
        href: a.getAttribute('href')!,
        fill: a.querySelector('path')!.getAttribute('fill')!,
        d: a.querySelector('path')!.getAttribute('d')!,
        value: a.querySelector('path')!.getAttribute('data-value')!,
      })),
    );
    expect(shapes.map((s) => s.id).sort()).toEqual(regions.map((r) => r.id).sort());
    for (const s of shapes) {
      expect(s.href).toBe(`/regions/${s.id}/`);
      expect(s.d).toMatch(/^M[\d.]+,[\d.]+L/);
      expect(Number(s.value)).toBe(annualHoursLost(s.id, 'moderate', 'acclimatized'));
    }
    const byValue = [...shapes].sort((a, b) => Number(a.value) - Number(b.value));
    for (let i = 1; i < byValue.length; i++) {
      if (Number(byValue[i].value) > Number(byValue[i - 1].value)) expect(luminance(byValue[i].fill)).toBeLessThan(luminance(byValue[i - 1].fill));
    }
    expect(await noJs.page.isVisible('#region-map svg')).toBe(true);
    expect(await noJs.page.$$eval('#ranking tbody tr', (r) => r.length)).toBe(regions.length);
    expect(await noJs.page.isVisible('[data-ranking-control]')).toBe(false);
    // No MapLibre on the home page.
    const scripts = await noJs.page.$$eval('script[src], link[href]', (els) => els.map((e) => e.getAttribute('src') ?? e.getAttribute('href')));
    expect(scripts.some((s) => /maplibre|GridExtentMap/.test(s ?? ''))).toBe(false);
    expect(await noJs.page.$$('canvas')).toHaveLength(0);
  });

  it("ranks the regions by person-hours lost (all outdoor work, baseline mean) in the CSV order, each column equal to the CSV and the region JSON's people, under the raster's source line", async () => {
    const key = 'person-hours-lost-shift.mean';
    expect(await home.page.getAttribute('#workforce-ranking', 'data-sort-key')).toBe(key);
    const want = [...regions]
      .map((r) => ({ ...r, v: annualWorkforce(r.id, 'person-hours-lost-shift', 'mean') }))
      .sort((a, b) => b.v - a.v || a.name.localeCompare(b.name))
      .map((r) => r.id);
    const keys = (await home.page.$$eval('#workforce-ranking thead th[data-key]', (ths) => ths.map((t) => t.getAttribute('data-key')!))).slice(2);
    expect(keys).toEqual([
      'people',
      'outdoor-workers',
      ...['person-hours-above-limit-shift', 'person-hours-lost-shift', 'full-time-equivalents-lost', 'outdoor-work-time-lost'].flatMap((f) => [
        `${f}.mean`,
        `${f}.p90`,
      ]),
    ]);
    const byRow = await home.page.$$eval('#workforce-ranking tbody tr', (trs) =>
      trs.map((tr) => ({
        id: tr.getAttribute('data-region-id')!,
        cells: Object.fromEntries(
          [...tr.querySelectorAll('td[data-col]')].map((td) => [
            td.getAttribute('data-col')!,
            { value: td.getAttribute('data-value')!, shown: (td.textContent ?? '').trim() },
          ]),
        ),
      })),
    );
    expect(byRow.map((r) => r.id)).toEqual(want);
    for (const r of byRow) {
      const summary = JSON.parse(readFileSync(join(dataDir, 'data/regions', `${r.id}.json`), 'utf8')).workforce;
      expect(Number(r.cells.people.value)).toBe(summary.people);
      expect(Number(r.cells['outdoor-workers'].value)).toBe(summary.outdoorWorkers);
      for (const k of keys.slice(2)) {
        const [figure, stat] = k.split('.');
        const v = annualWorkforce(r.id, figure, stat);
        expect(Number(r.cells[k].value), `${r.id} ${k}`).toBe(v);
        const decimals = (r.cells[k].shown.split('.')[1] ?? '').length;
        expect(Math.abs(parseShownNumber(r.cells[k].shown) - v)).toBeLessThanOrEqual(0.5 * 10 ** -decimals + 1e-9);
      }
    }
    const manifest = JSON.parse(readFileSync(join(dataDir, 'data/manifest.json'), 'utf8'));
    const source = (await home.page.textContent('#workforce-ranking-source'))!.replace(/\s+/g, ' ');
    expect(source).toContain(`${manifest.workforce.name} (${manifest.workforce.year})`);
    expect(source).toContain(manifest.workforce.licence);
    expect(source).toMatch(/Invented people/);
  });

  it('re-ranks the workforce table by full-time equivalents lost (P90 year) when the reader picks it, and leaves the hours ranking alone', async () => {
    const page = (await session.open('/')).page;
    const before = await ranking(page, 'moderate.acclimatized.sun');
    await page.selectOption('[data-ranking-control][data-for="workforce-ranking"] select', 'full-time-equivalents-lost.p90');
    const ids = await page.$$eval('#workforce-ranking tbody tr', (trs) =>
      trs.map((tr) => [tr.getAttribute('data-region-id')!, tr.querySelector('td.rank')!.textContent!.trim()]),
    );
    const want = [...regions]
      .map((r) => ({ ...r, v: annualWorkforce(r.id, 'full-time-equivalents-lost', 'p90') }))
      .sort((a, b) => b.v - a.v || a.name.localeCompare(b.name))
      .map((r) => r.id);
    expect(ids.map((x) => x[0])).toEqual(want);
    expect(ids.map((x) => x[1])).toEqual(want.map((_, i) => String(i + 1)));
    expect(await ranking(page, 'moderate.acclimatized.sun')).toEqual(before);
  });

  it("a region's outline on the map opens its report", async () => {
    const page = (await session.open('/')).page;
    await page.locator('#region-map').scrollIntoViewIfNeeded();
    // A point of the window where Kell Highlands' outline is the topmost shape (regions may overlap).
    const point = await page.$eval('#region-map a[data-region-id="kell-highlands"] path', (path) => {
      const box = path.getBoundingClientRect();
      for (let i = 1; i < 20; i++) {
        for (let j = 1; j < 20; j++) {
          const x = box.left + (box.width * i) / 20;
          const y = box.top + (box.height * j) / 20;
          if (document.elementFromPoint(x, y) === path) return { x, y };
        }
      }
      return null;
    });
    expect(point).not.toBeNull();
    await Promise.all([page.waitForURL(/\/regions\/kell-highlands\/$/), page.mouse.click(point!.x, point!.y)]);
    expect(await page.textContent('h1')).toBe('Kell Highlands');
  });

  it('shows the odd-name region as text in the ranking, the map and the list, and nothing executes', async () => {
    const { page } = home;
    const odd = regions.find((r) => r.id === 'odd-name')!;
    expect(odd.name).toContain(HOSTILE);
    expect(await page.textContent('#ranking tr[data-region-id="odd-name"] a')).toBe(odd.name);
    expect(await page.textContent('#region-map a[data-region-id="odd-name"] title')).toContain(odd.name);
    expect(await page.textContent('#regions li[data-region-id="odd-name"] .region-name')).toBe(odd.name);
    expect(await page.$$('main img')).toHaveLength(0);
    await page.waitForTimeout(200);
    expect(home.dialogs).toEqual([]);
  });

  it('keeps what the atlas covers and the cautions, makes no request beyond 127.0.0.1 and reports no error', async () => {
    expect(await home.page.isVisible('#coverage')).toBe(true);
    expect(await home.page.isVisible('.cautions')).toBe(true);
    expect(session.nonLocalRequests).toEqual([]);
    for (const p of session.pages) {
      expect(p.consoleErrors.filter((e) => !(p.scriptsBlocked && /ERR_FAILED.*\.js\)$/.test(e)))).toEqual([]);
      expect(p.pageErrors).toEqual([]);
      expect(await p.cspViolations()).toEqual([]);
      expect(p.dialogs).toEqual([]);
    }
  });
});
