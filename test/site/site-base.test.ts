/**
 * A site hosted under a sub-folder (config `site.base`): the configuration accepts a URL path and
 * refuses anything else with a catalogued error; a site built for `/sub/atlas/` has no
 * root-absolute link, source or data address outside that base in any page or stylesheet; served
 * from a parent folder at http://127.0.0.1/sub/atlas/ in Chromium, its pages, map, calculator and
 * downloads load with no request that fails or leaves the base.
 */
import { cpSync, existsSync, mkdirSync, readFileSync, readdirSync, statSync, writeFileSync } from 'node:fs';
import { dirname, join, relative } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildTestSite, PROJECT_ROOT, startSiteSession, type SiteSession } from './browser.ts';
import { buildPipelineData } from './pipeline-data.ts';
import { parseConfig } from '../../pipeline/config/load.ts';
import { expectCatalogued } from '../helpers/catalogued.ts';

const BASE = '/sub/atlas/';
let distDir = '';
let rootDir = '';
let session: SiteSession;

function files(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) => (e.isDirectory() ? files(join(dir, e.name)) : [join(dir, e.name)]));
}

beforeAll(async () => {
  const build = await buildTestSite((await buildPipelineData()).dataDir, { base: BASE });
  distDir = build.distDir;
  // Serve the site from a parent folder, as a host would under its sub-folder.
  rootDir = join(dirname(distDir), 'host-root');
  const target = join(rootDir, BASE);
  if (!existsSync(join(target, 'index.html'))) {
    mkdirSync(target, { recursive: true });
    cpSync(distDir, target, { recursive: true });
    // The host's own page at its root (the preview server wants one); the atlas lives below.
    writeFileSync(join(rootDir, 'index.html'), '<!doctype html><title>Host</title><p>The atlas is under /sub/atlas/.</p>\n');
  }
  session = await startSiteSession(rootDir, { width: 1200, height: 900 });
}, 900_000);

afterAll(async () => {
  await session?.close();
});

describe('site.base in the atlas configuration', () => {
  const demo = readFileSync(join(PROJECT_ROOT, 'content/atlas.yaml'), 'utf8');
  it('accepts a URL path with or without its final slash, stores it with one, and defaults to /', () => {
    expect(parseConfig(demo, 'a.yaml').site.base).toBe('/');
    expect(parseConfig(`${demo}\nsite:\n  base: /atlas/2025\n`, 'a.yaml').site.base).toBe('/atlas/2025/');
    expect(parseConfig(`${demo}\nsite:\n  base: /heat_atlas-v1.2/\n`, 'a.yaml').site.base).toBe('/heat_atlas-v1.2/');
  });

  it('refuses what is not a path below the host (no leading slash, spaces, a full address, dot parts) with ConfigInvalid naming site.base', () => {
    for (const bad of ['atlas/', '/my atlas/', 'https://example.org/atlas/', '/a/../b/', '/./', '/a?x=1']) {
      expectCatalogued(() => parseConfig(`${demo}\nsite:\n  base: "${bad}"\n`, 'a.yaml'), 'ConfigInvalid', /site\.base/);
    }
  });
});

describe('a site built for /sub/atlas/', () => {
  it('has no root-absolute address outside its base in any page or stylesheet', () => {
    const bad: string[] = [];
    let seen = 0;
    for (const f of files(distDir).filter((p) => /\.(html|css)$/.test(p) && !relative(distDir, p).startsWith('data/'))) {
      const text = readFileSync(f, 'utf8');
      const attrs = [...text.matchAll(/(?:href|src|action|data-[a-z-]*url)="(\/[^"]*)"/g)].map((m) => m[1]);
      const urls = [...text.matchAll(/url\(\s*['"]?(\/[^'")]*)/g)].map((m) => m[1]);
      for (const a of [...attrs, ...urls]) {
        seen += 1;
        if (!a.startsWith(BASE)) bad.push(`${relative(distDir, f)}: ${a}`);
      }
    }
    expect(seen).toBeGreaterThan(100);
    expect(bad).toEqual([]);
  });

  it('serves its pages, map, calculator and downloads under /sub/atlas/ with no failed request and none outside the base', async () => {
    const failed: string[] = [];
    const outside: string[] = [];
    session.context.on('response', (r) => {
      const url = new URL(r.url());
      if (r.status() >= 400) failed.push(`${r.status()} ${url.pathname}`);
      if (url.hostname === '127.0.0.1' && !url.pathname.startsWith(BASE)) outside.push(url.pathname);
    });
    session.context.on('requestfailed', (r) => failed.push(`failed ${r.url()}`));
    const home = (await session.open(`${BASE}`)).page;
    expect(await home.textContent('h1')).toContain('Site test atlas');
    const links = await home.$$eval('a[href]', (as) =>
      as.map((a) => new URL(a.getAttribute('href') ?? '', location.href).href).filter((h) => h.startsWith(location.origin)),
    );
    expect(links.length).toBeGreaterThan(10);
    for (const l of new Set(links.map((h) => h.split('#')[0]))) {
      const status = (await fetch(l, { method: 'HEAD' })).status;
      expect(status, l).toBe(200);
    }
    const map = (await session.open(`${BASE}map/`)).page;
    await map.waitForSelector('#explorer-map[data-map-state="idle"]', { timeout: 30_000 });
    const estimate = (await session.open(`${BASE}estimate/?region=sollent-coast`)).page;
    await estimate.waitForSelector('#estimate-app[data-state="ready"]', { timeout: 30_000 });
    // The parts the estimate page loads on demand come from under the base too: the monthly detail and the CSV writer.
    await estimate.click('.estimate-monthly > summary');
    await estimate.waitForFunction(() => document.querySelectorAll('#estimate-table tbody tr').length === 13, undefined, { timeout: 30_000 });
    const [csv] = await Promise.all([estimate.waitForEvent('download'), estimate.click('#bid-csv')]);
    expect(csv.suggestedFilename()).toMatch(/^bid-sollent-coast-.*\.csv$/);
    await (await session.open(`${BASE}regions/sollent-coast/`)).page.waitForLoadState('load');
    await (await session.open(`${BASE}regions/sollent-coast/summary/`)).page.waitForLoadState('load');
    await (await session.open(`${BASE}downloads/`)).page.waitForLoadState('load');
    await (await session.open(`${BASE}methods/`)).page.waitForLoadState('load');
    expect(failed).toEqual([]);
    expect(outside).toEqual([]);
    expect(session.nonLocalRequests).toEqual([]);
    for (const p of session.pages) expect(p.pageErrors).toEqual([]);
    // The files themselves are in the built folder, at the same relative places.
    expect(statSync(join(rootDir, BASE, 'data/manifest.json')).isFile()).toBe(true);
  }, 180_000);
});
