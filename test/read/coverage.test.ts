/**
 * The coverage check (pipeline/read/coverage.ts) on monthly files written by Debian's ncgen from
 * invented patterns, with an injected gap, a duplicated month (same values), a month duplicated
 * with different values, an ERA5T month and a file on another grid. Every expected figure is
 * counted by hand from the calendar: an hour belongs to the month it starts in and is named by
 * its stamp, the end of the hour (January 2020: stamps 2020-01-01T01:00Z … 2020-02-01T00:00Z,
 * 31 × 24 = 744 h; February 2020, a leap year: 29 × 24 = 696 h; April: 720 h).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { copyFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { checkCoverage, type CoverageReport } from '../../pipeline/read/coverage.ts';
import { coverageProblems, formatCoverage } from '../../pipeline/read/coverage-text.ts';
import { pattern, tempDir, toSource, writeFixture, type FixtureSpec } from '../fixtures/read/era5-cdl.ts';

const dir = tempDir('heathours-coverage-');
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const LAT = [10.25, 10];
const LON = [0, 0.25];
const H = 3_600_000;
const fx = (name: string, spec: Partial<FixtureSpec> & Pick<FixtureSpec, 'layout' | 'start' | 'hours'>, kind?: 'nc3' | 'nc4') =>
  writeFixture(dir, name, { lat: LAT, lon: LON, vars: ['t2m', 'd2m', 'sp', 'u10', 'v10', 'ssrd'], ...spec }, kind);

let r: CoverageReport;
const paths: Record<string, string> = {};
beforeAll(async () => {
  paths.jan = fx('jan', { layout: 'legacy', start: '2020-01-01T01:00:00Z', hours: 744 });
  // The same January again, with t2m 1 K warmer in the 10 hours of stamps 2020-01-10T01:00Z … 10:00Z.
  const warm0 = Date.UTC(2020, 0, 10, 1);
  paths.janB = fx('jan-again', {
    layout: 'legacy',
    start: '2020-01-01T01:00:00Z',
    hours: 744,
    value: (v, ms, la, lo) => toSource(v, pattern(v, ms, la, lo)) + (v === 't2m' && ms >= warm0 && ms < warm0 + 10 * H ? 1 : 0),
  });
  // February with 24 hours left out: indices 100–123, stamps 2020-02-05T05:00Z … 2020-02-06T04:00Z.
  paths.feb = fx('feb', { layout: 'legacy', start: '2020-02-01T01:00:00Z', hours: 696, skip: Array.from({ length: 24 }, (_, i) => 100 + i) });
  paths.mar = fx('mar', { layout: 'legacy', start: '2020-03-01T01:00:00Z', hours: 744 });
  paths.marCopy = join(dir, 'mar-copy.nc');
  copyFileSync(paths.mar, paths.marCopy);
  // April from the 2024 layout, all preliminary ERA5T.
  paths.apr = fx('apr', { layout: 'cds2024', start: '2020-04-01T01:00:00Z', hours: 720, expver: Array(720).fill('0005') }, 'nc4');
  paths.other = writeFixture(dir, 'land', { layout: 'legacy', start: '2020-01-01T01:00:00Z', hours: 24, lat: [10.1, 10], lon: [0, 0.1, 0.2], vars: ['t2m'] });
  r = await checkCoverage(Object.values(paths), { years: [2020, 2020] });
}, 120_000);

describe('coverage check of monthly files', () => {
  it('the year × month table counts the hours present, ERA5T and duplicated hours of every variable exactly', () => {
    expect(r.variables.map((v) => v.variable)).toEqual(['d2m', 'sp', 'ssrd', 't2m', 'u10', 'v10']);
    for (const v of r.variables) {
      const row = (m: number) => v.months.find((x) => x.month === m)!;
      expect(row(1)).toEqual({ year: 2020, month: 1, expected: 744, present: 744, preliminary: 0, duplicated: 744 });
      expect(row(2)).toEqual({ year: 2020, month: 2, expected: 696, present: 672, preliminary: 0, duplicated: 0 });
      expect(row(3)).toEqual({ year: 2020, month: 3, expected: 744, present: 744, preliminary: 0, duplicated: 744 });
      expect(row(4)).toEqual({ year: 2020, month: 4, expected: 720, present: 720, preliminary: 720, duplicated: 0 });
      expect(row(5)).toEqual({ year: 2020, month: 5, expected: 744, present: 0, preliminary: 0, duplicated: 0 });
      expect(v.months).toHaveLength(12);
    }
  });

  it('gaps: the injected day (first and last missing stamp, the file on both sides) and May to December (after the April file, no file after)', () => {
    for (const v of r.variables) {
      expect(v.gaps).toEqual([
        { from: '2020-02-05T05:00:00Z', to: '2020-02-06T04:00:00Z', hours: 24, before: paths.feb, after: paths.feb, months: ['2020-02'] },
        // 1 May 2020 01:00 to 1 January 2021 00:00: 245 days × 24 h = 5880 h.
        {
          from: '2020-05-01T01:00:00Z',
          to: '2021-01-01T00:00:00Z',
          hours: 5880,
          before: paths.apr,
          after: null,
          months: ['2020-05', '2020-06', '2020-07', '2020-08', '2020-09', '2020-10', '2020-11', '2020-12', '2021-01'],
        },
      ]);
    }
  });

  it('duplicates: March copied (values agree) and January again (t2m differs in exactly the 10 warmed hours, by 1 K within a packing step)', () => {
    const t2m = r.variables.find((v) => v.variable === 't2m')!;
    expect(t2m.duplicates.map(({ maxDifference: _, ...d }) => d)).toEqual([
      { from: '2020-01-01T01:00:00Z', to: '2020-02-01T00:00:00Z', hours: 744, files: [paths.janB, paths.jan], differing: 10 },
      { from: '2020-03-01T01:00:00Z', to: '2020-04-01T00:00:00Z', hours: 744, files: [paths.marCopy, paths.mar], differing: 0 },
    ]);
    expect(t2m.duplicates[0].maxDifference).toBeGreaterThan(0.99);
    expect(t2m.duplicates[0].maxDifference).toBeLessThan(1.01);
    const d2m = r.variables.find((v) => v.variable === 'd2m')!;
    expect(d2m.duplicates.map((d) => d.differing)).toEqual([0, 0]);
  });

  it('the ERA5T tail: the April stamps, in the April file', () => {
    for (const v of r.variables) expect(v.era5t).toEqual([{ from: '2020-04-01T01:00:00Z', to: '2020-05-01T00:00:00Z', hours: 720, files: [paths.apr] }]);
  });

  it('the file on the 0.1° grid is named as on another grid and left out of the tables', () => {
    expect(r.otherGrid.map((o) => o.file)).toEqual([paths.other]);
    expect(r.otherGrid[0].grid).toEqual({ lat: 2, lon: 3, dLat: 0.1, dLon: 0.1 });
    expect(r.grid).toEqual({ lat: 2, lon: 2, dLat: 0.25, dLon: 0.25 });
  });

  it('the text report marks every month: ok, ✗ with the hours present, T for ERA5T, D for duplicated', () => {
    const text = formatCoverage(r);
    expect(text).toContain('d2m, sp, ssrd, t2m, u10, v10: hours present by month');
    expect(text).toMatch(/\n2020 +okD +✗672 +okD +okT +✗0 +✗0 +✗0 +✗0 +✗0 +✗0 +✗0 +✗0\n/);
    expect(text).toContain('✗ d2m, sp, ssrd, t2m, u10, v10: missing 24 h, stamps 2020-02-05T05:00:00Z to 2020-02-06T04:00:00Z, between feb.nc and feb.nc');
    expect(text).toContain(
      '✗ t2m: 744 h in two files with the same expver, stamps 2020-01-01T01:00:00Z to 2020-02-01T00:00:00Z: jan-again.nc and jan.nc; values differ in 10 of them',
    );
    expect(text).toContain(
      '✗ d2m, sp, ssrd, u10, v10: 744 h in two files with the same expver, stamps 2020-01-01T01:00:00Z to 2020-02-01T00:00:00Z: jan-again.nc and jan.nc; values agree',
    );
    expect(text).toContain(
      'T d2m, sp, ssrd, t2m, u10, v10: 720 h preliminary ERA5T (expver 5), stamps 2020-04-01T01:00:00Z to 2020-05-01T00:00:00Z, in apr.nc',
    );
    expect(text).toContain('✗ land.nc is on another grid (2 × 3 points, spacing 0.1°)');
  });

  it('the build rule: every gap of an incomplete year, every duplicate and the other grid are problems; a rule of 6000 missing hours still stops on the duplicates', () => {
    const p = coverageProblems(r, 0);
    expect(p.filter((x) => x.startsWith('t2m: '))).toEqual([
      't2m: 24 h missing, stamps 2020-02-05T05:00:00Z to 2020-02-06T04:00:00Z (between feb.nc and feb.nc; the download(s) of 2020-02 would hold them)',
      't2m: 5880 h missing, stamps 2020-05-01T01:00:00Z to 2021-01-01T00:00:00Z (between apr.nc and none; the download(s) of 2020-05, 2020-06, 2020-07, 2020-08, 2020-09, 2020-10, 2020-11, 2020-12, 2021-01 would hold them)',
      't2m: 744 h twice with the same expver, stamps 2020-01-01T01:00:00Z to 2020-02-01T00:00:00Z, in jan-again.nc and jan.nc (values differ in 10 h)',
      't2m: 744 h twice with the same expver, stamps 2020-03-01T01:00:00Z to 2020-04-01T00:00:00Z, in mar-copy.nc and mar.nc (same values)',
    ]);
    expect(p[p.length - 1]).toMatch(/^land\.nc is on another grid/);
    const loose = coverageProblems(r, 6000);
    expect(loose.some((x) => /missing/.test(x))).toBe(false);
    expect(loose.filter((x) => /twice/.test(x))).toHaveLength(12);
  });
});
