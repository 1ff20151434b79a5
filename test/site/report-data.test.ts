/**
 * The report pages' data accessors (src/data/): they read what the real pipeline published
 * (test/site/pipeline-data.ts), and every bad file is a catalogued error naming the file and the
 * row or key. The pooled histograms are checked against the pipeline's own tile decoder
 * (pipeline/publish/histogram-tiles.ts `decodeHistogramTile`).
 */
import { cpSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { decodeHistogramTile } from '../../pipeline/publish/histogram-tiles.ts';
import { HIST_LEN } from '../../pipeline/reduce/layout.ts';
import { parseCsv } from '../../src/data/csv.ts';
import { loadRegionTable, loadRegionYearRows, parseRegionTable } from '../../src/data/region-table.ts';
import { loadRegionDetail } from '../../src/data/region-detail.ts';
import { loadHistogramIndex, loadPooledHistograms } from '../../src/data/region-histograms.ts';
import { loadAtlasManifest } from '../../src/data/atlas-manifest.ts';
import { loadManifest } from '../../src/data/manifest.ts';
import { loadManifestLayers } from '../../src/data/manifest-layers.ts';
import { loadEstimateContext } from '../../src/data/estimate.ts';
import { loadRegionReport, loadRegionSummary } from '../../src/data/region-report.ts';
import { expectCatalogued } from '../helpers/catalogued.ts';
import { buildPipelineData } from './pipeline-data.ts';

const REGION = 'varn-shore';
let source: string;
let work: string;

const HEADER = 'region_id,period,figure,workload_class,acclimatization,exposure,method,statistic,value,unit,years_used,baseline';
const ROW = 'r1,07,hours-lost-shift,moderate,acclimatized,sun,limit,mean,72.05,h,2,2021-2022';

beforeAll(async () => {
  source = (await buildPipelineData()).dataDir;
  work = mkdtempSync(join(tmpdir(), 'heathours-report-data-'));
  cpSync(join(source, 'data'), join(work, 'data'), { recursive: true, filter: (p) => !p.includes('/layers') });
});

afterAll(() => {
  if (work) rmSync(work, { recursive: true, force: true });
});

/** A fresh copy of the data folder to spoil. */
function copy(): string {
  const dir = mkdtempSync(join(work, 'case-'));
  cpSync(join(work, 'data'), join(dir, 'data'), { recursive: true });
  return dir;
}

describe('reading what the pipeline published', () => {
  it('reads a region table row for row, and the filtered and tail reads keep exactly the rows they ask for', () => {
    const all = loadRegionTable(REGION, work);
    const lines = readFileSync(join(work, 'data/regions', `${REGION}.csv`), 'utf8')
      .trim()
      .split('\n');
    expect(all).toHaveLength(lines.length - 1);
    const f = lines[1].split(',');
    expect(all[0]).toMatchObject({
      period: f[1],
      figure: f[2],
      workloadClass: f[3],
      acclimatization: f[4],
      exposure: f[5],
      statistic: f[7],
      value: Number(f[8]),
      yearsUsed: Number(f[10]),
      baseline: f[11],
    });
    const keep = (p: string, fig: string, s: string) => fig === 'hours-lost-shift' && s === 'p90' && p !== '03';
    expect(loadRegionTable(REGION, work, keep)).toEqual(all.filter((r) => keep(r.period, r.figure, r.statistic)));
    const yearKeep = (_p: string, fig: string, s: string) => fig === 'hours-lost-shift' && s === 'mean';
    const tail = loadRegionYearRows(REGION, work, yearKeep);
    expect(tail).toEqual(all.filter((r) => r.period === 'year' && yearKeep(r.period, r.figure, r.statistic)));
    expect(tail.length).toBeGreaterThan(0);
  });

  it("pools the baseline years' sun hours of a tile exactly as the pipeline's decoder gives them", () => {
    const index = loadHistogramIndex(work);
    const pooled = loadPooledHistograms(REGION, work, index, 'sun');
    const tiles = decodeHistogramTile(new Uint8Array(readFileSync(join(work, 'data/calculator', `${REGION}.bin`))), index.years.length);
    const use = index.years.map((y, i) => [y, i]).filter(([y]) => y >= index.baseline[0] && y <= index.baseline[1]);
    expect(pooled.years).toEqual(use.map(([y]) => y));
    for (let slot = 0; slot < 288; slot++) {
      for (let b = 0; b < HIST_LEN; b++) {
        const want = use.reduce((s, [, i]) => s + tiles[i][(slot * 2 + 0) * HIST_LEN + b], 0);
        expect(pooled.counts[slot * HIST_LEN + b]).toBeCloseTo(want, 9);
      }
    }
    const shade = loadPooledHistograms(REGION, work, index, 'shade');
    expect(shade.counts[12 * HIST_LEN + 100]).toBeCloseTo(
      use.reduce((s, [, i]) => s + tiles[i][(12 * 2 + 1) * HIST_LEN + 100], 0),
      9,
    );
  });

  it('assembles a report from the manifest, the table, the summary and the tile', () => {
    const r = loadRegionReport(REGION, work);
    expect(r.name).toBe(JSON.parse(readFileSync(join(work, 'data/regions', `${REGION}.json`), 'utf8')).name);
    expect(r.manifest.work.classes.map((c) => c.id)).toEqual(['low', 'moderate', 'high', 'very-high']);
    expect(
      r.figures.get({
        figure: 'hours-lost-shift',
        period: 'year',
        workloadClass: 'moderate',
        acclimatization: 'acclimatized',
        exposure: 'sun',
        statistic: 'mean',
      }),
    ).toBeGreaterThan(0);
    expect(r.matrix.values.every((v) => Number.isFinite(v))).toBe(true);
  });

  it("gives the one-page summary the report's values for every row it shows, and none of the rows it does not show", () => {
    const r = loadRegionReport(REGION, work);
    const s = loadRegionSummary(REGION, work);
    expect(s.detail).toEqual(r.detail);
    expect(s.manifest).toBe(r.manifest);
    let compared = 0;
    for (const figure of ['hours-above-limit-shift', 'hours-lost-shift']) {
      for (const period of ['01', '02', '03', '04', '05', '06', '07', '08', '09', '10', '11', '12', 'year']) {
        for (const c of r.manifest.work.classes) {
          for (const a of r.manifest.work.acclimatization) {
            for (const e of r.manifest.work.exposures) {
              for (const statistic of ['mean', 'p90']) {
                const k = { figure, period, workloadClass: c.id, acclimatization: a, exposure: e, statistic };
                expect(s.figures.has(k), JSON.stringify(k)).toBe(r.figures.has(k));
                if (r.figures.has(k)) {
                  expect(Object.is(s.figures.get(k), r.figures.get(k)), JSON.stringify(k)).toBe(true);
                  compared++;
                }
              }
            }
          }
        }
      }
    }
    expect(compared).toBe(2 * 13 * r.manifest.work.classes.length * r.manifest.work.acclimatization.length * r.manifest.work.exposures.length * 2);
    // The trend rows are the report's alone.
    const trendKey = {
      figure: 'hours-lost-shift',
      period: 'year',
      workloadClass: 'moderate',
      acclimatization: 'acclimatized',
      exposure: 'sun',
      statistic: 'trend',
    };
    expect(r.figures.has(trendKey)).toBe(true);
    expect(s.figures.has(trendKey)).toBe(false);
  });

  it('reads RFC 4180 CSV: quoted fields with commas, doubled quotes and line breaks, CRLF line ends', () => {
    expect(parseCsv('a,"b,c","d ""e""",f\r\n"g\nh",,i\n')).toEqual([
      ['a', 'b,c', 'd "e"', 'f'],
      ['g\nh', '', 'i'],
    ]);
    expect(parseCsv('x,y')).toEqual([['x', 'y']]);
  });
});

describe('bad data files are catalogued errors naming the file and where', () => {
  const path = '/data/regions/r1.csv';
  it('a region table with another header: SiteDataInvalid at row 1', () => {
    const e = expectCatalogued(() => parseRegionTable(`region,period\n${ROW}\n`, path, 'r1'), 'SiteDataInvalid', /header is "region,period"/);
    expect(e.where).toMatchObject({ file: path, key: 'row 1' });
  });

  it('a row with too few fields, another region, a bad period, value or year count: SiteDataInvalid at that row and column', () => {
    const cases: Array<[string, RegExp, string]> = [
      ['r1,07,hours-lost-shift', /3 fields, expected 12/, 'row 3.(all)'],
      [ROW.replace(/^r1/, 'r2'), /"r2" is not the region "r1"/, 'row 3.region_id'],
      [ROW.replace(',07,', ',13,'), /"13" is not 01-12 or year/, 'row 3.period'],
      [ROW.replace('72.05', 'lots'), /"lots" is not a number/, 'row 3.value'],
      [ROW.replace(',h,2,', ',h,two,'), /"two" is not a whole number/, 'row 3.years_used'],
    ];
    for (const [bad, message, key] of cases) {
      const e = expectCatalogued(() => parseRegionTable(`${HEADER}\n${ROW}\n${bad}\n`, path, 'r1'), 'SiteDataInvalid', message);
      expect(String(e.where.key)).toContain(key);
      expect(e.where.file).toBe(path);
    }
  });

  it('a quoted field left open: SiteDataUnreadable', () => {
    expectCatalogued(() => parseRegionTable(`${HEADER}\n${ROW}\nr1,"07,oops\n`, path, 'r1'), 'SiteDataUnreadable', /quoted field is not closed/);
  });

  it('a missing region table: SiteDataMissing naming data/regions/<id>.csv', () => {
    const e = expectCatalogued(() => loadRegionTable('no-such-region', work), 'SiteDataMissing', /no-such-region\.csv/);
    expect(e.where.file).toBe(join(work, 'data/regions/no-such-region.csv'));
  });

  it('a bad year row found by the tail read is reported at its row in the whole file', () => {
    const dir = copy();
    const file = join(dir, 'data/regions', `${REGION}.csv`);
    const lines = readFileSync(file, 'utf8').split('\n');
    const at = lines.findIndex((l) => l.startsWith(`${REGION},year,hours-lost-shift,moderate,acclimatized,sun,limit,mean,`));
    lines[at] = lines[at].replace(/,mean,[^,]+,/, ',mean,bad,');
    writeFileSync(file, lines.join('\n'));
    const e = expectCatalogued(() => loadRegionYearRows(REGION, dir), 'SiteDataInvalid', /"bad" is not a number/);
    expect(e.where.key).toBe(`row ${at + 1}.value`);
  });

  it('a region summary of another region: SiteDataInvalid at key id', () => {
    const dir = copy();
    const file = join(dir, 'data/regions', `${REGION}.json`);
    writeFileSync(file, readFileSync(file, 'utf8').replace(`"id":"${REGION}"`, '"id":"someone-else"'));
    const e = expectCatalogued(() => loadRegionDetail(REGION, dir), 'SiteDataInvalid', /another region/);
    expect(e.where).toMatchObject({ file, key: 'id' });
  });

  it('a histogram tile cut short or with bytes left over: SiteDataUnreadable naming the tile', () => {
    for (const spoil of [(b: Buffer) => b.subarray(0, b.length - 3), (b: Buffer) => Buffer.concat([b, Buffer.from([0, 0])])]) {
      const dir = copy();
      const file = join(dir, 'data/calculator', `${REGION}.bin`);
      writeFileSync(file, spoil(readFileSync(file)));
      const e = expectCatalogued(() => loadPooledHistograms(REGION, dir), 'SiteDataUnreadable', /tile ends inside|bytes after the last/);
      expect(e.where.file).toBe(file);
    }
  });

  it('a tile index without the region, with other bins, or a tile file missing: SiteDataInvalid / SiteDataMissing', () => {
    const dir = copy();
    const indexFile = join(dir, 'data/calculator/index.json');
    const index = JSON.parse(readFileSync(indexFile, 'utf8'));
    writeFileSync(indexFile, JSON.stringify({ ...index, regions: index.regions.filter((r: { id: string }) => r.id !== REGION) }));
    expect(expectCatalogued(() => loadPooledHistograms(REGION, dir), 'SiteDataInvalid', /no entry for region/).where.key).toBe('regions');
    writeFileSync(indexFile, JSON.stringify({ ...index, bins: { ...index.bins, edges: index.bins.edges.slice(1) } }));
    expect(expectCatalogued(() => loadHistogramIndex(dir), 'SiteDataInvalid', /bin edges differ/).where.key).toBe('bins.edges');
    writeFileSync(indexFile, JSON.stringify(index));
    rmSync(join(dir, 'data/calculator', `${REGION}.bin`));
    expectCatalogued(() => loadPooledHistograms(REGION, dir), 'SiteDataMissing', new RegExp(`${REGION}\\.bin`));
  });

  it('a manifest without workload classes: SiteDataInvalid at work.classes', () => {
    const dir = copy();
    const file = join(dir, 'data/manifest.json');
    const m = JSON.parse(readFileSync(file, 'utf8'));
    m.work.classes = [];
    writeFileSync(file, JSON.stringify(m));
    const e = expectCatalogued(() => loadAtlasManifest(dir), 'SiteDataInvalid', /work\.classes/);
    expect(e.where).toMatchObject({ file, key: 'work.classes' });
  });

  it('a region summary whose workforce people are negative, or a manifest workforce without its licence: SiteDataInvalid at that key', () => {
    const dir = copy();
    const file = join(dir, 'data/regions', `${REGION}.json`);
    const d = JSON.parse(readFileSync(file, 'utf8'));
    expect(d.workforce.people, 'the test atlas weights by a workforce raster').toBeGreaterThan(0);
    writeFileSync(file, JSON.stringify({ ...d, workforce: { ...d.workforce, people: -1 } }));
    expect(expectCatalogued(() => loadRegionDetail(REGION, dir), 'SiteDataInvalid', /workforce\.people/).where).toMatchObject({
      file,
      key: 'workforce.people',
    });
    const mf = join(dir, 'data/manifest.json');
    const m = JSON.parse(readFileSync(mf, 'utf8'));
    delete m.workforce.licence;
    writeFileSync(mf, JSON.stringify(m));
    expect(expectCatalogued(() => loadAtlasManifest(dir), 'SiteDataInvalid', /workforce\.licence/).where).toMatchObject({ file: mf, key: 'workforce.licence' });
  });

  it('the report, map, calculator and downloads readers share one parse of the manifest, and a rewritten manifest is read afresh', () => {
    const dir = copy();
    const file = join(dir, 'data/manifest.json');
    const text = readFileSync(file, 'utf8');
    const first = loadManifest(dir);
    const parse = vi.spyOn(JSON, 'parse');
    try {
      expect(loadAtlasManifest(dir)).toBe(first);
      expect(loadManifestLayers(dir)).toBe(first);
      expect(loadEstimateContext(dir)?.atlasTitle).toBe(first.atlas.title);
      expect(parse.mock.calls.filter(([arg]) => arg === text)).toHaveLength(0);
    } finally {
      parse.mockRestore();
    }
    const m = JSON.parse(text);
    m.atlas.title = `${m.atlas.title} (rewritten)`;
    writeFileSync(file, JSON.stringify(m));
    const second = loadAtlasManifest(dir);
    expect(second).not.toBe(first);
    expect(second.atlas.title).toBe(m.atlas.title);
    expect(loadManifestLayers(dir)).toBe(second);
  });

  // biome-ignore lint/suspicious/noExplicitAny: each case spoils a different part of a parsed manifest
  type Spoilable = any;
  it.each([
    ['a workload class id that is not a slug', (m: Spoilable) => (m.work.classes[0].id = 'Heavy work'), 'work.classes.0.id'],
    ['a shift without work days', (m: Spoilable) => (m.work.shift.days = []), 'work.shift.days'],
    ['a legend without stops', (m: Spoilable) => (m.layers[1].legend.stops = []), 'layers.1.legend.stops'],
    ['a map image corner north of the pole', (m: Spoilable) => (m.layers[0].mapImages[0].coordinates[0][1] = 91), 'layers.0.mapImages.0.coordinates.0.1'],
  ])('a manifest with %s: SiteDataInvalid at the key, from the one reader behind every view', (_what, spoil, key) => {
    const dir = copy();
    const file = join(dir, 'data/manifest.json');
    const m = JSON.parse(readFileSync(file, 'utf8'));
    spoil(m);
    writeFileSync(file, JSON.stringify(m));
    for (const load of [loadManifest, loadAtlasManifest, loadManifestLayers]) {
      expect(expectCatalogued(() => load(dir), 'SiteDataInvalid').where).toMatchObject({ file, key });
    }
  });
});
