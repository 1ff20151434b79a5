/**
 * The fast kernel (pipeline/physics/kernel.ts, one function with the table reads written out)
 * against the readable solver it was inlined from (pipeline/physics/liljegren-solve.ts
 * `solveCell`, the split functions): the same globe and natural wet-bulb roots in the shade, the
 * sun and under a shelter, to 1e−9 °C, on a seeded sample of 20,000 states that covers night,
 * calm air, saturated air, extreme sun and both globe diameters. The outside checks of the
 * solver itself are in solver.test.ts (bisection), reference.test.ts (the reference
 * implementation's table) and globe-diameter.test.ts (scipy).
 */
import { describe, it, expect } from 'vitest';
import { wbgtKernel } from '../../pipeline/physics/kernel.ts';
import { CellState, prepareCell, setGlobe, solveCell, psychrometricWetBulb, globeFactors } from '../../pipeline/physics/liljegren-solve.ts';
import { D_GLOBE, D_GLOBE_STANDARD, KELVIN } from '../../pipeline/physics/constants.ts';
import { rng, state } from './stratified-states.ts';

describe('the fast kernel equals the readable solver', () => {
  it('globe, natural wet bulb and WBGT in shade, sun and shelter, and the psychrometric wet bulb agree within 1e-9 °C on 20,000 seeded states (night, calm, saturation, extreme sun; 50.8 and 150 mm globes)', () => {
    const N = 20_000;
    const r = rng(20240719);
    const states = Array.from({ length: N }, (_, i) => state(r, i % 8));
    const a = () => new Float64Array(N);
    const inputs = {
      airTemperature: Float64Array.from(states, (s) => s.ta),
      dewPointTemperature: Float64Array.from(states, (s) => s.td),
      surfacePressure: Float64Array.from(states, (s) => s.p),
      wind2m: Float64Array.from(states, (s) => s.u),
      solar: Float64Array.from(states, (s) => s.sol),
      cosZenith: Float64Array.from(states, (s) => s.cz),
      directFraction: Float64Array.from(states, (s) => s.fd),
    };
    const s = new CellState();
    let compared = 0;
    let worst = 0;
    const kinds = new Set<number>();
    for (const d of [D_GLOBE, D_GLOBE_STANDARD]) {
      const g = globeFactors(d);
      const o = {
        wbgtSun: a(),
        wbgtShade: a(),
        globeSun: a(),
        wetBulbSun: a(),
        globeShade: a(),
        wetBulbShade: a(),
        wbgtShelter: a(),
        globeShelter: a(),
        wetBulbShelter: a(),
        psychrometric: a(),
        status: new Uint8Array(N),
      };
      const counts = wbgtKernel(inputs, o, N, 0, g);
      expect(counts.ok).toBe(N);
      setGlobe(s, g);
      for (let i = 0; i < N; i++) {
        const x = states[i];
        prepareCell(s, x.ta, Math.min(x.td, x.ta), x.p, x.u, x.sol, x.fd, x.cz);
        solveCell(s, true);
        const tpsy = psychrometricWetBulb(s);
        const wbgt = (tw: number, tg: number) => 0.7 * (tw - KELVIN) + 0.2 * (tg - KELVIN) + 0.1 * x.ta;
        const pairs: Array<[number, number]> = [
          [o.globeShade[i], s.tgShade - KELVIN],
          [o.wetBulbShade[i], s.twShade - KELVIN],
          [o.globeSun[i], s.tgSun - KELVIN],
          [o.wetBulbSun[i], s.twSun - KELVIN],
          [o.globeShelter[i], s.tgShelter - KELVIN],
          [o.wetBulbShelter[i], s.twShelter - KELVIN],
          [o.wbgtShade[i], wbgt(s.twShade, s.tgShade)],
          [o.wbgtSun[i], wbgt(s.twSun, s.tgSun)],
          [o.wbgtShelter[i], wbgt(s.twShelter, s.tgShelter)],
          [o.psychrometric[i], tpsy - KELVIN],
        ];
        for (const [fast, readable] of pairs) {
          expect(Number.isFinite(readable), `state ${i}`).toBe(true);
          const e = Math.abs(fast - readable);
          if (!(e <= 1e-9)) expect.fail(`state ${i} (${JSON.stringify(x)}), D = ${d} m: kernel ${fast} vs solver ${readable}`);
          worst = Math.max(worst, e);
          compared++;
        }
        kinds.add(i % 8);
      }
    }
    expect(compared).toBe(2 * N * 10);
    expect(kinds.size).toBe(8);
    expect(worst).toBeLessThanOrEqual(1e-9);
  });

  it('the sample really holds the edge cases: sun-down hours, calm air, clamped dew points and solar loads of 1,200 W/m² and more', () => {
    const r = rng(20240719);
    const states = Array.from({ length: 20_000 }, (_, i) => state(r, i % 8));
    expect(states.filter((s) => s.cz < 0).length).toBeGreaterThan(2000);
    expect(states.filter((s) => s.u < 0.13).length).toBeGreaterThan(1500);
    expect(states.filter((s) => s.td > s.ta).length).toBeGreaterThan(1000);
    expect(states.filter((s) => s.sol >= 1200).length).toBeGreaterThan(2000);
  });
});
