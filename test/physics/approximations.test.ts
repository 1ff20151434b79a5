/** Simplified estimates against their check values in docs/methods.md §7.1–§7.3. */
import { describe, it, expect } from 'vitest';
import { wetBulbStull2011, wbgtBureauOfMeteorology, naturalWetBulbBernard, wbgtIndoorLemkeKjellstrom } from '../../pipeline/physics/approximations.ts';

describe('simplified estimates (approximations)', () => {
  it('wetBulbStull2011 gives 13.699 °C at 20 °C/50 % (Stull 2011 worked example) and the docs/methods.md §7.1 values', () => {
    expect(wetBulbStull2011(20, 50)).toBeCloseTo(13.699, 2);
    expect(wetBulbStull2011(30, 50)).toBeCloseTo(22.297, 2);
    expect(wetBulbStull2011(35, 60)).toBeCloseTo(28.488, 2);
    expect(wetBulbStull2011(40, 20)).toBeCloseTo(22.704, 2);
    expect(wetBulbStull2011(25, 90)).toBeCloseTo(23.695, 2);
  });
  it('wbgtBureauOfMeteorology gives 29.26, 36.99, 35.28 °C (docs/methods.md §7.3)', () => {
    expect(wbgtBureauOfMeteorology(30, 50)).toBeCloseTo(29.26, 2);
    expect(wbgtBureauOfMeteorology(35, 60)).toBeCloseTo(36.99, 2);
    expect(wbgtBureauOfMeteorology(40, 30)).toBeCloseTo(35.28, 2);
  });
  it('naturalWetBulbBernard gives 22.49, 25.76, 25.65 °C (docs/methods.md §7.2)', () => {
    expect(naturalWetBulbBernard(30, 22, 31, 0.5)).toBeCloseTo(22.49, 2);
    expect(naturalWetBulbBernard(30, 22, 45, 0.5)).toBeCloseTo(25.76, 2);
    expect(naturalWetBulbBernard(30, 22, 45, 2.0)).toBeCloseTo(25.65, 2);
  });
  it('wbgtIndoorLemkeKjellstrom gives Tpwb/WBGT 22.97/25.29, 27.49/29.97, 23.10/28.68 °C (docs/methods.md §7.2)', () => {
    for (const [t, td, tp, w] of [
      [30, 20, 22.97, 25.29],
      [35, 25, 27.49, 29.97],
      [40, 15, 23.1, 28.68],
    ]) {
      const r = wbgtIndoorLemkeKjellstrom(t, td);
      expect(r.tpwb).toBeCloseTo(tp, 1);
      expect(r.wbgt).toBeCloseTo(w, 1);
    }
  });
});
