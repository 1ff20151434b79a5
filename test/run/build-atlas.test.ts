import { beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync, existsSync, readdirSync, mkdirSync, copyFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createHash } from 'node:crypto';
import { writeDemoDataset } from '../../pipeline/demo/index.ts';
import { buildAtlas } from '../../pipeline/run/build-atlas.ts';
import { HeathoursError } from '../../pipeline/model/errors.ts';
import { decodeHistogramTile } from '../../pipeline/publish/histogram-tiles.ts';
import { HIST_EDGES, HIST_LEN, HOURS, N_EXPOSURES } from '../../pipeline/reduce/layout.ts';
import { estimateFromHistogram, prepareWorkKernel, limitCurve2017 } from '../../pipeline/work/index.ts';
import type { Manifest } from '../../pipeline/publish/manifest.ts';
import { buildSite } from '../../pipeline/run/site-stage.ts';
import { testAtlasYaml } from '../helpers/atlas-yaml.ts';

const ROOT = new URL('../../', import.meta.url).pathname;
let dir = '';

function atlasYaml(extra = '', regions = join(ROOT, 'content/regions')): string {
  return `${testAtlasYaml({ id: 'small', title: 'Small test atlas (invented data)', years: [2022, 2023], regions })}${extra}`;
}

function parseCsv(text: string): Record<string, string>[] {
  const [head, ...rows] = text.trim().split('\n');
  const cols = head.split(',');
  return rows.map((r) => Object.fromEntries(r.split(',').map((v, i) => [cols[i], v])));
}

async function expectBuildError(yaml: string, code: string, name: string): Promise<HeathoursError> {
  const cfg = join(dir, `${name}.yaml`);
  writeFileSync(cfg, yaml);
  const out = join(dir, `out-${name}`);
  try {
    await buildAtlas({ configPath: cfg, outDir: out, jobs: 1, quiet: true, dataOnly: true, cache: false });
  } catch (e) {
    expect(e).toBeInstanceOf(HeathoursError);
    expect((e as HeathoursError).code).toBe(code);
    expect(existsSync(out), 'nothing is published after a failed build').toBe(false);
    expect(
      readdirSync(dir).filter((f) => f.includes('.stage-')),
      'no staging folder is left',
    ).toEqual([]);
    return e as HeathoursError;
  }
  throw new Error(`expected ${code}`);
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'hh-build-'));
  // Invented demo data, small grid, one legacy (2022) and one NetCDF-4 (2023) year.
  await writeDemoDataset({ outDir: join(dir, 'inputs'), years: [2022, 2023], layout: 'mixed', grid: 'small', quiet: true });
  writeFileSync(join(dir, 'atlas.yaml'), atlasYaml());
  await buildAtlas({ configPath: join(dir, 'atlas.yaml'), outDir: join(dir, 'out1'), jobs: 1, quiet: true, dataOnly: true, cache: false });
  await buildAtlas({ configPath: join(dir, 'atlas.yaml'), outDir: join(dir, 'out2'), jobs: 2, quiet: true, dataOnly: true, cache: false });
}, 300_000);

describe('heathours build on the invented small demo', () => {
  it('publishes the same tables and layers with 1 and 2 worker threads', () => {
    const m1 = JSON.parse(readFileSync(join(dir, 'out1/data/manifest.json'), 'utf8')) as Manifest;
    const m2 = JSON.parse(readFileSync(join(dir, 'out2/data/manifest.json'), 'utf8')) as Manifest;
    // The inventory and the region workbooks state the build time (the workbooks are byte-identical for the same build time: test/run/distributed.test.ts).
    const digests = (m: Manifest) =>
      m.artefacts.filter((a) => !a.path.endsWith('inventory.json') && !a.path.endsWith('.xlsx')).map((a) => `${a.path} ${a.sha256}`);
    expect(digests(m1)).toEqual(digests(m2));
    expect(m1.artefacts.length).toBeGreaterThan(100);
  });

  it('publishes the same tables and layers whether years are cut into months, quarters (the default) or whole years, and tiles into bands of 8 cells or one', async () => {
    // The inventory and the region workbooks state the build time (the workbooks are byte-identical for the same build time: test/run/distributed.test.ts).
    const digests = (m: Manifest) =>
      m.artefacts.filter((a) => !a.path.endsWith('inventory.json') && !a.path.endsWith('.xlsx')).map((a) => `${a.path} ${a.sha256}`);
    const ref = digests(JSON.parse(readFileSync(join(dir, 'out1/data/manifest.json'), 'utf8')) as Manifest);
    for (const [name, shards] of [
      ['months', '{ monthsPerPiece: 1, cellsPerTile: 8 }'],
      ['years', '{ monthsPerPiece: 12 }'],
    ] as const) {
      writeFileSync(join(dir, `atlas-${name}.yaml`), atlasYaml(`shards: ${shards}\n`));
      const r = await buildAtlas({
        configPath: join(dir, `atlas-${name}.yaml`),
        outDir: join(dir, `out-${name}`),
        jobs: 2,
        quiet: true,
        dataOnly: true,
        cache: false,
      });
      expect(r.shards, name).toBeGreaterThan(name === 'months' ? 24 : 2);
      const m = JSON.parse(readFileSync(join(dir, `out-${name}/data/manifest.json`), 'utf8')) as Manifest;
      expect(digests(m), name).toEqual(ref);
    }
  }, 300_000);

  it('the manifest lists every published file with its true SHA-256 and the inputs with theirs', () => {
    const m = JSON.parse(readFileSync(join(dir, 'out1/data/manifest.json'), 'utf8')) as Manifest;
    for (const a of m.artefacts.slice(0, 50)) {
      const bytes = readFileSync(join(dir, 'out1', a.path));
      expect(createHash('sha256').update(bytes).digest('hex'), a.path).toBe(a.sha256);
      expect(bytes.length).toBe(a.bytes);
    }
    // The inputs are the NetCDF files; demo-data also writes change files (scenarios/) and a people raster this config does not use.
    expect(m.inputs.map((i) => i.name).sort()).toEqual(
      readdirSync(join(dir, 'inputs'))
        .filter((f) => f.endsWith('.nc'))
        .sort(),
    );
    for (const i of m.inputs)
      expect(i.sha256).toBe(
        createHash('sha256')
          .update(readFileSync(join(dir, 'inputs', i.name)))
          .digest('hex'),
      );
    expect(m.atlas.invented).toBe(true);
    expect(m.counts.cellHours).toBeGreaterThan(0);
  });

  it('region tables are tidy, state units, and hold consistent statistics (hours lost ≤ hours above ≤ shift hours, median ≤ P90 ≤ max)', () => {
    const files = readdirSync(join(dir, 'out1/data/regions')).filter((f) => f.endsWith('.csv') && !f.endsWith('.wide.csv'));
    expect(files.length).toBe(5);
    for (const f of files) {
      const rows = parseCsv(readFileSync(join(dir, 'out1/data/regions', f), 'utf8'));
      const get = (period: string, figure: string, key: string, stat: string) =>
        Number(
          rows.find(
            (r) => r.period === period && r.figure === figure && `${r.workload_class}.${r.acclimatization}.${r.exposure}` === key && r.statistic === stat,
          )?.value,
        );
      for (const key of ['moderate.acclimatized.sun', 'very-high.unacclimatized.shade']) {
        for (const period of ['07', 'year']) {
          const lost = get(period, 'hours-lost-shift', key, 'mean');
          const above = get(period, 'hours-above-limit-shift', key, 'mean');
          expect(lost).toBeLessThanOrEqual(above + 1e-9);
          expect(get(period, 'hours-above-limit-shift', key, 'median')).toBeLessThanOrEqual(get(period, 'hours-above-limit-shift', key, 'p90') + 1e-9);
          expect(get(period, 'hours-above-limit-shift', key, 'p90')).toBeLessThanOrEqual(get(period, 'hours-above-limit-shift', key, 'max') + 1e-9);
        }
        expect(get('07', 'hours-above-limit-shift', key, 'mean')).toBeLessThanOrEqual(31 * 10);
      }
      // Hours and °C, each also per decade in the trend rows, and the trend's p-value (1).
      expect(new Set(rows.map((r) => r.unit))).toEqual(new Set(['h', 'degC', 'h decade-1', 'degC decade-1', '1']));
      // More work, more hours above the limit (same exposure and acclimatization).
      expect(get('year', 'hours-above-limit-shift', 'very-high.acclimatized.sun', 'mean')).toBeGreaterThanOrEqual(
        get('year', 'hours-above-limit-shift', 'low.acclimatized.sun', 'mean'),
      );
      // Sun is never kinder than shade.
      expect(get('year', 'hours-lost-shift', 'high.acclimatized.sun', 'mean')).toBeGreaterThanOrEqual(
        get('year', 'hours-lost-shift', 'high.acclimatized.shade', 'mean'),
      );
    }
  });

  it('the calculator histogram tile of a region reproduces its table: hours above the limit over all hours of July within 1 % of the hours', () => {
    const index = JSON.parse(readFileSync(join(dir, 'out1/data/calculator/index.json'), 'utf8'));
    const id = index.regions[0].id as string;
    const years = decodeHistogramTile(readFileSync(join(dir, 'out1/data/calculator', `${id}.bin`)), index.years.length);
    const rows = parseCsv(readFileSync(join(dir, 'out1/data/regions', `${id}.csv`), 'utf8'));
    const tableValue = Number(
      rows.find(
        (r) =>
          r.period === '07' &&
          r.figure === 'hours-above-limit-all' &&
          r.workload_class === 'high' &&
          r.acclimatization === 'acclimatized' &&
          r.exposure === 'sun' &&
          r.statistic === 'mean',
      )!.value,
    );
    const kernel = prepareWorkKernel({ workRate: 415, restRate: 115, limit: { model: 'curve-2017', acclimatization: 'acclimatized' } });
    expect(kernel.limitWork).toBeCloseTo(limitCurve2017(415, 'acclimatized'), 12);
    let total = 0;
    let hours = 0;
    for (const hist of years) {
      const counts = new Float64Array(HIST_LEN);
      for (let h = 0; h < HOURS; h++) {
        const base = (6 * HOURS + h) * N_EXPOSURES * HIST_LEN;
        for (let b = 0; b < HIST_LEN; b++) counts[b] += hist[base + b];
      }
      const e = estimateFromHistogram(HIST_EDGES, counts, kernel);
      total += e.hoursAbove;
      hours += e.hours;
    }
    const mean = total / years.length;
    expect(Math.abs(mean - tableValue)).toBeLessThanOrEqual(0.01 * (hours / years.length));
  });

  it('writes real map layers: a PNG and a GeoTIFF per month for the baseline mean of shift hours lost', () => {
    const m = JSON.parse(readFileSync(join(dir, 'out1/data/manifest.json'), 'utf8')) as Manifest;
    const lost = m.layers.filter((l) => l.figure === 'hours-lost-shift' && l.combo === 'high.acclimatized.sun' && l.statistic === 'mean');
    expect(lost.map((l) => l.period)).toEqual(['01', '02', '03', '04', '05', '06', '07', '08', '09', '10', '11', '12', 'year']);
    for (const l of lost) {
      expect(
        readFileSync(join(dir, 'out1', l.png))
          .subarray(1, 4)
          .toString(),
      ).toBe('PNG');
      expect(
        readFileSync(join(dir, 'out1', l.tif))
          .subarray(0, 2)
          .toString(),
      ).toBe('II');
      expect(l.legend.units).toBe('h');
    }
  });
});

describe('the site built from the pipeline output', () => {
  it('the home and data inventory pages show the dataset the pipeline read: file names, digests, variables and the invented-data label', async () => {
    const site = join(dir, 'site');
    await buildSite({ dataDir: join(dir, 'out1'), outDir: site, quiet: true });
    const inventory = JSON.parse(readFileSync(join(dir, 'out1/data/inventory.json'), 'utf8'));
    const page = readFileSync(join(site, 'inventory/index.html'), 'utf8');
    for (const f of inventory.files) {
      expect(page).toContain(f.name);
      expect(page).toContain(f.sha256.slice(0, 12));
    }
    for (const v of inventory.variables) expect(page).toContain(v.source);
    expect(readFileSync(join(site, 'index.html'), 'utf8').toLowerCase()).toContain('invented');
    expect(existsSync(join(site, 'data/manifest.json'))).toBe(true);
    expect(existsSync(join(site, 'data/regions/drovan-basin.csv'))).toBe(true);
  }, 300_000);
});

describe('heathours build refuses bad input and publishes nothing', () => {
  it('an unknown workload class', async () => {
    await expectBuildError(atlasYaml('  classes: [low, heavy-ish]\n'), 'WorkloadClassUnknown', 'unknown-class');
  });

  it('a negative metabolic rate in the workload-classes file', async () => {
    const classes = readFileSync(join(ROOT, 'content/workload-classes.yaml'), 'utf8').replace('metabolicRate: 300', 'metabolicRate: -300');
    writeFileSync(join(dir, 'bad-classes.yaml'), classes);
    const yaml = atlasYaml().replace(join(ROOT, 'content/workload-classes.yaml'), join(dir, 'bad-classes.yaml'));
    const e = await expectBuildError(yaml, 'MetabolicRateOutOfRange', 'negative-rate');
    expect(e.message).toContain('-300 W');
  });

  it('a shift outside 0-24 h', async () => {
    await expectBuildError(atlasYaml('  shift: { start: 7, end: 25 }\n'), 'WorkShiftInvalid', 'bad-shift');
  });

  it('an unknown time zone', async () => {
    await expectBuildError(atlasYaml().replace('Etc/GMT+10', 'Pacific/Atlantis'), 'ConfigInvalid', 'bad-zone');
  });

  it('years outside the data', async () => {
    await expectBuildError(atlasYaml().replace('years: [2022, 2023]', 'years: [2022, 2025]'), 'YearsOutsideData', 'years-outside');
  });

  it('a region outside the grid', async () => {
    const regions = join(dir, 'far-regions');
    mkdirSync(regions, { recursive: true });
    writeFileSync(
      join(regions, 'far.geojson'),
      JSON.stringify({
        type: 'Feature',
        properties: { id: 'far-away', name: 'Far away' },
        geometry: {
          type: 'Polygon',
          coordinates: [
            [
              [10, 10],
              [11, 10],
              [11, 11],
              [10, 11],
              [10, 10],
            ],
          ],
        },
      }),
    );
    await expectBuildError(atlasYaml('', regions), 'RegionOutsideGrid', 'region-outside');
  });

  it('a self-intersecting region polygon', async () => {
    const regions = join(dir, 'bowtie-regions');
    mkdirSync(regions, { recursive: true });
    copyFileSync(join(ROOT, 'content/regions/drovan-basin.geojson'), join(regions, 'drovan-basin.geojson'));
    writeFileSync(
      join(regions, 'bowtie.geojson'),
      JSON.stringify({
        type: 'Feature',
        properties: { id: 'bowtie', name: 'Bow tie' },
        geometry: {
          type: 'Polygon',
          coordinates: [
            [
              [-146, 19],
              [-145, 20],
              [-145, 19],
              [-146, 20],
              [-146, 19],
            ],
          ],
        },
      }),
    );
    const e = await expectBuildError(atlasYaml('', regions), 'RegionSelfIntersecting', 'bowtie');
    expect(e.where.file).toContain('bowtie.geojson');
  });
});
