/**
 * Budgets of every built page (found generically), loaded in Chromium from the preview server
 * with JavaScript on, on the pipeline-made test data: every response the page receives is counted
 * (the preview server does not compress, so bytes received = bytes of the files). Reported per
 * page on stderr and in test-artifacts/site/budgets.json:
 * - the page weight = HTML + CSS + JavaScript + images (+ fonts) it loads, and the data it fetches
 *   (JSON, GeoJSON, CSV, binary tiles) beside it;
 * - only the map pages (/map/ and /inventory/) load MapLibre (STACK.md: its chunk is ~1 MB);
 * - a region report (/regions/<id>/) weighs under 300 kB; every other page without a map under
 *   the same 300 kB, except the downloads listing (one link per published file) under 1 MB;
 * - the estimate page's own script under 60 kB: the JavaScript it loads when opened (before any
 *   click) less the files every page loads (the site's °C/°F switch and what it shares). Its
 *   rarely used parts (the monthly detail, the cell and point search, the download writers) are
 *   loaded on demand and not counted; their sizes are printed beside it.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ARTIFACTS_DIR, buildTestSite, htmlFiles, startSiteSession, type SiteSession, type TestSiteBuild } from './browser.ts';
import { buildPipelineData } from './pipeline-data.ts';

/** Pages that show a MapLibre map. */
const MAP_PAGES = new Set(['/map/', '/inventory/']);
const REGION_BUDGET = 300_000;
const PAGE_BUDGET = 300_000;
const LISTING_BUDGET = 1_000_000;
/** The estimate page's own script [B] (issue: the page carries no configuration schema). */
const ESTIMATE_OWN_SCRIPT_BUDGET = 60_000;

interface PageWeight {
  path: string;
  /** Bytes by kind of resource [B]. */
  html: number;
  css: number;
  js: number;
  images: number;
  fonts: number;
  data: number;
  other: number;
  /** HTML + CSS + JS + images + fonts [B]. */
  weight: number;
  requests: number;
  maplibre: string[];
  /** Each script file it loaded and its size [B]. */
  scripts: Record<string, number>;
}

let build: TestSiteBuild;
let session: SiteSession;
const weights: PageWeight[] = [];

/** Loads `path` and adds up every response it receives (the page and its workers). */
async function measure(path: string): Promise<PageWeight> {
  const page = await session.context.newPage();
  const w: PageWeight = { path, html: 0, css: 0, js: 0, images: 0, fonts: 0, data: 0, other: 0, weight: 0, requests: 0, maplibre: [], scripts: {} };
  const pending: Array<Promise<void>> = [];
  const onResponse = (res: import('playwright-core').Response) => {
    pending.push(
      (async () => {
        const body = await res.body().catch(() => Buffer.alloc(0));
        const url = new URL(res.url());
        const type = res.request().resourceType();
        const ext = url.pathname.split('.').pop() ?? '';
        w.requests += 1;
        if (type === 'document') w.html += body.length;
        else if (type === 'stylesheet' || ext === 'css') w.css += body.length;
        else if (type === 'script' || ext === 'js' || ext === 'mjs') {
          w.js += body.length;
          w.scripts[url.pathname] = body.length;
        } else if (type === 'image' || ['png', 'svg', 'jpg', 'webp', 'ico'].includes(ext)) w.images += body.length;
        else if (type === 'font') w.fonts += body.length;
        else if (type === 'fetch' || type === 'xhr' || ['json', 'geojson', 'csv', 'bin', 'tif'].includes(ext)) w.data += body.length;
        else w.other += body.length;
        if (
          (ext === 'js' || ext === 'mjs' || type === 'script') &&
          /maplibre/i.test(url.pathname + body.toString('latin1', 0, Math.min(body.length, 4_000_000)))
        )
          w.maplibre.push(url.pathname);
      })(),
    );
  };
  session.context.on('response', onResponse);
  try {
    await page.goto(new URL(path.slice(1), session.baseUrl).href, { waitUntil: 'networkidle' });
    await page.waitForTimeout(300);
    await Promise.all(pending);
  } finally {
    session.context.off('response', onResponse);
    await page.close();
  }
  w.weight = w.html + w.css + w.js + w.images + w.fonts;
  return w;
}

beforeAll(async () => {
  build = await buildTestSite((await buildPipelineData()).dataDir);
  session = await startSiteSession(build.distDir);
  for (const rel of htmlFiles(build.distDir).sort()) weights.push(await measure(`/${rel.replace(/index\.html$/, '')}`));
  const kB = (n: number) => (n / 1000).toFixed(1).padStart(8);
  process.stderr.write(`page weights [kB] (HTML + CSS + JS + images; data fetched beside):\n`);
  process.stderr.write(
    `${'page'.padEnd(34)}${'weight'.padStart(8)}${'html'.padStart(8)}${'css'.padStart(8)}${'js'.padStart(8)}${'img'.padStart(8)}${'data'.padStart(8)}  requests\n`,
  );
  for (const w of weights)
    process.stderr.write(`${w.path.padEnd(34)}${kB(w.weight)}${kB(w.html)}${kB(w.css)}${kB(w.js)}${kB(w.images)}${kB(w.data)}  ${w.requests}\n`);
  mkdirSync(ARTIFACTS_DIR, { recursive: true });
  writeFileSync(join(ARTIFACTS_DIR, 'budgets.json'), `${JSON.stringify(weights, null, 1)}\n`);
}, 900_000); // a fresh clone builds the test data and the site first

/** Script files every measured page loads (the site-wide part). */
function siteWideScripts(): Set<string> {
  const all = weights.map((w) => new Set(Object.keys(w.scripts)));
  return new Set([...all[0]].filter((f) => all.every((s) => s.has(f))));
}

/** A page's own script: the script files it loads less the site-wide ones [B]. */
function ownScript(w: PageWeight): { bytes: number; files: string[] } {
  const shared = siteWideScripts();
  const files = Object.keys(w.scripts).filter((f) => !shared.has(f));
  return { bytes: files.reduce((n, f) => n + w.scripts[f], 0), files };
}

afterAll(async () => {
  await session?.close();
});

describe('page budgets', () => {
  it('measures every built page, each with its HTML and stylesheet', () => {
    expect(weights.length).toBe(htmlFiles(build.distDir).length);
    for (const w of weights) {
      expect(w.html, w.path).toBeGreaterThan(1000);
      expect(w.css, w.path).toBeGreaterThan(1000);
    }
  });

  it('loads MapLibre on the map pages only', () => {
    for (const w of weights) {
      if (MAP_PAGES.has(w.path)) expect(w.maplibre.length, `${w.path} shows a map`).toBeGreaterThan(0);
      else expect(w.maplibre, w.path).toEqual([]);
    }
    expect(weights.some((w) => MAP_PAGES.has(w.path))).toBe(true);
  });

  it('keeps a region report under 300 kB, every other page without a map under 300 kB and the downloads listing under 1 MB', () => {
    for (const w of weights) {
      if (MAP_PAGES.has(w.path)) continue;
      const budget = w.path.startsWith('/regions/') ? REGION_BUDGET : w.path === '/downloads/' ? LISTING_BUDGET : PAGE_BUDGET;
      expect(w.weight, `${w.path}: ${w.weight} B`).toBeLessThan(budget);
    }
  });

  it('keeps the estimate page\u2019s own script (what it loads when opened, less the site-wide files) under 60 kB; the parts it loads on demand stay out of it', async () => {
    const w = weights.find((x) => x.path === '/estimate/')!;
    expect(w, 'the estimate page is built').toBeDefined();
    const own = ownScript(w);
    process.stderr.write(
      `estimate page own script: ${own.bytes} B in ${own.files.length} files (${own.files.map((f) => `${f.split('/').pop()} ${w.scripts[f]}`).join(', ')}); site-wide: ${[...siteWideScripts()].map((f) => `${f.split('/').pop()} ${w.scripts[f]}`).join(', ')}\n`,
    );
    expect(own.files.length, 'the page loads a script of its own').toBeGreaterThan(0);
    expect(own.bytes).toBeLessThan(ESTIMATE_OWN_SCRIPT_BUDGET);
    // The on-demand chunks exist in the build and were not loaded on opening.
    const { readdirSync, statSync } = await import('node:fs');
    const assets = readdirSync(join(build.distDir, 'assets')).filter((f) => f.endsWith('.js'));
    const lazy = assets.filter((f) => /^(monthly-detail|cell-place|bid-csv|bid-json)\./.test(f));
    expect(lazy.length, lazy.join(', ')).toBe(4);
    process.stderr.write(`on demand: ${lazy.map((f) => `${f} ${statSync(join(build.distDir, 'assets', f)).size}`).join(', ')}\n`);
    for (const f of lazy)
      expect(
        Object.keys(w.scripts).some((u) => u.endsWith(`/${f}`)),
        f,
      ).toBe(false);
  });

  it('made no request beyond 127.0.0.1', () => {
    expect(session.nonLocalRequests).toEqual([]);
  });
});
