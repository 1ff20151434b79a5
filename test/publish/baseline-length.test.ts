/**
 * What a baseline of n years can say about its 90th-percentile year (pipeline/publish/baseline-length.ts).
 * Outside checks: NumPy's percentile with its default linear method, which is Hyndman & Fan's
 * type 7 (numpy.percentile documentation; Debian's python3-numpy, version printed by the test),
 * and docs/methods.md §10.1, eq. 10.1's worked example (n = 30: P90 = x27 + 0.1 (x28 − x27)).
 */
import { execFileSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import {
  MIN_BASELINE_YEARS_P90,
  baselineYearCount,
  isShortForP90,
  p90Description,
  p90Label,
  p90Position,
  p90Rank,
  shortBaselineWarning,
} from '../../pipeline/publish/baseline-length.ts';
import { quantileSorted } from '../../pipeline/climate/quantile.ts';

/** NumPy's P90 of each list of values and its version, from Debian's python3-numpy (one process). */
function numpyP90(lists: number[][]): { p90: number[]; version: string } {
  const out = execFileSync(
    '/usr/bin/python3',
    [
      '-c',
      'import json,sys,numpy as np; v=json.loads(sys.argv[1]); print(json.dumps([[float(np.percentile(x, 90)) for x in v], np.__version__]))',
      JSON.stringify(lists),
    ],
    { encoding: 'utf8' },
  );
  const [p90, version] = JSON.parse(out) as [number[], string];
  return { p90, version };
}

describe('the 90th-percentile year of a short baseline', () => {
  it('a baseline of 4 years puts the type-7 P90 70 % of the way from the second-highest year to the highest, as NumPy computes it', () => {
    const years = [40, 52, 61, 97]; // invented counts [h]
    const {
      p90: [p90],
      version,
    } = numpyP90([years]);
    expect(version).toMatch(/^\d+\.\d+/);
    expect(p90).toBeCloseTo(61 + 0.7 * (97 - 61), 10);
    expect(p90Rank(4)).toBeCloseTo(3.7, 12);
    expect(quantileSorted(Float64Array.from(years), 0.9, 4)).toBeCloseTo(p90, 10);
    expect(p90Position(4)).toBe('between the second-highest and the highest of the 4 years, 70 % of the way to the highest');
  });

  it('the share of the way to the highest year is 1.1 − 0.1 n for every n from 2 to 11, as NumPy gives it', () => {
    const ns = Array.from({ length: 10 }, (_, i) => i + 2);
    const { p90: all } = numpyP90(ns.map((n) => Array.from({ length: n }, (_, i) => 10 * (i + 1))));
    for (const [k, n] of ns.entries()) {
      const share = (all[k] - 10 * (n - 1)) / 10;
      expect(share, `n = ${n}`).toBeCloseTo(1.1 - 0.1 * n, 10);
      expect(p90Rank(n) - (n - 1), `n = ${n}`).toBeCloseTo(1.1 - 0.1 * n, 10);
    }
  });

  it('docs/methods.md §10.1, eq. 10.1: for 30 years the P90 sits at rank 27.1 (x27 + 0.1 (x28 − x27))', () => {
    expect(p90Rank(30)).toBeCloseTo(27.1, 12);
  });

  it('fewer than 10 years is short: the label shows the number of years and says the P90 is near the highest; 10 or more reads as a 1-in-10 year', () => {
    expect(MIN_BASELINE_YEARS_P90).toBe(10);
    expect(isShortForP90(9)).toBe(true);
    expect(isShortForP90(10)).toBe(false);
    expect(p90Label(4)).toBe('P90 of 4 years (near the highest)');
    expect(p90Label(1)).toBe('P90 of 1 year (near the highest)');
    expect(p90Label(30)).toBe('P90 of 30 years (a hot year, about 1 in 10)');
    expect(p90Description(4, [2020, 2023])).toContain('it is not a 1-in-10 year');
    expect(p90Description(30, [1991, 2020])).toBe(
      '90th-percentile year of the baseline 1991–2020 (30 years; Hyndman–Fan type 7): a hot year: about 1 year in 10 is higher',
    );
    expect(p90Position(1)).toBe('the one baseline year itself');
  });

  it('the warning names the baseline, its length and the rule, and is absent for 10 years or more', () => {
    expect(baselineYearCount([2020, 2023])).toBe(4);
    expect(shortBaselineWarning([2020, 2023])).toBe(
      'the baseline 2020–2023 has 4 years, fewer than the 10 a 90th-percentile (P90) year needs: its P90 figures lie between the second-highest and the highest of the 4 years, ' +
        '70 % of the way to the highest, and the pages label them so; set a baseline of 10 years or more (30 for a WMO standard normal) for a 1-in-10 year',
    );
    expect(shortBaselineWarning([2011, 2020])).toBeNull();
  });
});
