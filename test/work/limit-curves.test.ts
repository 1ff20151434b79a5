import { describe, expect, it } from 'vitest';
import { limitCurve2017, limitTable1989, limitWbgt, TABLE_1989_RATES } from '../../pipeline/work/limit-curves.ts';

describe('WBGT limit curves', () => {
  // docs/methods.md §8.2 check values of the NIOSH 2016 REL/RAL curves (M in W), printed to 0.01 °C.
  const checks: [number, number, number][] = [
    [115, 33.0, 30.84],
    [180, 30.76, 28.1],
    [300, 28.21, 24.97],
    [415, 26.59, 22.99],
    [520, 25.47, 21.6],
  ];
  for (const [m, rel, ral] of checks) {
    it(`limitCurve2017 at ${m} W gives ${rel} °C acclimatized and ${ral} °C unacclimatized (docs/methods.md §8.2, NIOSH 2016 REL/RAL), within 0.006 °C`, () => {
      expect(Math.abs(limitCurve2017(m, 'acclimatized') - rel)).toBeLessThan(0.006);
      expect(Math.abs(limitCurve2017(m, 'unacclimatized') - ral)).toBeLessThan(0.006);
    });
  }

  it('limitCurve2017 takes M in W, not W m⁻²: the 1.8 m² conversion of 231 W m⁻² (≈ 415 W) gives the 415 W limit (docs/methods.md §8.2)', () => {
    expect(limitCurve2017(230.56 * 1.8, 'acclimatized')).toBeCloseTo(26.59, 2);
  });

  it('the 2017 curves are close to the Bröde et al. 2018 linear ISO approximation 34.9 − M/46 over 115–520 W (docs/methods.md §8.8), within 1.9 °C (largest gap at 520 W)', () => {
    // Bröde's linear form approximates the ISO curve; its values 32.40/28.38/25.88/23.60 °C (docs/methods.md §8.8).
    for (const m of [115, 300, 415, 520]) expect(Math.abs(limitCurve2017(m, 'acclimatized') - (34.9 - m / 46))).toBeLessThan(1.9);
    expect(34.9 - 300 / 46).toBeCloseTo(28.38, 2);
  });

  it('limitTable1989 reproduces the ISO 7243:1989 table at the class typical rates (docs/methods.md §8.3)', () => {
    const acclStill = [33, 30, 28, 25, 23];
    const acclMoving = [33, 30, 28, 26, 25];
    const unStill = [32, 29, 26, 22, 18];
    const unMoving = [32, 29, 26, 23, 20];
    TABLE_1989_RATES.forEach((m, i) => {
      expect(limitTable1989(m, 'acclimatized', false)).toBe(acclStill[i]);
      expect(limitTable1989(m, 'acclimatized', true)).toBe(acclMoving[i]);
      expect(limitTable1989(m, 'unacclimatized', false)).toBe(unStill[i]);
      expect(limitTable1989(m, 'unacclimatized', true)).toBe(unMoving[i]);
    });
  });

  it('limitTable1989 is linear between class rates and flat outside 115–520 W (our documented rule)', () => {
    expect(limitTable1989(240, 'acclimatized')).toBeCloseTo(29, 12); // half-way 180→300: 30→28
    expect(limitTable1989(90, 'acclimatized')).toBe(33);
    expect(limitTable1989(800, 'unacclimatized')).toBe(18);
  });

  it('limitWbgt dispatches on the model', () => {
    expect(limitWbgt(300, { model: 'curve-2017', acclimatization: 'acclimatized' })).toBe(limitCurve2017(300, 'acclimatized'));
    expect(limitWbgt(415, { model: 'table-1989', acclimatization: 'acclimatized', airMovement: true })).toBe(26);
  });
});
