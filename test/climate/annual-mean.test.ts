import { describe, expect, it } from 'vitest';
import { annualMeanFromMonthlySums } from '../../pipeline/climate/annual-mean.ts';
import { expectCatalogued } from './helpers.ts';

// Hours per month of a common year (common practice: 31 d × 24 h = 744 h, 28 d × 24 h = 672 h, 30 d × 24 h = 720 h).
const HOURS = [744, 672, 744, 720, 744, 720, 744, 744, 720, 744, 720, 744];

function monthly(meanByMonth: number[], valid: number[] = HOURS) {
  const sum = new Float64Array(12);
  const validHours = new Float64Array(12);
  const expectedHours = new Float64Array(HOURS);
  for (let m = 0; m < 12; m++) {
    sum[m] = meanByMonth[m] * valid[m];
    validHours[m] = valid[m];
  }
  return { years: [2001], nCells: 1, sum, validHours, expectedHours };
}

describe('annualMeanFromMonthlySums', () => {
  it('weights each month by its hours: 0 °C in February and 10 °C otherwise → 10·(8760−672)/8760 °C', () => {
    const means = HOURS.map((_, m) => (m === 1 ? 0 : 10));
    const out = annualMeanFromMonthlySums(monthly(means));
    expect(out[0]).toBeCloseTo((10 * (8760 - 672)) / 8760, 12);
  });

  it("missing hours inside the allowance do not tilt the year (a month's mean is sum / valid hours)", () => {
    const means = HOURS.map((_, m) => m); // month m has mean m °C
    const valid = [...HOURS];
    valid[6] = 744 - 200; // July lost 200 h: still counts (≤ 240 h)
    const out = annualMeanFromMonthlySums(monthly(means, valid));
    const want = HOURS.reduce((a, h, m) => a + h * m, 0) / 8760;
    expect(out[0]).toBeCloseTo(want, 12);
  });

  it('a month with more than 240 missing hours makes the year NaN', () => {
    const valid = [...HOURS];
    valid[3] = 720 - 241;
    expect(annualMeanFromMonthlySums(monthly(new Array(12).fill(20), valid))[0]).toBeNaN();
  });

  it('arrays of the wrong length are a catalogued ClimateShapeMismatch', () => {
    const m = monthly(new Array(12).fill(20));
    expectCatalogued(() => annualMeanFromMonthlySums({ ...m, nCells: 2 }), 'ClimateShapeMismatch', /years × 12 months × cells/);
  });
});
