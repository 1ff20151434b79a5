/**
 * The downloads page, built from the pipeline-made test data (pipeline-data.ts) and read in
 * Chromium without JavaScript (the page needs none): every file of the manifest, and the manifest
 * itself, is linked exactly once with its size; tables and other files show units, description
 * and SHA-256 as the manifest gives them; layers are grouped by figure and combination, each cell
 * linking the GeoTIFF and PNG the manifest names for that period and statistic; every link
 * answers 200 from the preview server; the manifest's own digest is its SHA-256 (node:crypto).
 */
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { buildTestSite, screenshot, startSiteSession, type SiteSession, type TestSiteBuild } from './browser.ts';
import { buildPipelineData } from './pipeline-data.ts';
import { formatBytes, formatUnits } from '../../src/lib/format.ts';
import { periodName, statisticLabel } from '../../src/lib/layer-labels.ts';
import type { SiteManifest } from '../../src/data/manifest.ts';

let dataDir: string;
let manifest: SiteManifest;
let build: TestSiteBuild;
let session: SiteSession;
let page: Page;

beforeAll(async () => {
  dataDir = (await buildPipelineData()).dataDir;
  manifest = JSON.parse(readFileSync(join(dataDir, 'data/manifest.json'), 'utf8')) as SiteManifest;
  build = await buildTestSite(dataDir);
  session = await startSiteSession(build.distDir);
  page = (await session.open('/downloads/', { javaScript: false })).page;
});

afterAll(async () => {
  await session?.close();
});

/** Every link of the page's main content: href → link texts with the text of its cell and row. */
async function links(): Promise<Array<{ href: string; text: string; cell: string; row: string }>> {
  return page.$$eval('main a[href^="/data/"]', (as) =>
    as.map((a) => ({
      href: a.getAttribute('href') ?? '',
      text: (a.textContent ?? '').trim(),
      cell: (a.closest('td')?.textContent ?? '').replace(/\s+/g, ' ').trim(),
      row: (a.closest('tr')?.textContent ?? '').replace(/\s+/g, ' ').trim(),
    })),
  );
}

describe('the downloads page', () => {
  it('links every file of the manifest and the manifest itself exactly once', async () => {
    const hrefs = (await links()).map((l) => l.href);
    const expected = ['/data/manifest.json', ...manifest.artefacts.map((a) => `/${a.path}`)];
    expect(hrefs.length).toBe(expected.length);
    expect([...hrefs].sort()).toEqual([...expected].sort());
    expect(new Set(hrefs).size).toBe(hrefs.length);
  });

  it('shows the manifest with its size and its SHA-256 as computed from the published file', async () => {
    const bytes = readFileSync(join(build.distDir, 'data/manifest.json'));
    const row = await page.$eval('tr[data-path="data/manifest.json"]', (tr) => [...tr.querySelectorAll('td')].map((td) => (td.textContent ?? '').trim()));
    expect(row[2]).toBe(formatBytes(bytes.length));
    expect(row[3]).toBe(createHash('sha256').update(bytes).digest('hex'));
  });

  it('lists each table and each other file with the units, description, size and SHA-256 of the manifest', async () => {
    const layerFiles = new Set(manifest.layers.flatMap((l) => [l.png, l.tif]));
    const listed = manifest.artefacts.filter((a) => !layerFiles.has(a.path));
    expect(listed.filter((a) => a.kind === 'table').length).toBeGreaterThanOrEqual(7);
    for (const a of listed) {
      const cells = await page.$eval(`tr[data-path="${a.path}"]`, (tr) => [...tr.querySelectorAll('td')].map((td) => (td.textContent ?? '').trim()));
      const table = a.kind === 'table' ? await page.$eval(`tr[data-path="${a.path}"]`, (tr) => tr.closest('table')?.id) : undefined;
      if (a.kind === 'table') expect(table, a.path).toBe('table-files');
      const [, ...rest] = cells;
      const units = a.units === undefined ? '–' : a.units === 'unit column' ? 'in the unit column' : formatUnits(a.units);
      // Tables: what, units, size, digest; other files: kind, what, units, size, digest.
      const tail = rest.slice(-4);
      expect(tail[0].startsWith(a.description), a.path).toBe(true);
      expect(tail[1], a.path).toBe(units);
      expect(tail[2], a.path).toBe(formatBytes(a.bytes));
      expect(tail[3], a.path).toBe(a.sha256);
    }
  });

  it('groups the layers by figure and combination, each cell linking the GeoTIFF and PNG of its period and statistic, with their sizes', async () => {
    const size = new Map(manifest.artefacts.map((a) => [a.path, a.bytes]));
    const shown = await page.$$eval('section.layer-figure', (sections) =>
      sections.map((s) => ({
        figure: s.getAttribute('data-figure') ?? '',
        combos: [...s.querySelectorAll('details.layer-combo')].map((d) => {
          const stats = [...d.querySelectorAll('thead th[data-statistic]')].map((th) => th.getAttribute('data-statistic') ?? '');
          const statLabels = [...d.querySelectorAll('thead th[data-statistic]')].map((th) => (th.textContent ?? '').trim());
          const rows = [...d.querySelectorAll('tbody tr')].map((tr) => ({
            period: tr.getAttribute('data-period') ?? '',
            label: (tr.querySelector('th')?.textContent ?? '').trim(),
            cells: [...tr.querySelectorAll('td')].map((td) => ({
              hrefs: [...td.querySelectorAll('a')].map((a) => a.getAttribute('href') ?? ''),
              text: (td.textContent ?? '').replace(/\s+/g, ' ').trim(),
            })),
          }));
          return { combo: d.getAttribute('data-combo') ?? '', stats, statLabels, rows };
        }),
      })),
    );
    const figures = [...new Set(manifest.layers.map((l) => l.figure))];
    expect(shown.map((s) => s.figure).sort()).toEqual([...figures].sort());
    let cellsSeen = 0;
    for (const fig of shown) {
      const layers = manifest.layers.filter((l) => l.figure === fig.figure);
      expect(fig.combos.map((c) => c.combo).sort(), fig.figure).toEqual([...new Set(layers.map((l) => l.combo))].sort());
      for (const combo of fig.combos) {
        const mine = layers.filter((l) => l.combo === combo.combo);
        expect(combo.stats.sort(), combo.combo).toEqual([...new Set(mine.map((l) => l.statistic))].sort());
        expect(combo.rows.map((r) => r.period).sort()).toEqual([...new Set(mine.map((l) => l.period))].sort());
        for (const row of combo.rows) {
          expect(row.label).toBe(periodName(row.period));
          row.cells.forEach((cell, j) => {
            const stat = combo.stats[j];
            const layer = mine.find((l) => l.period === row.period && l.statistic === stat);
            if (!layer) return expect(cell.text).toBe('–');
            cellsSeen += 1;
            expect(cell.hrefs).toEqual([`/${layer.tif}`, `/${layer.png}`]);
            expect(cell.text).toBe(`GeoTIFF ${formatBytes(size.get(layer.tif)!)} · PNG ${formatBytes(size.get(layer.png)!)}`);
          });
        }
        // The P90 names the test atlas's 2 baseline years.
        expect(combo.statLabels).toEqual(combo.stats.map((st) => statisticLabel(st, manifest.baseline[1] - manifest.baseline[0] + 1)));
        if (combo.stats.includes('p90')) expect(combo.statLabels).toContain('P90 of 2 years (near the highest)');
      }
    }
    expect(cellsSeen).toBe(manifest.layers.length);
  });

  it('names each figure with its label and units from the manifest', async () => {
    const heads = await page.$$eval('section.layer-figure', (ss) =>
      ss.map((s) => ({ id: s.getAttribute('data-figure'), h: s.querySelector('h3')?.textContent, facts: s.querySelector('.layer-figure-facts')?.textContent })),
    );
    for (const f of manifest.figures.filter((f) => manifest.layers.some((l) => l.figure === f.id))) {
      const h = heads.find((x) => x.id === f.id);
      expect(h?.h).toBe(f.label);
      expect(h?.facts).toContain(`Units: ${formatUnits(f.units)}`);
    }
  });

  it('opens a figure and then a combination without JavaScript (details and summary) and every link answers 200', async () => {
    const figure = page.locator('details.layer-figure-combos').first();
    expect(await figure.evaluate((d) => (d as HTMLDetailsElement).open)).toBe(false);
    await figure.locator('summary').first().click();
    const first = figure.locator('details.layer-combo').first();
    expect(await first.evaluate((d) => (d as HTMLDetailsElement).open)).toBe(false);
    await first.locator('summary').click();
    expect(await first.evaluate((d) => (d as HTMLDetailsElement).open)).toBe(true);
    expect(await first.locator('a').first().isVisible()).toBe(true);
    await screenshot(page, 'downloads');
    const hrefs = [...new Set((await links()).map((l) => l.href))];
    const statuses = await Promise.all(hrefs.map(async (h) => (await fetch(new URL(h.slice(1), session.baseUrl), { method: 'HEAD' })).status));
    expect(statuses.filter((s) => s !== 200)).toEqual([]);
  });

  it('lists the data dictionary first among the tables and explains it beside the region tables', async () => {
    expect(await page.$eval('#table-files tbody tr', (tr) => tr.getAttribute('data-path'))).toBe('data/data-dictionary.csv');
    expect(await page.textContent('#dictionary-note')).toMatch(/label and the unit in words/);
    expect(await page.getAttribute('#dictionary-note a', 'href')).toBe('#dictionary-file');
  });

  it('shows the region named with HTML as text beside its files, and says the data are invented', async () => {
    const oddName = (
      JSON.parse(readFileSync(join(dataDir, 'data/regions.geojson'), 'utf8')) as { features: Array<{ properties: { id: string; name: string } }> }
    ).features.find((f) => f.properties.id === 'odd-name')!.properties.name;
    const names = await page.$$eval('tr[data-path*="odd-name"] .region-name', (els) => els.map((e) => e.textContent));
    expect(names.length).toBeGreaterThanOrEqual(3);
    for (const n of names) expect(n).toBe(oddName);
    expect(manifest.atlas.invented).toBe(true);
    expect(await page.isVisible('[data-invented-downloads]')).toBe(true);
  });
});
