/**
 * The site of a large atlas is built by several Astro processes side by side
 * (pipeline/run/site-parts.ts, src/lib/site-part.ts), after the region tables were read once into
 * a digest the pages are pointed to (pipeline/run/site-digest.ts, src/data/site-digest.ts).
 * Claims: a part renders each region's pages in exactly one part; the data the pages load are the
 * same with and without the digest (the region report, its summary, the home page's annual
 * figures, the map's values of the record and of a what-if climate: deep-equal on the site-test
 * atlas with a scenario and a workforce raster); the site built in two parts is byte-identical,
 * file by file, to the site built in one process; a damaged region table is a catalogued error
 * naming the file and row before any page is built; a part that fails is a catalogued
 * SiteBuildFailed naming the part, and the previous site is left as it was.
 */
import { execFile } from 'node:child_process';
import { cpSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative } from 'node:path';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { rendersRegion, rendersShared, sitePart } from '../../src/lib/site-part.ts';
import { SITE_PARTS_ENV, SITE_PARTS_MIN_REGIONS, siteParts } from '../../pipeline/run/site-parts.ts';
import { gatherSiteDigest } from '../../pipeline/run/site-digest.ts';
import { SITE_DIGEST_ENV } from '../../src/data/site-digest.ts';
import { HeathoursError } from '../../pipeline/model/errors.ts';
import { FIGURE_HOURS_LOST, figureKeyOf, type FigureKey, type RegionFigures } from '../../src/lib/report/region-figures.ts';
import { buildPipelineData } from './pipeline-data.ts';
import { buildTestSite, PROJECT_ROOT } from './browser.ts';

const run = promisify(execFile);

describe('which pages a part renders', () => {
  it('reads K/N from HEATHOURS_SITE_PART and renders every page without it', () => {
    expect(sitePart({})).toEqual({ index: 0, count: 1 });
    expect(sitePart({ HEATHOURS_SITE_PART: '1/3' })).toEqual({ index: 1, count: 3 });
    for (const bad of ['3/3', '-1/2', '1', 'a/b', '0/0']) expect(() => sitePart({ HEATHOURS_SITE_PART: bad })).toThrow(/K\/N/);
  });

  it('gives each region to exactly one of N parts, and the pages of many regions to part 0 only', () => {
    for (const count of [1, 2, 3, 5]) {
      const parts = Array.from({ length: count }, (_, index) => ({ index, count }));
      for (let i = 0; i < 200; i++) expect(parts.filter((p) => rendersRegion(i, p)).length).toBe(1);
      expect(parts.filter((p) => rendersShared(p)).map((p) => p.index)).toEqual([0]);
    }
    // Part 0 also renders the pages of every region: a little fewer region pages (31 of 64 in two parts, 15 of 64 in four).
    const share = (index: number, count: number) => Array.from({ length: 6400 }, (_, i) => i).filter((i) => rendersRegion(i, { index, count })).length;
    expect([share(0, 2), share(1, 2)]).toEqual([3100, 3300]);
    expect([0, 1, 2, 3].map((k) => share(k, 4))).toEqual([1500, 1700, 1600, 1600]);
  });

  it('builds in one process below SITE_PARTS_MIN_REGIONS regions and in one per core above, unless told', () => {
    expect(siteParts(SITE_PARTS_MIN_REGIONS - 1, 2, {})).toBe(1);
    expect(siteParts(SITE_PARTS_MIN_REGIONS, 2, {})).toBe(2);
    expect(siteParts(10_000, 1, {})).toBe(1);
    expect(siteParts(6, 2, { [SITE_PARTS_ENV]: '3' })).toBe(3);
    expect(() => siteParts(6, 2, { [SITE_PARTS_ENV]: '0' })).toThrow(/whole number/);
  });
});

let dataDir: string;
let work: string;

beforeAll(async () => {
  ({ dataDir } = await buildPipelineData({ withScenario: true }));
  work = mkdtempSync(join(tmpdir(), 'heathours-site-parts-'));
}, 1_800_000);

afterAll(() => {
  if (work) rmSync(work, { recursive: true, force: true });
});

/** `v` as plain data: functions dropped, Maps as their entries, class instances as plain objects. */
function plainOf(v: unknown): unknown {
  if (typeof v === 'function') return undefined;
  if (v instanceof Map) return [...v.entries()].map(([k, x]) => [k, plainOf(x)]);
  if (Array.isArray(v)) return v.map(plainOf);
  if (v !== null && typeof v === 'object') return Object.fromEntries(Object.entries(v).map(([k, x]) => [k, plainOf(x)]));
  return v;
}

/** Runs `fn` with the pages pointed to digest folder `dir` (undefined: none). */
async function withDigest<T>(dir: string | undefined, fn: () => Promise<T>): Promise<T> {
  const before = process.env[SITE_DIGEST_ENV];
  if (dir === undefined) delete process.env[SITE_DIGEST_ENV];
  else process.env[SITE_DIGEST_ENV] = dir;
  try {
    return await fn();
  } finally {
    if (before === undefined) delete process.env[SITE_DIGEST_ENV];
    else process.env[SITE_DIGEST_ENV] = before;
  }
}

describe('the digest of the region tables', () => {
  it('gives the pages the same rows and values as the tables themselves (record, scenario, workforce)', async () => {
    const digestDir = join(work, 'digest');
    // Slices of 2 regions, values written every 3 regions: each layer's file is written in pieces.
    await gatherSiteDigest(dataDir, digestDir, 2, true, { slice: 2, flushRegions: 3 });
    expect(existsSync(join(digestDir, 'values', 'index.json'))).toBe(true);
    const regionCount = (JSON.parse(readFileSync(join(dataDir, 'data', 'regions.geojson'), 'utf8')) as { features: unknown[] }).features.length;
    expect(regionCount).toBeGreaterThan(4);
    expect(statSync(join(digestDir, 'values', '0.f64')).size).toBe(regionCount * 8);
    expect(readdirSync(join(digestDir, 'figures', 'record')).length).toBe(regionCount);
    // Every key of every row of a region's tables, and one that no table has: the figures are compared by what they answer.
    const { parseRegionTable, regionTablePath } = await import('../../src/data/region-table.ts');
    const probes = (id: string, scenarioId?: string): FigureKey[] => {
      const path = regionTablePath(dataDir, id, scenarioId);
      const rows = parseRegionTable(readFileSync(path, 'utf8'), path, id);
      return [...rows, { ...rows[0], figure: 'no-such-figure' }].map(figureKeyOf);
    };
    const answers = (f: RegionFigures, keys: FigureKey[]) => keys.map((k) => [f.has(k), f.get(k)]);
    // Each load in a fresh module graph: the explorer's values are cached per data folder.
    const load = async () => {
      const { vi } = await import('vitest');
      vi.resetModules();
      const { loadRegions } = await import('../../src/data/regions.ts');
      const { loadRegionReport, loadRegionSummary } = await import('../../src/data/region-report.ts');
      const { loadRegionAnnuals } = await import('../../src/data/region-annual.ts');
      const { loadExplorerValues, loadExplorerScenarios, loadScenarioValues } = await import('../../src/data/explorer.ts');
      const regions = loadRegions(dataDir).features.map((f) => ({ id: f.properties.id, name: f.properties.name }));
      const scenarios = loadExplorerScenarios(dataDir);
      expect(scenarios.length).toBeGreaterThan(0);
      return {
        reports: regions.map((r) => {
          const report = loadRegionReport(r.id, dataDir);
          return {
            ...report,
            figures: answers(report.figures, probes(r.id)),
            scenarios: report.scenarios.map((sc) => ({ ...sc, figures: answers(sc.figures, probes(r.id, sc.id)) })),
          };
        }),
        summaries: regions.map((r) => {
          const summary = loadRegionSummary(r.id, dataDir);
          return { ...summary, figures: answers(summary.figures, probes(r.id)) };
        }),
        annuals: loadRegionAnnuals(regions, dataDir, true),
        scenarioAnnuals: loadRegionAnnuals(regions, dataDir, true, scenarios[0].id),
        values: loadExplorerValues(dataDir),
        scenarioValues: scenarios.map((s) => loadScenarioValues(s.id, dataDir)),
      };
    };
    const plain = await withDigest(undefined, load);
    const digested = await withDigest(digestDir, load);
    // The report shows workforce rows and the scenario's means: the digest must carry them.
    expect(plain.reports[0].scenarios[0].figures.filter(([has]) => has).length).toBeGreaterThan(50);
    expect(plain.annuals[0].workforce?.size).toBeGreaterThan(2);
    // The report's figures answer for hundreds of keys, the summary's for fewer, and neither for every row of the table.
    const held = (a: Array<Array<unknown>>) => a.filter(([has]) => has).length;
    expect(held(plain.reports[0].figures)).toBeGreaterThan(100);
    expect(held(plain.summaries[0].figures)).toBeLessThan(held(plain.reports[0].figures));
    expect(held(plain.reports[0].figures)).toBeLessThan(plain.reports[0].figures.length);
    // Plain data on both sides (the loads come from separate module graphs, so their classes differ).
    expect(plainOf(digested)).toEqual(plainOf(plain));
  });

  it('ends in SiteDataInvalid naming the table and row of a damaged region table, before any page is built', async () => {
    const copy = join(work, 'damaged');
    cpSync(dataDir, copy, { recursive: true });
    const regionsDir = join(copy, 'data', 'regions');
    const csv = readdirSync(regionsDir).find((f) => f.endsWith('.csv') && !f.endsWith('.wide.csv'))!;
    const lines = readFileSync(join(regionsDir, csv), 'utf8').split('\n');
    // A row the report shows (hours lost, mean): the digest keeps and checks it.
    const at = lines.findIndex((l) => l.split(',')[2] === FIGURE_HOURS_LOST && l.split(',')[7] === 'mean');
    expect(at).toBeGreaterThan(0);
    lines[at] = lines[at].replace(/,[^,]*,([^,]*),([^,]*),([^,]*)$/, ',twelve,$1,$2,$3');
    writeFileSync(join(regionsDir, csv), lines.join('\n'));
    const err = await gatherSiteDigest(copy, join(work, 'digest-damaged'), 1, true).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(HeathoursError);
    expect((err as HeathoursError).code).toBe('SiteDataInvalid');
    expect((err as HeathoursError).message).toMatch(/twelve/);
    expect((err as HeathoursError).where.file).toContain(csv);
    expect((err as HeathoursError).where.key).toBe(`row ${at + 1}.value`);
  });
});

/** Every file below `dir`, relative, sorted. */
function files(dir: string): string[] {
  const out: string[] = [];
  const walk = (d: string) => {
    for (const e of readdirSync(d, { withFileTypes: true })) {
      const p = join(d, e.name);
      if (e.isDirectory()) walk(p);
      else out.push(relative(dir, p));
    }
  };
  walk(dir);
  return out.sort();
}

/** Builds the site of `data` into `out` in `parts` Astro processes (the page tests' child), rejecting with its stderr. */
async function buildInParts(data: string, out: string, parts: number): Promise<void> {
  await run(process.execPath, ['--import', 'tsx', join(PROJECT_ROOT, 'test/site/build-site-child.ts'), data, out], {
    cwd: PROJECT_ROOT,
    env: { ...process.env, ASTRO_TELEMETRY_DISABLED: '1', [SITE_PARTS_ENV]: String(parts) },
    maxBuffer: 16 * 1024 * 1024,
  });
}

describe('a site built in parts', () => {
  it('is byte-identical, file by file, to the site built in one process', async () => {
    const one = (await buildTestSite(dataDir)).distDir;
    const two = join(work, 'two-parts');
    await buildInParts(dataDir, two, 2);
    const names = files(one);
    expect(files(two)).toEqual(names);
    // Region pages of both parts are there (the regions alternate between the parts).
    expect(names.filter((f) => /^regions\/[^/]+\/index\.html$/.test(f)).length).toBeGreaterThan(3);
    const differ = names.filter((f) => !readFileSync(join(one, f)).equals(readFileSync(join(two, f))));
    expect(differ).toEqual([]);
  }, 900_000);

  it('fails with SiteBuildFailed naming the part whose region page cannot be built, and leaves the previous site', async () => {
    const copy = join(work, 'bad-summary');
    cpSync(dataDir, copy, { recursive: true });
    // The second region (part 2 of 2) gets a summary the pages refuse (the digest does not read this key); part 1 reads it too (the home page).
    const { loadRegions } = await import('../../src/data/regions.ts');
    const second = loadRegions(copy).features[1].properties.id;
    const path = join(copy, 'data', 'regions', `${second}.json`);
    const summary = JSON.parse(readFileSync(path, 'utf8'));
    summary.areaKm2 = 'large';
    writeFileSync(path, JSON.stringify(summary));
    const out = join(work, 'previous');
    mkdirSync(out);
    writeFileSync(join(out, 'marker.txt'), 'previous site');
    const err = await buildInParts(copy, out, 2).catch((e: { stderr?: string }) => e);
    expect(String((err as { stderr?: string }).stderr)).toMatch(/SiteBuildFailed[\s\S]*site part [12] of 2: [\s\S]*areaKm2/);
    expect(readFileSync(join(out, 'marker.txt'), 'utf8')).toBe('previous site');
    // No part's folder or working folder is left behind.
    expect(readdirSync(work).filter((f) => f.startsWith('.site-part-'))).toEqual([]);
    expect(readdirSync(PROJECT_ROOT).filter((f) => f.startsWith('.site-part-'))).toEqual([]);
    expect(statSync(out).isDirectory()).toBe(true);
  }, 900_000);
});
