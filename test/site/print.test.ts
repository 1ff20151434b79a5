/**
 * The printed region report and its one-page summary, printed to PDF by Chromium (A4) for every
 * region of the pipeline-made test atlas and read back with poppler's pdfinfo and pdftotext
 * (Debian's poppler-utils, an outside reader of the PDF): the report takes at most 4 pages, the
 * summary exactly 1; every page's foot names the atlas, the build and the data and numbers the
 * page ("Page 2 of 4"); the downloads are one line with full addresses instead of link tables;
 * no table cell hyphenates or breaks a word.
 */
import { execFileSync } from 'node:child_process';
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ARTIFACTS_DIR, buildTestSite, startSiteSession, type SiteSession } from './browser.ts';
import { buildPipelineData } from './pipeline-data.ts';
import { formatUtc } from '../../src/lib/format.ts';

let session: SiteSession;
let regions: Array<{ id: string; name: string }> = [];
let buildTime = '';

beforeAll(async () => {
  const dataDir = (await buildPipelineData()).dataDir;
  const distDir = (await buildTestSite(dataDir)).distDir;
  regions = (
    JSON.parse(readFileSync(join(dataDir, 'data/regions.geojson'), 'utf8')) as { features: Array<{ properties: { id: string; name: string } }> }
  ).features.map((f) => f.properties);
  buildTime = (JSON.parse(readFileSync(join(dataDir, 'data/manifest.json'), 'utf8')) as { buildTime: string }).buildTime;
  session = await startSiteSession(distDir);
}, 900_000);

afterAll(async () => {
  await session?.close();
});

interface Printed {
  pages: number;
  /** pdftotext's text of each page. */
  text: string[];
  pdfPath: string;
}

/** Prints `path` to an A4 PDF in Chromium and reads it back with poppler. */
async function print(path: string, name: string): Promise<Printed> {
  const { page } = await session.open(path);
  const pdf = await page.pdf({ format: 'A4', preferCSSPageSize: true });
  await page.close();
  mkdirSync(ARTIFACTS_DIR, { recursive: true });
  const pdfPath = join(ARTIFACTS_DIR, `print-${name}.pdf`);
  writeFileSync(pdfPath, pdf);
  const info = execFileSync('pdfinfo', [pdfPath], { encoding: 'utf8' });
  const pages = Number(/^Pages:\s+(\d+)/m.exec(info)?.[1]);
  const text = execFileSync('pdftotext', ['-layout', pdfPath, '-'], { encoding: 'utf8' }).split('\f').slice(0, pages);
  return { pages, text, pdfPath };
}

function expectFooters(p: Printed, where: string): void {
  const built = `built ${formatUtc(buildTime)}`;
  p.text.forEach((t, i) => {
    const flat = t.replace(/\s+/g, ' ');
    expect(flat, `${where} page ${i + 1}`).toContain(`Page ${i + 1} of ${p.pages}`);
    expect(flat, `${where} page ${i + 1}`).toContain(built);
    expect(flat, `${where} page ${i + 1}`).toContain('data: invented');
    expect(flat, `${where} page ${i + 1}`).toContain('Site test atlas (invented data)');
  });
}

describe('the printed region report', () => {
  it('fits on at most 4 A4 pages for every region (it took 17), each page numbered and footed with the atlas, the build and the data', async () => {
    const counts: Record<string, number> = {};
    for (const r of regions) {
      const p = await print(`/regions/${r.id}/`, `report-${r.id}`);
      counts[r.id] = p.pages;
      expect(p.pages, r.id).toBeLessThanOrEqual(4);
      expectFooters(p, r.id);
    }
    process.stderr.write(`printed report pages: ${JSON.stringify(counts)}\n`);
  }, 300_000);

  it('prints the downloads as one line of full addresses, not the link tables; the other classes are named, not printed', async () => {
    const { page } = await session.open('/regions/sollent-coast/');
    await page.emulateMedia({ media: 'print' });
    expect(await page.isVisible('#print-downloads')).toBe(true);
    for (const sel of ['#region-files', '#region-layers', 'details.class-tables', '.report-actions', '.site-header nav'])
      expect(await page.isVisible(sel), sel).toBe(false);
    expect(await page.isVisible('#print-other-classes')).toBe(true);
    const line = (await page.textContent('#print-downloads'))!.replace(/\s+/g, ' ');
    for (const path of ['data/regions/sollent-coast.csv', 'data/data-dictionary.csv', 'regions/sollent-coast/summary/', 'downloads/'])
      expect(line).toContain(new URL(path, session.baseUrl).href);
    const p = await print('/regions/sollent-coast/', 'report-downloads');
    const all = p.text.join('\n').replace(/\s+/g, '');
    expect(all).toContain(new URL('data/regions/sollent-coast.csv', session.baseUrl).href);
    await page.close();
  });

  it('never hyphenates or breaks a word inside a table cell: print styles say so, and every word of the printed tables is whole in the PDF text', async () => {
    const { page } = await session.open('/regions/sollent-coast/');
    await page.emulateMedia({ media: 'print' });
    const cells = await page.$$eval('.region-report table th, .region-report table td', (all) =>
      all
        .filter((c) => (c as HTMLElement).offsetParent !== null)
        .map((c) => {
          const s = getComputedStyle(c);
          return { style: `${s.hyphens}|${s.overflowWrap}|${s.wordBreak}`, text: (c as HTMLElement).innerText };
        }),
    );
    await page.close();
    expect(cells.length).toBeGreaterThan(300);
    expect([...new Set(cells.map((c) => c.style))]).toEqual(['manual|normal|normal']);
    // Every word of six letters or more in a printed table cell, e.g. "Unacclimatized", "September".
    const words = [...new Set(cells.flatMap((c) => c.text.match(/[A-Za-z]{6,}/g) ?? []))];
    expect(words).toEqual(expect.arrayContaining(['Unacclimatized', 'September', 'Moderate']));
    const p = await print('/regions/sollent-coast/', 'report-words');
    const pdfWords = new Set(p.text.join('\n').match(/[A-Za-z]+/g) ?? []);
    expect(words.filter((w) => !pdfWords.has(w))).toEqual([]);
  });
});

describe('the one-page summary for a bid file', () => {
  it('prints on exactly one A4 page for every region, footed and numbered, with the monthly table, the cautions and the addresses', async () => {
    for (const r of regions) {
      const p = await print(`/regions/${r.id}/summary/`, `summary-${r.id}`);
      expect(p.pages, r.id).toBe(1);
      expectFooters(p, `${r.id} summary`);
      const flat = p.text[0].replace(/\s+/g, ' ');
      for (const words of ['Whole year', 'Before you use these figures', 'Screening values only', 'P90 of 2 years']) expect(flat, r.id).toContain(words);
      expect(flat.replace(/\s+/g, '')).toContain(new URL(`regions/${r.id}/`, session.baseUrl).href);
    }
  }, 300_000);
});
