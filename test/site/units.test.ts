/**
 * The °C/°F switch (src/components/UnitSwitch.astro, src/scripts/units.ts, src/lib/units.ts) in
 * Chromium, on pages with temperatures of the convention (the methods page's limits and clothing
 * adjustment, the inventory's temperature variables). Expected values are converted here
 * independently: °F = °C × 9/5 + 32 for a temperature, × 9/5 for a difference (the definition of
 * the Fahrenheit scale).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { buildTestSite, screenshot, startSiteSession, type SiteSession, type TestSiteBuild } from './browser.ts';
import { buildPipelineData } from './pipeline-data.ts';
import { formatFixed } from '../../src/lib/format.ts';
import { formatTemperatureList, temperatureTextIn } from '../../src/lib/units.ts';
import { NICHE_CAVEAT, NICHE_LABELS } from '../../pipeline/climate/niche.ts';
import { HOOD_CAV } from '../../pipeline/work/clothing.ts';
import { htmlFiles } from './browser.ts';

let build: TestSiteBuild;
/** One browser profile for the switching and persistence tests. */
let session: SiteSession;

beforeAll(async () => {
  build = await buildTestSite((await buildPipelineData()).dataDir);
  session = await startSiteSession(build.distDir);
});

afterAll(async () => {
  await session?.close();
});

interface Shown {
  units: string | undefined;
  pressed: Record<string, string | null>;
  hidden: boolean[];
  temps: Array<{ c: number; digits: number; signed: boolean; text: string }>;
  deltas: Array<{ c: number; digits: number; plus: boolean; text: string }>;
  labels: string[];
}

async function shown(page: Page): Promise<Shown> {
  return page.evaluate(() => ({
    units: document.documentElement.dataset.units,
    pressed: Object.fromEntries(
      [...document.querySelectorAll('[data-unit-choice]')].map((b) => [b.getAttribute('data-unit-choice'), b.getAttribute('aria-pressed')]),
    ),
    hidden: [...document.querySelectorAll<HTMLButtonElement>('[data-unit-choice]')].map((b) => b.hidden),
    temps: [...document.querySelectorAll<HTMLElement>('[data-temp-c]')].map((e) => ({
      c: Number(e.dataset.tempC),
      digits: Number(e.dataset.digits ?? 1),
      signed: e.hasAttribute('data-temp-signed'),
      text: e.textContent ?? '',
    })),
    deltas: [...document.querySelectorAll<HTMLElement>('[data-temp-delta-c]')].map((e) => ({
      c: Number(e.dataset.tempDeltaC),
      digits: Number(e.dataset.digits ?? 1),
      plus: e.dataset.deltaSign !== 'none',
      text: e.textContent ?? '',
    })),
    labels: [...document.querySelectorAll('[data-unit-label]')].map((e) => e.textContent ?? ''),
  }));
}

/** What a temperature must read in a unit, converted here (not with src/lib/units.ts). */
function expected(c: number, digits: number, unit: 'C' | 'F', signed = false): string {
  const v = unit === 'F' ? (c * 9) / 5 + 32 : c;
  return `${signed && v > 0 ? '+' : ''}${formatFixed(v, digits)} °${unit}`;
}
function expectedDelta(c: number, digits: number, unit: 'C' | 'F', plus = true): string {
  const v = unit === 'F' ? (c * 9) / 5 : c;
  return `${plus && v > 0 ? '+' : ''}${formatFixed(v, digits)} °${unit}`;
}

function expectAllIn(s: Shown, unit: 'C' | 'F', where: string): void {
  expect(s.units, where).toBe(unit);
  expect(s.pressed, where).toEqual({ C: String(unit === 'C'), F: String(unit === 'F') });
  for (const t of s.temps) expect(t.text, where).toBe(expected(t.c, t.digits, unit, t.signed));
  for (const d of s.deltas) expect(d.text, where).toBe(expectedDelta(d.c, d.digits, unit, d.plus));
  for (const l of s.labels) expect(l, where).toBe(`°${unit}`);
}

describe('the °C/°F switch', () => {
  it('starts in °C with both buttons shown, the °C one pressed, and every temperature in °C', async () => {
    const { page } = await session.open('/methods/');
    const s = await shown(page);
    expect(s.temps.length).toBeGreaterThanOrEqual(8);
    expect(s.deltas.length).toBeGreaterThanOrEqual(1);
    expect(s.labels.length).toBeGreaterThanOrEqual(2);
    expect(s.hidden).toEqual([false, false]);
    expectAllIn(s, 'C', 'methods, at load');
    // A known value: the acclimatized limit at 300 W is 28.2 °C = 82.8 °F (56.7 − 11.5·log10 300 = 28.21).
    expect(s.temps.map((t) => t.text)).toContain('28.2 °C');
  });

  it('switches every temperature, difference and unit label of the page to °F and back, and announces each change', async () => {
    const { page } = await session.open('/methods/');
    await page.evaluate(() => {
      (globalThis as unknown as { __units: string[] }).__units = [];
      document.addEventListener('heathours:units', (e) =>
        (globalThis as unknown as { __units: string[] }).__units.push((e as CustomEvent<{ unit: string }>).detail.unit),
      );
    });
    const before = await shown(page);
    await page.click('[data-unit-choice="F"]');
    const f = await shown(page);
    expectAllIn(f, 'F', 'methods, after °F');
    expect(f.temps.map((t) => t.text)).toContain('82.8 °F');
    await screenshot(page, 'methods-fahrenheit');
    await page.click('[data-unit-choice="C"]');
    const c = await shown(page);
    expectAllIn(c, 'C', 'methods, back to °C');
    expect(c.temps.map((t) => t.text)).toEqual(before.temps.map((t) => t.text));
    expect(await page.evaluate(() => (globalThis as unknown as { __units: string[] }).__units)).toEqual(['F', 'C']);
  });

  it('keeps the choice across pages and visits (stored in the browser)', async () => {
    const first = await session.open('/methods/');
    await first.page.click('[data-unit-choice="F"]');
    const inventory = await session.open('/inventory/');
    const s = await shown(inventory.page);
    expect(s.temps.length).toBeGreaterThanOrEqual(3);
    expectAllIn(s, 'F', 'inventory after choosing °F on the methods page');
    const downloads = await session.open('/downloads/');
    expect((await shown(downloads.page)).units).toBe('F');
    const again = await session.open('/methods/');
    expectAllIn(await shown(again.page), 'F', 'methods, visited again');
    await again.page.click('[data-unit-choice="C"]');
  });

  it('shows the choice made on a later page after going back in the same tab', async () => {
    const { page } = await session.open('/methods/');
    expect((await shown(page)).units).toBe('C');
    await page.click('nav a[href="/inventory/"]');
    await page.waitForURL(/\/inventory\/$/);
    await page.click('[data-unit-choice="F"]');
    await page.goBack();
    await page.waitForURL(/\/methods\/$/);
    await page.waitForFunction(() => document.readyState === 'complete');
    expectAllIn(await shown(page), 'F', 'methods after going back');
    await page.click('[data-unit-choice="C"]');
  });

  it('follows a choice made in another tab, and re-reads the choice when a page comes back from the back/forward cache', async () => {
    const a = await session.open('/methods/');
    const b = await session.open('/inventory/');
    expect((await shown(a.page)).units).toBe('C');
    await b.page.click('[data-unit-choice="F"]');
    await a.page.waitForFunction(() => document.documentElement.dataset.units === 'F', undefined, { timeout: 5000 });
    expectAllIn(await shown(a.page), 'F', 'methods after °F in another tab');
    // A page restored from the back/forward cache fires pageshow with persisted = true; headless
    // Chromium does not keep pages in that cache, so the event is sent as the browser would.
    await a.page.evaluate(() => {
      localStorage.setItem('heathours.units', 'C');
      window.dispatchEvent(new PageTransitionEvent('pageshow', { persisted: true }));
    });
    expectAllIn(await shown(a.page), 'C', 'methods after a restore with °C stored');
    await b.page.click('[data-unit-choice="C"]');
  });

  it('follows ?units=F in a fresh browser, keeps it for the next page, and ?units=C switches back', async () => {
    const fresh = await startSiteSession(build.distDir);
    try {
      const q = await fresh.open('/methods/?units=F');
      expectAllIn(await shown(q.page), 'F', 'methods?units=F');
      const next = await fresh.open('/inventory/');
      expectAllIn(await shown(next.page), 'F', 'inventory after ?units=F');
      const back = await fresh.open('/inventory/?units=C');
      expectAllIn(await shown(back.page), 'C', 'inventory?units=C');
      expect(fresh.nonLocalRequests).toEqual([]);
    } finally {
      await fresh.close();
    }
  });

  it('without JavaScript shows °C and hides the switch', async () => {
    const { page } = await session.open('/methods/', { javaScript: false });
    const s = await shown(page);
    expect(s.hidden).toEqual([true, true]);
    for (const t of s.temps) expect(t.text).toBe(expected(t.c, t.digits, 'C', t.signed));
    expect(s.labels.every((l) => l === '°C')).toBe(true);
  });

  it('made no request beyond 127.0.0.1 and no page logged an error', async () => {
    for (const w of session.pages) {
      const errors = w.scriptsBlocked ? w.consoleErrors.filter((e) => !/ERR_FAILED \(.*\.m?js\)$/.test(e)) : w.consoleErrors;
      expect(errors, w.page.url()).toEqual([]);
      expect(w.pageErrors, w.page.url()).toEqual([]);
    }
    expect(session.nonLocalRequests).toEqual([]);
  });
});

/** Runs in the page: text with "°C" that is not inside an element marked `data-unit-fixed` (file units, published formulas). */
const CELSIUS_LEFT = `(() => {
  const out = [];
  const walker = document.createTreeWalker(document.body, NodeFilter.SHOW_TEXT);
  for (let n = walker.nextNode(); n; n = walker.nextNode()) {
    const el = n.parentElement;
    if (!el || el.closest('[data-unit-fixed], script, style')) continue;
    if (/°C|\u2103/.test(n.textContent || '')) out.push((n.textContent || '').trim().slice(0, 90) + ' <' + el.tagName.toLowerCase() + '>');
  }
  return out;
})()`;

describe('every temperature follows the switch', () => {
  it('free text, lists and class names with temperatures convert (°F = °C × 9/5 + 32); differences take no offset', () => {
    expect(temperatureTextIn(NICHE_LABELS.margin, 'F')).toBe('Lived-in, but outside both bands (below 84.2 °F)');
    expect(temperatureTextIn('Main band (11–15 °C)', 'F')).toBe('Main band (51.8–59 °F)');
    expect(temperatureTextIn('at \u22125 °C', 'F')).toBe('at 23 °F');
    expect(temperatureTextIn('no temperature [°C]', 'F')).toBe('no temperature [°C]');
    expect(formatTemperatureList([11, 15, 20, 25, 29], 'C')).toBe('11, 15, 20, 25 or 29 °C');
    expect(formatTemperatureList([11, 15, 20, 25, 29], 'F')).toBe('51.8, 59, 68, 77 or 84.2 °F');
  });

  it("a page shown in °F keeps no °C text outside what names a file's or a published formula's unit, on every page but the calculator", async () => {
    const left: string[] = [];
    const pages = htmlFiles(build.distDir)
      .map((f) => `/${f.replace(/index\.html$/, '')}`)
      .filter((p) => p !== '/estimate/');
    for (const path of pages) {
      const { page } = await session.open(`${path}?units=F`);
      if (path === '/map/') await page.waitForSelector('#explorer-map[data-map-state="idle"]', { timeout: 30_000 });
      for (const t of (await page.evaluate(CELSIUS_LEFT)) as string[]) left.push(`${path}: ${t}`);
      await page.close();
    }
    expect(left).toEqual([]);
    const back = await session.open('/methods/?units=C');
    await back.page.close();
  }, 180_000);

  it('the region report in °F: niche classes, the caveat (its words in °C exactly those of the pipeline) and the limit marks convert', async () => {
    const { page } = await session.open('/regions/sollent-coast/?units=C');
    const caveatC = (await page.textContent('#niche-caveat'))!
      .replace(/^\s*Caveat\.\s*/, '')
      .replace(/\s+/g, ' ')
      .trim();
    expect(caveatC).toBe(NICHE_CAVEAT);
    await page.click('[data-unit-choice="F"]');
    const caveatF = (await page.textContent('#niche-caveat'))!;
    expect(caveatF).toContain('within about 0.9 °F of a band edge (51.8, 59, 68, 77 or 84.2 °F)');
    const titles = await page.$$eval('svg title[data-temp-text]', (ts) => ts.map((t) => t.textContent ?? ''));
    expect(titles.length).toBeGreaterThan(4);
    expect(titles.every((t) => t.includes('°F') && !t.includes('°C'))).toBe(true);
    await page.click('[data-unit-choice="C"]');
    await page.close();
  });

  it("the calculator's hood option reads one plus sign and follows the switch: (+1 °C) and (+2 °F)", async () => {
    const { page } = await session.open('/estimate/?units=C');
    const hood = page.locator('label', { has: page.locator('input[name="hood"]') });
    expect((await hood.textContent())!.replace(/\s+/g, ' ').trim()).toBe(`with a hood (+${HOOD_CAV} °C)`);
    await page.click('[data-unit-choice="F"]');
    // 1 °C-WBGT as a difference is 1.8 °F, shown with the page's 0 decimals.
    expect((await hood.textContent())!.replace(/\s+/g, ' ').trim()).toBe(`with a hood (+${formatFixed((HOOD_CAV * 9) / 5, 0)} °F)`);
    await page.click('[data-unit-choice="C"]');
    await page.close();
  });
});
