/**
 * The fast solver against a slow, plain one: the kernel's globe and natural wet-bulb roots (first
 * guesses, paired property tables, Newton stopped at a 1e−3 K step) are checked against bisection
 * to 1e−10 K on the readable property forms of air-properties.ts (docs/methods.md §6.3–§6.6), and
 * the tabulated direct-fraction estimate against its formula (docs/methods.md §4.3).
 */
import { describe, it, expect } from 'vitest';
import * as P from '../../pipeline/physics/air-properties.ts';
import { wbgtKernel } from '../../pipeline/physics/kernel.ts';
import { CellState, prepareCell } from '../../pipeline/physics/liljegren-solve.ts';
import { directFractionEstimate, directFractionExact } from '../../pipeline/physics/solar-inputs.ts';
import {
  D_GLOBE,
  D_WICK,
  EMIS_GLOBE,
  EMIS_SFC,
  EMIS_WICK,
  RATIO,
  PRANDTL,
  STEFAN_BOLTZMANN as SB,
  KELVIN,
  WICK_EXPONENT,
} from '../../pipeline/physics/constants.ts';

function bisect(f: (x: number) => number, lo: number, hi: number): number {
  for (let k = 0; k < 200 && hi - lo > 1e-11; k++) {
    const m = 0.5 * (lo + hi);
    if (f(m) < 0) lo = m;
    else hi = m;
  }
  return 0.5 * (lo + hi);
}

/** Seeded uniform numbers (mulberry32), so the states are the same on every run. */
function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = Math.imul(a ^ (a >>> 15), a | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

describe('solver roots', () => {
  it('globe and natural wet-bulb roots (sun and shade) agree with bisection on the readable forms within 1e-5 K over 400 varied states', () => {
    const r = rng(7);
    const s = new CellState();
    let worst = 0;
    for (let k = 0; k < 400; k++) {
      const ta = -30 + 85 * r();
      const td = ta - 0.3 - 35 * r();
      const p = 500 + 560 * r();
      const u = 0.05 + 15 * r();
      const sol = r() < 0.3 ? 0 : 1200 * r();
      const cz = 0.02 + 0.98 * r();
      const fd = 0.9 * r();
      const a = (x: number) => Float64Array.of(x);
      const o = { wbgtSun: a(0), wbgtShade: a(0), globeSun: a(0), wetBulbSun: a(0), globeShade: a(0), wetBulbShade: a(0), status: new Uint8Array(1) };
      wbgtKernel(
        { airTemperature: a(ta), dewPointTemperature: a(td), surfacePressure: a(p), wind2m: a(u), solar: a(sol), cosZenith: a(cz), directFraction: a(fd) },
        o,
        1,
      );
      expect(o.status[0]).toBe(0);
      prepareCell(s, ta, td, p, u, sol, fd, cz); // only for the solar loads Q_g, Q_w (inputs of the balances)
      const TA = ta + KELVIN;
      const ea = P.saturationVaporPressureModelK(td + KELVIN);
      const lrad = 0.5 * (P.atmosphericEmissivity(ea) + EMIS_SFC) * TA ** 4;
      const globe = (qg: number) => (x: number) => x ** 4 - lrad - qg + (P.sphereHeatTransfer(D_GLOBE, 0.5 * (x + TA), p, u) / (EMIS_GLOBE * SB)) * (x - TA);
      const wick = (qw: number) => (x: number) => {
        const t = 0.5 * (x + TA);
        const ew = P.saturationVaporPressureModelK(x);
        const z = (P.latentHeat(t) / RATIO) * (PRANDTL / P.schmidtNumber(t, p)) ** WICK_EXPONENT;
        return x - TA + (z * (ew - ea)) / (p - ew) - (SB * EMIS_WICK * (lrad - x ** 4) + qw) / P.cylinderHeatTransfer(D_WICK, t, p, u);
      };
      const pairs: [number, number][] = [
        [o.globeShade[0], bisect(globe(0), TA - 80, TA + 300) - KELVIN],
        [o.globeSun[0], bisect(globe(s.qg), TA - 80, TA + 300) - KELVIN],
        [o.wetBulbShade[0], bisect(wick(0), TA - 80, TA + 60) - KELVIN],
        [o.wetBulbSun[0], bisect(wick(s.qw), TA - 80, TA + 60) - KELVIN],
      ];
      for (const [fast, slow] of pairs) {
        worst = Math.max(worst, Math.abs(fast - slow));
        expect(Math.abs(fast - slow), `state ${k}`).toBeLessThan(1e-5);
      }
    }
    expect(worst).toBeGreaterThan(0);
  });

  it('with no solar load, sun values are exactly the shade values (same balance, solved once)', () => {
    const a = (x: number) => Float64Array.of(x);
    const o = { wbgtSun: a(0), wbgtShade: a(0), globeSun: a(0), wetBulbSun: a(0), globeShade: a(0), wetBulbShade: a(0), status: new Uint8Array(1) };
    wbgtKernel(
      { airTemperature: a(27), dewPointTemperature: a(18), surfacePressure: a(1000), wind2m: a(1.5), solar: a(0), cosZenith: a(-0.3), directFraction: a(0) },
      o,
      1,
    );
    expect(o.wbgtSun[0]).toBe(o.wbgtShade[0]);
    expect(o.globeSun[0]).toBe(o.globeShade[0]);
  });
});

describe('tabulated direct fraction', () => {
  it('matches exp(3 − 1.34 s − 1.65/s) clipped to 0.9 within 1e-9 over 0 < s ≤ 0.85 (docs/methods.md §4.3)', () => {
    let worst = 0;
    for (let x = 1e-6; x <= 0.85; x += 1.7e-5) worst = Math.max(worst, Math.abs(directFractionEstimate(x) - Math.min(0.9, directFractionExact(x))));
    expect(worst).toBeLessThan(1e-9);
    expect(directFractionEstimate(0)).toBe(0);
    expect(directFractionEstimate(0.9)).toBe(0.9); // above the cap: exact form, clipped
  });
});
