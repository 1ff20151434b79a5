import { beforeAll, describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { mkdtempSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { writeDemoDataset, LSM_FILE, yearFileName } from '../../pipeline/demo/index.ts';
import { POPULATION_FILE } from '../../pipeline/demo/population.ts';
import { changeFactorFile, DEMO_WARMING_LEVELS } from '../../pipeline/demo/change-factors.ts';
import { makeCellClimate } from '../../pipeline/demo/cell-climate.ts';
import { ERA5_VARIABLES } from '../../pipeline/demo/era5-variables.ts';
import { placeGrid, SMALL_GRID } from '../../pipeline/demo/territory.ts';
import { YearWeather } from '../../pipeline/demo/weather.ts';
import { dataStrings, dataValues, ncdump } from './ncdump.ts';

// Both layouts are checked with Debian's ncdump (netcdf-bin, the NetCDF reference C library).
// Layout facts (dims, time units, packing, attribute names) are docs/methods.md §2.3, which cites
// ncdump output of CDS files and the ECMWF conversion pages.

const sha = (p: string) => createHash('sha256').update(readFileSync(p)).digest('hex');
let dirA: string;
let dirB: string;
let filesA: string[];

beforeAll(async () => {
  dirA = mkdtempSync(join(tmpdir(), 'heathours-demo-a-'));
  dirB = mkdtempSync(join(tmpdir(), 'heathours-demo-b-'));
  // mixed: 2022 is written in the legacy layout, 2023 in the NetCDF-4 layout; A in this thread,
  // B in two worker threads (same bytes expected).
  filesA = (await writeDemoDataset({ outDir: dirA, years: [2022, 2023], layout: 'mixed', grid: 'small', seed: 11, quiet: true, jobs: 1 })).files;
  await writeDemoDataset({ outDir: dirB, years: [2022, 2023], layout: 'mixed', grid: 'small', seed: 11, quiet: true, jobs: 2 });
}, 300_000);

describe('writeDemoDataset, small grid, mixed layout', () => {
  it("writes the mask, the invented population raster, one file per year and the two scenarios' change files, and nothing else (no temporary files left)", () => {
    expect(filesA.map((f) => f.slice(dirA.length + 1))).toEqual([LSM_FILE, POPULATION_FILE, yearFileName(2022), yearFileName(2023)]);
    expect(readdirSync(dirA).sort()).toEqual([LSM_FILE, POPULATION_FILE, yearFileName(2022), yearFileName(2023), 'scenarios'].sort());
    expect(readdirSync(join(dirA, 'scenarios')).sort()).toEqual(DEMO_WARMING_LEVELS.map((l) => changeFactorFile(l).slice('scenarios/'.length)).sort());
  });

  it('ncdump -h parses the legacy file: NetCDF-3 classic, packed shorts, hours since 1900, invented labels', () => {
    const path = join(dirA, yearFileName(2022));
    expect(readFileSync(path).subarray(0, 4)).toEqual(Buffer.from([0x43, 0x44, 0x46, 0x01]));
    const h = ncdump('-h', path);
    expect(h).toContain('longitude = 10 ;');
    expect(h).toContain('latitude = 8 ;');
    expect(h).toContain('time = UNLIMITED ; // (8760 currently)');
    expect(h).toContain('int time(time) ;');
    expect(h).toContain('time:units = "hours since 1900-01-01 00:00:00.0" ;');
    expect(h).toContain('time:calendar = "gregorian" ;');
    for (const v of ['t2m', 'd2m', 'u10', 'v10', 'sp', 'ssrd', 'fdir', 'strd']) {
      expect(h).toContain(`short ${v}(time, latitude, longitude) ;`);
      expect(h).toContain(`${v}:_FillValue = -32767s ;`);
      expect(h).toContain(`${v}:missing_value = -32767s ;`);
      expect(h).toMatch(new RegExp(`${v}:scale_factor = [0-9.e-]+ ;`));
      expect(h).toMatch(new RegExp(`${v}:add_offset = [0-9.e-]+ ;`));
      expect(h).toContain(`${v}:units = "${ERA5_VARIABLES[v as 't2m'].units}" ;`);
    }
    expect(h).toContain(':Conventions = "CF-1.6" ;');
    expect(h).toMatch(/:history = "[^"]*invented/);
    expect(h).toMatch(/:title = "[^"]*invented/);
  });

  it('ncdump -h parses the NetCDF-4 file: valid_time int64 seconds since 1970, stored_direction, number, expver, float32 with NaN fill', () => {
    const path = join(dirA, yearFileName(2023));
    expect(readFileSync(path).subarray(0, 8)).toEqual(Buffer.from([0x89, 0x48, 0x44, 0x46, 0x0d, 0x0a, 0x1a, 0x0a]));
    const h = ncdump('-h', path);
    // dimensions in the intended order (from _Netcdf4Dimid)
    expect(h).toMatch(/dimensions:\n\tvalid_time = 8760 ;\n\tlatitude = 8 ;\n\tlongitude = 10 ;/);
    expect(h).toContain('int64 valid_time(valid_time) ;');
    expect(h).toContain('valid_time:units = "seconds since 1970-01-01" ;');
    expect(h).toContain('valid_time:calendar = "proleptic_gregorian" ;');
    expect(h).toContain('latitude:stored_direction = "decreasing" ;');
    expect(h).toContain('int64 number ;');
    expect(h).toContain('string expver(valid_time) ;');
    for (const v of ['t2m', 'd2m', 'u10', 'v10', 'sp', 'ssrd', 'fdir', 'strd']) {
      expect(h).toContain(`float ${v}(valid_time, latitude, longitude) ;`);
      expect(h).toContain(`${v}:_FillValue = NaNf ;`);
      expect(h).toContain(`${v}:units = "${ERA5_VARIABLES[v as 't2m'].units}" ;`);
    }
    expect(h).toMatch(/:history = "[^"]*invented/);
    // ncdump -hs shows the storage: chunked and deflated
    const hs = ncdump('-hs', path);
    expect(hs).toMatch(/t2m:_Storage = "chunked" ;/);
    expect(hs).toMatch(/t2m:_DeflateLevel = \d ;/);
  });

  it('ncdump -h parses the land-sea mask file: lsm with a single time step', () => {
    const h = ncdump('-h', join(dirA, LSM_FILE));
    expect(h).toContain('time = UNLIMITED ; // (1 currently)');
    expect(h).toContain('short lsm(time, latitude, longitude) ;');
    expect(h).toContain('lsm:units = "(0 - 1)" ;');
  });

  it('ncdump -v gives the values meant: legacy t2m unpacked by hand equals the generator within half a packing step', () => {
    const path = join(dirA, yearFileName(2022));
    const cdl = ncdump('-v', 't2m,time,latitude,longitude', path);
    const sf = Number(/t2m:scale_factor = ([0-9.e-]+) ;/.exec(cdl)![1]);
    const ao = Number(/t2m:add_offset = ([0-9.e-]+) ;/.exec(cdl)![1]);
    const packed = dataValues(cdl, 't2m');
    const time = dataValues(cdl, 'time');
    expect(dataValues(cdl, 'latitude')).toEqual([24, 23, 22, 21, 20, 19, 18, 17]);
    expect(dataValues(cdl, 'longitude')).toEqual([210, 211, 212, 213, 214, 215, 216, 217, 218, 219]);
    // time: the hours ending 2022-01-01 01:00 … 2023-01-01 00:00 UTC, one step apart
    expect(time[0]).toBe((Date.UTC(2022, 0, 1, 1) - Date.UTC(1900, 0, 1)) / 3.6e6);
    expect(time[time.length - 1]).toBe((Date.UTC(2023, 0, 1) - Date.UTC(1900, 0, 1)) / 3.6e6);
    for (let k = 1; k < time.length; k++) expect(time[k] - time[k - 1]).toBe(1);
    const gen = new YearWeather(makeCellClimate(placeGrid(SMALL_GRID)), 11, 2022);
    const block = gen.allocBlock(48);
    gen.next(48, block);
    let worst = 0;
    for (let i = 0; i < 48 * 80; i++) worst = Math.max(worst, Math.abs(packed[i] * sf + ao - block.t2m[i]));
    expect(worst).toBeLessThanOrEqual(sf / 2 + 1e-4);
    expect(packed.every((p) => p >= -32766 && p <= 32766)).toBe(true);
  });

  it('ncdump -v gives the values meant: NetCDF-4 t2m, valid_time joining the legacy year with no gap, expver 0005 for Oct–Dec of the last year', () => {
    const path = join(dirA, yearFileName(2023));
    const cdl = ncdump('-v', 't2m,valid_time,expver', path);
    const vt = dataValues(cdl, 'valid_time');
    expect(vt[0]).toBe(Date.UTC(2023, 0, 1, 1) / 1000);
    expect(vt[vt.length - 1]).toBe(Date.UTC(2024, 0, 1) / 1000);
    const legacy = dataValues(ncdump('-v', 'time', join(dirA, yearFileName(2022))), 'time');
    const legacyLastS = legacy[legacy.length - 1] * 3600 + Date.UTC(1900, 0, 1) / 1000;
    expect(vt[0] - legacyLastS).toBe(3600);
    const ev = dataStrings(cdl, 'expver');
    const firstPrelim = vt.findIndex((s) => s * 1000 > Date.UTC(2023, 9, 1));
    expect(new Set(ev.slice(0, firstPrelim))).toEqual(new Set(['0001']));
    expect(new Set(ev.slice(firstPrelim))).toEqual(new Set(['0005']));
    const t2m = dataValues(cdl, 't2m');
    const gen = new YearWeather(makeCellClimate(placeGrid(SMALL_GRID)), 11, 2023);
    const block = gen.allocBlock(48);
    gen.next(48, block);
    const step = ERA5_VARIABLES.t2m.step;
    for (let i = 0; i < 48 * 80; i++) expect(Math.abs(t2m[i] - block.t2m[i])).toBeLessThanOrEqual(step / 2 + 1e-4);
  });

  it('the same seed gives the same bytes in every file (both layouts), whether years are written in worker threads or not', () => {
    for (const f of [...readdirSync(dirA).filter((f) => f.endsWith('.nc')), ...DEMO_WARMING_LEVELS.map(changeFactorFile)])
      expect(sha(join(dirB, f))).toBe(sha(join(dirA, f)));
  });

  it('adding a year writes only that year and leaves the old files byte-identical', async () => {
    const old = [...readdirSync(dirA).filter((f) => f.endsWith('.nc')), ...DEMO_WARMING_LEVELS.map(changeFactorFile)];
    const before = Object.fromEntries(old.map((f) => [f, { sha: sha(join(dirA, f)), mtime: statSync(join(dirA, f)).mtimeMs }]));
    const r = await writeDemoDataset({ outDir: dirA, years: [2024], layout: 'mixed', grid: 'small', seed: 11, quiet: true });
    expect(r.files).toEqual([join(dirA, yearFileName(2024))]);
    expect(r.changeFactors).toEqual([]);
    expect(r.unchanged).toEqual([join(dirA, LSM_FILE), join(dirA, POPULATION_FILE), ...DEMO_WARMING_LEVELS.map((l) => join(dirA, changeFactorFile(l)))]);
    for (const [f, b] of Object.entries(before)) {
      expect(sha(join(dirA, f))).toBe(b.sha);
      expect(statSync(join(dirA, f)).mtimeMs).toBe(b.mtime);
    }
    expect(ncdump('-h', join(dirA, yearFileName(2024)))).toContain('valid_time = 8784 ;');
  }, 300_000);
});

describe('a legacy year too large for CDF-1', () => {
  it('is written as 64-bit-offset NetCDF when its data pass 2 GiB (a 150 × 150 year of 8 variables: 3.15 GB), classic below', async () => {
    const { legacyFileFormat } = await import('../../pipeline/demo/legacy-layout.ts');
    expect(legacyFileFormat(8760, 150 * 150, 8)).toBe('64bit-offset');
    expect(legacyFileFormat(8784, 40 * 60, 8)).toBe('classic');
  });
});
