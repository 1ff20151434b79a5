/**
 * Accessibility and print basics of every built page (found generically), on the pipeline-made
 * test data, in Chromium:
 * - contrast: the palette of src/styles/site.css in the pairs the stylesheet uses, and the
 *   rendered text of every page against its effective background, at least 4.5:1 (3:1 for large
 *   text) — WCAG 2.1 success criterion 1.4.3, with its relative-luminance and contrast-ratio
 *   definitions;
 * - a skip link first in the tab order that moves the focus to the main content;
 * - landmarks: one banner, one navigation with a name, one main, one contentinfo, nothing outside;
 * - one h1 and no heading level skipped;
 * - the HTML parses as written (the parser adds or moves no element);
 * - print: navigation, skip link, unit switch and page contents lists are hidden, content stays.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PROJECT_ROOT, buildTestSite, htmlFiles, screenshot, startSiteSession, type SiteSession, type TestSiteBuild, type WatchedPage } from './browser.ts';
import { buildPipelineData } from './pipeline-data.ts';

/** WCAG 2.1 relative luminance of an sRGB colour [0–1]. */
function relativeLuminance([r, g, b]: [number, number, number]): number {
  const lin = (c: number) => {
    const s = c / 255;
    return s <= 0.04045 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
  };
  return 0.2126 * lin(r) + 0.7152 * lin(g) + 0.0722 * lin(b);
}

/** WCAG 2.1 contrast ratio of two colours [1–21]. */
function contrastRatio(a: [number, number, number], b: [number, number, number]): number {
  const [hi, lo] = [relativeLuminance(a), relativeLuminance(b)].sort((x, y) => y - x);
  return (hi + 0.05) / (lo + 0.05);
}

function hex(h: string): [number, number, number] {
  const m = h.trim().match(/^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i);
  if (!m) throw new Error(`not a #rrggbb colour: ${h}`);
  return [parseInt(m[1], 16), parseInt(m[2], 16), parseInt(m[3], 16)];
}

const CSS = readFileSync(join(PROJECT_ROOT, 'src/styles/site.css'), 'utf8');
/** The custom properties of :root in site.css. */
const PALETTE: Record<string, string> = Object.fromEntries([...CSS.matchAll(/--([a-z-]+):\s*(#[0-9a-f]{6})\s*;/gi)].map((m) => [m[1], m[2]]));
/** The background a rule of site.css sets, read from the file: `.cautions { … background: #fff8f2 }`. */
function backgroundOf(selector: string): string {
  const rule = CSS.match(new RegExp(`(^|\\n)${selector.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}\\s*\\{([^}]*)\\}`));
  const m = rule?.[2].match(/background:\s*(#[0-9a-f]{6}|var\(--[a-z-]+\))/i);
  if (!m) throw new Error(`no background in ${selector}`);
  const v = m[1];
  return v.startsWith('var(') ? PALETTE[v.slice(6, -1)] : v;
}

let build: TestSiteBuild;
let session: SiteSession;
let pages: string[];
const visited = new Map<string, WatchedPage>();
const urlPath = (rel: string) => `/${rel.replace(/index\.html$/, '')}`;

beforeAll(async () => {
  build = await buildTestSite((await buildPipelineData()).dataDir);
  pages = htmlFiles(build.distDir).sort();
  session = await startSiteSession(build.distDir);
  for (const rel of pages) visited.set(rel, await session.open(urlPath(rel), { javaScript: false }));
});

afterAll(async () => {
  await session?.close();
});

describe('the contrast of the palette (site.css)', () => {
  it('computes WCAG contrast as the standard defines it (black on white 21:1, equal colours 1:1)', () => {
    expect(contrastRatio([0, 0, 0], [255, 255, 255])).toBeCloseTo(21, 10);
    expect(contrastRatio([118, 118, 118], [255, 255, 255])).toBeGreaterThan(4.5); // #767676, the lightest grey commonly quoted as passing on white
    expect(contrastRatio([119, 119, 119], [255, 255, 255])).toBeLessThan(4.5);
    expect(contrastRatio([40, 90, 160], [40, 90, 160])).toBe(1);
  });

  it('reaches 4.5:1 for every text colour on the background it is used on', () => {
    for (const name of ['ink', 'muted', 'paper', 'accent', 'warm', 'invented', 'invented-bg']) expect(PALETTE[name], name).toMatch(/^#/);
    const pairs: Array<[string, string, string]> = [
      ['body text', PALETTE.ink, PALETTE.paper],
      ['muted text (lead, notes, footer)', PALETTE.muted, PALETTE.paper],
      ['links', PALETTE.accent, PALETTE.paper],
      ['links on hover', PALETTE.warm, PALETTE.paper],
      ['cautions heading', PALETTE.warm, backgroundOf('.cautions')],
      ['cautions text', PALETTE.ink, backgroundOf('.cautions')],
      ['invented-data notice', PALETTE.invented, PALETTE['invented-bg']],
      ['invented tag', PALETTE.invented, PALETTE.paper],
      ['equations', PALETTE.ink, backgroundOf('.equation')],
      ['pressed unit button', '#ffffff', backgroundOf(".unit-switch button[aria-pressed='true']")],
      ['skip link', '#ffffff', backgroundOf('.skip-link')],
    ];
    for (const [what, fg, bg] of pairs) {
      const ratio = contrastRatio(hex(fg), hex(bg));
      process.stderr.write(`contrast ${what}: ${fg} on ${bg} = ${ratio.toFixed(2)}:1\n`);
      expect(ratio, `${what}: ${fg} on ${bg}`).toBeGreaterThanOrEqual(4.5);
    }
  });
});

describe('every built page', () => {
  it('shows all its text at 4.5:1 or more against the background it is drawn on (3:1 for large text)', async () => {
    for (const rel of pages) {
      const samples = await visited.get(rel)!.page.evaluate(() => {
        const rgba = (s: string): [number, number, number, number] => {
          const m = s.match(/rgba?\(([^)]+)\)/);
          if (!m) return [0, 0, 0, 0];
          const p = m[1]
            .split(/[ ,/]+/)
            .filter(Boolean)
            .map(Number);
          return [p[0], p[1], p[2], p.length > 3 ? p[3] : 1];
        };
        const out: Array<{ text: string; fg: number[]; bg: number[]; large: boolean }> = [];
        for (const el of document.querySelectorAll<HTMLElement>('body *')) {
          if (el.closest('.maplibregl-map, script, style')) continue;
          const own = [...el.childNodes].some((n) => n.nodeType === Node.TEXT_NODE && (n.textContent ?? '').trim() !== '');
          if (!own || el.getClientRects().length === 0) continue;
          const cs = getComputedStyle(el);
          if (cs.visibility === 'hidden') continue;
          // Composite the backgrounds from the element up to the page.
          const layers: Array<[number, number, number, number]> = [];
          for (let e: HTMLElement | null = el; e; e = e.parentElement) {
            const c = rgba(getComputedStyle(e).backgroundColor);
            if (c[3] > 0) layers.push(c);
            if (c[3] >= 1) break;
          }
          let bg: [number, number, number] = [255, 255, 255];
          for (const [r, g, b, a] of layers.reverse()) bg = [r * a + bg[0] * (1 - a), g * a + bg[1] * (1 - a), b * a + bg[2] * (1 - a)];
          const [r, g, b, a] = rgba(cs.color);
          const fg = [r * a + bg[0] * (1 - a), g * a + bg[1] * (1 - a), b * a + bg[2] * (1 - a)];
          const size = parseFloat(cs.fontSize);
          const bold = Number(cs.fontWeight) >= 700;
          out.push({ text: (el.textContent ?? '').trim().slice(0, 40), fg, bg, large: size >= 24 || (bold && size >= 18.66) });
        }
        return out;
      });
      expect(samples.length, rel).toBeGreaterThan(10);
      for (const s of samples) {
        const ratio = contrastRatio(s.fg.map(Math.round) as [number, number, number], s.bg.map(Math.round) as [number, number, number]);
        expect(ratio, `${rel}: "${s.text}" rgb(${s.fg.map(Math.round)}) on rgb(${s.bg.map(Math.round)})`).toBeGreaterThanOrEqual(s.large ? 3 : 4.5);
      }
    }
  });

  it('has landmarks for everything: one banner with a named navigation, one main, one contentinfo, nothing loose in the body', async () => {
    for (const rel of pages) {
      const r = await visited.get(rel)!.page.evaluate(() => ({
        banners: document.querySelectorAll('body > header').length,
        mains: document.querySelectorAll('main').length,
        mainId: document.querySelector('main')?.id,
        footers: document.querySelectorAll('body > footer').length,
        navNames: [...document.querySelectorAll('header nav')].map((n) => n.getAttribute('aria-label')),
        loose: [...document.body.children]
          .filter((e) => !['HEADER', 'MAIN', 'FOOTER', 'ASIDE', 'NAV', 'SCRIPT'].includes(e.tagName) && !e.classList.contains('skip-link'))
          .map((e) => e.tagName),
        asidesNamed: [...document.querySelectorAll('body > aside')].every((a) => (a.getAttribute('aria-label') ?? '') !== ''),
        lang: document.documentElement.lang,
      }));
      expect(r, rel).toEqual({ banners: 1, mains: 1, mainId: 'content', footers: 1, navNames: ['Site'], loose: [], asidesNamed: true, lang: 'en' });
    }
  });

  it('has one h1 and never skips a heading level', async () => {
    for (const rel of pages) {
      const levels = await visited.get(rel)!.page.$$eval('h1, h2, h3, h4, h5, h6', (hs) => hs.map((h) => Number(h.tagName[1])));
      expect(
        levels.filter((l) => l === 1),
        rel,
      ).toHaveLength(1);
      expect(levels[0], rel).toBe(1);
      levels.forEach((l, i) => {
        if (i > 0) expect(l - levels[i - 1], `${rel}: h${levels[i - 1]} then h${l}`).toBeLessThanOrEqual(1);
      });
    }
  });

  it('parses as written: the HTML parser adds, drops or moves no element', async () => {
    for (const rel of pages) {
      // A <noscript> holds text for a browser with scripts on (HTML § 4.12.2): its elements are not counted.
      const html = readFileSync(join(build.distDir, rel), 'utf8').replace(/<noscript>[\s\S]*?<\/noscript>/g, '<noscript></noscript>');
      const written: Record<string, number> = {};
      for (const m of html.matchAll(/<([a-z][a-z0-9-]*)(?=[\s>/])/gi)) written[m[1].toLowerCase()] = (written[m[1].toLowerCase()] ?? 0) + 1;
      const parsed = await visited
        .get(rel)!
        .page.evaluate((tags) => Object.fromEntries(tags.map((t) => [t, document.getElementsByTagName(t).length])), Object.keys(written));
      expect(parsed, rel).toEqual(written);
    }
  });
});

describe('keyboard and print', () => {
  it('offers a skip link first in the tab order, visible when focused, that moves the focus to the main content', async () => {
    for (const path of ['/', '/methods/', '/downloads/']) {
      const { page } = await session.open(path);
      await page.keyboard.press('Tab');
      const first = await page.evaluate(() => ({
        cls: document.activeElement?.className,
        href: document.activeElement?.getAttribute('href'),
        top: document.activeElement?.getBoundingClientRect().top ?? -1,
      }));
      expect(first.cls, path).toBe('skip-link');
      expect(first.href, path).toBe('#content');
      expect(first.top, path).toBeGreaterThanOrEqual(0);
      await page.keyboard.press('Enter');
      expect(await page.evaluate(() => document.activeElement?.id), path).toBe('content');
    }
  });

  it('prints the methods page without navigation, skip link, unit switch or contents list, keeping equations, tables and cautions', async () => {
    const { page } = await session.open('/methods/');
    await page.emulateMedia({ media: 'print' });
    try {
      for (const hidden of ['.site-header nav', '.skip-link', '.unit-switch', '.toc']) expect(await page.isVisible(hidden), hidden).toBe(false);
      for (const shown of ['h1', '.equation >> nth=0', '#class-limits', '.cautions', '#sources']) expect(await page.isVisible(shown), shown).toBe(true);
      await screenshot(page, 'methods-print');
    } finally {
      await page.emulateMedia({ media: 'screen' });
    }
  });
});
