/**
 * The calculator's result table: one row per work month (figures for one such month) and one row
 * for the whole project period, per worker and for the crew. The page's HTML table and the CSV
 * download are both made from these rows and columns, so they cannot disagree.
 */
import type { EstimateResult } from './estimate.ts';
import type { QuantityStats } from './statistics.ts';

export const MONTH_NAMES = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December'];

export interface EstimateRow {
  /** `01`–`12`, or `total` for the project period. */
  key: string;
  label: string;
  /** Column key → value (NaN when the baseline has too few complete years). */
  values: Record<ColumnKey, number>;
}

export type ColumnKey =
  | 'months'
  | 'shift_hours'
  | 'above_mean'
  | 'above_p90'
  | 'lost_mean'
  | 'lost_p90'
  | 'lost_share'
  | 'crew_lost_mean'
  | 'crew_lost_p90'
  | 'years_used';

export interface EstimateColumn {
  key: ColumnKey;
  /** Header on the page (units in brackets). */
  label: string;
  /** Header in the CSV (unit as a suffix). */
  csv: string;
  /** Decimals on the page and in the CSV. */
  digits: number;
  csvDigits: number;
}

export const ESTIMATE_COLUMNS: readonly EstimateColumn[] = [
  { key: 'months', label: 'Months in project', csv: 'months_in_project', digits: 0, csvDigits: 0 },
  { key: 'shift_hours', label: 'Shift hours per worker, mean [h]', csv: 'shift_hours_per_worker_mean_h', digits: 1, csvDigits: 2 },
  { key: 'above_mean', label: 'Hours above the limit per worker, mean [h]', csv: 'hours_above_limit_per_worker_mean_h', digits: 1, csvDigits: 2 },
  { key: 'above_p90', label: 'Hours above the limit per worker, P90 year [h]', csv: 'hours_above_limit_per_worker_p90_h', digits: 1, csvDigits: 2 },
  { key: 'lost_mean', label: 'Hours lost per worker, mean [h]', csv: 'hours_lost_per_worker_mean_h', digits: 1, csvDigits: 2 },
  { key: 'lost_p90', label: 'Hours lost per worker, P90 year [h]', csv: 'hours_lost_per_worker_p90_h', digits: 1, csvDigits: 2 },
  { key: 'lost_share', label: 'Share of shift hours lost, mean [%]', csv: 'share_of_shift_hours_lost_mean_pct', digits: 1, csvDigits: 2 },
  { key: 'crew_lost_mean', label: 'Crew hours lost, mean [h]', csv: 'crew_hours_lost_mean_h', digits: 1, csvDigits: 2 },
  { key: 'crew_lost_p90', label: 'Crew hours lost, P90 year [h]', csv: 'crew_hours_lost_p90_h', digits: 1, csvDigits: 2 },
  { key: 'years_used', label: 'Baseline years used', csv: 'baseline_years_used', digits: 0, csvDigits: 0 },
];

function rowValues(q: QuantityStats, months: number, crew: number): Record<ColumnKey, number> {
  const share = q.shiftHours.mean > 0 ? (100 * q.lost.mean) / q.shiftHours.mean : q.shiftHours.mean === 0 ? 0 : NaN;
  return {
    months,
    shift_hours: q.shiftHours.mean,
    above_mean: q.above.mean,
    above_p90: q.above.p90,
    lost_mean: q.lost.mean,
    lost_p90: q.lost.p90,
    lost_share: share,
    crew_lost_mean: crew * q.lost.mean,
    crew_lost_p90: crew * q.lost.p90,
    years_used: Math.min(q.shiftHours.yearsUsed, q.above.yearsUsed, q.lost.yearsUsed),
  };
}

/** Rows: the work months in calendar order, then the project total. */
export function estimateRows(r: EstimateResult): EstimateRow[] {
  const rows: EstimateRow[] = [];
  const crew = r.inputs.crew;
  for (let m = 0; m < 12; m++) {
    if (!r.inputs.workMonths[m]) continue;
    rows.push({ key: String(m + 1).padStart(2, '0'), label: MONTH_NAMES[m], values: rowValues(r.statistics.months[m], r.occurrences[m], crew) });
  }
  const nMonths = r.occurrences.reduce((a, b) => a + b, 0);
  rows.push({ key: 'total', label: r.inputs.period ? 'Project period' : 'One year of work months', values: rowValues(r.statistics.total, nMonths, crew) });
  return rows;
}
