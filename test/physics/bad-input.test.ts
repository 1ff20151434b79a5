/** Bad input gets a status (per row / cell) or a catalogued error (bad file), never a number. */
import { describe, it, expect } from 'vitest';
import { mkdtempSync, writeFileSync, readFileSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { computePoint, type PointInput } from '../../pipeline/physics/point-row.ts';
import { STATUS } from '../../pipeline/physics/status.ts';
import { runPoint } from '../../pipeline/commands/point.ts';
import { HeathoursError } from '../../pipeline/model/errors.ts';

const base: PointInput = {
  timeMs: Date.UTC(2010, 6, 1, 12),
  avgMinutes: 60,
  lat: 10,
  lon: 0,
  ta: 30,
  rh: 50,
  pressure: 1000,
  wind: 2,
  windHeight: 10,
  urban: false,
  dt: 0,
  solar: 700,
};

describe('out-of-range inputs get a status, not a number', () => {
  const cases: [string, Partial<PointInput>, number][] = [
    ['RH 0', { rh: 0 }, STATUS.humidityOutOfRange],
    ['RH above 100', { rh: 100.5 }, STATUS.humidityOutOfRange],
    ['air temperature below −40', { ta: -41 }, STATUS.airTemperatureOutOfRange],
    ['air temperature above 60', { ta: 61 }, STATUS.airTemperatureOutOfRange],
    ['pressure below 300', { pressure: 250 }, STATUS.pressureOutOfRange],
    ['pressure above 1100', { pressure: 1150 }, STATUS.pressureOutOfRange],
    ['negative wind', { wind: -1 }, STATUS.windOutOfRange],
    ['negative solar', { solar: -5 }, STATUS.solarOutOfRange],
    ['solar above 1500', { solar: 1600 }, STATUS.solarOutOfRange],
    ['cos zenith above 1', { cosZenith: 1.2 }, STATUS.cosZenithOutOfRange],
    ['direct fraction above 1', { directFraction: 1.5 }, STATUS.directFractionOutOfRange],
    ['year 1899', { timeMs: Date.UTC(1899, 6, 1, 12) }, STATUS.timeOutOfRange],
    ['year 2101', { timeMs: Date.UTC(2101, 6, 1, 12) }, STATUS.timeOutOfRange],
    ['unparseable time', { timeMs: NaN }, STATUS.timeOutOfRange],
    ['no humidity at all', { rh: undefined, td: undefined }, STATUS.missingInput],
  ];
  for (const [name, change, status] of cases) {
    it(`${name} → status ${status} and NaN outputs`, () => {
      const o = computePoint({ ...base, ...change });
      expect(o.status).toBe(status);
      expect(o.wbgt).toBeNaN();
      expect(o.wbgtShade).toBeNaN();
    });
  }
  it('a dew point above the air temperature is clamped to it and counted', () => {
    const o = computePoint({ ...base, rh: undefined, td: 30.4 });
    expect(o.status).toBe(0);
    expect(o.dewPointClamped).toBe(true);
    expect(o.tpsy).toBeCloseTo(30, 3);
  });
});

describe('heathours point files', () => {
  const dir = mkdtempSync(join(tmpdir(), 'heathours-point-'));
  it('a header without rh_pct or td_c is the catalogued PointMissingColumn error naming the column and file; no output is left', async () => {
    const inp = join(dir, 'nohum.csv');
    writeFileSync(inp, 'time_utc,lat,lon,ta_c,pressure_hpa,wind_ms,solar_wm2\n2010-07-01T12:00Z,10,0,30,1000,2,700\n');
    const err = await runPoint(inp, join(dir, 'out1.csv'), { quiet: true }).catch((e) => e);
    expect(err).toBeInstanceOf(HeathoursError);
    expect(err.code).toBe('PointMissingColumn');
    expect(err.message).toContain('rh_pct or td_c');
    expect(err.where.file).toBe(inp);
    expect(readdirSync(dir).filter((f) => f.startsWith('out1') || f.includes('.tmp'))).toEqual([]);
  });
  it('a missing required column is named; a missing file is PointInputNotFound', async () => {
    const inp = join(dir, 'nolat.csv');
    writeFileSync(inp, 'time_utc,lon,ta_c,rh_pct,pressure_hpa,wind_ms,solar_wm2\n');
    await expect(runPoint(inp, join(dir, 'o.csv'), { quiet: true })).rejects.toMatchObject({
      code: 'PointMissingColumn',
      message: expect.stringContaining('"lat"'),
    });
    await expect(runPoint(join(dir, 'none.csv'), join(dir, 'o.csv'), { quiet: true })).rejects.toMatchObject({ code: 'PointInputNotFound' });
  });
  it('quoted fields and CRLF are read; a bad row gets empty outputs and a status and the run goes on', async () => {
    const inp = join(dir, 'ok.csv');
    writeFileSync(
      inp,
      [
        'site,time_utc,lat,lon,ta_c,rh_pct,pressure_hpa,wind_ms,solar_wm2',
        '"Yard, north",2007-07-15T18:30:00Z,41.88,-87.63,32,50,1000,3,800',
        '"say ""hi""",2007-07-15T18:30:00Z,41.88,-87.63,32,0,1000,3,800',
      ].join('\r\n') + '\r\n',
    );
    const out = join(dir, 'ok-out.csv');
    const s = await runPoint(inp, out, { quiet: true, globeDiameter: 0.0508 }); // the reference's 2-inch globe
    expect(s.rows).toBe(2);
    expect(s.ok).toBe(1);
    expect(s.byStatus.humidityOutOfRange).toBe(1);
    const lines = readFileSync(out, 'utf8').trim().split('\r\n');
    const head = lines[0].split(',');
    expect(head.slice(9, 22)).toEqual([
      'cos_zenith',
      'direct_fraction',
      'wind_2m_ms',
      'tg_c',
      'tnwb_c',
      'tpsy_c',
      'wbgt_c',
      'tg_shade_c',
      'tnwb_shade_c',
      'wbgt_shade_c',
      'tg_shelter_c',
      'tnwb_shelter_c',
      'wbgt_shelter_c',
    ]);
    expect(head.at(-1)).toBe('status');
    expect(lines[1].startsWith('"Yard, north",')).toBe(true);
    // docs/methods.md §6.9 full Chicago call: WBGT 29.836 °C (reference C), exact root within 0.03 °C.
    const wbgt = Number(lines[1].split(',').at(head.indexOf('wbgt_c') + 1)); // +1: the quoted comma in the site field
    expect(Math.abs(wbgt - 29.836)).toBeLessThan(0.03);
    // Every output of the bad row is empty (13 physics + 2 per workload class), then the status.
    expect(lines[2].endsWith(`${','.repeat(head.length - 9)}humidityOutOfRange`)).toBe(true);
  });
});
