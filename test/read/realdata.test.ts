/**
 * `inspectFile` on the real NetCDF files of test/fixtures/realdata (copied from Debian 12 packages,
 * see PROVENANCE.md there). Expected values come from PROVENANCE.md and from Debian's `ncdump`
 * (netcdf-bin), the reference library's own dump of the same file.
 */
import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { inspectFile, type FileInspection } from '../../pipeline/read/index.ts';
import { fixturePath } from '../helpers/fixtures.ts';

const REAL = `${fixturePath('realdata')}/`;
const byName = (r: FileInspection, n: string) => {
  const v = r.variables.find((x) => x.name === n);
  if (!v) throw new Error(`no ${n}`);
  return v;
};

/** Values of one variable as ncdump prints them: numbers, or null for "_" (fill) and NaN. */
function ncdumpValues(file: string, variable: string): Array<number | null> {
  const text = execFileSync('ncdump', ['-v', variable, file], { encoding: 'utf8', maxBuffer: 1 << 28 });
  const data = text.slice(text.indexOf('data:'));
  const body = data.slice(data.indexOf(`${variable} =`) + variable.length + 2, data.lastIndexOf(';'));
  return body
    .split(/[,\s]+/)
    .filter((s) => s.length > 0)
    .map((s) => (s === '_' || /nan/i.test(s) ? null : Number(s)));
}

function ncdumpStats(vals: Array<number | null>, scale = 1) {
  const ok = vals.filter((x): x is number => x !== null).map((x) => x * scale);
  return { min: Math.min(...ok), max: Math.max(...ok), missing: vals.length - ok.length, n: vals.length };
}

describe('inspect on real files from Debian packages', () => {
  it('bcsd_obs_1999.nc (r-cran-stars): tas decodes to -0.42 … 29.39 °C with 7,116 NaN of 32,076 (PROVENANCE.md), as ncdump shows', async () => {
    const r = await inspectFile(REAL + 'bcsd_obs_1999.nc');
    expect(r.format).toBe('netcdf3-classic');
    const tas = byName(r, 'tas');
    expect(tas.min).toBeCloseTo(-0.42, 2);
    expect(tas.max).toBeCloseTo(29.39, 2);
    expect(tas.fillCount).toBe(7116);
    expect(tas.count).toBe(32076);
    const ref = ncdumpStats(ncdumpValues(REAL + 'bcsd_obs_1999.nc', 'tas'));
    expect(ref.missing).toBe(7116);
    expect(tas.min).toBeCloseTo(ref.min, 4);
    expect(tas.max).toBeCloseTo(ref.max, 4);
    // time "days since 1950-01-01" at month ends (PROVENANCE.md); bounds variables named but absent are tolerated
    expect(r.timeAxes[0]).toMatchObject({ variable: 'time', start: '1999-01-31T00:00:00Z', end: '1999-12-31T00:00:00Z', count: 12 });
    expect(byName(r, 'latitude').role).toBe('coordinate');
  });

  it('reduced.nc (r-cran-stars): int16 sst with scale_factor 0.01 decodes to -1.80 … 32.97 °C with 4,448 fill cells (PROVENANCE.md; ncdump raw shorts × 0.01)', async () => {
    const r = await inspectFile(REAL + 'reduced.nc');
    const sst = byName(r, 'sst');
    expect(sst.dims).toEqual(['time', 'zlev', 'lat', 'lon']);
    expect(sst.shape).toEqual([1, 1, 90, 180]);
    expect(sst.min).toBeCloseTo(-1.8, 4);
    expect(sst.max).toBeCloseTo(32.97, 4);
    expect(sst.fillCount).toBe(4448);
    const ref = ncdumpStats(ncdumpValues(REAL + 'reduced.nc', 'sst'), 0.01);
    expect(ref.missing).toBe(4448);
    expect(sst.max).toBeCloseTo(ref.max, 4);
    expect(r.timeAxes[0].start).toBe('1981-12-31T00:00:00Z'); // 1460 days after 1978-01-01
  });

  it('flxf06.gdas.1979.grb2.nc (r-cran-ncdfgeom): CSDSF_L1_FcstAvg 0 … 388.6 W m-2, "+0:00" time units, char arrays listed', async () => {
    const r = await inspectFile(REAL + 'flxf06.gdas.1979.grb2.nc');
    const v = byName(r, 'CSDSF_L1_FcstAvg');
    expect(v.min).toBe(0);
    expect(v.max).toBeCloseTo(388.6, 3);
    expect(v.fillCount).toBe(0);
    const t = r.timeAxes.find((a) => a.variable === 'time')!;
    expect(t.problem).toBeUndefined();
    expect(t.start).toBe('1979-01-16T12:00:00Z'); // 372 h after 1979-01-01 (ncdump -v time: first value 372)
    expect(ncdumpValues(REAL + 'flxf06.gdas.1979.grb2.nc', 'time')[0]).toBe(372);
    expect(byName(r, 'ref_date_time').type).toBe('char');
    expect(byName(r, 'lon').max).toBeCloseTo(236.875, 3);
  });

  it('nc4uvt.nc (libncarg-data): groups are listed and T, labelled "C" but holding 190.0 … 310.6, is flagged NetcdfUnitImplausible', async () => {
    const r = await inspectFile(REAL + 'nc4uvt.nc');
    expect(r.format).toBe('netcdf4');
    const T = byName(r, 'grp1/T');
    expect(T.dims).toEqual(['grp1/time', 'grp1/lev', 'grp1/lat', 'grp1/lon']);
    expect(T.min).toBeCloseTo(190.0, 1);
    expect(T.max).toBeCloseTo(310.6, 1);
    expect(T.problems.map((p) => p.code)).toContain('NetcdfUnitImplausible');
    expect(byName(r, 'T').problems[0].message).toMatch(/kelvin values labelled as Celsius/);
    // "Month" is not CF time; the axis is listed with the reason
    expect(r.timeAxes.find((a) => a.variable === 'time')!.problem!.code).toBe('NetcdfTimeUnits');
    expect(byName(r, 'U').problems).toEqual([]);
  });

  it('nc4uvt.nc (libncarg-data): the statistics of T and U, read from the raw chunks (shuffle + deflate), equal the minimum, maximum and mean of the values ncdump prints', async () => {
    const r = await inspectFile(REAL + 'nc4uvt.nc');
    for (const name of ['T', 'U']) {
      // ncdump -v prints the root group's variable first; its values run to the first ';'.
      const text = execFileSync('ncdump', ['-v', name, REAL + 'nc4uvt.nc'], { encoding: 'utf8', maxBuffer: 1 << 28 });
      const data = text.slice(text.indexOf('data:'));
      const from = data.indexOf(`${name} =`) + name.length + 2;
      const ref = data
        .slice(from, data.indexOf(';', from))
        .split(/[,\s]+/)
        .filter((t) => t.length > 0)
        .map((t) => (t === '_' ? null : Number(t)));
      expect(ref.every((x) => x === null || Number.isFinite(x))).toBe(true);
      const ok = ref.filter((x): x is number => x !== null);
      const v = byName(r, name);
      expect(v.min).toBeCloseTo(
        ok.reduce((a, b) => Math.min(a, b), Infinity),
        3,
      );
      expect(v.max).toBeCloseTo(
        ok.reduce((a, b) => Math.max(a, b), -Infinity),
        3,
      );
      expect(v.mean!).toBeCloseTo(ok.reduce((a, b) => a + b, 0) / ok.length, 2);
      expect(v.fillCount).toBe(ref.length - ok.length);
    }
  });

  it('esku_heat_budget.cdf (ferret-datasets): year-0 axis "hour since 0000-01-01" is reported undecodable with the reason; FSR 0 … 311.5 W/M2 with the positive 1e34 fill masked', async () => {
    const r = await inspectFile(REAL + 'esku_heat_budget.cdf');
    const t = r.timeAxes.find((a) => a.variable === 'TIME')!;
    expect(t.start).toBeNull();
    expect(t.problem!.code).toBe('NetcdfCalendarUnsupported');
    const fsr = byName(r, 'FSR');
    expect(fsr.min).toBe(0);
    expect(fsr.max).toBeCloseTo(311.5, 1);
    const ref = ncdumpStats(ncdumpValues(REAL + 'esku_heat_budget.cdf', 'FSR'));
    expect(fsr.fillCount).toBe(ref.missing);
    expect(byName(r, 'ESKUX').max).toBe(375);
    expect(byName(r, 'ESKUYedges').role).toBe('coordinate');
    expect(r.variables.length).toBeGreaterThan(20);
  });
});
