/**
 * The report's monthly figures for one workload class and exposure: shift hours with WBGT above
 * the limit and shift hours lost to the rest breaks the limit requires [h per worker], each as
 * the baseline mean and the 90th-percentile year (docs/methods.md §10.1: Hyndman–Fan type 7 across the
 * baseline years), per month and for the whole year. Values come straight from the region's
 * table; nothing is recomputed. Pure.
 */
import { FIGURE_HOURS_ABOVE, FIGURE_HOURS_LOST, MONTH_PERIODS, YEAR_PERIOD, type RegionFigures } from './region-figures.ts';
import { periodName } from './months.ts';

/** One value column of the monthly table. */
export interface MonthlyColumn {
  /** Stable key, e.g. `lost-acclimatized-p90` (the header's `data-key`). */
  key: string;
  figure: string;
  acclimatization: string;
  statistic: 'mean' | 'p90';
  /** What the column holds, in words. */
  label: string;
}

export interface MonthlyRow {
  /** `01`–`12` or `year`. */
  period: string;
  name: string;
  /** One value per column [h]; NaN = no value. */
  values: number[];
}

export interface MonthlyTableModel {
  workloadClass: string;
  exposure: string;
  columns: MonthlyColumn[];
  rows: MonthlyRow[];
}

const FIGURES = [
  { id: FIGURE_HOURS_ABOVE, short: 'above', words: 'Hours above the limit' },
  { id: FIGURE_HOURS_LOST, short: 'lost', words: 'Hours lost' },
] as const;
const STATS = [
  { id: 'mean', words: 'mean' },
  { id: 'p90', words: '90th-percentile year' },
] as const;

/** Columns for the given acclimatization states, in table order. */
export function monthlyColumns(acclimatizations: readonly string[]): MonthlyColumn[] {
  const cols: MonthlyColumn[] = [];
  for (const a of acclimatizations) {
    for (const f of FIGURES) {
      for (const s of STATS) cols.push({ key: `${f.short}-${a}-${s.id}`, figure: f.id, acclimatization: a, statistic: s.id, label: `${f.words}, ${s.words}` });
    }
  }
  return cols;
}

/** The monthly table of one class and exposure: twelve months, then the whole year. */
export function monthlyTable(fig: RegionFigures, workloadClass: string, exposure: string, acclimatizations: readonly string[]): MonthlyTableModel {
  const columns = monthlyColumns(acclimatizations);
  const rows = [...MONTH_PERIODS, YEAR_PERIOD].map((period) => ({
    period,
    name: periodName(period),
    values: columns.map((c) => fig.get({ figure: c.figure, period, workloadClass, acclimatization: c.acclimatization, exposure, statistic: c.statistic })),
  }));
  return { workloadClass, exposure, columns, rows };
}

/** Shift hours lost in a year [h per worker] (baseline `statistic`, default the mean). */
export function annualHoursLost(fig: RegionFigures, workloadClass: string, acclimatization: string, exposure: string, statistic = 'mean'): number {
  return fig.get({ figure: FIGURE_HOURS_LOST, period: YEAR_PERIOD, workloadClass, acclimatization, exposure, statistic });
}

/** One month's mean and P90 of shift hours lost [h per worker]. */
export interface MonthLoss {
  period: string;
  name: string;
  mean: number;
  p90: number;
}

/** Mean and P90 hours lost for each month (January first). */
export function monthlyLosses(fig: RegionFigures, workloadClass: string, acclimatization: string, exposure: string): MonthLoss[] {
  return MONTH_PERIODS.map((period) => ({
    period,
    name: periodName(period),
    mean: fig.get({ figure: FIGURE_HOURS_LOST, period, workloadClass, acclimatization, exposure, statistic: 'mean' }),
    p90: fig.get({ figure: FIGURE_HOURS_LOST, period, workloadClass, acclimatization, exposure, statistic: 'p90' }),
  }));
}

/**
 * The months with the most mean hours lost, most first (ties: earlier month first), at most
 * `count`, leaving out months with no hours lost (0 or no value).
 */
export function worstMonths(fig: RegionFigures, workloadClass: string, acclimatization: string, exposure: string, count = 3): MonthLoss[] {
  return monthlyLosses(fig, workloadClass, acclimatization, exposure)
    .filter((m) => Number.isFinite(m.mean) && m.mean > 0)
    .sort((a, b) => b.mean - a.mean || a.period.localeCompare(b.period))
    .slice(0, count);
}
