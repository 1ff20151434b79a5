import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { computeNormals } from '../../pipeline/climate/normals.ts';
import { quantile } from '../../pipeline/climate/quantile.ts';
import { expectCatalogued } from './helpers.ts';

const METHODS_COUNTS = [40, 43, 48, 52, 55, 57, 66, 72, 74, 88, 89, 95, 97, 97, 100, 102, 103, 112, 117, 123, 129, 137, 137, 137, 138, 140, 142, 146, 148, 154];
const range = (a: number, b: number) => Array.from({ length: b - a + 1 }, (_, i) => a + i);

describe('computeNormals', () => {
  it('reproduces docs/methods.md §10.1 for one item over 1991–2020: median 101.0 h, P90 142.4 h, min 40, max 154, n 30', () => {
    // Source: docs/methods.md §10.1 check values (computed there with numpy); mean 3038/30 = 101.27 h from the same list.
    const years = range(1991, 2020);
    const n = computeNormals({ years, values: new Float64Array(METHODS_COUNTS), nItems: 1 }, { baseline: [1991, 2020] });
    expect(n.median[0]).toBeCloseTo(101.0, 12);
    expect(n.p90[0]).toBeCloseTo(142.4, 12);
    expect(n.min[0]).toBe(40);
    expect(n.max[0]).toBe(154);
    expect(n.yearsUsed[0]).toBe(30);
    expect(n.yearsMissing[0]).toBe(0);
    expect(n.mean[0]).toBeCloseTo(METHODS_COUNTS.reduce((a, b) => a + b, 0) / 30, 12);
    expect(n.minYears).toBe(24);
  });

  it('agrees item by item with quantile() on random stacks with missing years (property test, 200 cases)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 12 }),
        fc.integer({ min: 1, max: 40 }),
        fc.array(fc.oneof(fc.double({ min: -50, max: 800, noNaN: true }), fc.constant(NaN)), { minLength: 480, maxLength: 480 }),
        (nYears, nItems, pool) => {
          const values = new Float64Array(nYears * nItems).map((_, k) => pool[k % pool.length]);
          const years = range(2001, 2000 + nYears);
          const rule = { maxMissingHours: 240, minYearShare: 0.01 };
          const n = computeNormals({ years, values, nItems }, { baseline: [2001, 2000 + nYears], rule });
          for (let i = 0; i < nItems; i++) {
            const col = years.map((_, y) => values[y * nItems + i]);
            const med = quantile(col, 0.5);
            expect(n.yearsUsed[i]).toBe(med.n);
            if (med.n === 0) {
              expect(n.median[i]).toBeNaN();
              continue;
            }
            expect(n.median[i]).toBeCloseTo(med.value, 9);
            expect(n.p90[i]).toBeCloseTo(quantile(col, 0.9).value, 9);
            const finite = col.filter(Number.isFinite);
            // + 0 folds −0 into 0: the sort may keep either zero first, and both are the same value.
            expect(n.min[i] + 0).toBe(Math.min(...finite) + 0);
            expect(n.max[i] + 0).toBe(Math.max(...finite) + 0);
          }
        },
      ),
      { numRuns: 200 },
    );
  });

  it('withholds a 30-year normal with 23 usable years and publishes it with 24 (≥ 80 %, WMO-No. 1203 from memory)', () => {
    const years = range(1991, 2020);
    const values = new Float64Array(30 * 2).fill(5);
    for (let y = 0; y < 7; y++) values[y * 2 + 0] = NaN; // item 0: 23 years
    for (let y = 0; y < 6; y++) values[y * 2 + 1] = NaN; // item 1: 24 years
    const n = computeNormals({ years, values, nItems: 2 }, { baseline: [1991, 2020] });
    expect(n.yearsUsed[0]).toBe(23);
    expect(n.mean[0]).toBeNaN();
    expect(n.median[0]).toBeNaN();
    expect(n.yearsUsed[1]).toBe(24);
    expect(n.yearsMissing[1]).toBe(6);
    expect(n.mean[1]).toBe(5);
  });

  it('counts baseline years absent from the stack as missing (stack 1995–2020 → 26 of 30; 2000–2020 → 21, withheld)', () => {
    const a = computeNormals({ years: range(1995, 2020), values: new Float64Array(26).fill(1), nItems: 1 }, { baseline: [1991, 2020] });
    expect(a.yearsUsed[0]).toBe(26);
    expect(a.yearsMissing[0]).toBe(4);
    expect(a.mean[0]).toBe(1);
    const b = computeNormals({ years: range(2000, 2020), values: new Float64Array(21).fill(1), nItems: 1 }, { baseline: [1991, 2020] });
    expect(b.yearsUsed[0]).toBe(21);
    expect(b.mean[0]).toBeNaN();
  });

  it('a January counts with 240 missing hours (10 days) and not with 241 (WMO-No. 1203 spirit, from memory)', () => {
    const years = range(2001, 2010);
    const values = new Float64Array(10).map((_, y) => y + 1);
    const expectedHours = new Float64Array(10).fill(744);
    const validHours = new Float64Array(10).fill(744);
    validHours[0] = 744 - 240; // counts
    validHours[1] = 744 - 241; // does not count
    validHours[2] = 744 - 241;
    const n = computeNormals({ years, values, nItems: 1, validHours, expectedHours }, { baseline: [2001, 2010] });
    expect(n.yearsUsed[0]).toBe(8);
    expect(n.mean[0]).toBeCloseTo((1 + 4 + 5 + 6 + 7 + 8 + 9 + 10) / 8, 12);
    expect(n.min[0]).toBe(1);
  });

  it('ranks the latest year among the baseline years, highest first, and gives its difference from the mean', () => {
    // Baseline 2001–2010 values 1..10, mean 5.5; latest year 2024 in three items: 12, 0, 7 and a tie at 10.
    const years = [...range(2001, 2010), 2024];
    const nItems = 4;
    const values = new Float64Array(11 * nItems);
    for (let y = 0; y < 10; y++) for (let i = 0; i < nItems; i++) values[y * nItems + i] = y + 1;
    values.set([12, 0, 7, 10], 10 * nItems);
    const n = computeNormals({ years, values, nItems }, { baseline: [2001, 2010], latestYear: 2024 });
    expect([...n.latest]).toEqual([12, 0, 7, 10]);
    expect([...n.latestDifference]).toEqual([6.5, -5.5, 1.5, 4.5]);
    expect([...n.latestRank]).toEqual([1, 11, 4, 1]); // 7: years 8, 9, 10 above → rank 4; a tie with the top is rank 1
    expect(n.latestYear).toBe(2024);
  });

  it('a latest year that is missing or incomplete gives NaN difference and rank, never a stale number', () => {
    const years = [...range(2001, 2010), 2024];
    const values = new Float64Array(11).map((_, y) => y);
    values[10] = NaN;
    const n = computeNormals({ years, values, nItems: 1 }, { baseline: [2001, 2010], latestYear: 2024 });
    expect(n.latest[0]).toBeNaN();
    expect(n.latestDifference[0]).toBeNaN();
    expect(n.latestRank[0]).toBeNaN();
  });

  it('bad inputs are catalogued errors: shape, year order, period, hour counts, latest year, rule', () => {
    const years = range(2001, 2005);
    const values = new Float64Array(10);
    expectCatalogued(
      () => computeNormals({ years, values, nItems: 3 }, { baseline: [2001, 2005] }),
      'ClimateShapeMismatch',
      /holds 10 values; years × items needs 15/,
    );
    expectCatalogued(
      () => computeNormals({ years: [2001, 2003, 2002, 2004, 2005], values, nItems: 2 }, { baseline: [2001, 2005] }),
      'ClimateYearsNotAscending',
      /year 2002 at row 3/,
    );
    expectCatalogued(
      () => computeNormals({ years: [2001, 2001, 2002, 2003, 2004], values, nItems: 2 }, { baseline: [2001, 2005] }),
      'ClimateYearsNotAscending',
    );
    expectCatalogued(
      () => computeNormals({ years, values, nItems: 2 }, { baseline: [1961, 1990] }),
      'ClimatePeriodNotInStack',
      /baseline 1961–1990 shares no year with the stack \(2001–2005\)/,
    );
    expectCatalogued(() => computeNormals({ years, values, nItems: 2 }, { baseline: [2005, 2001] }), 'ClimateBadPeriod');
    expectCatalogued(
      () => computeNormals({ years, values, nItems: 2 }, { baseline: [2001, 2005], latestYear: 2030 }),
      'ClimatePeriodNotInStack',
      /latest year/,
    );
    const expectedHours = new Float64Array(10).fill(744);
    const validHours = new Float64Array(10).fill(744);
    validHours[5] = 745;
    const err = expectCatalogued(
      () => computeNormals({ years, values, nItems: 2, validHours, expectedHours }, { baseline: [2001, 2005] }),
      'ClimateBadHourCounts',
      /year row 3 \(1-based\), item 1: 745 valid hours against 744/,
    );
    expect(err.where.row).toBe(3);
    expectCatalogued(() => computeNormals({ years, values, nItems: 2, validHours }, { baseline: [2001, 2005] }), 'ClimateShapeMismatch', /expectedHours/);
    expectCatalogued(
      () => computeNormals({ years, values, nItems: 2 }, { baseline: [2001, 2005], rule: { maxMissingHours: 240, minYearShare: 0 } }),
      'ClimateBadRule',
    );
    expectCatalogued(
      () => computeNormals({ years, values, nItems: 2 }, { baseline: [2001, 2005], rule: { maxMissingHours: -1, minYearShare: 0.8 } }),
      'ClimateBadRule',
    );
  });
});
