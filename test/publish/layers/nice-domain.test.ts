import { describe, expect, it } from 'vitest';
import { niceDomain } from '../../../pipeline/publish/layers/nice-domain.ts';
import { expectCatalogued } from './helpers.ts';

// Reference: d3-scale's linear nice() rounding (d3-scale 4.0.3 docs: extends the domain to round
// values), and the type-7 quantile of docs/methods.md §10.1 (Hyndman & Fan 1996) worked by hand below.
describe('niceDomain', () => {
  it('counts start at 0 and end at a round number above the maximum; NaN cells are ignored', () => {
    expect(niceDomain(Float32Array.from([3, 17, NaN, 231.4]))).toEqual([0, 240]); // d3 nice() with its default 10 ticks: step 20
    expect(niceDomain([0.02, 0.37, 0.61])).toEqual([0, 0.65]); // step 0.05
  });

  it('several months at once share one domain that covers them all', () => {
    const jan = Float32Array.from([0, 2, 5]);
    const jul = Float32Array.from([40, 180, NaN, 312]);
    expect(niceDomain([jan, jul])).toEqual([0, 350]);
  });

  it('fromZero: false spans the data (temperatures), rounded outwards', () => {
    expect(niceDomain(Float32Array.from([18.3, 24.9, 31.2]), { fromZero: false })).toEqual([18, 32]);
  });

  it('percentiles clip extremes: the type-7 P90 of 1…10 and 1000 is 10, so the domain is [0, 10]', () => {
    // sorted x = 1…10, 1000 (n = 11): h = (11 − 1)·0.9 = 9 → x(10) = 10 exactly (0-based index 9)
    const v = Float32Array.from([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 1000]);
    expect(niceDomain(v, { percentiles: [0, 90] })).toEqual([0, 10]);
    expect(niceDomain(v)).toEqual([0, 1000]);
  });

  it('a cap bounds the domain (e.g. 744 h in a 31-day month)', () => {
    expect(niceDomain(Float32Array.from([0, 731]), { cap: 744 })).toEqual([0, 744]);
  });

  it('all-equal data get a unit-wide domain (zero hours everywhere in winter)', () => {
    expect(niceDomain(new Float32Array(10))).toEqual([0, 1]);
    expect(niceDomain(Float32Array.from([21, 21]), { fromZero: false })).toEqual([21, 22]);
  });

  it('data with no finite value is a LayerNoData error', () => {
    expectCatalogued(() => niceDomain(Float32Array.from([NaN, NaN])), 'LayerNoData', /all 2 values are NaN/);
  });
});
