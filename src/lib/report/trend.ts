/**
 * The region report's trend of the record: per acclimatization state, the Theil–Sen slope of the
 * yearly shift hours lost per decade and its Mann–Kendall p-value (the table's `trend` and
 * `trend-p` rows, docs/methods.md §10.5), or, with fewer than 15 years built, that the trend needs
 * more years. Pure.
 */
import { MIN_TREND_YEARS } from '../../../pipeline/climate/trend.ts';
import { FIGURE_HOURS_LOST, YEAR_PERIOD, type RegionFigures } from './region-figures.ts';

export interface TrendRow {
  acclimatization: string;
  /** Shift hours lost per worker per decade [h decade⁻¹]; NaN without a value. */
  slope: number;
  /** Two-sided Mann–Kendall p-value [–]; NaN without a value. */
  p: number;
}

export interface TrendModel {
  /** Years built [years]. */
  yearsBuilt: number;
  /** Fewest years a trend needs [years]. */
  minYears: number;
  /** Whether the record is long enough for a trend to be shown. */
  enough: boolean;
  rows: TrendRow[];
}

/** The trend rows of one workload class and exposure, for each acclimatization state. */
export function trendModel(
  fig: RegionFigures,
  years: readonly [number, number],
  workloadClass: string,
  exposure: string,
  states: readonly string[],
): TrendModel {
  const yearsBuilt = years[1] - years[0] + 1;
  const get = (acclimatization: string, statistic: string) =>
    fig.get({ figure: FIGURE_HOURS_LOST, period: YEAR_PERIOD, workloadClass, acclimatization, exposure, statistic });
  return {
    yearsBuilt,
    minYears: MIN_TREND_YEARS,
    enough: yearsBuilt >= MIN_TREND_YEARS,
    rows: states.map((a) => ({ acclimatization: a, slope: get(a, 'trend'), p: get(a, 'trend-p') })),
  };
}

/** A p-value in words for a reader [–]. */
export function pValueWords(p: number): string {
  if (!Number.isFinite(p)) return 'no value';
  if (p < 0.01) return 'a steady change, very unlikely by chance (p < 0.01)';
  if (p < 0.05) return 'a steady change, unlikely by chance (p < 0.05)';
  return `not distinguishable from year-to-year variation (p = ${p.toFixed(2)})`;
}
