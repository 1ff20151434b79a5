/**
 * Atlases of N = 150 and 2N = 300 regions (invented rectangles on the invented small demo grid,
 * the inputs of the site-10000-regions benchmark at sizes a test can build;
 * bench/rectangle-regions.ts), built with `regionWorkbooks: false`: every region gets its tables
 * and pages, no workbook; the map's catalogue carries neither the regions nor a value per region
 * and layer (the regions are in pieces, src/components/map/explorer/region-index.ts); each
 * layer's values file has one value per region equal to the region tables (read here with our
 * CSV parser); and what the map page, the home page and the downloads page send does not grow
 * with the regions: 2N regions cost within a few per cent of N (above FULL_LIST_LIMIT = 100
 * regions, src/lib/region-list.ts). The map's search, run by the page's own loader on the built
 * files and in Chromium (Debian's, through the preview server), finds a region in a piece the
 * first view did not load; the preview server sends the page's scripts gzip-compressed. The
 * 10,000-region build is the benchmark's.
 */
import { existsSync, mkdirSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { beforeAll, describe, expect, it } from 'vitest';
import { buildAtlas } from '../../pipeline/run/build-atlas.ts';
import { rectangleRegions, writeRegionBenchInputs } from '../../bench/rectangle-regions.ts';
import { firstViewBytes } from '../../bench/first-view.mjs';
import { parseCsvObjects } from '../../src/lib/csv-parse.ts';
import { RegionLoader } from '../../src/components/map/explorer/region-loader.ts';
import type { RegionListPiece } from '../../src/components/map/explorer/region-index.ts';
import { PROJECT_ROOT, buildTestSite, startSiteSession } from './browser.ts';
import type { PublishedCatalogue } from '../../src/components/map/explorer/catalogue.ts';

const N = 150;
interface Built {
  n: number;
  dataDir: string;
  dist: string;
  ids: string[];
}
const built: Record<number, Built> = {};

async function build(n: number): Promise<Built> {
  const dir = join(PROJECT_ROOT, 'test-artifacts', `many-regions-${n}`);
  mkdirSync(dir, { recursive: true });
  const regions = rectangleRegions(n, 16, 5);
  const ids = (JSON.parse(regions) as { features: Array<{ properties: { id: string } }> }).features.map((f) => f.properties.id);
  const config = await writeRegionBenchInputs(dir, {
    id: `many-regions-${n}`,
    title: `Test atlas of ${n} regions (invented data)`,
    regions,
    classesFile: join(PROJECT_ROOT, 'content/workload-classes.yaml'),
    extra: 'regionWorkbooks: false\n',
  });
  const dataDir = join(dir, 'out');
  await buildAtlas({ configPath: config, outDir: dataDir, jobs: 2, quiet: true, dataOnly: true, cache: false });
  return { n, dataDir, dist: (await buildTestSite(dataDir)).distDir, ids };
}

beforeAll(async () => {
  // Built afresh each run (about a minute of CPU each); a site is reused when its data are the same.
  process.env.HEATHOURS_BUILD_TIME ??= '2026-01-01T00:00:00.000Z';
  built[N] = await build(N);
  built[2 * N] = await build(2 * N);
}, 3_600_000);

const read = (b: Built, path: string) => readFileSync(join(b.dist, path), 'utf8');
const catalogueOf = (b: Built) => JSON.parse(read(b, 'map/explorer.json')) as PublishedCatalogue & { regions?: unknown; regionValues?: unknown };
const gzipOf = (b: Built, path: string) => gzipSync(readFileSync(join(b.dist, path))).length;
/** Relative growth from N to 2N regions. */
const growth = (a: number, b: number) => (b - a) / a;

describe(`atlases of ${N} and ${2 * N} regions`, () => {
  it('publish each region its tables, summary and tile, and with regionWorkbooks false no workbook', () => {
    const b = built[2 * N];
    const files = new Set(readdirSync(join(b.dataDir, 'data', 'regions')));
    for (const id of b.ids) for (const ext of ['csv', 'wide.csv', 'json']) expect(files.has(`${id}.${ext}`), `${id}.${ext}`).toBe(true);
    expect([...files].filter((f) => f.endsWith('.xlsx'))).toEqual([]);
    expect(b.ids.every((id) => existsSync(join(b.dataDir, 'data', 'calculator', `${id}.bin`)))).toBe(true);
  });

  it('build a report and a one-page summary for every region', () => {
    const b = built[2 * N];
    for (const id of b.ids) {
      expect(existsSync(join(b.dist, 'regions', id, 'index.html')), id).toBe(true);
      expect(existsSync(join(b.dist, 'regions', id, 'summary', 'index.html')), id).toBe(true);
    }
  });

  it("hold neither the regions nor a value per region in the map's catalogue; the pieces hold every region once; each layer's values file has one value per region, equal to the region tables", () => {
    const b = built[2 * N];
    const catalogue = catalogueOf(b);
    expect(catalogue.regions).toBeUndefined();
    expect(catalogue.regionValues).toBeUndefined();
    expect(catalogue.regionIndex.count).toBe(2 * N);
    const byIndex: string[] = [];
    for (const p of catalogue.regionIndex.byId) for (const r of (JSON.parse(read(b, p.path)) as RegionListPiece).regions) byIndex[r.i] = r.id;
    expect([...byIndex].sort()).toEqual([...b.ids].sort());
    const layers = catalogue.layers.filter((l) => l.figure === 'hours-lost-shift' && l.statistic === 'mean').slice(0, 3);
    expect(layers.length).toBe(3);
    for (const l of catalogue.layers) expect(existsSync(join(b.dist, l.values)), l.values).toBe(true);
    for (const l of layers) {
      const values = JSON.parse(read(b, l.values)) as Array<number | null>;
      expect(values).toHaveLength(2 * N);
      byIndex.forEach((id, i) => {
        if (i % 25 !== 0) return;
        const rows = parseCsvObjects(readFileSync(join(b.dataDir, 'data', 'regions', `${id}.csv`), 'utf8'));
        const row = rows.find(
          (x) =>
            x.period === l.period &&
            x.figure === l.figure &&
            x.statistic === l.statistic &&
            x.workload_class === l.view.workloadClass &&
            x.acclimatization === l.view.acclimatization &&
            x.exposure === l.view.exposure &&
            x.method === 'limit',
        )!;
        expect(values[i], `${id} ${l.id}`).toBe(row.value === '' ? null : Number(row.value));
      });
    }
  });

  it('keep the map page first view under 2 MB as gzip sends it, 2N regions within 3 % of N, and the catalogue the same size', () => {
    const a = firstViewBytes(built[N].dist, 'map/');
    const b = firstViewBytes(built[2 * N].dist, 'map/');
    process.stdout.write(
      `many-regions: map first view at ${N} regions ${a.bytes} B stored, ${a.gzipBytes} B gzip; at ${2 * N}: ${b.bytes} B stored, ${b.gzipBytes} B gzip; largest ${b.largest.join('; ')}\n`,
    );
    expect(b.gzipBytes).toBeLessThan(2e6);
    expect(Math.abs(growth(a.gzipBytes, b.gzipBytes))).toBeLessThan(0.03);
    expect(Math.abs(growth(gzipOf(built[N], 'map/explorer.json'), gzipOf(built[2 * N], 'map/explorer.json')))).toBeLessThan(0.01);
  });

  it("find a region by name with the map's own search, from a name piece the first view did not load", async () => {
    const b = built[2 * N];
    const catalogue = catalogueOf(b);
    const view = firstViewBytes(b.dist, 'map/');
    const last = catalogue.regionIndex.byName[catalogue.regionIndex.byName.length - 1];
    expect(catalogue.regionIndex.byName.length).toBeGreaterThan(1);
    expect(view.paths).not.toContain(last.path);
    const target = (JSON.parse(read(b, last.path)) as RegionListPiece).regions.at(-1)!;
    const fetched: string[] = [];
    const loader = new RegionLoader(catalogue.regionIndex, async (path) => {
      fetched.push(path);
      return JSON.parse(read(b, path));
    });
    expect(await loader.search(target.name)).toEqual({ kind: 'region', id: target.id, name: target.name });
    expect(fetched).toContain(last.path);
    expect(fetched.length).toBeLessThanOrEqual(3);
  });

  it('keep the home page and the downloads page within 3 % from N to 2N regions, and list every region and every region file once on their index pages', () => {
    for (const page of ['index.html', 'downloads/index.html']) {
      const a = statSync(join(built[N].dist, page)).size;
      const b = statSync(join(built[2 * N].dist, page)).size;
      process.stdout.write(`many-regions: ${page} ${a} B at ${N} regions, ${b} B at ${2 * N}\n`);
      expect(Math.abs(growth(a, b)), page).toBeLessThan(0.03);
    }
    const b = built[2 * N];
    const listed = (folder: string, pattern: RegExp) =>
      readdirSync(join(b.dist, folder)).flatMap((k) => [...read(b, `${folder}/${k}/index.html`).matchAll(pattern)].map((m) => m[1]));
    const onIndex = listed('region-index', /<li data-region-id="([^"]+)"/g);
    expect([...onIndex].sort()).toEqual([...b.ids].sort());
    const files = listed('downloads/regions', /<tr data-path="([^"]+)"/g);
    const manifest = JSON.parse(readFileSync(join(b.dataDir, 'data', 'manifest.json'), 'utf8')) as { artefacts: Array<{ path: string }> };
    const perRegion = manifest.artefacts.map((x) => x.path).filter((p) => /\/(regions|calculator)\/r\d+\.[a-z.]+$/.test(p));
    expect(perRegion.length).toBeGreaterThanOrEqual(3 * 2 * N);
    expect([...files].sort()).toEqual([...perRegion].sort());
    // The downloads page keeps every other file, and links every region file page.
    const downloads = read(b, 'downloads/index.html');
    for (const p of manifest.artefacts.map((x) => x.path).filter((p) => !perRegion.includes(p) && !p.startsWith('data/layers/')))
      expect(downloads, p).toContain(`data-path="${p}"`);
    for (const k of readdirSync(join(b.dist, 'downloads/regions'))) expect(downloads).toContain(`downloads/regions/${k}/`);
  });

  it('in Chromium: the map draws every region of the opening view from area pieces, fetches no name piece until a search, whose result is fitted; the scripts come gzip-compressed; the home page search opens a report', async () => {
    const b = built[2 * N];
    const catalogue = catalogueOf(b);
    const session = await startSiteSession(b.dist);
    try {
      const requests: Array<{ url: string; encoding: string | undefined }> = [];
      session.context.on('response', (r) => requests.push({ url: new URL(r.url()).pathname, encoding: r.headers()['content-encoding'] }));
      const { page, pageErrors } = await session.open('/map/');
      await page.waitForSelector('#explorer-map[data-map-state="idle"]', { timeout: 60_000 });
      expect(await page.getAttribute('#explorer-map', 'data-regions-drawn')).toBe(String(2 * N));
      expect(await page.locator('[data-region-label]').count()).toBe(2 * N);
      expect(requests.filter((r) => r.url.includes('/map/regions/name-'))).toEqual([]);
      const scripts = requests.filter((r) => /\.m?js$/.test(r.url));
      expect(scripts.length).toBeGreaterThan(0);
      for (const r of scripts) {
        if (statSync(join(b.dist, r.url)).size >= 1024) expect(r.encoding, r.url).toBe('gzip');
      }
      const last = catalogue.regionIndex.byName[catalogue.regionIndex.byName.length - 1];
      const target = (JSON.parse(read(b, last.path)) as RegionListPiece).regions.at(-1)!;
      await page.fill('#map-search-text', target.name);
      await page.click('#map-search button[type="submit"]');
      await page.waitForSelector('#map-search[data-result="region"]', { timeout: 30_000 });
      expect(new URL(page.url()).searchParams.get('region')).toBe(target.id);
      expect(await page.textContent('#map-search-result')).toContain(target.name);
      expect(requests.map((r) => r.url)).toContain(`/${last.path}`);
      expect(pageErrors).toEqual([]);

      const home = await session.open('/');
      await home.page.fill('#region-search-text', target.name);
      await Promise.all([home.page.waitForURL(`**/regions/${target.id}/`, { timeout: 30_000 }), home.page.click('#region-search button[type="submit"]')]);
      expect(await home.page.textContent('h1')).toBe(target.name);
      expect(session.nonLocalRequests).toEqual([]);
    } finally {
      await session.close();
    }
  }, 180_000);
});
