/**
 * openDataset / readBlock on ERA5-style fixtures written by Debian's ncgen (netcdf-bin) from CDL:
 * the values we read back must equal the invented test pattern the CDL was built from, which
 * shows our decoding agrees with the reference library's encoding (packing, fill, layouts).
 */
import { afterAll, describe, expect, it } from 'vitest';
import { rmSync } from 'node:fs';
import { openDataset } from '../../pipeline/read/index.ts';
import { pattern, toSource, tempDir, writeFixture, type FixtureSpec, type Short } from '../fixtures/read/era5-cdl.ts';
import { expectCatalogued } from './helpers.ts';

const dir = tempDir();
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const H = 3_600_000;
const ALL: Short[] = ['t2m', 'd2m', 'sp', 'u10', 'v10', 'ssrd'];
const LAT_DESC = [10.5, 10.25, 10];
const LON_360 = [359.5, 359.75, 0, 0.25];
let n = 0;
const fx = (spec: Partial<FixtureSpec> & Pick<FixtureSpec, 'layout'>, kind?: 'nc3' | 'nc4' | 'nc6') =>
  writeFixture(dir, `f${n++}`, { start: '2020-01-01T00:00:00Z', hours: 24, lat: LAT_DESC, lon: LON_360, vars: ALL, ...spec }, kind);

/** Max |read − pattern| of a canonical field over a block, with the pattern mapped like the reader. */
function maxError(
  block: Awaited<ReturnType<Awaited<ReturnType<typeof openDataset>>['readBlock']>>,
  field: 'airTemperature' | 'surfacePressure' | 'solarGlobal' | 'windSpeed10m' | 'dewPointTemperature',
  expected: (ms: number, lat: number, lon: number) => number,
): number {
  const x = block.fields[field]!;
  const nx = block.lon.length;
  const cells = block.lat.length * nx;
  let worst = 0;
  for (let t = 0; t < block.time.length; t++)
    for (let y = 0; y < block.lat.length; y++)
      for (let i = 0; i < nx; i++) worst = Math.max(worst, Math.abs(x[t * cells + y * nx + i] - expected(block.time[t], block.lat[y], block.lon[i])));
  return worst;
}

describe('openDataset on ERA5 layouts (fixtures from ncgen)', () => {
  it('the legacy CDS layout (classic, int16 packed, hours since 1900, lat descending, lon 0..360) reads back the pattern in canonical units', async () => {
    const ds = await openDataset([fx({ layout: 'legacy' })], { product: 'era5' });
    expect(Array.from(ds.grid.lat)).toEqual([10, 10.25, 10.5]);
    expect(Array.from(ds.grid.lon)).toEqual([-0.5, -0.25, 0, 0.25]);
    expect(ds.time).toEqual({ start: Date.UTC(2020, 0, 1), count: 24 });
    expect(ds.files[0]).toMatchObject({ format: 'netcdf3-classic', layout: 'era5-legacy', timeStart: '2020-01-01T00:00:00Z', timeEnd: '2020-01-01T23:00:00Z' });
    expect(ds.files[0].sha256).toMatch(/^[0-9a-f]{64}$/);
    const b = await ds.readBlock(0, 24, { y0: 0, y1: 3, x0: 0, x1: 4 });
    // packing step is range/65000: well below 0.01 for these ranges
    expect(maxError(b, 'airTemperature', (ms, la, lo) => pattern('t2m', ms, la, lo))).toBeLessThan(0.01);
    expect(maxError(b, 'surfacePressure', (ms, la, lo) => pattern('sp', ms, la, lo))).toBeLessThan(0.01);
    expect(maxError(b, 'solarGlobal', (ms, la, lo) => pattern('ssrd', ms, la, lo))).toBeLessThan(0.05);
    expect(maxError(b, 'windSpeed10m', (ms, la, lo) => Math.hypot(pattern('u10', ms, la, lo), pattern('v10', ms, la, lo)))).toBeLessThan(0.001);
    await ds.close();
  });

  it('the 2024 CDS layout (NetCDF-4 + zlib, valid_time seconds since 1970, number and expver coordinates) reads the same pattern', async () => {
    const ds = await openDataset([fx({ layout: 'cds2024', lon: [-0.5, -0.25, 0, 0.25], expver: Array(24).fill('0001') })], { product: 'era5' });
    expect(ds.files[0]).toMatchObject({ format: 'netcdf4', layout: 'era5-cds-2024' });
    const b = await ds.readBlock(3, 5, { y0: 1, y1: 3, x0: 1, x1: 4 });
    expect(b.time[0]).toBe(Date.UTC(2020, 0, 1, 3));
    expect(Array.from(b.lat)).toEqual([10.25, 10.5]);
    expect(maxError(b, 'airTemperature', (ms, la, lo) => pattern('t2m', ms, la, lo))).toBeLessThan(1e-4);
    expect(maxError(b, 'dewPointTemperature', (ms, la, lo) => pattern('d2m', ms, la, lo))).toBeLessThan(1e-4);
    await ds.close();
  });

  it('a 64-bit offset file (ncgen -k nc6) reads like a classic one', async () => {
    const ds = await openDataset([fx({ layout: 'legacy' }, 'nc6')], { product: 'era5' });
    expect(ds.files[0].format).toBe('netcdf3-64bit-offset');
    const b = await ds.readBlock(0, 24, { y0: 0, y1: 3, x0: 0, x1: 4 });
    expect(maxError(b, 'airTemperature', (ms, la, lo) => pattern('t2m', ms, la, lo))).toBeLessThan(0.01);
    await ds.close();
  });

  it('a multi-file dataset (one legacy file and one 2024-layout file, then one per variable) has one continuous hourly axis', async () => {
    const a = fx({ layout: 'legacy' });
    const b = fx({ layout: 'cds2024', start: '2020-01-02T00:00:00Z', lon: [-0.5, -0.25, 0, 0.25], expver: Array(24).fill('0001') });
    const ds = await openDataset([b, a], { product: 'era5' });
    expect(ds.time).toEqual({ start: Date.UTC(2020, 0, 1), count: 48 });
    const blk = await ds.readBlock(20, 8, { y0: 0, y1: 3, x0: 0, x1: 4 });
    expect(maxError(blk, 'airTemperature', (ms, la, lo) => pattern('t2m', ms, la, lo))).toBeLessThan(0.01);
    const s = await ds.summary();
    const t = s.find((v) => v.name === 'airTemperature')!;
    expect(t).toMatchObject({ source: 't2m', units: 'degC', sourceUnits: 'K', fillCount: 0 });
    await ds.close();
    const perVar = ALL.map((v) => fx({ layout: 'legacy', vars: [v] }));
    const ds2 = await openDataset(perVar, { product: 'era5' });
    expect(ds2.variables).toEqual(['airTemperature', 'dewPointTemperature', 'surfacePressure', 'windSpeed10m', 'solarGlobal']);
    await ds2.close();
  });

  it("the summary of chunks summarised elsewhere (as the build's workers do) equals the summary read in one go, and fills the cache", async () => {
    // Hours stamped 31 Dec 2020 00:00 … 1 Jan 2021 23:00 (stamps are hour ends): two UTC years, the
    // 25th stamp (1 Jan 00:00) ending the last hour that starts in 2020.
    const a = fx({ layout: 'legacy', start: '2020-12-31T00:00:00Z', hours: 48 });
    const ds = await openDataset([a], { product: 'era5' });
    const chunks = ds.summaryChunks();
    expect(chunks.map((c) => c.hours)).toEqual([
      [0, 25],
      [25, 48],
    ]);
    const whole = await ds.summary();
    const parts = new Map(await Promise.all(chunks.map(async (c) => [c.key, await ds.summariseChunk(c.hours[0], c.hours[1])] as const)));
    const kept = new Map<string, unknown>();
    const cache = { get: (k: string) => kept.get(k) as never, set: (k: string, v: unknown) => void kept.set(k, v) };
    expect(await ds.summary(cache, parts)).toEqual(whole);
    expect([...kept.keys()].sort()).toEqual(chunks.map((c) => c.key).sort());
    expect(await ds.summary(cache)).toEqual(whole);
    await ds.close();
  });

  it('expver along valid_time: where final ERA5 ("0001") and ERA5T ("0005") files share hours, final wins and no hour is counted twice', async () => {
    const fin = fx({ layout: 'cds2024', hours: 12, lon: [-0.5, -0.25, 0, 0.25], expver: Array(12).fill('0001') });
    const pre = fx(
      {
        layout: 'cds2024',
        hours: 24,
        lon: [-0.5, -0.25, 0, 0.25],
        expver: Array(24).fill('0005'),
        value: (v, ms, la, lo) => (v === 't2m' ? 310 : toSource(v, pattern(v, ms, la, lo))),
      },
      'nc4',
    );
    const ds = await openDataset([pre, fin], { product: 'era5' });
    expect(ds.time.count).toBe(24);
    const b = await ds.readBlock(0, 24, { y0: 0, y1: 3, x0: 0, x1: 4 });
    const x = b.fields.airTemperature!;
    expect(x[0]).toBeCloseTo(pattern('t2m', Date.UTC(2020, 0, 1), 10, -0.5), 3); // hour 0 from the final file
    expect(x[12 * 12]).toBeCloseTo(310 - 273.15, 3); // hour 12 only in ERA5T
    await ds.close();
  });

  it('expver as a dimension (time, expver, lat, lon): each hour takes the final value, else the ERA5T value', async () => {
    const slots = Array.from({ length: 24 }, (_, i) => (i < 20 ? 0 : 1));
    const ds = await openDataset([fx({ layout: 'expver-dim', expverSlot: slots })], { product: 'era5' });
    const b = await ds.readBlock(0, 24, { y0: 0, y1: 3, x0: 0, x1: 4 });
    expect(maxError(b, 'airTemperature', (ms, la, lo) => pattern('t2m', ms, la, lo))).toBeLessThan(0.01);
    expect(b.fields.airTemperature!.some((v) => Number.isNaN(v))).toBe(false);
    await ds.close();
  });

  it('ERA5-Land accumulations since 00 UTC are de-accumulated (docs/methods.md §2.2): the 01 UTC hour as is, later hours as differences, 00 UTC from the previous day', async () => {
    // Accumulated ssrd [J m-2]: A(t) = sum of hourly means × 3600 since 00 UTC; 00 UTC holds the whole previous day.
    const start = Date.UTC(2020, 0, 1, 1);
    const accumulated = (ms: number, la: number, lo: number) => {
      let s = 0;
      const hour = new Date(ms).getUTCHours() || 24;
      for (let k = hour - 1; k >= 0; k--) s += pattern('ssrd', ms - k * H, la, lo) * 3600;
      return s;
    };
    const file = fx({
      layout: 'legacy',
      start: '2020-01-01T01:00:00Z',
      hours: 30,
      value: (v, ms, la, lo) =>
        v === 'ssrd'
          ? accumulated(ms, la, lo)
          : v === 't2m' || v === 'd2m'
            ? pattern(v, ms, la, lo) + 273.15
            : v === 'sp'
              ? pattern(v, ms, la, lo) * 100
              : pattern(v, ms, la, lo),
    });
    const ds = await openDataset([file], { product: 'era5-land' });
    expect(ds.time.start).toBe(start);
    const b = await ds.readBlock(0, 30, { y0: 0, y1: 3, x0: 0, x1: 4 });
    // packing step of the accumulation (range up to ~1.8e7 J m-2 / 65000 ≈ 280 J m-2 ≈ 0.08 W m-2), two values differenced
    expect(maxError(b, 'solarGlobal', (ms, la, lo) => pattern('ssrd', ms, la, lo))).toBeLessThan(0.2);
    const later = await ds.readBlock(5, 3, { y0: 0, y1: 1, x0: 0, x1: 1 });
    expect(later.fields.solarGlobal![1]).toBeCloseTo(pattern('ssrd', start + 6 * H, 10, -0.5), 0);
    await ds.close();
  });

  it('the land-sea mask (lsm, static) gives landFraction per canonical cell and, with a threshold, the land mask', async () => {
    const ds = await openDataset([fx({ layout: 'legacy', vars: [...ALL, 'lsm'] })], { product: 'era5', landSeaMask: { variable: 'lsm', threshold: 0.5 } });
    expect(Array.from(ds.landFraction!.slice(0, 4)).map((v) => Math.round(v * 100) / 100)).toEqual([0.2, 0.2, 0.2, 1]);
    expect(ds.landCells).toBe(3);
    const b = await ds.readBlock(0, 1, { y0: 1, y1: 2, x0: 2, x1: 4 });
    expect(Array.from(b.landFraction!).map((v) => Math.round(v * 100) / 100)).toEqual([0.2, 1]);
    await ds.close();
  });
});

describe('openDataset bad inputs: each a catalogued error naming the file', () => {
  it('a missing variable (no d2m anywhere) is MissingNetcdfVariable naming the files', async () => {
    const f = fx({ layout: 'legacy', vars: ['t2m', 'sp', 'u10', 'v10', 'ssrd'] });
    await expectCatalogued(openDataset([f], { product: 'era5' }), 'MissingNetcdfVariable', /no d2m.*f\d+\.nc/);
  });

  it('a variable missing for a day between two days that have it is MissingNetcdfVariable naming the file that covers those hours', async () => {
    const a = fx({ layout: 'legacy' });
    const b = fx({ layout: 'legacy', start: '2020-01-02T00:00:00Z', vars: ['t2m', 'sp', 'u10', 'v10', 'ssrd'] });
    const c = fx({ layout: 'legacy', start: '2020-01-03T00:00:00Z' });
    await expectCatalogued(
      openDataset([a, b, c], { product: 'era5' }),
      'MissingNetcdfVariable',
      /d2m: it is missing for the hours 2020-01-02T00:00:00Z to 2020-01-02T23:00:00Z, which f\d+\.nc cover/,
    );
  });

  it('a variable present for the first day only: the dataset keeps the common day and reports the hours the others have alone', async () => {
    const a = fx({ layout: 'legacy' });
    const b = fx({ layout: 'legacy', start: '2020-01-02T00:00:00Z', vars: ['t2m', 'sp', 'u10', 'v10', 'ssrd'] });
    const ds = await openDataset([a, b], { product: 'era5' });
    expect(ds.time).toEqual({ start: Date.UTC(2020, 0, 1), count: 24 });
    expect(ds.notes).toHaveLength(5);
    expect(ds.notes[0]).toMatch(/^t2m has the hours 2020-01-02T00:00:00Z to 2020-01-02T23:00:00Z \(in f\d+\.nc\) that d2m lack\(s\)/);
    await ds.close();
  });

  it('the configured land-sea mask variable missing from every file is MissingNetcdfVariable', async () => {
    await expectCatalogued(
      openDataset([fx({ layout: 'legacy' })], { product: 'era5', landSeaMask: { variable: 'lsm', threshold: 0.5 } }),
      'MissingNetcdfVariable',
      /lsm/,
    );
  });

  it('an unknown unit is NetcdfUnitUnknown naming the variable and file', async () => {
    const f = fx({ layout: 'legacy', units: { sp: 'furlongs' } });
    const e = await expectCatalogued(openDataset([f], { product: 'era5' }), 'NetcdfUnitUnknown', /furlongs/);
    expect(e.where).toMatchObject({ variable: 'sp', file: f });
  });

  it('kelvin values labelled "C" are NetcdfUnitImplausible naming the variable (the nc4uvt.nc trap, libncarg-data)', async () => {
    const f = fx({ layout: 'legacy', units: { t2m: 'C' } });
    const e = await expectCatalogued(openDataset([f], { product: 'era5' }), 'NetcdfUnitImplausible', /kelvin values labelled as Celsius/);
    expect(e.where).toMatchObject({ variable: 't2m', file: f });
  });

  it('files on different grids are NetcdfGridMismatch naming both files', async () => {
    const a = fx({ layout: 'legacy' });
    const b = fx({ layout: 'legacy', start: '2020-01-02T00:00:00Z', lat: [10.5, 10.25, 10.0].map((x) => x + 0.1) });
    await expectCatalogued(openDataset([a, b], { product: 'era5' }), 'NetcdfGridMismatch', /f\d+\.nc and f\d+\.nc differ: latitude/);
  });

  it('a gap in the hourly axis is NetcdfTimeGap naming the hours and the files on both sides', async () => {
    const a = fx({ layout: 'legacy' });
    const b = fx({ layout: 'legacy', start: '2020-01-02T03:00:00Z' });
    await expectCatalogued(
      openDataset([a, b], { product: 'era5' }),
      'NetcdfTimeGap',
      /2020-01-02T00:00:00Z to 2020-01-02T02:00:00Z.*between f\d+\.nc \(ending 2020-01-01T23:00:00Z\) and f\d+\.nc \(starting 2020-01-02T03:00:00Z\); no input file holds these hours[\s\S]*at: file \/.*f\d+\.nc, \/.*f\d+\.nc/,
    );
  });

  it('a gap inside one file (its time axis skips hours) is NetcdfTimeGap naming that file once, at: that file, not the land-sea mask listed first', async () => {
    const mask = fx({ layout: 'legacy', hours: 1, vars: ['lsm'] });
    const a = fx({ layout: 'legacy', skip: [5, 6] });
    const e = await expectCatalogued(
      openDataset([mask, a], { product: 'era5' }),
      'NetcdfTimeGap',
      /2020-01-01T05:00:00Z to 2020-01-01T06:00:00Z.*inside f\d+\.nc: its time axis jumps from 2020-01-01T04:00:00Z to 2020-01-01T07:00:00Z/,
    );
    expect(e.where.file).toBe(a);
  });

  it('the same hours in two files (same expver) are NetcdfDuplicateHours naming both files', async () => {
    const a = fx({ layout: 'legacy' });
    const b = fx({ layout: 'legacy', start: '2020-01-01T12:00:00Z' });
    await expectCatalogued(openDataset([a, b], { product: 'era5' }), 'NetcdfDuplicateHours', /2020-01-01T12:00:00Z is in f\d+\.nc and again in f\d+\.nc/);
  });

  it('a non-singleton extra dimension (an ensemble of 3 members) is NetcdfDimensionUnsupported', async () => {
    const cdl = `netcdf e { dimensions: time = 2 ; number = 3 ; latitude = 2 ; longitude = 2 ;
variables: int time(time) ; time:units = "hours since 1900-01-01" ; float latitude(latitude) ; latitude:units = "degrees_north" ;
float longitude(longitude) ; longitude:units = "degrees_east" ; float t2m(time, number, latitude, longitude) ; t2m:units = "K" ;
data: time = 1051896, 1051897 ; latitude = 1, 0 ; longitude = 0, 1 ; t2m = ${Array(24).fill(290).join(',')} ; }`;
    const { ncgen } = await import('../fixtures/read/era5-cdl.ts');
    await expectCatalogued(
      openDataset([ncgen(dir, 'ens', cdl)], { product: 'era5', require: ['airTemperature'] }),
      'NetcdfDimensionUnsupported',
      /number of length 3/,
    );
  });

  it('readBlock outside the dataset is NetcdfBlockOutOfRange', async () => {
    const ds = await openDataset([fx({ layout: 'legacy' })], { product: 'era5' });
    await expectCatalogued(ds.readBlock(20, 10, { y0: 0, y1: 1, x0: 0, x1: 1 }), 'NetcdfBlockOutOfRange');
    await expectCatalogued(ds.readBlock(0, 1, { y0: 0, y1: 9, x0: 0, x1: 1 }), 'NetcdfBlockOutOfRange');
    await ds.close();
  });

  it('no files at all is NetcdfNoFiles', async () => {
    await expectCatalogued(openDataset([], { product: 'era5' }), 'NetcdfNoFiles');
  });
});
