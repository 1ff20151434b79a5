/**
 * Safety of every built page (found generically: every .html file of the built site), on the data
 * folder the real pipeline makes for the site tests, whose region "odd-name" has a name and a note
 * made of HTML and script (test/fixtures/site-regions/odd-name.geojson).
 *
 * - Each page carries the site's Content-Security-Policy meta tag; no inline script (a `<script>`
 *   without `src`), no `<style>` element, no `style=""` attribute, no `on*=` event-handler
 *   attribute, no remote `src`/`href`. Checked twice: on the HTML text, and in the DOM as
 *   Chromium's HTML parser builds it (the reference for what a browser would run).
 * - The odd-name region's name and note appear only escaped (as text) in every file, nothing they
 *   contain becomes an element, and no page opens a dialog.
 * - No page makes a request beyond 127.0.0.1, logs an error or reports a CSP violation.
 * Escaping follows the HTML standard: text content and quoted attribute values are never parsed
 * as markup.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildTestSite, htmlFiles, startSiteSession, type SiteSession, type TestSiteBuild, type WatchedPage } from './browser.ts';
import { buildPipelineData } from './pipeline-data.ts';
import { CONTENT_SECURITY_POLICY } from '../../src/lib/content-security-policy.ts';

const ODD = JSON.parse(readFileSync(join(import.meta.dirname, '../fixtures/site-regions/odd-name.geojson'), 'utf8')) as {
  properties: { id: string; name: string; note: string };
};
/** Raw markup in the odd region's name and note; none may appear unescaped in any built file. */
const MARKUP_PIECES = ['<img src=x', '<script>alert', '<svg onload'];

let build: TestSiteBuild;
let session: SiteSession;
let pages: string[];
/** Every page, opened once with JavaScript and left to run. */
const visited = new Map<string, WatchedPage>();

/** Attribute names (lower case) and values of one start tag, as the HTML tokenizer splits them. */
function tagAttributes(tag: string): Array<[string, string]> {
  const body = tag.replace(/^<[a-z][^\s/>]*/i, '').replace(/\/?>$/, '');
  const out: Array<[string, string]> = [];
  for (const m of body.matchAll(/([^\s"'>/=]+)(?:\s*=\s*(?:"([^"]*)"|'([^']*)'|([^\s"'=<>`]+)))?/g)) {
    out.push([m[1].toLowerCase(), m[2] ?? m[3] ?? m[4] ?? '']);
  }
  return out;
}

/** URL path of a built HTML file: `regions/a/index.html` → `/regions/a/`. */
function urlPath(rel: string): string {
  return `/${rel.replace(/index\.html$/, '')}`;
}

beforeAll(async () => {
  build = await buildTestSite((await buildPipelineData()).dataDir);
  pages = htmlFiles(build.distDir).sort();
  session = await startSiteSession(build.distDir);
  for (const rel of pages) {
    const w = await session.open(urlPath(rel));
    // Give an injected handler (onerror, onload) or a deferred script time to fire, if there were one.
    await w.page.waitForTimeout(250);
    visited.set(rel, w);
  }
});

afterAll(async () => {
  await session?.close();
});

describe('every built page', () => {
  it('is found: the site has its fixed pages (and any region pages, generically)', () => {
    for (const rel of ['index.html', 'inventory/index.html', 'downloads/index.html', 'methods/index.html']) expect(pages).toContain(rel);
    expect(pages.length).toBeGreaterThanOrEqual(4);
  });

  it('carries the Content-Security-Policy meta tag first in its head, with exactly the site policy', () => {
    for (const rel of pages) {
      const html = readFileSync(join(build.distDir, rel), 'utf8');
      const metas = [...html.matchAll(/<meta http-equiv="Content-Security-Policy" content="([^"]*)"/g)];
      expect(metas, rel).toHaveLength(1);
      expect(metas[0][1].replace(/&#39;/g, "'"), rel).toBe(CONTENT_SECURITY_POLICY);
      // Before any script or stylesheet, so it governs them.
      const at = html.indexOf('http-equiv="Content-Security-Policy"');
      for (const first of [html.indexOf('<script'), html.indexOf('<link rel="stylesheet"')]) if (first >= 0) expect(at, rel).toBeLessThan(first);
    }
  });

  it('has no inline script, style element, style attribute, event-handler attribute or remote reference in its HTML text', () => {
    for (const rel of pages) {
      const html = readFileSync(join(build.distDir, rel), 'utf8');
      for (const m of html.matchAll(/<script\b([^>]*)>([\s\S]*?)<\/script>/gi)) {
        expect(/\bsrc="\/[^"]+"/.test(m[1]), `${rel}: <script${m[1]}> without a site src`).toBe(true);
        expect(m[2], `${rel}: script with inline content`).toBe('');
      }
      expect(html, rel).not.toMatch(/<style\b/i);
      // Escaped text never holds a raw `<`, so this sees tags only; attributes are read by name.
      for (const tag of html.match(/<[a-z][^<>]*>/gi) ?? []) {
        for (const [name, value] of tagAttributes(tag)) {
          expect(name, `${rel}: ${tag}`).not.toBe('style');
          expect(name.startsWith('on'), `${rel}: ${tag}`).toBe(false);
          if (['src', 'href', 'action', 'srcset', 'poster', 'data'].includes(name))
            expect(value, `${rel}: ${tag}`).not.toMatch(/^\s*((https?|ftp|wss?):)?\/\//i);
        }
      }
    }
  });

  it('has, as Chromium parses it (scripts off, so the DOM is the HTML), no script without src, no style element or attribute, and no on* attribute', async () => {
    for (const rel of pages) {
      // With scripts running, libraries may set element styles through the CSSOM (MapLibre sizes its
      // canvas so), which the policy allows; the rule is about the HTML the site serves.
      const parsed = await session.open(urlPath(rel), { javaScript: false });
      const found = await parsed.page.evaluate(() => {
        const bad: string[] = [];
        for (const el of document.querySelectorAll('*')) {
          for (const a of el.getAttributeNames()) {
            if (a === 'style' || a.startsWith('on')) bad.push(`<${el.localName} ${a}>`);
          }
        }
        for (const s of document.querySelectorAll('script:not([src])')) bad.push(`inline script: ${(s.textContent ?? '').slice(0, 60)}`);
        for (const s of document.querySelectorAll('style')) bad.push(`style element: ${(s.textContent ?? '').slice(0, 60)}`);
        return bad;
      });
      expect(found, rel).toEqual([]);
    }
  });
});

describe('the region whose name and note are HTML and script', () => {
  it('appears only escaped in every built HTML file, and its name is shown as text on at least one page', async () => {
    expect(ODD.properties.name).toContain('<script>');
    expect(ODD.properties.note).toContain('<svg onload');
    let shown = 0;
    for (const rel of pages) {
      const html = readFileSync(join(build.distDir, rel), 'utf8');
      for (const piece of MARKUP_PIECES) expect(html.includes(piece), `${rel} holds ${piece} unescaped`).toBe(false);
      const text = await visited.get(rel)!.page.evaluate(() => document.body.textContent ?? '');
      if (text.includes(ODD.properties.name)) shown += 1;
    }
    expect(shown, 'pages that show the odd region name as text').toBeGreaterThanOrEqual(1);
  });

  it('turns into no element on any page (no img with src x, no svg from the note) and opens no dialog', async () => {
    for (const rel of pages) {
      const w = visited.get(rel)!;
      const injected = await w.page.evaluate(() => document.querySelectorAll('img[src="x"], svg[onload], script:not([src])').length);
      expect(injected, rel).toBe(0);
      expect(w.dialogs, rel).toEqual([]);
    }
  });
});

describe('the pages at run time', () => {
  it('made no request beyond 127.0.0.1, and logged no error or CSP violation', async () => {
    expect(visited.size).toBe(pages.length);
    for (const [rel, w] of visited) {
      expect(w.consoleErrors, rel).toEqual([]);
      expect(w.pageErrors, rel).toEqual([]);
      expect(await w.cspViolations(), rel).toEqual([]);
    }
    expect(session.nonLocalRequests).toEqual([]);
  });

  it('enforce the Content-Security-Policy: an injected inline script and a remote image are blocked and reported', async () => {
    // A page outside session.pages, so the violations provoked here do not count against the site.
    const page = await session.context.newPage();
    await page.goto(session.baseUrl, { waitUntil: 'load' });
    const ran = await page.evaluate(async () => {
      const s = document.createElement('script');
      s.textContent = 'globalThis.__inlineRan = true;';
      document.head.append(s);
      const img = document.createElement('img');
      img.src = 'https://example.org/x.png';
      document.body.append(img);
      await new Promise((r) => setTimeout(r, 200));
      return (globalThis as unknown as { __inlineRan?: boolean }).__inlineRan === true;
    });
    expect(ran).toBe(false);
    const violations = await page.evaluate(() => (globalThis as unknown as { __cspViolations: string[] }).__cspViolations);
    expect(violations.some((v) => v.startsWith('script-src'))).toBe(true);
    expect(violations.some((v) => v.startsWith('img-src'))).toBe(true);
    await page.close();
  });
});
