/** The `heathours inspect` command end to end, on real files of Debian packages (test/fixtures/realdata/PROVENANCE.md). */
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { tempDir } from '../fixtures/read/era5-cdl.ts';
import { fixturePath } from '../helpers/fixtures.ts';
import { CLI_TS } from '../helpers/cli.ts';

const REAL = `${fixturePath('realdata')}/`;
const run = (...args: string[]) => spawnSync(process.execPath, [CLI_TS, 'inspect', ...args], { encoding: 'utf8' });

describe('heathours inspect', () => {
  it('--json prints one object per file with format, dims, roles and decoded ranges (reduced.nc and esku_heat_budget.cdf)', () => {
    const r = run('--json', REAL + 'reduced.nc', REAL + 'esku_heat_budget.cdf');
    expect(r.status).toBe(0);
    const [a, b] = r.stdout.trim().split('\n').map((l) => JSON.parse(l));
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
});
