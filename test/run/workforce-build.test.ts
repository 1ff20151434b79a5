/**
 * `heathours build` with a workforce (issue 17) on the invented small demo (8 × 10 cells at 1°,
 * 2022–2023) and the demo's invented population raster: person-hours checked by hand against
 * people from GDAL (`gdalwarp -r sum`, Debian gdal-bin; 3.6.2 here), the shares written out by
 * hand and the published hours per worker of each cell; bad workforce inputs stop the build with a
 * catalogued error and publish nothing.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { copyFileSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createHash } from 'node:crypto';
import { fromFile } from 'geotiff';
import { writeDemoDataset } from '../../pipeline/demo/index.ts';
import { POPULATION_FILE, demoPopulation } from '../../pipeline/demo/population.ts';
import { buildAtlas } from '../../pipeline/run/build-atlas.ts';
import { writeGeoTiff } from '../../pipeline/publish/layers/geotiff-write.ts';
import { EARTH_RADIUS_KM, rectangleAreaSr } from '../../pipeline/regions/spherical-area.ts';
import { HeathoursError } from '../../pipeline/model/errors.ts';
import type { Manifest } from '../../pipeline/publish/manifest.ts';
import { testAtlasYaml } from '../helpers/atlas-yaml.ts';

const ROOT = new URL('../../', import.meta.url).pathname;
let dir = '';
let out = '';

/** Shares of the test atlas: default rows for every region, and rows of its own for Varn Shore. */
const SHARES = `region_id,workload_class,share,acclimatized_share,sun_share
*,low,0.03,,0.6
*,moderate,0.05,,0.8
*,high,0.03,0.9,
*,very-high,0.01,0.9,
varn-shore,moderate,0.2,0.5,0.5
`;
/**
 * The default rows' weight of each evaluation, worked out by hand: share × (acclimatized share or
 * 1 − it) × (sun share or 1 − it); acclimatized and sun shares default to 1.
 */
const DEFAULT_WEIGHTS: Record<string, number> = {
  'low.acclimatized.sun': 0.03 * 1 * 0.6, // 0.018
  'low.acclimatized.shade': 0.03 * 1 * 0.4, // 0.012
  'moderate.acclimatized.sun': 0.05 * 1 * 0.8, // 0.040
  'moderate.acclimatized.shade': 0.05 * 1 * 0.2, // 0.010
  'high.acclimatized.sun': 0.03 * 0.9 * 1, // 0.027
  'high.unacclimatized.sun': 0.03 * 0.1 * 1, // 0.003
  'very-high.acclimatized.sun': 0.01 * 0.9 * 1, // 0.009
  'very-high.unacclimatized.sun': 0.01 * 0.1 * 1, // 0.001
};
/** A test region of exactly two land cells of the small grid (centres 20 °N, 146 and 145 °W). */
const TWO_CELLS = {
  lon: [-146.5, -144.5],
  lat: [19.5, 20.5],
  centres: [
    [-146, 20],
    [-145, 20],
  ] as const,
};

function atlasYaml(workforce: string, regions = join(dir, 'regions')): string {
  return `${testAtlasYaml({ id: 'people', title: 'Workforce test atlas (invented data)', years: [2022, 2023], regions })}${workforce}`;
}

const workforceKey = (raster = `inputs/${POPULATION_FILE}`, shares = 'shares.csv') => `workforce:
  raster: ${raster}
  shares: ${shares}
  name: Invented people of the test territory
  year: 2024
  licence: Invented for the test; no licence applies
  invented: true
`;

function parseCsv(text: string): Record<string, string>[] {
  const [head, ...rows] = text
    .replace(/^\uFEFF/, '')
    .trim()
    .split('\n');
  const cols = head.split(',');
  return rows.map((r) => Object.fromEntries(r.split(',').map((v, i) => [cols[i], v])));
}

/** People per cell of the small grid by GDAL: gdalwarp -r sum of the raster onto the grid's extent, rows south to north. */
async function gdalPeople(): Promise<{ at: (lon: number, lat: number) => number; total: number }> {
  // The small grid: 8 × 10 cells of 1°, centres 17…24 °N, 150…141 °W (edges 16.5…24.5, −150.5…−140.5).
  execFileSync('gdalwarp', [
    '-q',
    '-overwrite',
    '-r',
    'sum',
    '-ot',
    'Float64',
    '-te',
    '-150.5',
    '16.5',
    '-140.5',
    '24.5',
    '-ts',
    '10',
    '8',
    join(dir, 'inputs', POPULATION_FILE),
    join(dir, 'gdal-sum.tif'),
  ]);
  const tif = await fromFile(join(dir, 'gdal-sum.tif'));
  const v = (await (await tif.getImage(0)).readRasters({ interleave: true })) as unknown as Float64Array;
  await tif.close();
  let total = 0;
  for (const x of v) if (Number.isFinite(x)) total += x;
  return { at: (lon, lat) => v[(24 - lat) * 10 + (lon + 150)], total };
}

async function expectBuildError(name: string, yaml: string, code: string, match?: RegExp): Promise<HeathoursError> {
  const cfg = join(dir, `${name}.yaml`);
  writeFileSync(cfg, yaml);
  const target = join(dir, `out-${name}`);
  try {
    await buildAtlas({ configPath: cfg, outDir: target, jobs: 1, quiet: true, dataOnly: true, cache: false });
  } catch (e) {
    expect(e).toBeInstanceOf(HeathoursError);
    const err = e as HeathoursError;
    expect(err.code).toBe(code);
    expect(err.hint.length).toBeGreaterThan(10);
    if (match) expect(err.format()).toMatch(match);
    expect(existsSync(target), 'nothing is published after a failed build').toBe(false);
    return err;
  }
  throw new Error(`expected ${code}`);
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'hh-people-'));
  await writeDemoDataset({ outDir: join(dir, 'inputs'), years: [2022, 2023], layout: 'mixed', grid: 'small', quiet: true });
  mkdirSync(join(dir, 'regions'));
  for (const f of readdirSync(join(ROOT, 'content/regions'))) copyFileSync(join(ROOT, 'content/regions', f), join(dir, 'regions', f));
  const [w, e] = TWO_CELLS.lon;
  const [s, n] = TWO_CELLS.lat;
  writeFileSync(
    join(dir, 'regions', 'zz-two-cells.geojson'),
    JSON.stringify({
      type: 'Feature',
      properties: { id: 'two-cells', name: 'Two cells (test)' },
      geometry: {
        type: 'Polygon',
        coordinates: [
          [
            [w, s],
            [e, s],
            [e, n],
            [w, n],
            [w, s],
          ],
        ],
      },
    }),
  );
  writeFileSync(join(dir, 'shares.csv'), SHARES);
  writeFileSync(join(dir, 'atlas.yaml'), atlasYaml(workforceKey()));
  out = join(dir, 'out');
  await buildAtlas({ configPath: join(dir, 'atlas.yaml'), outDir: out, jobs: 2, quiet: true, dataOnly: true, cache: false });
}, 600_000);

describe('heathours build with a workforce raster and shares (invented small demo)', () => {
  it('a region of two whole cells holds the people GDAL sums for those cells (gdalwarp -r sum), within 0.5 %', async () => {
    const g = await gdalPeople();
    const summary = JSON.parse(readFileSync(join(out, 'data/regions/two-cells.json'), 'utf8'));
    const expected = TWO_CELLS.centres.reduce((sum, [lon, lat]) => sum + g.at(lon, lat), 0);
    expect(expected).toBeGreaterThan(1e4);
    expect(Math.abs(summary.workforce.people / expected - 1)).toBeLessThan(0.005);
    expect(summary.workforce.raster).toEqual({
      name: 'Invented people of the test territory',
      year: 2024,
      licence: 'Invented for the test; no licence applies',
      invented: true,
    });
    expect(summary.workforce.outdoorWorkers).toBeCloseTo(summary.workforce.people * 0.12, 6);
  });

  it('person-hours lost in July = Σ people × share × hours per worker, by hand from GDAL people, the shares and the published hours of each cell', async () => {
    const g = await gdalPeople();
    const cellRows = readdirSync(join(out, 'data/cell-tables')).flatMap((f) => parseCsv(readFileSync(join(out, 'data/cell-tables', f), 'utf8')));
    const hours = (lon: number, lat: number, figure: string, key: string) => {
      const row = cellRows.find(
        (r) =>
          Number(r.lon) === lon &&
          Number(r.lat) === lat &&
          r.period === '07' &&
          r.figure === figure &&
          `${r.workload_class}.${r.acclimatization}.${r.exposure}` === key,
      );
      return Number(row!.mean);
    };
    const byHand = (figure: string) =>
      TWO_CELLS.centres.reduce(
        (sum, [lon, lat]) => sum + g.at(lon, lat) * Object.entries(DEFAULT_WEIGHTS).reduce((s, [key, w]) => s + w * hours(lon, lat, figure, key), 0),
        0,
      );
    const table = parseCsv(readFileSync(join(out, 'data/regions/two-cells.csv'), 'utf8'));
    const get = (period: string, figure: string, cls: string, stat: string) =>
      table.find((r) => r.period === period && r.figure === figure && r.workload_class === cls && r.statistic === stat)!;
    const lost = get('07', 'person-hours-lost-shift', 'all', 'mean');
    const above = get('07', 'person-hours-above-limit-shift', 'all', 'mean');
    expect(lost.unit).toBe('person-h');
    expect(lost.acclimatization).toBe('by-shares');
    // Cell hours are published to 0.01 h: a relative rounding of well under 0.1 % here.
    expect(byHand('hours-lost-shift')).toBeGreaterThan(1e5);
    expect(Number(lost.value) / byHand('hours-lost-shift')).toBeCloseTo(1, 3);
    expect(Number(above.value) / byHand('hours-above-limit-shift')).toBeCloseTo(1, 3);
    // Full-time equivalents: person-hours / a year of the 07–17 Monday–Saturday shift, 10 h × 6 × 52 = 3120 h.
    expect(Number(get('07', 'full-time-equivalents-lost', 'all', 'mean').value)).toBeCloseTo(Number(lost.value) / 3120, 2);
    // Share of outdoor work time: July 2022 and 2023 each have 26 Monday–Saturday shifts of 10 h = 260 h per worker.
    const people = JSON.parse(readFileSync(join(out, 'data/regions/two-cells.json'), 'utf8')).workforce.people;
    expect(Number(get('07', 'outdoor-work-time-lost', 'all', 'mean').value)).toBeCloseTo((100 * Number(lost.value)) / (people * 0.12 * 260), 2);
    // The classes add up to all, and P90 year ≥ mean.
    const classes = ['low', 'moderate', 'high', 'very-high'].reduce((s, c) => s + Number(get('year', 'person-hours-lost-shift', c, 'mean').value), 0);
    expect(classes / Number(get('year', 'person-hours-lost-shift', 'all', 'mean').value)).toBeCloseTo(1, 5);
    expect(Number(get('year', 'person-hours-lost-shift', 'all', 'p90').value)).toBeGreaterThanOrEqual(
      Number(get('year', 'person-hours-lost-shift', 'all', 'mean').value),
    );
  });

  it('the map layer of person-hours lost per km² holds people × Σ weight × hours / cell area for a cell (by hand)', async () => {
    const m = JSON.parse(readFileSync(join(out, 'data/manifest.json'), 'utf8')) as Manifest;
    const layer = m.layers.find((l) => l.id === 'person-hours-lost-density/all/mean-07')!;
    expect(layer.units).toBe('person-h km-2');
    expect(m.layers.some((l) => l.id === 'person-hours-lost-density/all/p90-year')).toBe(true);
    const tif = await fromFile(join(out, layer.tif));
    const img = await tif.getImage(0);
    const v = (await img.readRasters({ interleave: true })) as unknown as Float32Array;
    const [west, north] = [img.getOrigin()[0], img.getOrigin()[1]];
    await tif.close();
    const [lon, lat] = TWO_CELLS.centres[0];
    const value = v[Math.floor(north - lat) * img.getWidth() + Math.floor(lon - west)];
    const g = await gdalPeople();
    const cellRows = readdirSync(join(out, 'data/cell-tables')).flatMap((f) => parseCsv(readFileSync(join(out, 'data/cell-tables', f), 'utf8')));
    const h = (key: string) =>
      Number(
        cellRows.find(
          (r) =>
            Number(r.lon) === lon &&
            Number(r.lat) === lat &&
            r.period === '07' &&
            r.figure === 'hours-lost-shift' &&
            `${r.workload_class}.${r.acclimatization}.${r.exposure}` === key,
        )!.mean,
      );
    const areaKm2 = EARTH_RADIUS_KM ** 2 * rectangleAreaSr(lon - 0.5, lon + 0.5, lat - 0.5, lat + 0.5);
    const byHand = (g.at(lon, lat) * Object.entries(DEFAULT_WEIGHTS).reduce((s, [k, w]) => s + w * h(k), 0)) / areaKm2;
    expect(value / byHand).toBeCloseTo(1, 3);
  });

  it("the manifest states the raster (name, year, licence, digest) and where its people went; people on land and over sea add up to GDAL's sum over the grid", async () => {
    const m = JSON.parse(readFileSync(join(out, 'data/manifest.json'), 'utf8')) as Manifest;
    const wf = m.workforce!;
    expect(wf.name).toBe('Invented people of the test territory');
    expect(wf.invented).toBe(true);
    expect(wf.raster.sha256).toBe(
      createHash('sha256')
        .update(readFileSync(join(dir, 'inputs', POPULATION_FILE)))
        .digest('hex'),
    );
    expect(wf.annualHours).toBe(3120);
    expect(wf.peopleOffLand).toBeGreaterThan(0);
    const g = await gdalPeople();
    expect((wf.peopleOnLand + wf.peopleOffLand) / g.total).toBeCloseTo(1, 4);
    // The demo raster's people on the 1° grid: everything inside the grid's extent is counted somewhere.
    const pop = demoPopulation();
    let inGrid = 0;
    pop.values.forEach((x, i) => {
      const la = pop.lat[Math.floor(i / pop.lon.length)];
      if (la > 16.5 && la < 24.5) inGrid += x;
    });
    expect((wf.peopleOnLand + wf.peopleOffLand + wf.peopleOutsideGrid) / inGrid).toBeCloseTo(1, 4);
  });

  it('region summaries, tables and workbooks carry the workforce figures with units; a region with rows of its own uses them', () => {
    const varn = JSON.parse(readFileSync(join(out, 'data/regions/varn-shore.json'), 'utf8'));
    expect(varn.workforce.sharesFrom).toBe('rows of this region');
    expect(varn.workforce.shares.find((c: { workloadClass: string }) => c.workloadClass === 'moderate')).toEqual({
      workloadClass: 'moderate',
      share: 0.2,
      acclimatized: 0.5,
      sun: 0.5,
    });
    expect(varn.workforce.year.personHoursLost.mean).toBeGreaterThan(0);
    const units = new Set(parseCsv(readFileSync(join(out, 'data/regions/varn-shore.csv'), 'utf8')).map((r) => r.unit));
    const base = ['h', 'degC', 'person-h km-2', 'person-h', 'FTE', '%'];
    // Each unit also per decade (the trend rows) and the Mann–Kendall p-value's 1.
    expect(units).toEqual(new Set([...base, ...base.map((u) => `${u} decade-1`), '1']));
    // The workbook gains the workforce sheets (read back by Python's openpyxl, Debian python3-openpyxl).
    const sheets = execFileSync(
      '/usr/bin/python3',
      ['-c', `import openpyxl; print('|'.join(openpyxl.load_workbook('${join(out, 'data/regions/varn-shore.xlsx')}').sheetnames))`],
      { encoding: 'utf8' },
    )
      .trim()
      .split('|');
    expect(sheets).toEqual(expect.arrayContaining(['Person-hours by month', 'Full-time equivalents by month', 'Outdoor time lost by month']));
    const assumptions = execFileSync(
      '/usr/bin/python3',
      [
        '-c',
        `import openpyxl; ws=openpyxl.load_workbook('${join(out, 'data/regions/varn-shore.xlsx')}')['Assumptions']; print('\\n'.join(str(r[1]) for r in ws.iter_rows(values_only=True)))`,
      ],
      { encoding: 'utf8' },
    );
    expect(assumptions).toContain('Invented people of the test territory, 2024 (INVENTED); licence: Invented for the test; no licence applies');
  });
});

describe('bad workforce inputs stop the build with a catalogued error and publish nothing', () => {
  it('a raster in Web Mercator (with the gdalwarp command to EPSG:4326 in the hint)', async () => {
    execFileSync('gdalwarp', ['-q', '-t_srs', 'EPSG:3857', join(dir, 'inputs', POPULATION_FILE), join(dir, 'mercator.tif')]);
    const e = await expectBuildError('crs', atlasYaml(workforceKey('mercator.tif')), 'WorkforceRasterCrs', /EPSG:3857/);
    expect(e.hint).toContain('gdalwarp -t_srs EPSG:4326');
  });

  it('a raster with a negative count', async () => {
    const pop = demoPopulation();
    pop.values[pop.values.length - 1000] = -3;
    writeFileSync(join(dir, 'negative.tif'), writeGeoTiff(pop, { units: 'people', description: 'invented (test)' }));
    await expectBuildError('negative', atlasYaml(workforceKey('negative.tif')), 'WorkforceCountInvalid', /-3/);
  });

  it('a raster that covers only part of the regions', async () => {
    execFileSync('gdal_translate', ['-q', '-projwin', '-150.2', '24.2', '-146', '16', join(dir, 'inputs', POPULATION_FILE), join(dir, 'west-half.tif')]);
    await expectBuildError('cover', atlasYaml(workforceKey('west-half.tif')), 'WorkforceRasterNotCovering', /lon -150\.2 … -146/);
  });

  it('shares that add up to more than 1 for a region, and a shares table naming an unknown region', async () => {
    writeFileSync(join(dir, 'too-many.csv'), 'region_id,workload_class,share\n*,low,0.5\n*,moderate,0.6\n');
    await expectBuildError('sum', atlasYaml(workforceKey(undefined, 'too-many.csv')), 'WorkforceSharesSum', /1\.1000/);
    writeFileSync(join(dir, 'unknown.csv'), 'region_id,workload_class,share\n*,low,0.1\natlantis,low,0.1\n');
    await expectBuildError('unknown', atlasYaml(workforceKey(undefined, 'unknown.csv')), 'WorkforceSharesRegionUnknown', /atlantis/);
  });

  it('a raster file that does not exist', async () => {
    await expectBuildError('missing', atlasYaml(workforceKey('nowhere.tif')), 'ConfigWorkforceFileMissing', /workforce\.raster/);
  });
});
