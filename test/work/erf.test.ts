import { describe, expect, it } from 'vitest';
import { erf, erfc, normalCdf, normalCdfFast } from '../../pipeline/work/erf.ts';
import { readFixture } from './helpers.ts';

describe('erf and the normal distribution', () => {
  it('erf matches SciPy scipy.special.erf within 1e-14 on 2,401 points over [−6, 6] (fixtures/scipy-erf.csv)', () => {
    let max = 0;
    for (const r of readFixture('scipy-erf.csv')) max = Math.max(max, Math.abs(erf(Number(r.x)) - Number(r.erf)));
    expect(max).toBeLessThan(1e-14);
  });

  it('erf is odd, erf(0) = 0, saturates at ±1 and passes NaN through', () => {
    expect(erf(0)).toBe(0);
    expect(erf(-1.3)).toBe(-erf(1.3));
    expect(erf(7)).toBe(1);
    expect(erf(-Infinity)).toBe(-1);
    expect(erf(Number.NaN)).toBeNaN();
  });

  it('erf(1) = 0.8427007929497149 (Abramowitz & Stegun 1964, Table 7.1, to the digits printed there: 0.84270 07929)', () => {
    expect(erf(1)).toBeCloseTo(0.8427007929, 10);
  });

  it('normalCdf and normalCdfFast match SciPy scipy.stats.norm.cdf within 1e-14 and 1e-9 on 6,001 points over [−9, 9] (fixtures/scipy-norm-cdf.csv)', () => {
    let maxExact = 0;
    let maxFast = 0;
    for (const r of readFixture('scipy-norm-cdf.csv')) {
      const z = Number(r.z);
      maxExact = Math.max(maxExact, Math.abs(normalCdf(z) - Number(r.cdf)));
      maxFast = Math.max(maxFast, Math.abs(normalCdfFast(z) - Number(r.cdf)));
    }
    expect(maxExact).toBeLessThan(1e-14);
    expect(maxFast).toBeLessThan(1e-9);
  });

  it('normalCdfFast is within 1e-9 of normalCdf between the table knots (dense sweep, 200,001 points)', () => {
    let max = 0;
    for (let i = 0; i <= 200000; i++) {
      const z = -8.5 + i * 8.5e-5;
      max = Math.max(max, Math.abs(normalCdfFast(z) - normalCdf(z)));
    }
    expect(max).toBeLessThan(1e-9);
  });
  it('erfc keeps its relative accuracy in the tail: within 1e-12 relative of SciPy 1.10.1 scipy.special.erfc (Debian python3-scipy; values pinned) from 0.1 to 10', () => {
    const scipy: [number, number][] = [
      [0.1, 0.8875370839817152],
      [1, 0.15729920705028516],
      [2.4, 0.0006885138966450789],
      [2.5, 0.00040695201744495886],
      [3, 2.2090496998585445e-5],
      [4, 1.541725790028002e-8],
      [5, 1.5374597944280347e-12],
      [6, 2.1519736712498913e-17],
      [8, 1.1224297172982928e-29],
      [10, 2.0884875837625446e-45],
    ];
    for (const [x, ref] of scipy) expect(Math.abs(erfc(x) - ref) / ref).toBeLessThan(1e-12);
    expect(erfc(-1)).toBeCloseTo(2 - 0.15729920705028516, 15);
    expect(erfc(0)).toBe(1);
    expect(erfc(Number.NaN)).toBeNaN();
  });
});
