/**
 * The 2 m wind step (pipeline/physics/wind.ts): the factor tables it reads when no classes are
 * asked for give the same wind as the class-by-class path (stabilityClass, the solar-radiation /
 * ΔT table of EPA-454/R-99-005 §6.2.5 as in the Liljegren et al. 2008 reference code), at every
 * bound of the class table and on seeded random cell-hours (invented inputs, for the comparison
 * only); windAt2m gives the same 2 m wind for each class.
 */
import { describe, it, expect } from 'vitest';
import { stabilityClass, windAt2m, wind2mStep } from '../../pipeline/physics/wind.ts';
import { rng } from './stratified-states.ts';

/** Speeds and solar values on, just below and just above every class bound, and odd values. */
const SPEEDS = [-1, 0, 0.1, 1.999999, 2, 2.000001, 2.4999999, 2.5, 2.75, 2.9999999, 3, 4.99999, 5, 5.5, 5.999999, 6, 7, 12, 40, Infinity, NaN];
const SOLARS = [-5, 0, 100, 174.99999999999997, 175, 175.00000000000003, 500, 674.9999999999999, 675, 800, 924.9999999999999, 925, 1100, NaN];

/** The wind of the tabled path (no classes asked for) and of the class path, and the classes. */
function both(speed: number[], solar: number[], cz: number[], urban: boolean | Uint8Array, deltaT = 0) {
  const n = speed.length;
  const nCells = typeof urban === 'boolean' ? n : urban.length;
  const inp = { windSpeed: speed, cosZenith: cz, solar, height: 10, urban, deltaT };
  const tabled = new Float64Array(n);
  const classes = new Float64Array(n);
  const cls = new Uint8Array(n);
  wind2mStep(inp, tabled, n, nCells);
  wind2mStep(inp, classes, n, nCells, cls);
  return { tabled, classes, cls };
}

describe('2 m wind step', () => {
  it('the factor tables give the class path wind at every class bound, by day and by night, rural and urban, both ΔT signs', () => {
    const speed: number[] = [];
    const solar: number[] = [];
    const cz: number[] = [];
    for (const u of SPEEDS)
      for (const s of SOLARS)
        for (const c of [0.5, 0, -0.2]) {
          speed.push(u);
          solar.push(s);
          cz.push(c);
        }
    for (const urban of [false, true]) {
      for (const dT of [0, -1]) {
        const { tabled, classes, cls } = both(speed, solar, cz, urban, dT);
        expect(Array.from(tabled)).toEqual(Array.from(classes));
        for (let i = 0; i < speed.length; i++) {
          expect(cls[i]).toBe(stabilityClass(cz[i] > 0, speed[i], solar[i], dT));
          expect(classes[i]).toBe(windAt2m(speed[i], 10, cls[i], urban));
        }
      }
    }
  });
  it('the factor tables give the class path wind on 200,000 seeded random cell-hours with per-cell urban flags', () => {
    const rnd = rng(7);
    const n = 200_000;
    const speed = Array.from({ length: n }, () => (rnd() < 0.001 ? Number.NaN : 14 * rnd()));
    const solar = Array.from({ length: n }, () => 1200 * rnd());
    const cz = Array.from({ length: n }, () => 2 * rnd() - 1);
    const urban = Uint8Array.from({ length: 100 }, (_, i) => (i % 3 === 0 ? 1 : 0));
    const { tabled, classes } = both(speed, solar, cz, urban);
    expect(Array.from(tabled)).toEqual(Array.from(classes));
  });
  it('keeps the speed as it is at the reference height of 2 m (Liljegren et al. 2008)', () => {
    const out = new Float64Array(3);
    wind2mStep({ windSpeed: [0.05, 3, Number.NaN], cosZenith: [1, 1, 1], solar: [500, 500, 500], height: 2, urban: false }, out, 3, 3);
    expect(Array.from(out)).toEqual([0.05, 3, Number.NaN]);
  });
});
