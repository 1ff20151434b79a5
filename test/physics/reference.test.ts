/**
 * Checks against Liljegren et al. 2008, reference implementation v1.1 (test/fixtures/reference/
 * liljegren-wbgt-public.csv, 150 rows) and the docs/methods.md §6.9 cases (reference C compiled).
 * Our solves go to the exact root; the reference stops a damped iteration at 0.02 K, so the
 * tolerance is 0.05 °C as its README states.
 */
import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { wbgtKernel } from '../../pipeline/physics/kernel.ts';
import { computePoint } from '../../pipeline/physics/point-row.ts';
import { dewPointFromRelativeHumidity } from '../../pipeline/physics/humidity.ts';
import { fixturePath } from '../helpers/fixtures.ts';

const csv = readFileSync(fixturePath('reference', 'liljegren-wbgt-public.csv'), 'utf8').trim().split('\n');
const head = csv[0].split(',');
const rows = csv.slice(1).map((l) => {
  const v = l.split(',');
  const r: Record<string, number> = {};
  head.forEach((k, i) => (r[k] = Number(v[i])));
  return r;
});

function kernelOne(ta: number, rh: number, p: number, u2: number, s: number, f: number, cz: number) {
  const a = (x: number) => Float64Array.of(x);
  const o = { wbgtSun: a(0), wbgtShade: a(0), globeSun: a(0), wetBulbSun: a(0), psychrometric: a(0), status: new Uint8Array(1) };
  wbgtKernel(
    {
      airTemperature: a(ta),
      dewPointTemperature: a(dewPointFromRelativeHumidity(ta, rh)),
      surfacePressure: a(p),
      wind2m: a(u2),
      solar: a(s),
      cosZenith: a(cz),
      directFraction: a(f),
    },
    o,
    1,
  );
  return { status: o.status[0], tg: o.globeSun[0], tnwb: o.wetBulbSun[0], tpsy: o.psychrometric[0], wbgt: o.wbgtSun[0] };
}

/** The reference's day count is one day late in leap years after 2000 (test/fixtures/reference/README.md). */
const leapAfter2000 = (y: number) => y > 2000 && y % 4 === 0;

describe('Liljegren reference table', () => {
  it('with the reference geometry fed in, every row agrees within 0.05 °C on WBGT, Tg and Tnwb', () => {
    let worst = 0;
    for (const r of rows) {
      const k = kernelOne(r.ta_c, r.rh_pct, r.pressure_hpa, r.wind2m_est_ms, r.solar_used_wm2, r.fdir, r.cos_zenith);
      expect(k.status, `row ${r.id}`).toBe(0);
      for (const [ours, ref] of [
        [k.wbgt, r.wbgt_c],
        [k.tg, r.tg_c],
        [k.tnwb, r.tnwb_c],
        [k.tpsy, r.tpsy_c],
      ]) {
        worst = Math.max(worst, Math.abs(ours - ref));
        expect(Math.abs(ours - ref), `row ${r.id}`).toBeLessThan(0.05);
      }
    }
    expect(worst).toBeGreaterThan(0); // exact root vs damped iteration: never bit-identical
  });

  it('the reference\u2019s damped loop stops at most 0.0172 °C from the exact root, as the methods page says (largest gap on the globe temperature)', () => {
    let tg = 0;
    for (const r of rows) {
      const k = kernelOne(r.ta_c, r.rh_pct, r.pressure_hpa, r.wind2m_est_ms, r.solar_used_wm2, r.fdir, r.cos_zenith);
      tg = Math.max(tg, Math.abs(k.tg - r.tg_c));
    }
    expect(tg).toBeGreaterThan(0.0171);
    expect(tg).toBeLessThan(0.0173);
  });

  it('through the whole chain (time, place, raw solar, wind at its height) rows with cos z ≥ 0.2 agree within 0.05 °C', () => {
    let n = 0;
    for (const r of rows) {
      if (r.cos_zenith < 0.2 || leapAfter2000(r.year)) continue;
      const timeMs = Date.UTC(r.year, r.month - 1, r.day, r.hour, r.minute) - r.gmt_offset_h * 3_600_000;
      const o = computePoint({
        timeMs,
        avgMinutes: r.avg_period_min,
        lat: r.lat,
        lon: r.lon,
        ta: r.ta_c,
        rh: r.rh_pct,
        pressure: r.pressure_hpa,
        wind: r.wind_ms,
        windHeight: r.wind_height_m,
        urban: r.urban === 1,
        dt: r.dt_c,
        solar: r.solar_wm2,
      });
      expect(o.status, `row ${r.id}`).toBe(0);
      expect(Math.abs(o.cosZenith - r.cos_zenith), `row ${r.id} cos z`).toBeLessThan(0.001);
      for (const [ours, ref] of [
        [o.wbgt, r.wbgt_c],
        [o.tg, r.tg_c],
        [o.tnwb, r.tnwb_c],
      ])
        expect(Math.abs(ours - ref), `row ${r.id}`).toBeLessThan(0.05);
      n++;
    }
    expect(n).toBeGreaterThan(50);
  });

  it('all rows through the whole chain with cos z and direct fraction given: within 0.05 °C (wind conversion and cap exercised)', () => {
    for (const r of rows) {
      const timeMs = Date.UTC(r.year, r.month - 1, r.day, r.hour, r.minute) - r.gmt_offset_h * 3_600_000;
      const o = computePoint({
        timeMs,
        avgMinutes: r.avg_period_min,
        lat: r.lat,
        lon: r.lon,
        ta: r.ta_c,
        rh: r.rh_pct,
        pressure: r.pressure_hpa,
        wind: r.wind_ms,
        windHeight: r.wind_height_m,
        urban: r.urban === 1,
        dt: r.dt_c,
        solar: r.solar_wm2,
        cosZenith: r.cos_zenith,
        directFraction: r.cos_zenith >= 0.00873 ? r.fdir : undefined,
      });
      expect(o.status, `row ${r.id}`).toBe(0);
      expect(Math.abs(o.wind2m - r.wind2m_est_ms), `row ${r.id} wind`).toBeLessThan(1e-4);
      expect(Math.abs(o.solarUsed - r.solar_used_wm2), `row ${r.id} solar`).toBeLessThan(0.01);
      if (r.wind_height_m !== 2) expect(o.stabilityClass, `row ${r.id} class`).toBe(r.stability_class);
      expect(Math.abs(o.wbgt - r.wbgt_c), `row ${r.id}`).toBeLessThan(0.05);
    }
  });

  it('the estimated direct fraction matches the reference fdir where the sun is up (Liljegren et al. 2008, reference implementation v1.1)', () => {
    for (const r of rows) {
      if (leapAfter2000(r.year)) continue;
      const timeMs = Date.UTC(r.year, r.month - 1, r.day, r.hour, r.minute) - r.gmt_offset_h * 3_600_000;
      const o = computePoint({
        timeMs,
        avgMinutes: r.avg_period_min,
        lat: r.lat,
        lon: r.lon,
        ta: r.ta_c,
        rh: r.rh_pct,
        pressure: r.pressure_hpa,
        wind: r.wind_ms,
        windHeight: r.wind_height_m,
        urban: r.urban === 1,
        dt: r.dt_c,
        solar: r.solar_wm2,
      });
      expect(Math.abs(o.directFraction - r.fdir), `row ${r.id}`).toBeLessThan(0.005);
    }
  });
});

describe('docs/methods.md §6.9 check values (reference C compiled locally)', () => {
  // Exact-root values sit about 0.01 °C below the damped ones; tolerance 0.03 °C.
  const cases: [number, number, number, number, number, number, number, number, number, number, number][] = [
    [30, 50, 1013.25, 1.0, 800, 0.7, 0.8, 48.716, 25.281, 21.802, 30.44],
    [35, 40, 1000, 2.0, 900, 0.8, 0.9, 50.223, 25.827, 23.611, 31.623],
    [25, 80, 1010, 0.5, 0, 0, 0.5, 23.918, 22.284, 22.321, 22.882],
    [40, 20, 950, 3.0, 1000, 0.85, 0.95, 53.665, 23.221, 21.199, 30.987],
  ];
  it('direct component calls give Tg, Tnw, Tpsy and WBGT within 0.03 °C', () => {
    for (const [ta, rh, p, u, s, f, cz, tg, tnw, tpsy, wbgt] of cases) {
      const k = kernelOne(ta, rh, p, u, s, f, cz);
      expect(Math.abs(k.tg - tg)).toBeLessThan(0.03);
      expect(Math.abs(k.tnwb - tnw)).toBeLessThan(0.03);
      expect(Math.abs(k.tpsy - tpsy)).toBeLessThan(0.03);
      expect(Math.abs(k.wbgt - wbgt)).toBeLessThan(0.03);
    }
  });
  it('the exact root of the first case is 48.703 / 25.267 / 30.428 °C (docs/methods.md §6.9, bisection) within 0.002 °C', () => {
    const k = kernelOne(30, 50, 1013.25, 1.0, 800, 0.7, 0.8);
    expect(Math.abs(k.tg - 48.703)).toBeLessThan(0.002);
    expect(Math.abs(k.tnwb - 25.267)).toBeLessThan(0.002);
    expect(Math.abs(k.wbgt - 30.428)).toBeLessThan(0.002);
  });
  it('the full Chicago call (2007-07-15 12:30 LST, UTC−6, 60 min) gives u2 2.680 m/s and WBGT 29.836 °C within 0.03 °C', () => {
    const o = computePoint({
      timeMs: Date.UTC(2007, 6, 15, 18, 30),
      avgMinutes: 60,
      lat: 41.88,
      lon: -87.63,
      ta: 32,
      rh: 50,
      pressure: 1000,
      wind: 3,
      windHeight: 10,
      urban: false,
      dt: 0,
      solar: 800,
    });
    expect(o.wind2m).toBeCloseTo(2.68, 3);
    expect(Math.abs(o.tg - 44.801)).toBeLessThan(0.03);
    expect(Math.abs(o.tnwb - 25.252)).toBeLessThan(0.03);
    expect(Math.abs(o.tpsy - 23.422)).toBeLessThan(0.03);
    expect(Math.abs(o.wbgt - 29.836)).toBeLessThan(0.03);
  });
});
