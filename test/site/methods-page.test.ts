/**
 * The methods page as built from the pipeline-made test data (pipeline-data.ts), read in
 * Chromium: every constant shown is the pipeline's constant (read back from the module named in
 * the cell, or, for a number written in a function, the descriptor value that
 * methods-constants.test.ts evaluates against that function); every method, equation, source and
 * caution is there; the provenance is the manifest's; the limits per class are the NIOSH 2016
 * REL/RAL check values of docs/methods.md §8.2; the data are said to be invented. The Copernicus
 * attribution of real ERA5 / ERA5-Land builds is checked on the pure function.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { buildTestSite, readKeyValueTable, screenshot, startSiteSession, type SiteSession, type TestSiteBuild } from './browser.ts';
import { buildPipelineData } from './pipeline-data.ts';
import { resolveExport } from './method-exports.ts';
import { PHYSICS_METHODS } from '../../pipeline/physics/methods.ts';
import { WORK_METHODS } from '../../pipeline/work/methods.ts';
import { CLIMATE_METHODS } from '../../pipeline/climate/methods.ts';
import { REGION_METHODS } from '../../pipeline/regions/methods.ts';
import { SOURCES, UNVERIFIED, formatMethodNumber, parseMethodNumber } from '../../pipeline/model/sources.ts';
import { MODELLING_CHOICES } from '../../pipeline/physics/modelling-choices.ts';
import { CLOTHING_ENSEMBLES, HOOD_CAV_SOURCE_TAG } from '../../pipeline/work/clothing.ts';
import { CAUTIONS } from '../../src/lib/cautions.ts';
import { formatBytes, formatUtc } from '../../src/lib/format.ts';
import { dataAttribution } from '../../src/lib/attribution.ts';
import type { SiteManifest } from '../../src/data/manifest.ts';

const METHODS = [PHYSICS_METHODS, WORK_METHODS, CLIMATE_METHODS, REGION_METHODS].flatMap((g) => g.methods);

let manifest: SiteManifest;
let build: TestSiteBuild;
let session: SiteSession;
let page: Page;

beforeAll(async () => {
  const { dataDir } = await buildPipelineData();
  manifest = JSON.parse(readFileSync(join(dataDir, 'data/manifest.json'), 'utf8')) as SiteManifest;
  build = await buildTestSite(dataDir);
  session = await startSiteSession(build.distDir);
  page = (await session.open('/methods/')).page;
});

afterAll(async () => {
  await session?.close();
});

describe('the methods page', () => {
  it('shows every constant as the pipeline holds it: each cell\u2019s value is the export its code reference names, printed exactly', async () => {
    const cells = await page.$$eval('[data-constant]', (tds) =>
      tds.map((td) => ({
        method: td.closest('[data-method]')?.getAttribute('data-method') ?? '',
        symbol: td.getAttribute('data-constant') ?? '',
        value: td.getAttribute('data-value') ?? '',
        code: td.getAttribute('data-code') ?? '',
        text: (td.textContent ?? '').trim(),
      })),
    );
    expect(cells.length).toBe(METHODS.reduce((n, m) => n + m.constants.length, 0));
    let exported = 0;
    for (const c of cells) {
      const where = `${c.method} ${c.symbol}`;
      expect(parseMethodNumber(c.text), where).toBe(Number(c.value));
      const descriptor = METHODS.find((m) => m.id === c.method)!.constants.find((k) => k.symbol === c.symbol)!;
      expect(Number(c.value), where).toBe(descriptor.value);
      expect(c.code, where).toBe(descriptor.code);
      if (c.code.includes('#')) {
        expect(await resolveExport(c.code), where).toBe(Number(c.value));
        exported += 1;
      }
    }
    expect(exported).toBeGreaterThan(80);
  });

  it('shows every method of every stage with its equation lines, in the descriptors\u2019 order', async () => {
    const shown = await page.$$eval('article.method', (as) =>
      as.map((a) => ({
        id: a.getAttribute('data-method'),
        name: a.querySelector('h3')?.textContent,
        lines: [...a.querySelectorAll('[data-equation] code')].map((c) => c.textContent),
      })),
    );
    expect(shown.map((s) => s.id)).toEqual(METHODS.map((m) => m.id));
    METHODS.forEach((m, i) => {
      expect(shown[i].name).toBe(m.name);
      expect(shown[i].lines).toEqual(m.equation);
    });
    // Equations print the constants themselves: the WBGT weights, the REL intercept.
    expect(shown.find((s) => s.id === 'wbgt')?.lines[0]).toBe('WBGT = 0.7·T_nw + 0.2·T_g + 0.1·T_a');
    expect(shown.find((s) => s.id === 'limit-curve')?.lines[0]).toContain(`${formatMethodNumber(56.7)} − ${formatMethodNumber(11.5)}·log₁₀ M`);
  });

  it('links every cited source to its entry, and lists the whole bibliography with what was checked', async () => {
    const cited = await page.$$eval('a[data-source]', (as) => as.map((a) => a.getAttribute('href')));
    expect(cited.length).toBeGreaterThan(20);
    const anchors = await page.$$eval('[data-ref]', (lis) => lis.map((li) => ({ id: li.id, text: li.textContent ?? '' })));
    expect(anchors.map((a) => a.id)).toEqual(SOURCES.map((s) => `ref-${s.id}`));
    for (const href of cited) expect(anchors.map((a) => `#${a.id}`)).toContain(href);
    SOURCES.forEach((s, i) => {
      expect(anchors[i].text).toContain(s.title);
      expect(anchors[i].text).toContain(s.checked);
      if (s.doi) expect(anchors[i].text).toContain(s.doi);
    });
  });

  it('states the provenance of this build from the manifest: build time, code version, configuration digest, years, inputs with digests', async () => {
    const facts = await readKeyValueTable(page, '#build-facts');
    expect(facts['build-time']).toBe(formatUtc(manifest.buildTime));
    expect(facts['code-version']).toBe(`heathours ${manifest.codeVersion}`);
    expect(facts['config-digest']).toBe(manifest.configDigest);
    expect(facts.years).toBe(`${manifest.years[0]}–${manifest.years[1]}`);
    expect(facts.baseline).toBe(`${manifest.baseline[0]}–${manifest.baseline[1]}`);
    expect(facts['latest-year']).toBe(String(manifest.latestYear));
    expect(facts.data).toContain('Invented data');
    const rows = await page.$$eval('#inputs tbody tr', (trs) => trs.map((tr) => [...tr.querySelectorAll('td')].map((td) => (td.textContent ?? '').trim())));
    expect(rows).toHaveLength(manifest.inputs.length);
    manifest.inputs.forEach((f, i) => {
      expect(rows[i][0]).toBe(f.name);
      // Hour-end stamps: a file running 2021-01-01 01:00 to 2022-01-01 00:00 UTC holds 2021.
      expect(rows[i][1]).toBe(f.timeStart === '' ? 'static (no time axis)' : String(new Date(Date.parse(f.timeEnd) - 1).getUTCFullYear()));
      expect(rows[i][2]).toBe(formatBytes(f.bytes));
      expect(rows[i][3]).toBe(f.sha256);
      expect(rows[i][5]).toBe(f.variables.join(', '));
    });
    expect(rows.map((r) => r[1])).toEqual(expect.arrayContaining(['2021', '2022', '2023']));
  });

  it('says the input data are invented and credits no third party for them', async () => {
    const licence = (await page.textContent('#licence')) ?? '';
    expect(licence).toContain('invented');
    expect(licence).not.toContain('Copernicus');
    expect(licence).toContain(manifest.atlas.attribution!);
  });

  it('gives per class the limits of the build\u2019s limit model: the NIOSH 2016 REL and RAL check values (docs/methods.md §8.2)', async () => {
    // docs/methods.md §8.2 check values: M → REL, RAL: 180 → 30.76, 28.10; 300 → 28.21, 24.97; 415 → 26.59, 22.99; 520 → 25.47, 21.60 °C.
    const check: Record<number, [number, number]> = { 180: [30.76, 28.1], 300: [28.21, 24.97], 415: [26.59, 22.99], 520: [25.47, 21.6] };
    expect(manifest.work.limitModel).toBe('curve-2017');
    const rows = await page.$$eval('#class-limits tbody tr', (trs) =>
      trs.map((tr) => ({
        rate: Number(tr.children[1].textContent),
        acc: Number(tr.querySelector('[data-limit="acclimatized"] [data-temp-c]')?.getAttribute('data-temp-c')),
        un: Number(tr.querySelector('[data-limit="unacclimatized"] [data-temp-c]')?.getAttribute('data-temp-c')),
      })),
    );
    expect(rows.map((r) => r.rate)).toEqual(manifest.work.classes.map((c) => c.metabolicRate));
    for (const r of rows) {
      expect(Math.abs(r.acc - check[r.rate][0]), `REL at ${r.rate} W`).toBeLessThan(0.006);
      expect(Math.abs(r.un - check[r.rate][1]), `RAL at ${r.rate} W`).toBeLessThan(0.006);
    }
  });

  it('carries the cautions in full, and each caution of the tables with its source', async () => {
    expect(await page.$$eval('.cautions li', (lis) => lis.map((li) => li.getAttribute('data-caution')))).toEqual(CAUTIONS.map((c) => c.id));
    const rows = await page.$$eval('#caution-table tbody tr', (trs) =>
      trs.map((tr) => ({ id: tr.getAttribute('data-caution-source'), cells: [...tr.querySelectorAll('td')].map((td) => td.textContent) })),
    );
    expect(rows.map((r) => r.id)).toEqual(manifest.work.cautions.map((c) => c.id));
    manifest.work.cautions.forEach((c, i) => expect(rows[i].cells).toEqual([c.text, c.basis]));
    const text = ((await page.textContent('main')) ?? '').toLowerCase();
    for (const words of ['screening', 'competent person', 'local regulations', 'medical help']) expect(text).toContain(words);
    await screenshot(page, 'methods');
  });

  it('names the globe of the build (the manifest\u2019s physics.globeDiameter, 150 mm by default) and the shade model (open sky with the sun removed)', async () => {
    const settings = await readKeyValueTable(page, '#work-settings');
    expect(manifest.physics.globeDiameter).toBe(0.15);
    expect(settings['globe-diameter']).toMatch(/^150 mm: the standard black globe the screening limits assume/);
    expect(settings.exposures).toContain('in the shade (open sky with the sun removed)');
  });

  it('states each modelling choice with its reasoning and its measured effect on the demo, labelled invented', async () => {
    const ids = await page.$$eval('[data-choice]', (els) => els.map((e) => e.getAttribute('data-choice')));
    expect(ids).toEqual(MODELLING_CHOICES.map((c) => c.id));
    for (const c of MODELLING_CHOICES) expect(await page.$$eval(`#choice-${c.id} [data-measured]`, (els) => els.length), c.id).toBe(c.measured.length);
    expect(await page.textContent('#modelling-choices')).toMatch(/invented/);
  });

  it('keeps what is not verified in one list, each row linked to its source; option labels carry no such words, and the page cites no methods document outside the repository', async () => {
    const rows = await page.$$eval('#unverified-table tbody tr', (trs) =>
      trs.map((tr) => ({ id: tr.getAttribute('data-unverified'), href: tr.querySelector('a')?.getAttribute('href') })),
    );
    const fromMemory = CLOTHING_ENSEMBLES.filter((e) => e.sourceTag === 'from-memory').length + (HOOD_CAV_SOURCE_TAG === 'from-memory' ? 1 : 0);
    expect(rows.length).toBe(UNVERIFIED.length + fromMemory);
    for (const r of rows) expect(r.href).toBe(`#ref-${r.id}`);
    const html = await page.content();
    expect(html).not.toMatch(/METHODS\.md/);
    expect(html).not.toMatch(/value not verified/);
  });
});

describe('the data attribution', () => {
  it('credits the Copernicus Climate Change Service for ERA5 and ERA5-Land, with the year, a dataset citation and the from-memory caveat', () => {
    for (const product of ['era5', 'era5-land'] as const) {
      const a = dataAttribution({ invented: false, product, attribution: 'Own line.' }, 2025);
      expect(a.credit[0]).toContain('Contains modified Copernicus Climate Change Service information 2025');
      expect(a.credit[0]).toContain('Neither the European Commission nor ECMWF is responsible');
      expect(a.credit).toContain('Own line.');
      expect(a.citation).toContain(product === 'era5' ? 'ERA5 hourly data on single levels' : 'ERA5-Land hourly data');
      expect(a.caveat).toMatch(/from memory/);
    }
  });

  it('says invented data are invented and names no licence holder', () => {
    const a = dataAttribution({ invented: true, product: 'era5', attribution: undefined }, 2025);
    expect(a.licence).toMatch(/invented/);
    expect(a.credit.join(' ')).not.toMatch(/Copernicus|ECMWF/);
    expect(a.citation).toBeUndefined();
  });
});

describe('the methods document page (/methods/document/)', () => {
  it('is linked from the methods page and shows docs/methods.md: its title as the one h1, then every section and subsection heading in order', async () => {
    const href = await page.getAttribute('#methods-document-link', 'href');
    expect(href).toMatch(/\/methods\/document\/$/);
    const doc = (await session.open(href!)).page;
    const md = readFileSync(join(import.meta.dirname, '../../docs/methods.md'), 'utf8');
    const expected = [...md.matchAll(/^(#{1,3}) (.+)$/gm)].map((m) => ({ level: m[1].length, text: m[2].replace(/`/g, '').trim() }));
    const shown = await doc.$$eval('main h1, main h2, main h3', (hs) => hs.map((h) => ({ level: Number(h.tagName[1]), text: (h.textContent ?? '').trim() })));
    expect(expected.length).toBeGreaterThan(50);
    // Astro's Markdown turns straight quotes and "--" into typographic ones; compare ignoring them.
    const plain = (s: string) => s.replace(/[\u2018\u2019]/g, "'").replace(/[\u201c\u201d]/g, '"');
    expect(shown.map((h) => ({ ...h, text: plain(h.text) }))).toEqual(expected.map((h) => ({ ...h, text: plain(h.text) })));
    // The equations and tables arrive too: the first and the last numbered equation, and the check values of the limit curves.
    const text = await doc.textContent('main');
    expect(text).toContain('(2.1) T[°C] = T[K] − 273.15');
    expect(text).toContain('(13.5) cost = crew-hours lost × labour rate');
    expect(text).toContain('115 → 33.00, 30.84; 180 → 30.76, 28.10');
    expect(await doc.$$eval('main table', (ts) => ts.length)).toBe(md.match(/^\| ---/gm)!.length);
    await screenshot(doc, 'methods-document');
  });
});
