import { describe, expect, it } from 'vitest';
import { quantile, quantileSorted } from '../../pipeline/climate/quantile.ts';
import { expectCatalogued } from './helpers.ts';

// docs/methods.md §10.1 check values: 30 sorted yearly exceedance counts [h].
const METHODS_COUNTS = [40, 43, 48, 52, 55, 57, 66, 72, 74, 88, 89, 95, 97, 97, 100, 102, 103, 112, 117, 123, 129, 137, 137, 137, 138, 140, 142, 146, 148, 154];

describe('quantile (Hyndman–Fan type 7)', () => {
  it('gives the docs/methods.md §10.1 worked example: n = 30 counts → median 101.0 h, P90 142.4 h', () => {
    // Source: docs/methods.md §10.1; numpy 2.4.6 np.quantile(x, [0.5, 0.9]) prints [101. 142.4] on this machine.
    expect(quantile(METHODS_COUNTS, 0.5).value).toBeCloseTo(101.0, 12);
    expect(quantile(METHODS_COUNTS, 0.9).value).toBeCloseTo(142.4, 12);
  });

  it('does not depend on the input order (the same 30 counts shuffled)', () => {
    const shuffled = [...METHODS_COUNTS].reverse().map((_v, i, a) => a[(i * 7) % a.length]);
    expect([...shuffled].sort((a, b) => a - b)).toEqual(METHODS_COUNTS);
    expect(quantile(shuffled, 0.9).value).toBeCloseTo(142.4, 12);
  });

  it('matches numpy.quantile (default "linear" = type 7) for odd n = 7 at p = 0, 0.1, 0.25, 0.5, 0.9, 1', () => {
    // Source: numpy 2.4.6, np.quantile([3.5,-1.25,7,2,11.5,0.5,9.75], [0,.1,.25,.5,.9,1]) run on this machine.
    const y = [3.5, -1.25, 7.0, 2.0, 11.5, 0.5, 9.75];
    const want = [-1.25, -0.2, 1.25, 3.5, 10.45, 11.5];
    [0, 0.1, 0.25, 0.5, 0.9, 1].forEach((p, i) => expect(quantile(y, p).value).toBeCloseTo(want[i], 12));
  });

  it('matches numpy.quantile for even n = 4 (median halfway between the middle two)', () => {
    // Source: numpy 2.4.6, np.quantile([12,5,8,1], [0.1,0.5,0.9]) → [2.2, 6.5, 10.8].
    const z = [12, 5, 8, 1];
    expect(quantile(z, 0.1).value).toBeCloseTo(2.2, 12);
    expect(quantile(z, 0.5).value).toBeCloseTo(6.5, 12);
    expect(quantile(z, 0.9).value).toBeCloseTo(10.8, 12);
  });

  it('n = 1 returns the one value at every p; n = 2 interpolates linearly (numpy: [4, 10] → 7.0, 9.4)', () => {
    for (const p of [0, 0.3, 0.5, 0.9, 1]) expect(quantile([42], p).value).toBe(42);
    expect(quantile([10, 4], 0.5).value).toBeCloseTo(7.0, 12);
    expect(quantile([10, 4], 0.9).value).toBeCloseTo(9.4, 12);
  });

  it('leaves NaN years out and counts them; all-NaN gives NaN with n = 0', () => {
    const r = quantile([NaN, 10, NaN, 4, NaN], 0.9);
    expect(r.value).toBeCloseTo(9.4, 12);
    expect(r.n).toBe(2);
    expect(r.excluded).toBe(3);
    const none = quantile([NaN, NaN], 0.5);
    expect(none.value).toBeNaN();
    expect(none.n).toBe(0);
    expect(none.excluded).toBe(2);
    expect(quantile([], 0.5).value).toBeNaN();
  });

  it('quantileSorted uses only the first n values of a longer buffer', () => {
    expect(quantileSorted(new Float64Array([1, 2, 3, 99, 99]), 1, 3)).toBe(3);
    expect(quantileSorted(new Float64Array([1, 2, 3, 99]), 0.5, 3)).toBe(2);
  });

  it('a probability outside 0–1 (or NaN) is a catalogued ClimateProbabilityOutOfRange error', () => {
    expectCatalogued(() => quantile([1, 2], 90), 'ClimateProbabilityOutOfRange', /probability 90/);
    expectCatalogued(() => quantile([1, 2], -0.1), 'ClimateProbabilityOutOfRange');
    expectCatalogued(() => quantile([1, 2], NaN), 'ClimateProbabilityOutOfRange');
  });
});
