/**
 * Scenarios through `heathours build` on the invented small demo (8 × 10 cells at 1°, 2022–2023)
 * with the demo's own invented change files: a warming of 0 and a change file of zeros publish
 * tables byte-identical to the baseline's, and hours above the limit and hours lost never
 * decrease from the baseline to +1.5 to +2 °C in any region, month and evaluation.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { writeDemoDataset } from '../../pipeline/demo/index.ts';
import { buildAtlas } from '../../pipeline/run/build-atlas.ts';
import { Netcdf3Writer } from '../../pipeline/formats/netcdf3-writer.ts';
import { closeChangeFiles } from '../../pipeline/run/scenario-change.ts';
import type { Manifest } from '../../pipeline/publish/manifest.ts';
import { expectCataloguedAsync } from '../helpers/catalogued.ts';
import { fromFile } from 'geotiff';
import { testAtlasYaml } from '../helpers/atlas-yaml.ts';

let dir = '';
let out = '';

const yaml = (scenarios: string) => `${testAtlasYaml({ id: 'scen', title: 'Scenario test atlas (invented data)', years: [2022, 2023] })}scenarios:
${scenarios}`;

const SCENARIOS = `  - { id: zero-warming, name: No warming, warming: 0 }
  - { id: zero-file, name: A change file of zeros, changeFile: zeros.nc, humidity: relative }
  - { id: level-1-5, name: +1.5 (invented), changeFile: inputs/scenarios/warming-level-1.5.nc, humidity: relative }
  - { id: level-2, name: +2 (invented), changeFile: inputs/scenarios/warming-level-2.0.nc, humidity: relative }
`;

/** A change file of zeros (tas, hurs, rsds) on a 1° grid in 0–360 covering the small grid (16.5…24.5 °N, 150.5…140.5 °W). */
function writeZeros(path: string, months = 12): void {
  const lat = Array.from({ length: 12 }, (_, i) => 15 + i);
  const lon = Array.from({ length: 14 }, (_, i) => 208 + i);
  const a = (name: string, value: string) => ({ name, value });
  const w = new Netcdf3Writer(path, {
    format: 'classic',
    numRecords: 0,
    dims: [
      { name: 'month', length: months },
      { name: 'lat', length: lat.length },
      { name: 'lon', length: lon.length },
    ],
    attrs: [a('Conventions', 'CF-1.8'), a('title', 'zero changes (test)')],
    vars: [
      { name: 'month', type: 'int', dims: ['month'], attrs: [a('long_name', 'calendar month')] },
      { name: 'lat', type: 'double', dims: ['lat'], attrs: [a('standard_name', 'latitude'), a('units', 'degrees_north')] },
      { name: 'lon', type: 'double', dims: ['lon'], attrs: [a('standard_name', 'longitude'), a('units', 'degrees_east')] },
      { name: 'tas', type: 'float', dims: ['month', 'lat', 'lon'], attrs: [a('standard_name', 'air_temperature'), a('units', 'K')] },
      { name: 'hurs', type: 'float', dims: ['month', 'lat', 'lon'], attrs: [a('standard_name', 'relative_humidity'), a('units', '%')] },
      { name: 'rsds', type: 'float', dims: ['month', 'lat', 'lon'], attrs: [a('standard_name', 'surface_downwelling_shortwave_flux_in_air'), a('units', '%')] },
    ],
  });
  w.writeFixed(
    'month',
    Array.from({ length: months }, (_, m) => m + 1),
  );
  w.writeFixed('lat', lat);
  w.writeFixed('lon', lon);
  for (const v of ['tas', 'hurs', 'rsds']) w.writeFixed(v, new Float32Array(months * lat.length * lon.length));
  w.close();
}

interface Row {
  [k: string]: string;
}
function readCsv(path: string): Row[] {
  const [head, ...rows] = readFileSync(path, 'utf8')
    .replace(/^\uFEFF/, '')
    .trim()
    .split('\n');
  const cols = head.split(',');
  return rows.map((r) => Object.fromEntries(r.split(',').map((v, i) => [cols[i], v])));
}

/** Every table (CSV) of a published folder, by path relative to it. */
function tables(root: string): string[] {
  const found: string[] = [];
  for (const sub of ['regions', 'cell-tables']) {
    for (const f of readdirSync(join(root, sub))) if (f.endsWith('.csv')) found.push(join(sub, f));
  }
  return found.sort();
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'hh-scen-'));
  await writeDemoDataset({ outDir: join(dir, 'inputs'), years: [2022, 2023], layout: 'mixed', grid: 'small', quiet: true });
  writeZeros(join(dir, 'zeros.nc'));
  writeFileSync(join(dir, 'atlas.yaml'), yaml(SCENARIOS));
  out = join(dir, 'out');
  process.env.HEATHOURS_BUILD_TIME = '2026-01-01T00:00:00Z';
  await buildAtlas({ configPath: join(dir, 'atlas.yaml'), outDir: out, jobs: 2, quiet: true, dataOnly: true, cache: false });
  await closeChangeFiles();
}, 900_000);

describe('scenarios through the build (invented small demo)', () => {
  it('publishes every scenario under data/scenarios/<id>/ with the baseline\u2019s table names, and lists it in the manifest', () => {
    const manifest = JSON.parse(readFileSync(join(out, 'data/manifest.json'), 'utf8')) as Manifest & { scenarios: { id: string }[] };
    expect(manifest.scenarios.map((s) => s.id)).toEqual(['zero-warming', 'zero-file', 'level-1-5', 'level-2']);
    const base = tables(join(out, 'data'));
    expect(base.length).toBeGreaterThan(5);
    for (const id of ['zero-warming', 'zero-file', 'level-1-5', 'level-2']) expect(tables(join(out, 'data/scenarios', id))).toEqual(base);
  });

  it('a warming of 0 and a change file of zeros give region and cell tables byte-identical to the baseline\u2019s', () => {
    const base = tables(join(out, 'data'));
    for (const id of ['zero-warming', 'zero-file']) {
      for (const t of base) {
        const a = readFileSync(join(out, 'data', t));
        const b = readFileSync(join(out, 'data/scenarios', id, t));
        expect(b.equals(a), `${id}/${t}`).toBe(true);
      }
    }
  });

  it('hours above the limit and hours lost never decrease from the baseline to +1.5 to +2 °C, in any region, period, evaluation and statistic, and do increase somewhere', () => {
    const FIGURES = new Set(['hours-above-limit-shift', 'hours-above-limit-all', 'hours-lost-shift']);
    const key = (r: Row) => [r.period, r.figure, r.workload_class, r.acclimatization, r.exposure, r.method, r.statistic].join('|');
    let checked = 0;
    let rose = 0;
    const regionFiles = readdirSync(join(out, 'data/regions')).filter((f) => f.endsWith('.csv') && !f.endsWith('.wide.csv'));
    expect(regionFiles.length).toBeGreaterThan(0);
    for (const f of regionFiles) {
      const load = (root: string) =>
        new Map(
          readCsv(join(root, 'regions', f))
            .filter((r) => FIGURES.has(r.figure) && r.value !== '')
            .map((r) => [key(r), Number(r.value)]),
        );
      const b = load(join(out, 'data'));
      const s1 = load(join(out, 'data/scenarios/level-1-5'));
      const s2 = load(join(out, 'data/scenarios/level-2'));
      for (const [k, v] of b) {
        expect(s1.get(k), `${f} ${k} baseline ≤ +1.5`).toBeGreaterThanOrEqual(v);
        expect(s2.get(k), `${f} ${k} +1.5 ≤ +2`).toBeGreaterThanOrEqual(s1.get(k)!);
        checked++;
        if (s2.get(k)! > v) rose++;
      }
    }
    expect(checked).toBeGreaterThan(1000);
    expect(rose).toBeGreaterThan(checked / 4);
  });

  it('publishes a trend layer per combination of hours above the limit and hours lost (whole year, h per decade), for the record and each scenario, holding no value with 2 years built (a trend needs 15)', async () => {
    const manifest = JSON.parse(readFileSync(join(out, 'data/manifest.json'), 'utf8')) as Manifest & {
      scenarios: Array<{ id: string; layers: Manifest['layers'] }>;
    };
    for (const layers of [manifest.layers, ...manifest.scenarios.map((s) => s.layers)]) {
      const trend = layers.filter((l) => l.statistic === 'trend');
      const w = manifest.work as { classes: unknown[]; acclimatization: unknown[]; exposures: unknown[] };
      expect(trend.length).toBe(2 * w.classes.length * w.acclimatization.length * w.exposures.length);
      for (const l of trend) {
        expect([l.period, l.units]).toEqual(['year', 'h decade-1']);
        expect(['hours-above-limit-shift', 'hours-lost-shift']).toContain(l.figure);
      }
      const tif = await fromFile(join(out, trend[0].tif));
      const values = (await (await tif.getImage(0)).readRasters({ interleave: true })) as unknown as Float32Array;
      await tif.close();
      expect(values.length).toBeGreaterThan(0);
      expect(values.every((v) => v === -9999 || Number.isNaN(v))).toBe(true);
    }
    // The region tables agree: trend rows, empty, with the 2 years that had a value.
    const rows = readCsv(join(out, 'data/regions/drovan-basin.csv')).filter((r) => r.statistic === 'trend');
    expect(rows.length).toBeGreaterThan(0);
    for (const r of rows) expect([r.period, r.value, r.years_used, r.baseline]).toEqual(['year', '', '2', '2022-2023']);
  });

  it('a change file whose month axis has 11 entries stops the build with ChangeFileNotMonthly and publishes nothing', async () => {
    writeZeros(join(dir, 'eleven.nc'), 11);
    writeFileSync(join(dir, 'bad.yaml'), yaml('  - { id: eleven, name: Eleven months, changeFile: eleven.nc, humidity: relative }\n'));
    const target = join(dir, 'out-bad');
    await expectCataloguedAsync(
      buildAtlas({ configPath: join(dir, 'bad.yaml'), outDir: target, jobs: 1, quiet: true, dataOnly: true, cache: false }),
      'ChangeFileNotMonthly',
      /11 entries/,
    );
    expect(existsSync(target)).toBe(false);
  });

  it('a scenario id that is not a slug stops the build with ScenarioIdInvalid and publishes nothing', async () => {
    writeFileSync(join(dir, 'badid.yaml'), yaml('  - { id: Plus 2, name: Two, warming: 2 }\n'));
    const target = join(dir, 'out-badid');
    await expectCataloguedAsync(
      buildAtlas({ configPath: join(dir, 'badid.yaml'), outDir: target, jobs: 1, quiet: true, dataOnly: true, cache: false }),
      'ScenarioIdInvalid',
      /Plus 2/,
    );
    expect(existsSync(target)).toBe(false);
  });
});
