import { describe, expect, it } from 'vitest';
import { dunne2013Loss, dunne2013LossInto, kjellstrom2018Loss, kjellstrom2018LossInto, type KjellstromIntensity } from '../../pipeline/work/capacity-loss.ts';
import { expectWorkError } from './helpers.ts';

describe('capacity-loss functions', () => {
  // docs/methods.md §9.1 check values (scipy.stats.norm.cdf) of the Kjellstrom et al. 2018 cumulative normal (loss fraction, 4 decimals).
  const kj: [number, number, number, number][] = [
    [26, 0.0078, 0.0287, 0.0599],
    [30, 0.0802, 0.1879, 0.2763],
    [34, 0.3489, 0.5515, 0.6435],
  ];
  for (const [w, l200, l300, l400] of kj) {
    it(`kjellstrom2018Loss at ${w} °C gives ${l200} / ${l300} / ${l400} for 200 / 300 / 400 W (docs/methods.md §9.1, Kjellstrom et al. 2018), within 5e-5`, () => {
      expect(Math.abs(kjellstrom2018Loss(w, 200) - l200)).toBeLessThan(5e-5);
      expect(Math.abs(kjellstrom2018Loss(w, 300) - l300)).toBeLessThan(5e-5);
      expect(Math.abs(kjellstrom2018Loss(w, 400) - l400)).toBeLessThan(5e-5);
    });
  }

  it('kjellstrom2018Loss for 300 W is one half at μ = 33.49 °C (Φ is one half at its mean, docs/methods.md §9.1)', () => {
    expect(kjellstrom2018Loss(33.49, 300)).toBeCloseTo(0.5, 12);
  });

  it('kjellstrom2018LossInto matches the scalar function within 1e-7 and applies the offset', () => {
    const n = 4001;
    const w = Float32Array.from({ length: n }, (_, i) => 10 + i * 0.01);
    for (const intensity of [200, 300, 400] as KjellstromIntensity[]) {
      const out = kjellstrom2018LossInto(new Float32Array(n), w, intensity);
      const shifted = kjellstrom2018LossInto(new Float32Array(n), w, intensity, 2);
      for (let i = 0; i < n; i++) {
        expect(Math.abs(out[i] - kjellstrom2018Loss(w[i], intensity))).toBeLessThan(1e-7);
        expect(Math.abs(shifted[i] - kjellstrom2018Loss(w[i] + 2, intensity))).toBeLessThan(1e-7);
      }
    }
  });

  // docs/methods.md §9.2 check values: capacity 75.00 % at 26 °C, 37.00 % at 29 °C, 8.52 % at 32 °C, 0 % at 33 °C.
  it('dunne2013Loss gives capacity 100 / 75.00 / 37.00 / 8.52 / 0 % at 25 / 26 / 29 / 32 / 33 °C (docs/methods.md §9.2, Dunne et al. 2013)', () => {
    expect(dunne2013Loss(20)).toBe(0);
    expect(dunne2013Loss(25)).toBe(0);
    expect(1 - dunne2013Loss(26)).toBeCloseTo(0.75, 10);
    expect(Math.abs(1 - dunne2013Loss(29) - 0.37)).toBeLessThan(5e-5);
    expect(Math.abs(1 - dunne2013Loss(32) - 0.0852)).toBeLessThan(5e-5);
    expect(dunne2013Loss(33)).toBe(1);
    expect(dunne2013Loss(40)).toBe(1);
    expect(dunne2013Loss(Number.NaN)).toBeNaN();
  });

  it('dunne2013LossInto matches the scalar function', () => {
    const w = Float32Array.from({ length: 300 }, (_, i) => 20 + i * 0.05);
    const out = dunne2013LossInto(new Float32Array(300), w);
    for (let i = 0; i < 300; i++) expect(out[i]).toBeCloseTo(dunne2013Loss(w[i]), 6);
  });

  it('an intensity other than 200, 300 or 400 W is a WorkParameterInvalid error', () => {
    expectWorkError(() => kjellstrom2018Loss(30, 350 as KjellstromIntensity), 'WorkParameterInvalid', /intensity is 350/);
    expectWorkError(() => kjellstrom2018LossInto(new Float32Array(2), new Float32Array(1), 300), 'WorkParameterInvalid');
  });
});
