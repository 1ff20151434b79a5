/**
 * Change files onto the atlas grid (pipeline/read/change-file.ts, pipeline/scenario/regrid.ts,
 * pipeline/run/scenario-change.ts): units, longitude conventions, exact bilinear interpolation of
 * a linear field, and the catalogued errors of files that cannot be used. The files are written
 * here with our NetCDF-3 writer, invented for the test.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Netcdf3Writer, type Nc3Attr } from '../../pipeline/formats/netcdf3-writer.ts';
import { closeChangeFiles, scenarioCellChange } from '../../pipeline/run/scenario-change.ts';
import { checkScenarioIds, type ScenarioSpec } from '../../pipeline/scenario/settings.ts';
import { expectCatalogued, expectCataloguedAsync } from '../helpers/catalogued.ts';

let dir = '';

/** The atlas grid of the test: 4 × 5 cells of 0.25°, centres 20.125…20.875 °N, 145.875…144.875 °W. */
const GRID = { lat: Float64Array.from({ length: 4 }, (_, i) => 20.125 + 0.25 * i), lon: Float64Array.from({ length: 5 }, (_, i) => -145.875 + 0.25 * i) };
const ALL = Int32Array.from({ length: 20 }, (_, i) => i);

interface FileSpec {
  lat: number[];
  /** Longitudes as written in the file [° E]. */
  lon: number[];
  months?: number;
  /** Value of tas at (month 1–12, lat, lon in −180…180). */
  tas: (m: number, lat: number, lon: number) => number;
  tasUnits?: string;
  hurs?: (m: number, lat: number, lon: number) => number;
}

function writeChangeFile(name: string, f: FileSpec): string {
  const path = join(dir, name);
  const months = f.months ?? 12;
  const text = (n: string, value: string): Nc3Attr => ({ name: n, value });
  const vars = [
    {
      name: 'time',
      type: 'double' as const,
      dims: ['time'],
      attrs: [text('standard_name', 'time'), text('units', 'days since 2000-01-01'), text('calendar', '360_day')],
    },
    { name: 'lat', type: 'double' as const, dims: ['lat'], attrs: [text('standard_name', 'latitude'), text('units', 'degrees_north')] },
    { name: 'lon', type: 'double' as const, dims: ['lon'], attrs: [text('standard_name', 'longitude'), text('units', 'degrees_east')] },
    {
      name: 'tas',
      type: 'double' as const,
      dims: ['time', 'lat', 'lon'],
      attrs: [text('standard_name', 'air_temperature'), text('units', f.tasUnits ?? 'K'), text('units_metadata', 'temperature: difference')],
    },
    ...(f.hurs
      ? [{ name: 'hurs', type: 'double' as const, dims: ['time', 'lat', 'lon'], attrs: [text('standard_name', 'relative_humidity'), text('units', '%')] }]
      : []),
  ];
  const w = new Netcdf3Writer(path, {
    format: 'classic',
    numRecords: 0,
    dims: [
      { name: 'time', length: months },
      { name: 'lat', length: f.lat.length },
      { name: 'lon', length: f.lon.length },
    ],
    attrs: [text('Conventions', 'CF-1.8'), text('title', 'invented change factors for a test')],
    vars,
  });
  const field = (fn: (m: number, lat: number, lon: number) => number) => {
    const v = new Float64Array(months * f.lat.length * f.lon.length);
    for (let m = 0; m < months; m++)
      for (let y = 0; y < f.lat.length; y++)
        for (let x = 0; x < f.lon.length; x++) v[(m * f.lat.length + y) * f.lon.length + x] = fn(m + 1, f.lat[y], f.lon[x] >= 180 ? f.lon[x] - 360 : f.lon[x]);
    return v;
  };
  w.writeFixed(
    'time',
    Array.from({ length: months }, (_, m) => 30 * m + 15),
  );
  w.writeFixed('lat', f.lat);
  w.writeFixed('lon', f.lon);
  w.writeFixed('tas', field(f.tas));
  if (f.hurs) w.writeFixed('hurs', field(f.hurs));
  w.close();
  return path;
}

const spec = (path: string, humidity: 'relative' | 'specific' = 'relative'): ScenarioSpec => ({
  id: 'test',
  name: 'test',
  kind: 'change-file',
  path,
  file: path,
  sha256: '0'.repeat(64),
  humidity,
});
const axis = (a: number, n: number, step: number) => Array.from({ length: n }, (_, i) => a + step * i);
/** A 1° source grid around the atlas: 19…22 °N, 147…143 °W, in −180…180 and in 0–360. */
const LAT = axis(19, 4, 1);
const LON = axis(-147, 5, 1);
const LON360 = LON.map((x) => x + 360);
/** A field linear in latitude and longitude, different each month [K]. */
const linear = (m: number, lat: number, lon: number) => 0.1 * m + 0.3 * (lat - 20) - 0.2 * (lon + 145);

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'hh-change-'));
});
afterAll(async () => {
  await closeChangeFiles();
  rmSync(dir, { recursive: true, force: true });
});

describe('a change file on the atlas grid', () => {
  it('interpolates a field linear in latitude and longitude exactly (to 1e-12 K) at every cell and month', async () => {
    const c = await scenarioCellChange(spec(writeChangeFile('linear.nc', { lat: LAT, lon: LON, tas: linear })), ALL, GRID);
    let worst = 0;
    for (let m = 0; m < 12; m++)
      for (let k = 0; k < 20; k++) worst = Math.max(worst, Math.abs(c.temperature[m * 20 + k] - linear(m + 1, GRID.lat[Math.floor(k / 5)], GRID.lon[k % 5])));
    expect(worst).toBeLessThan(1e-12);
    expect(c.humidity).toBeNull();
  });

  it('gives identical changes for a file in K and the same file in degC (a difference, never shifted by 273.15)', async () => {
    const k = await scenarioCellChange(spec(writeChangeFile('in-k.nc', { lat: LAT, lon: LON, tas: linear, tasUnits: 'K' })), ALL, GRID);
    const c = await scenarioCellChange(spec(writeChangeFile('in-degc.nc', { lat: LAT, lon: LON, tas: linear, tasUnits: 'degC' })), ALL, GRID);
    expect(Buffer.from(c.temperature.buffer).equals(Buffer.from(k.temperature.buffer))).toBe(true);
  });

  it('gives identical changes for a file in 0–360 longitudes and its copy in −180–180 (humidity too)', async () => {
    const hurs = (m: number, lat: number, lon: number) => Math.sin(m + lat) * 3 + 0.01 * lon;
    const a = await scenarioCellChange(
      spec(writeChangeFile('lon180.nc', { lat: LAT, lon: LON, tas: (m, la, lo) => Math.cos(m * la) + 0.037 * (lo + 145), hurs })),
      ALL,
      GRID,
    );
    const b = await scenarioCellChange(
      spec(writeChangeFile('lon360.nc', { lat: LAT, lon: LON360, tas: (m, la, lo) => Math.cos(m * la) + 0.037 * (lo + 145), hurs })),
      ALL,
      GRID,
    );
    expect(Buffer.from(a.temperature.buffer).equals(Buffer.from(b.temperature.buffer))).toBe(true);
    expect(Buffer.from(a.humidity!.buffer).equals(Buffer.from(b.humidity!.buffer))).toBe(true);
  });

  it('refuses a file without a time axis of 12 months (ChangeFileNotMonthly)', async () => {
    await expectCataloguedAsync(
      scenarioCellChange(spec(writeChangeFile('eleven.nc', { lat: LAT, lon: LON, months: 11, tas: linear })), ALL, GRID),
      'ChangeFileNotMonthly',
      /11 entries, not 12/,
    );
  });

  it('refuses a grid that does not cover the atlas (ChangeGridNotCovering), naming the cell', async () => {
    // Ends at 146 °W: the atlas's easternmost cells (144.875 °W) lie more than half a step beyond.
    await expectCataloguedAsync(
      scenarioCellChange(spec(writeChangeFile('short.nc', { lat: LAT, lon: axis(-149, 4, 1), tas: linear })), ALL, GRID),
      'ChangeGridNotCovering',
      /does not cover the atlas cell/,
    );
  });

  it('refuses a relative-humidity change beyond ±100 points (HumidityChangeOutOfRange), naming the month', async () => {
    const hurs = (m: number) => (m === 7 ? 120 : 2);
    await expectCataloguedAsync(
      scenarioCellChange(spec(writeChangeFile('wet.nc', { lat: LAT, lon: LON, tas: linear, hurs })), ALL, GRID),
      'HumidityChangeOutOfRange',
      /month 7/,
    );
  });

  it('refuses a scenario id that is not a slug, reserved or repeated (ScenarioIdInvalid, ScenarioIdDuplicate)', () => {
    expectCatalogued(() => checkScenarioIds([{ id: 'Plus 2C' }], 'atlas.yaml'), 'ScenarioIdInvalid', /upper-case/);
    expectCatalogued(() => checkScenarioIds([{ id: 'plus_2' }], 'atlas.yaml'), 'ScenarioIdInvalid', /characters other than/);
    expectCatalogued(() => checkScenarioIds([{ id: '-two' }], 'atlas.yaml'), 'ScenarioIdInvalid', /starts with a dash/);
    expectCatalogued(() => checkScenarioIds([{ id: 'baseline' }], 'atlas.yaml'), 'ScenarioIdInvalid', /reserved/);
    expectCatalogued(() => checkScenarioIds([{ id: 'a' }, { id: 'a' }], 'atlas.yaml'), 'ScenarioIdDuplicate', /used twice/);
    expect(() => checkScenarioIds([{ id: 'plus-2c' }, { id: 'warming-level-1-5' }], 'atlas.yaml')).not.toThrow();
  });
});
