/** The `heathours inspect` command end to end, on real files of Debian packages (test/fixtures/realdata/PROVENANCE.md). */
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdirSync, writeFileSync } from 'node:fs';
import { execFileSync } from 'node:child_process';
import { join } from 'node:path';
import { tempDir, writeFixture } from '../fixtures/read/era5-cdl.ts';
import { fixturePath } from '../helpers/fixtures.ts';
import { CLI_TS } from '../helpers/cli.ts';

const REAL = `${fixturePath('realdata')}/`;
const run = (...args: string[]) => spawnSync(process.execPath, [CLI_TS, 'inspect', ...args], { encoding: 'utf8' });

describe('heathours inspect', () => {
  it('--json prints one object per file with format, dims, roles and decoded ranges (reduced.nc and esku_heat_budget.cdf)', () => {
    const r = run('--json', REAL + 'reduced.nc', REAL + 'esku_heat_budget.cdf');
    expect(r.status).toBe(0);
    const [a, b] = r.stdout
      .trim()
      .split('\n')
      .map((l) => JSON.parse(l));
    expect(a.format).toBe('netcdf3-classic');
    expect(a.variables.find((v: { name: string }) => v.name === 'sst')).toMatchObject({ fillCount: 4448, role: 'other', units: 'degree_C' });
    expect(b.timeAxes[0].problem.code).toBe('NetcdfCalendarUnsupported');
  });

  it('the text report lists variables and says why a time axis could not be decoded (esku_heat_budget.cdf, ferret-datasets)', () => {
    const r = run(REAL + 'esku_heat_budget.cdf');
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/time TIME \(12 steps, units "hour since 0000-01-01 00:00:00"\): could not be decoded: .*1582-10-15/);
    expect(r.stdout).toMatch(/FSR\(TIME, ESKUY, ESKUX\) shape \[12, 46, 72\] float units "W\/M2" role other: min 0 max 311\.52/);
  });

  it('a bad file exits with status 3 (input data) and prints the catalogued error with its hint', () => {
    const p = join(tempDir(), 'x.grb');
    writeFileSync(p, 'GRIB....');
    const r = run(p);
    expect(r.status).toBe(3);
    expect(r.stderr).toMatch(/error \[NetcdfGribFile\]/);
    expect(r.stderr).toMatch(/hint: convert it to NetCDF first/);
  });

  it('--coverage on a folder holding a ZIP archive (Info-ZIP) and a NetCDF file: the members count, the JSON names the gap between them; a bad --years is a usage error (status 2)', () => {
    const d = join(tempDir(), 'inputs');
    mkdirSync(d);
    const spec = { lat: [10.25, 10], lon: [0, 0.25], vars: ['t2m', 'd2m', 'sp', 'u10', 'v10', 'ssrd'] as const };
    const a = writeFixture(d, 'day1', { layout: 'legacy', start: '2020-01-01T01:00:00Z', hours: 24, ...spec, vars: [...spec.vars] });
    writeFixture(d, 'day3', { layout: 'legacy', start: '2020-01-03T01:00:00Z', hours: 24, ...spec, vars: [...spec.vars] });
    execFileSync('zip', ['-q', '-j', '-m', join(d, 'first.zip'), a]);
    const r = run('--coverage', '--json', d);
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    const rep = JSON.parse(r.stdout);
    expect(rep.files.map((f: { name: string }) => f.name)).toEqual(['day1.nc', 'day3.nc']);
    const t2m = rep.variables.find((v: { variable: string }) => v.variable === 't2m');
    // Stamps 2020-01-02T01:00Z … 2020-01-03T00:00Z: the 24 hours of 2 January.
    expect(t2m.gaps[0]).toMatchObject({
      from: '2020-01-02T01:00:00Z',
      to: '2020-01-03T00:00:00Z',
      hours: 24,
      before: join(d, 'first.zip') + '!/day1.nc',
      after: join(d, 'day3.nc'),
    });
    const text = run('--coverage', d);
    expect(text.stdout).toMatch(
      /✗ d2m, sp, ssrd, t2m, u10, v10: missing 24 h, stamps 2020-01-02T01:00:00Z to 2020-01-03T00:00:00Z, between first\.zip!\/day1\.nc and day3\.nc/,
    );
    const bad = run('--coverage', '--years', '2021-2020', d);
    expect(bad.status).toBe(2);
    expect(bad.stderr).toMatch(/error \[UsageError\]/);
  });
});
