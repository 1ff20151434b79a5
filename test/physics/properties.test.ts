/** Physical properties of the model, checked with fast-check (monotonicity: common practice). */
import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { wbgtKernel } from '../../pipeline/physics/kernel.ts';
import { dewPointFromRelativeHumidity } from '../../pipeline/physics/humidity.ts';

function run(ta: number, td: number, p: number, u: number, s: number, f: number, cz: number) {
  const a = (x: number) => Float64Array.of(x);
  const o = {
    wbgtSun: a(0),
    wbgtShade: a(0),
    globeSun: a(0),
    wetBulbSun: a(0),
    globeShade: a(0),
    wetBulbShade: a(0),
    psychrometric: a(0),
    status: new Uint8Array(1),
  };
  wbgtKernel(
    { airTemperature: a(ta), dewPointTemperature: a(td), surfacePressure: a(p), wind2m: a(u), solar: a(s), cosZenith: a(cz), directFraction: a(f) },
    o,
    1,
  );
  expect(o.status[0]).toBe(0);
  return { sun: o.wbgtSun[0], shade: o.wbgtShade[0], tg: o.globeSun[0], tw: o.wetBulbSun[0], tpsy: o.psychrometric[0] };
}

const state = fc.record({
  ta: fc.double({ min: -10, max: 50, noNaN: true }),
  rh: fc.double({ min: 5, max: 95, noNaN: true }),
  p: fc.double({ min: 600, max: 1050, noNaN: true }),
  u: fc.double({ min: 0.2, max: 10, noNaN: true }),
  s: fc.double({ min: 0, max: 1000, noNaN: true }),
  f: fc.double({ min: 0, max: 0.9, noNaN: true }),
  cz: fc.double({ min: 0.1, max: 1, noNaN: true }),
});

describe('model properties', () => {
  it('WBGT rises with humidity', () => {
    fc.assert(
      fc.property(state, (x) => {
        const lo = run(x.ta, dewPointFromRelativeHumidity(x.ta, x.rh), x.p, x.u, x.s, x.f, x.cz);
        const hi = run(x.ta, dewPointFromRelativeHumidity(x.ta, x.rh + 4), x.p, x.u, x.s, x.f, x.cz);
        return hi.sun > lo.sun && hi.shade > lo.shade;
      }),
      { numRuns: 200 },
    );
  });
  it('WBGT in sun rises with solar radiation', () => {
    fc.assert(
      fc.property(state, (x) => {
        const td = dewPointFromRelativeHumidity(x.ta, x.rh);
        return run(x.ta, td, x.p, x.u, x.s + 100, x.f, x.cz).sun > run(x.ta, td, x.p, x.u, x.s, x.f, x.cz).sun;
      }),
      { numRuns: 200 },
    );
  });
  it('WBGT in sun falls with wind when the sun is strong (S ≥ 300 W/m²)', () => {
    fc.assert(
      fc.property(state, (x) => {
        const td = dewPointFromRelativeHumidity(x.ta, x.rh);
        const s = Math.max(300, x.s);
        return run(x.ta, td, x.p, x.u + 1, s, x.f, x.cz).sun < run(x.ta, td, x.p, x.u, s, x.f, x.cz).sun;
      }),
      { numRuns: 200 },
    );
  });
  it('shade WBGT ≤ sun WBGT; Tnw ≤ Tg in sun (S ≥ 100 W/m²); the psychrometric wet bulb lies between dew point and air temperature', () => {
    fc.assert(
      fc.property(state, (x) => {
        const td = dewPointFromRelativeHumidity(x.ta, x.rh);
        const r = run(x.ta, td, x.p, x.u, x.s, x.f, x.cz);
        return r.shade <= r.sun + 1e-6 && (x.s < 100 || r.tw <= r.tg) && r.tpsy >= td - 1e-6 && r.tpsy <= x.ta + 1e-6;
      }),
      { numRuns: 300 },
    );
  });
});
