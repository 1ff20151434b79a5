/**
 * The trend of the record (pipeline/climate/trend.ts) against SciPy 1.10.1 (Debian python3-scipy,
 * /usr/bin/python3, with numpy 1.24.2): `scipy.stats.theilslopes(x, years)[0]` for the Theil–Sen
 * slope, and `scipy.stats.kendalltau(years, x, method='asymptotic').pvalue` for the Mann–Kendall
 * p-value (with distinct years, Kendall's tau test of x against time is the Mann–Kendall test:
 * the same S, the same tie-corrected variance, the normal approximation without continuity
 * correction). The values below were computed once with that Python and pinned.
 */
import { describe, expect, it } from 'vitest';
import { annualCellTrends, computeTrends, mannKendall, MIN_TREND_YEARS, theilSenSlope } from '../../pipeline/climate/trend.ts';

const range = (a: number, n: number) => Array.from({ length: n }, (_, i) => a + i);

/** 20 years 2001–2020, with ties; scipy: slope 1.5, p 9.502661382954885e-07; S = 151, Var S = 949. */
const X1 = [41, 45, 39, 52, 48, 47, 55, 50, 58, 52, 61, 57, 63, 60, 66, 59, 70, 68, 72, 71];
/** 16 years 1990–2005, many ties, no trend; scipy: slope 0.0, p 0.9635564047779084; S = 1, Var S = 479. */
const X2 = [12.5, 11.0, 14.0, 11.0, 13.5, 12.0, 11.0, 15.0, 12.0, 13.0, 11.5, 14.5, 12.0, 13.0, 12.5, 11.0];
/** 16 years with gaps; scipy: slope 0.35912698412698413, p 6.439940727464865e-06; S = 100, Var S = 491.333…. */
const Y3 = [2000, 2001, 2002, 2004, 2005, 2006, 2007, 2009, 2010, 2011, 2012, 2013, 2014, 2016, 2017, 2018];
const X3 = [3.0, 2.5, 4.0, 3.5, 5.0, 4.5, 6.0, 5.5, 5.0, 7.0, 6.5, 8.0, 7.5, 9.0, 8.0, 9.5];
/** 30 years 1991–2020, falling; scipy: slope −1.4000000000000012, p 1.4655533068712225e-09; S = −339, Var S = 3141.666…. */
const X4 = [
  200.0, 200.5, 195.8, 190.8, 192.1, 187.6, 192.6, 198.9, 186.6, 184.6, 189.9, 187.8, 185.0, 177.5, 181.6, 184.7, 171.1, 175.2, 165.2, 167.6, 162.9, 171.3,
  163.8, 171.7, 169.7, 166.4, 151.1, 161.7, 163.3, 163.0,
];

describe('Theil–Sen slope and Mann–Kendall test', () => {
  it('the Theil–Sen slope equals scipy.stats.theilslopes on four series (ties, gaps in the years, falling)', () => {
    expect(theilSenSlope(range(2001, 20), X1)).toBeCloseTo(1.5, 12);
    expect(theilSenSlope(range(1990, 16), X2)).toBe(0);
    expect(theilSenSlope(Y3, X3)).toBeCloseTo(0.35912698412698413, 12);
    expect(theilSenSlope(range(1991, 30), X4)).toBeCloseTo(-1.4000000000000012, 12);
  });

  it('the Mann–Kendall S and tie-corrected variance equal the hand formula, and the p-value scipy.stats.kendalltau(asymptotic) within 1e-10 relative', () => {
    const cases: [number[], number, number, number][] = [
      [X1, 151, 949, 9.502661382954885e-7],
      [X2, 1, 479, 0.9635564047779084],
      [X3, 100, 491.3333333333333, 6.439940727464865e-6],
      [X4, -339, 3141.6666666666665, 1.4655533068712225e-9],
    ];
    for (const [x, s, v, p] of cases) {
      const mk = mannKendall(x);
      expect(mk.s).toBe(s);
      expect(mk.variance).toBeCloseTo(v, 9);
      expect(Math.abs(mk.pValue - p) / p).toBeLessThan(1e-10);
    }
  });

  it('a hand-worked Mann–Kendall example: 1, 3, 2, 4 has S = 4 (5 rises, 1 fall), Var S = 4·3·13/18 = 26/3, p = erfc(4/√(26/3)/√2) ≈ 0.1742 (our arithmetic; scipy 1.10.1 kendalltau(asymptotic) gives 0.17423138824802498)', () => {
    const mk = mannKendall([1, 3, 2, 4]);
    expect(mk.s).toBe(4);
    expect(mk.variance).toBeCloseTo(26 / 3, 12);
    expect(mk.pValue).toBeCloseTo(0.17423138824802498, 12);
  });

  it('equal values: S = 0, p = 1, slope 0', () => {
    const mk = mannKendall(new Array(20).fill(7));
    expect(mk.s).toBe(0);
    expect(mk.pValue).toBe(1);
    expect(theilSenSlope(range(2000, 20), new Array(20).fill(7))).toBe(0);
  });

  it('computeTrends gives the slope per decade (× 10) and the p-value per item, skipping missing years, and NaN with the count of years below 15', () => {
    // Item 0: X3 on the years of Y3, NaN in the missing years of 2000–2018; item 1: only 14 years; item 2: X1 on 2001–2019 + NaN.
    const years = range(2000, 19);
    const nItems = 3;
    const values = new Float64Array(years.length * nItems).fill(NaN);
    Y3.forEach((yr, k) => (values[(yr - 2000) * nItems] = X3[k]));
    for (let y = 0; y < 14; y++) values[y * nItems + 1] = y * 2;
    for (let y = 1; y < 19; y++) values[y * nItems + 2] = X1[y - 1];
    const tr = computeTrends({ years, values, nItems });
    expect(MIN_TREND_YEARS).toBe(15);
    expect(Array.from(tr.years)).toEqual([16, 14, 18]);
    expect(tr.slopePerDecade[0]).toBeCloseTo(3.5912698412698414, 11);
    expect(Math.abs(tr.pValue[0] - 6.439940727464865e-6) / 6.439940727464865e-6).toBeLessThan(1e-10);
    expect(tr.slopePerDecade[1]).toBeNaN();
    expect(tr.pValue[1]).toBeNaN();
    expect(tr.s[1]).toBeNaN();
    // scipy on the first 18 values of X1 over 2001–2018: slope 1.5 per year, p 1.0977319134518045e-05.
    expect(tr.slopePerDecade[2]).toBeCloseTo(15, 11);
    expect(Math.abs(tr.pValue[2] - 1.0977319134518045e-5) / 1.0977319134518045e-5).toBeLessThan(1e-10);
    const only = computeTrends({ years, values, nItems }, [2]);
    expect(only.slopePerDecade[0]).toBe(tr.slopePerDecade[2]);
  });

  it("the per-cell trends of the merge (annualCellTrends, the trend-year and trend-p-year layers) take each cell × combination's whole-year value and give scipy's slope and p-value, cell-major", () => {
    // 2 cells × 13 periods × 2 combinations over 1991–2020 (30 years); only the year (period 12) carries the pinned series:
    // cell 0: X4 (combination 0) and X1 on 2001–2020 (combination 1); cell 1: X2 on 1995–2010 (0) and a constant (1).
    // Months hold values that would change every result if they were taken.
    const years = range(1991, 30);
    const nCells = 2;
    const nC = 2;
    const P = 13;
    const nItems = nCells * P * nC;
    const values = new Float64Array(years.length * nItems).fill(NaN);
    const at = (y: number, cell: number, period: number, combo: number) => y * nItems + (cell * P + period) * nC + combo;
    years.forEach((_, y) => {
      for (let c = 0; c < nCells; c++) for (let k = 0; k < nC; k++) for (let m = 0; m < 12; m++) values[at(y, c, m, k)] = 1000 - 37 * y + m;
      values[at(y, 0, 12, 0)] = X4[y];
      if (y >= 10) values[at(y, 0, 12, 1)] = X1[y - 10];
      if (y >= 4 && y < 20) values[at(y, 1, 12, 0)] = X2[y - 4];
      values[at(y, 1, 12, 1)] = 5;
    });
    const tr = annualCellTrends({ years, values, nItems }, nCells, nC, P);
    expect(Array.from(tr.years)).toEqual([30, 20, 16, 30]);
    // scipy 1.10.1 (pinned above): X4 slope −1.4 per year, p 1.4655533068712225e-09; X1 1.5, 9.502661382954885e-07; X2 0, 0.9635564047779084; a constant: p 1.
    expect(tr.slopePerDecade[0]).toBeCloseTo(-14.000000000000012, 10);
    expect(tr.slopePerDecade[1]).toBeCloseTo(15, 11);
    expect(tr.slopePerDecade[2]).toBe(0);
    expect(tr.slopePerDecade[3]).toBe(0);
    const pinned = [1.4655533068712225e-9, 9.502661382954885e-7, 0.9635564047779084];
    pinned.forEach((p, i) => expect(Math.abs(tr.pValue[i] - p) / p, `item ${i}`).toBeLessThan(1e-10));
    expect(tr.pValue[3]).toBe(1);
    // Fewer than 15 years with a value (1991–2004): no slope, no p-value.
    const short = annualCellTrends({ years: years.slice(0, 14), values: values.subarray(0, 14 * nItems), nItems }, nCells, nC, P);
    expect(Array.from(short.pValue).every(Number.isNaN)).toBe(true);
    expect(Array.from(short.years)).toEqual([14, 4, 10, 14]);
  });
});
