/**
 * The site's workforce views (issue 17) in Node, on the data folder the real pipeline makes
 * (test/site/pipeline-data.ts: the demo's INVENTED population raster and content/workforce-shares.csv):
 * the manifest reader keeps the raster's name, year and licence; the region summary's
 * `workforce.people`; the report's tables (src/lib/report/workforce.ts) against the region CSV read
 * here with a plain split; the map catalogue's person-hours layer and its source line; and the
 * accessors' behaviour without a workforce. Outside values: the region CSVs and JSON the pipeline
 * wrote (their own checks against GDAL and by hand are test/run/workforce-build.test.ts), and the
 * year of the Mon–Sat 07–17 shift counted by hand (10 h × 6 days × 52 weeks = 3,120 h).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { buildPipelineData, PIPELINE_DATA_WORKFORCE } from './pipeline-data.ts';
import { buildTestSite } from './browser.ts';
import { loadManifest } from '../../src/data/manifest.ts';
import { loadRegionDetail } from '../../src/data/region-detail.ts';
import { loadRegionReport } from '../../src/data/region-report.ts';
import { loadRegionAnnuals } from '../../src/data/region-annual.ts';
import { loadExplorerCatalogue } from '../../src/data/explorer.ts';
import {
  ALL_CLASSES,
  hasWorkforceFigures,
  workforceByClass,
  workforceByMonth,
  workforceColumns,
  workforceRankingColumns,
  workforceSourceLine,
} from '../../src/lib/report/workforce.ts';

let dataDir = '';
const REGION = 'drovan-basin';

beforeAll(async () => {
  ({ dataDir } = await buildPipelineData());
}, 600_000);

function csvValue(id: string, period: string, figure: string, cls: string, stat: string): number {
  const line = readFileSync(join(dataDir, 'data/regions', `${id}.csv`), 'utf8')
    .split('\n')
    .find((l) => l.startsWith(`${id},${period},${figure},${cls},by-shares,by-shares,limit,${stat},`));
  if (!line) throw new Error(`no row ${id} ${period} ${figure} ${cls} ${stat}`);
  const v = line.split(',')[8];
  return v === '' ? NaN : Number(v);
}

describe('the workforce views of the site', () => {
  it("the manifest reader keeps the raster's name, year, licence and the invented flag the config gave", () => {
    const wf = loadManifest(join(dataDir)).workforce!;
    expect(wf).toBeDefined();
    expect({ name: wf.name, year: wf.year, licence: wf.licence, invented: wf.invented }).toEqual({ ...PIPELINE_DATA_WORKFORCE, invented: true });
    expect(wf.annualHours).toBe(3120);
    expect(workforceSourceLine(wf)).toBe(`People: ${PIPELINE_DATA_WORKFORCE.name} (2024), INVENTED data; licence: ${PIPELINE_DATA_WORKFORCE.licence}.`);
    expect(workforceSourceLine({ ...wf, invented: false })).not.toMatch(/INVENTED/);
  });

  it('every region summary has workforce.people, and the people of the regions that do not overlap sum to at most the people on land', () => {
    const manifest = loadManifest(dataDir);
    const ids = JSON.parse(readFileSync(join(dataDir, 'data/regions.geojson'), 'utf8')).features.map(
      (f: { properties: { id: string } }) => f.properties.id,
    ) as string[];
    let districts = 0;
    for (const id of ids) {
      const d = loadRegionDetail(id, dataDir);
      expect(d.workforce, id).toBeDefined();
      expect(d.workforce!.people, id).toBeGreaterThan(0);
      expect(d.workforce!.outdoorWorkers).toBeCloseTo(d.workforce!.people * d.workforce!.shares.reduce((s, c) => s + c.share, 0), 6);
      if (id !== 'odd-name') districts += d.workforce!.people;
    }
    // The demo's five districts do not overlap (the odd-name test square lies over them).
    expect(districts).toBeLessThanOrEqual(manifest.workforce!.peopleOnLand * (1 + 1e-9));
    // Drovan Basin takes its own rows of content/workforce-shares.csv, the odd-name region the default rows.
    expect(loadRegionDetail(REGION, dataDir).workforce!.shares.find((s) => s.workloadClass === 'moderate')!.share).toBe(0.07);
    expect(loadRegionDetail('odd-name', dataDir).workforce!.shares.find((s) => s.workloadClass === 'moderate')!.share).toBe(0.05);
  });

  it("the report's tables by class and by month hold the region CSV's values, all outdoor work last", () => {
    const report = loadRegionReport(REGION, dataDir);
    expect(hasWorkforceFigures(report.figures)).toBe(true);
    const cols = workforceColumns('P90 of 2 years');
    const classes = report.manifest.work.classes;
    const byClass = workforceByClass(report.figures, classes, cols);
    expect(byClass.map((r) => r.key)).toEqual([...classes.map((c) => c.id), ALL_CLASSES]);
    for (const r of byClass) cols.forEach((c, i) => expect(r.values[i], `${r.key} ${c.key}`).toBe(csvValue(REGION, 'year', c.figure, r.key, c.statistic)));
    const byMonth = workforceByMonth(report.figures, ALL_CLASSES, cols);
    expect(byMonth.map((r) => r.key)).toEqual(['01', '02', '03', '04', '05', '06', '07', '08', '09', '10', '11', '12', 'year']);
    for (const r of byMonth) cols.forEach((c, i) => expect(r.values[i], `${r.key} ${c.key}`).toBe(csvValue(REGION, r.key, c.figure, ALL_CLASSES, c.statistic)));
    // Person-hours of all outdoor work = the sum over the classes (the pipeline's definition), to the table's 0.1 person-h per row.
    const lost = cols.findIndex((c) => c.key === 'lost-mean');
    const sum = byClass.slice(0, -1).reduce((s, r) => s + r.values[lost], 0);
    expect(Math.abs(sum - byClass[byClass.length - 1].values[lost])).toBeLessThanOrEqual(0.05 * classes.length + 1e-6);
  });

  it("the home page's annuals carry each region's people and its workforce figures of all outdoor work; without the flag they carry none", () => {
    const ids = [{ id: REGION, name: 'Drovan Basin' }];
    const [a] = loadRegionAnnuals(ids, dataDir, true);
    expect(a.workforce!.get('people')).toBe(loadRegionDetail(REGION, dataDir).workforce!.people);
    for (const c of workforceRankingColumns('P90 of 2 years').slice(2)) {
      const [figure, stat] = c.key.split('.');
      expect(a.workforce!.get(c.key), c.key).toBe(csvValue(REGION, 'year', figure, ALL_CLASSES, stat));
    }
    expect(loadRegionAnnuals(ids, dataDir).map((x) => x.workforce)).toEqual([undefined]);
  });

  it('the map catalogue offers the person-hours per km² layer without class, acclimatization or exposure choices, its figure carrying the source line', () => {
    const cat = loadExplorerCatalogue(dataDir);
    const fig = cat.figures.find((f) => f.id === 'person-hours-lost-density')!;
    expect(fig).toBeDefined();
    expect(fig.label).toBe('Person-hours lost per km²');
    expect(fig.source).toBe(workforceSourceLine(loadManifest(dataDir).workforce!));
    expect(fig.sourceInvented).toBe(true);
    const layers = cat.layers.filter((l) => l.figure === 'person-hours-lost-density');
    expect(layers.length).toBeGreaterThan(0);
    for (const l of layers) expect(l.view).toEqual({});
    // The other figures carry no people source, and no choice list gained the workforce codes.
    expect(cat.figures.filter((f) => f.source !== undefined).map((f) => f.id)).toEqual(['person-hours-lost-density']);
    for (const key of ['workloadClass', 'acclimatization', 'exposure'] as const) {
      expect(cat.choices[key].map((c) => c.id)).not.toContain(key === 'workloadClass' ? 'all' : 'by-shares');
    }
  });

  it('the downloads page (person-hours layers) and the methods page (licence of the data) name the raster with its year and licence, marked invented', async () => {
    const { distDir } = await buildTestSite(dataDir);
    const text = (html: string, id: string) => {
      const m = new RegExp(`<p[^>]*id="${id}"[^>]*>([\\s\\S]*?)</p>`).exec(html);
      return (m?.[1] ?? '')
        .replace(/<[^>]+>/g, '')
        .replace(/\s+/g, ' ')
        .trim();
    };
    const want = `Invented people. ${workforceSourceLine({ ...PIPELINE_DATA_WORKFORCE, invented: true })}`;
    expect(text(readFileSync(join(distDir, 'downloads/index.html'), 'utf8'), 'layers-workforce-source')).toBe(want);
    expect(text(readFileSync(join(distDir, 'methods/index.html'), 'utf8'), 'licence-workforce')).toBe(want);
  }, 600_000);
});
