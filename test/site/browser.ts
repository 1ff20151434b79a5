/**
 * The browser-test harness of the site, for every issue's page tests:
 * - {@link buildTestSite} builds a site from a data folder once per content digest (of src/,
 *   public/, astro.config.mjs, pipeline/, docs/ and the data folder) and shares it between test
 *   files and runs (test-artifacts/site-builds/<digest>/dist, with a lock folder);
 * - {@link startSiteSession} serves it with `startPreviewServer` on 127.0.0.1 (port 0) and
 *   launches Debian's /usr/bin/chromium through playwright-core exactly as STACK.md says (never a
 *   downloaded browser). Every request not to 127.0.0.1 is aborted and recorded; console errors,
 *   page errors, dialogs and CSP violations are recorded per page;
 * - helpers read HTML tables, map pixels and write screenshots to test-artifacts/site/.
 */
import { createHash } from 'node:crypto';
import { execFile } from 'node:child_process';
import { existsSync, readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { mkdir, mkdtemp, rm, stat } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join, relative, resolve } from 'node:path';
import { promisify } from 'node:util';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { startPreviewServer, type PreviewServer } from '../../pipeline/commands/preview.ts';
import type { Rgb } from '../../src/components/map/map-colours.ts';

const run = promisify(execFile);

export const PROJECT_ROOT = resolve(import.meta.dirname, '../..');
export const ARTIFACTS_DIR = join(PROJECT_ROOT, 'test-artifacts/site');
const BUILDS_DIR = join(PROJECT_ROOT, 'test-artifacts/site-builds');

/** The launch arguments STACK.md proved for headless Chromium with WebGL (SwiftShader via ANGLE). */
export const CHROMIUM_ARGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--enable-unsafe-swiftshader',
  // Belt and braces: no host name but the loopback address resolves.
  '--host-resolver-rules=MAP * ~NOTFOUND, EXCLUDE 127.0.0.1',
];

function listFiles(dir: string): string[] {
  if (!existsSync(dir)) return [];
  const out: string[] = [];
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, entry.name);
    if (entry.isDirectory()) out.push(...listFiles(p));
    else out.push(p);
  }
  return out.sort();
}

/** Digest of everything a site build depends on (sources, static files, config, pipeline code, data, base path). */
export function siteInputsDigest(dataDir: string, base = '/'): string {
  const h = createHash('sha256');
  h.update(`base ${base}\0`);
  const inputs = [
    ...listFiles(join(PROJECT_ROOT, 'src')),
    ...listFiles(join(PROJECT_ROOT, 'public')),
    join(PROJECT_ROOT, 'astro.config.mjs'),
    // Pages import pipeline modules (the methods page renders the pipeline's constants).
    ...listFiles(join(PROJECT_ROOT, 'pipeline')),
    // The methods document page renders docs/methods.md.
    ...listFiles(join(PROJECT_ROOT, 'docs')),
    join(PROJECT_ROOT, 'package-lock.json'),
    ...listFiles(dataDir),
  ];
  for (const f of inputs) {
    h.update(relative(PROJECT_ROOT, f));
    h.update('\0');
    h.update(readFileSync(f));
    h.update('\0');
  }
  return h.digest('hex').slice(0, 16);
}

/** Whether the process that took a lock folder (its `pid` file) has gone, so the lock is stale. */
function lockOwnerGone(lockDir: string): boolean {
  let pid: number;
  try {
    pid = Number(readFileSync(join(lockDir, 'pid'), 'utf8'));
  } catch {
    return false; // just being created, or an older lock without a pid: fall back to its age
  }
  try {
    process.kill(pid, 0);
    return false;
  } catch (e) {
    return (e as NodeJS.ErrnoException).code === 'ESRCH';
  }
}

async function withLock<T>(lockDir: string, work: () => Promise<T>): Promise<T> {
  const deadline = Date.now() + 300_000;
  for (;;) {
    try {
      await mkdir(lockDir);
      writeFileSync(join(lockDir, 'pid'), String(process.pid));
      break;
    } catch {
      const age = await stat(lockDir).then(
        (s) => Date.now() - s.mtimeMs,
        () => 0,
      );
      // A test run killed while building leaves its lock behind: take it over at once.
      if (age > 300_000 || lockOwnerGone(lockDir)) await rm(lockDir, { recursive: true, force: true });
      if (Date.now() > deadline) throw new Error(`timed out waiting for the site build lock ${lockDir}`);
      await new Promise((r) => setTimeout(r, 250));
    }
  }
  try {
    return await work();
  } finally {
    await rm(lockDir, { recursive: true, force: true });
  }
}

/** Removes cached builds of other inputs not used for a day, so test-artifacts/ does not grow without end. */
async function pruneOldBuilds(keep: string): Promise<void> {
  const dayAgo = Date.now() - 86_400_000;
  for (const entry of readdirSync(BUILDS_DIR, { withFileTypes: true })) {
    if (!entry.isDirectory() || entry.name === keep || entry.name.endsWith('.lock')) continue;
    const path = join(BUILDS_DIR, entry.name);
    if (statSync(path).mtimeMs < dayAgo) await rm(path, { recursive: true, force: true });
  }
}

/** What {@link buildTestSite} did: where the site is, and whether it was built now or reused. */
export interface TestSiteBuild {
  distDir: string;
  reused: boolean;
  /** Wall time of the build [ms]; 0 when reused. */
  buildMs: number;
}

/**
 * Builds the site from `dataDir` with `buildSite` (in a child process), or reuses the build of
 * the same inputs from an earlier test file or run. `dataDir` is usually the pipeline-made test
 * data (`(await buildPipelineData()).dataDir`, test/site/pipeline-data.ts); `base` is the URL path
 * the site is built for (config `site.base`, default `/`).
 */
export async function buildTestSite(dataDir: string, opts: { base?: string } = {}): Promise<TestSiteBuild> {
  const base = opts.base ?? '/';
  const digest = siteInputsDigest(dataDir, base);
  const distDir = join(BUILDS_DIR, digest, 'dist');
  await mkdir(BUILDS_DIR, { recursive: true });
  return withLock(join(BUILDS_DIR, `${digest}.lock`), async () => {
    if (existsSync(join(distDir, 'index.html'))) return { distDir, reused: true, buildMs: 0 };
    await pruneOldBuilds(digest);
    const t0 = Date.now();
    await run(process.execPath, ['--import', 'tsx', join(PROJECT_ROOT, 'test/site/build-site-child.ts'), dataDir, distDir, base], {
      cwd: PROJECT_ROOT,
      env: { ...process.env, ASTRO_TELEMETRY_DISABLED: '1' },
      maxBuffer: 16 * 1024 * 1024,
    });
    return { distDir, reused: false, buildMs: Date.now() - t0 };
  });
}

/** Every `.html` file of a built site, relative paths. */
export function htmlFiles(distDir: string): string[] {
  return listFiles(distDir)
    .filter((f) => f.endsWith('.html') && statSync(f).isFile())
    .map((f) => relative(distDir, f));
}

/** A page with what it reported while it ran. */
export interface WatchedPage {
  page: Page;
  consoleErrors: string[];
  pageErrors: string[];
  dialogs: string[];
  /** Opened with `javaScript: false`: its script files were aborted on purpose. */
  scriptsBlocked: boolean;
  /** CSP violations the page reported (`securitypolicyviolation` events). */
  cspViolations(): Promise<string[]>;
}

export interface SiteSession {
  baseUrl: string;
  context: BrowserContext;
  /** Requests to anything but 127.0.0.1, aborted. */
  nonLocalRequests: string[];
  /** Every page opened so far. */
  pages: WatchedPage[];
  /** Opens `path` below the site; `javaScript: false` aborts every script file the page asks for. */
  open(path: string, opts?: { javaScript?: boolean }): Promise<WatchedPage>;
  close(): Promise<void>;
}

/** Serves `distDir` on 127.0.0.1 and opens Debian's Chromium on it (see the file comment). */
export async function startSiteSession(distDir: string, viewport = { width: 1200, height: 900 }): Promise<SiteSession> {
  const server: PreviewServer = await startPreviewServer({ dir: distDir, port: 0 });
  const profile = await mkdtemp(join(tmpdir(), 'heathours-chromium-'));
  let context: BrowserContext;
  try {
    context = await chromium.launchPersistentContext(profile, {
      executablePath: '/usr/bin/chromium',
      headless: true,
      args: CHROMIUM_ARGS,
      viewport,
      deviceScaleFactor: 1,
    });
  } catch (e) {
    await server.close();
    await rm(profile, { recursive: true, force: true });
    throw e;
  }
  const nonLocalRequests: string[] = [];
  await context.route('**/*', (route) => {
    const url = new URL(route.request().url());
    if (url.hostname === '127.0.0.1') return route.continue();
    nonLocalRequests.push(route.request().url());
    return route.abort('blockedbyclient');
  });
  await context.addInitScript(() => {
    const seen: string[] = [];
    (globalThis as unknown as { __cspViolations: string[] }).__cspViolations = seen;
    document.addEventListener('securitypolicyviolation', (e) => {
      seen.push(`${e.violatedDirective} blocked ${e.blockedURI || '(inline)'} at ${e.sourceFile}:${e.lineNumber}`);
    });
  });
  const pages: WatchedPage[] = [];
  return {
    baseUrl: server.url,
    context,
    nonLocalRequests,
    pages,
    async open(path, opts = {}) {
      const page = await context.newPage();
      const watched: WatchedPage = {
        page,
        consoleErrors: [],
        pageErrors: [],
        dialogs: [],
        scriptsBlocked: opts.javaScript === false,
        cspViolations: () => page.evaluate(() => [...((globalThis as unknown as { __cspViolations?: string[] }).__cspViolations ?? [])]),
      };
      page.on('console', (m) => {
        if (m.type() === 'error') watched.consoleErrors.push(`${m.text()} (${m.location().url})`);
      });
      page.on('pageerror', (e) => watched.pageErrors.push(e.message));
      page.on('dialog', (d) => {
        watched.dialogs.push(`${d.type()}: ${d.message()}`);
        void d.dismiss();
      });
      if (opts.javaScript === false) await page.route(/\.m?js(\?.*)?$/, (r) => r.abort());
      await page.goto(new URL(path.replace(/^\//, ''), server.url).href, { waitUntil: 'load' });
      pages.push(watched);
      return watched;
    },
    async close() {
      await context.close();
      await server.close();
      await rm(profile, { recursive: true, force: true });
    },
  };
}

/** Rows of a table with a header: one object per body row, keyed by each header cell's `data-key`. */
export async function readDataTable(page: Page, selector: string): Promise<Array<Record<string, string>>> {
  return page.$eval(selector, (table) => {
    const keys = [...table.querySelectorAll('thead th')].map((th) => th.getAttribute('data-key') ?? '');
    return [...table.querySelectorAll('tbody tr')].map((tr) =>
      Object.fromEntries([...tr.querySelectorAll('td')].map((td, i) => [keys[i], (td.textContent ?? '').trim()])),
    );
  });
}

/** A table of labelled rows: `data-key` of each row → its value cell's text. */
export async function readKeyValueTable(page: Page, selector: string): Promise<Record<string, string>> {
  return page.$eval(selector, (table) =>
    Object.fromEntries(
      [...table.querySelectorAll('tbody tr')].map((tr) => [tr.getAttribute('data-key') ?? '', (tr.querySelector('td')?.textContent ?? '').trim()]),
    ),
  );
}

/** Parses a number as the site prints it (U+2212 minus, thin-space thousands). */
export function parseShownNumber(text: string): number {
  return Number(text.replace(/\u2212/g, '-').replace(/[\u2009\u202f ,]/g, ''));
}

/** Waits until the map in container `mapId` has drawn everything (`data-map-state="idle"`). */
export async function waitForMapIdle(page: Page, mapId: string, timeout = 30_000): Promise<void> {
  await page.waitForSelector(`#${mapId}[data-map-state="idle"]`, { timeout });
}

/** The drawn colour of the map `mapId` at a geographic point [° E, ° N], and where that is on the canvas. */
export async function mapPixelAt(page: Page, mapId: string, lngLat: [number, number]): Promise<{ rgb: Rgb; x: number; y: number; inside: boolean }> {
  return page.evaluate(
    ([id, lonlat]) => {
      const map = (
        globalThis as unknown as { heathoursMaps: Record<string, { project(p: [number, number]): { x: number; y: number }; getCanvas(): HTMLCanvasElement }> }
      ).heathoursMaps[id];
      const canvas = map.getCanvas();
      const scale = canvas.width / canvas.clientWidth;
      const p = map.project(lonlat);
      const x = Math.round(p.x * scale);
      const y = Math.round(p.y * scale);
      const copy = document.createElement('canvas');
      copy.width = canvas.width;
      copy.height = canvas.height;
      const ctx = copy.getContext('2d')!;
      ctx.drawImage(canvas, 0, 0);
      const inside = x >= 0 && y >= 0 && x < canvas.width && y < canvas.height;
      const d = inside ? ctx.getImageData(x, y, 1, 1).data : [0, 0, 0];
      return { rgb: [d[0], d[1], d[2]] as [number, number, number], x, y, inside };
    },
    [mapId, lngLat] as const,
  );
}

/** Largest per-channel difference between two colours [0–255]. */
export function colourDistance(a: Rgb, b: Rgb): number {
  return Math.max(Math.abs(a[0] - b[0]), Math.abs(a[1] - b[1]), Math.abs(a[2] - b[2]));
}

/** Writes a full-page screenshot to test-artifacts/site/<name>.png and returns its path. */
export async function screenshot(page: Page, name: string): Promise<string> {
  await mkdir(ARTIFACTS_DIR, { recursive: true });
  const path = join(ARTIFACTS_DIR, `${name}.png`);
  await page.screenshot({ path, fullPage: true });
  return path;
}
