/**
 * The trend rows of a region table (pipeline/publish/region-table.ts, docs/methods.md §10.5):
 * the whole year only, `trend` in the figure's unit per decade and `trend-p` in 1, the years with
 * a value and the years built; empty below 15 years. Values against SciPy 1.10.1 (Debian
 * python3-scipy): theilslopes and kendalltau(method='asymptotic') of the series below, pinned.
 */
import { describe, expect, it } from 'vitest';
import { computeNormals, computeTrends } from '../../pipeline/climate/index.ts';
import { regionTableCsv } from '../../pipeline/publish/region-table.ts';
import { PERIODS, type FigureDef } from '../../pipeline/reduce/figures.ts';

/** 20 annual values 2001–2020 (test/climate/trend.test.ts X1): scipy slope 1.5 per year, p 9.502661382954885e-07. */
const X1 = [41, 45, 39, 52, 48, 47, 55, 50, 58, 52, 61, 57, 63, 60, 66, 59, 70, 68, 72, 71];

function table(years: number[], series: number[]): string[][] {
  const def = { id: 'hours-lost-shift', label: 'Hours lost', units: 'h', combos: ['moderate.acclimatized.sun'], annual: 'sum' } as FigureDef;
  const nItems = PERIODS;
  const values = new Float64Array(years.length * nItems).fill(NaN);
  years.forEach((_, y) => (values[y * nItems + PERIODS - 1] = series[y]));
  const baseline: [number, number] = [years[0], years[years.length - 1]];
  const region = computeNormals({ years, values, nItems }, { baseline, latestYear: baseline[1] });
  const trend = computeTrends({ years, values, nItems }, [PERIODS - 1]);
  const csv = regionTableCsv('r', [{ def, region, worstValue: new Float64Array(nItems).fill(NaN), trend }], baseline, baseline[1], baseline);
  return csv
    .trim()
    .split('\n')
    .map((l) => l.split(','));
}

describe('trend rows of the region table', () => {
  it('gives the Theil–Sen slope per decade (15 h per decade: scipy theilslopes 1.5 per year) and the Mann–Kendall p-value (scipy kendalltau 9.5027e-07, written to 3 significant digits) for the year only', () => {
    const rows = table(
      Array.from({ length: 20 }, (_, i) => 2001 + i),
      X1,
    );
    const trend = rows.filter((r) => r[7] === 'trend');
    const p = rows.filter((r) => r[7] === 'trend-p');
    expect(trend).toEqual([['r', 'year', 'hours-lost-shift', 'moderate', 'acclimatized', 'sun', 'limit', 'trend', '15', 'h decade-1', '20', '2001-2020']]);
    expect(p).toEqual([['r', 'year', 'hours-lost-shift', 'moderate', 'acclimatized', 'sun', 'limit', 'trend-p', '9.5e-7', '1', '20', '2001-2020']]);
  });

  it('leaves the trend and its p-value empty with fewer than 15 years, and says how many years there were', () => {
    const rows = table(
      Array.from({ length: 14 }, (_, i) => 2001 + i),
      X1.slice(0, 14),
    );
    expect(rows.filter((r) => r[7] === 'trend' || r[7] === 'trend-p').map((r) => [r[7], r[8], r[9], r[10]])).toEqual([
      ['trend', '', 'h decade-1', '14'],
      ['trend-p', '', '1', '14'],
    ]);
  });
});
