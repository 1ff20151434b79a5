/**
 * The rows of the estimate's schedule tables, shared by the page, the CLI's text output, the CSV
 * and the workbook, so all show the same figures with the same labels, units and decimals.
 */
import type { BidJson } from './bid-json.ts';
import { grouped } from './settings-text.ts';

/** A figure of a schedule (keys of the JSON's schedule fields). */
export type ScheduleKey =
  | 'finishDate'
  | 'workingDays'
  | 'calendarDays'
  | 'addedWorkingDays'
  | 'addedCalendarDays'
  | 'crewHoursLost'
  | 'crewHoursAbove'
  | 'cost';

export interface ScheduleRow {
  key: ScheduleKey;
  label: string;
  /** Unit in words (`currency` is replaced by the job's currency label). */
  unit: string;
  /** Decimals shown (dates: none). */
  digits: number;
}

export const SCHEDULE_ROWS: readonly ScheduleRow[] = [
  { key: 'finishDate', label: 'Finish date', unit: 'date', digits: 0 },
  { key: 'workingDays', label: 'Working days', unit: 'days', digits: 1 },
  { key: 'calendarDays', label: 'Calendar days', unit: 'days', digits: 1 },
  { key: 'addedWorkingDays', label: 'Working days added by heat', unit: 'days', digits: 1 },
  { key: 'addedCalendarDays', label: 'Calendar days added by heat', unit: 'days', digits: 1 },
  { key: 'crewHoursLost', label: 'Crew-hours lost to rest breaks', unit: 'crew-hours', digits: 0 },
  { key: 'crewHoursAbove', label: 'Crew-hours in hours above the limit', unit: 'crew-hours', digits: 0 },
  { key: 'cost', label: 'Cost of heat', unit: 'currency', digits: 0 },
];

/** The statistics shown, in order. */
export const STATISTICS = [
  { key: 'mean', label: 'Mean' },
  { key: 'p50', label: 'Median (P50)' },
  { key: 'p90', label: 'P90 year' },
] as const;
export type StatisticKey = (typeof STATISTICS)[number]['key'];

/** The unit of a row in words, with the currency label. */
export function rowUnit(row: ScheduleRow, currency: string): string {
  return row.unit === 'currency' ? currency || 'currency units' : row.unit;
}

/** A value as shown: dates as they are, numbers grouped with the row's decimals. */
export function showValue(v: number | string, row: ScheduleRow): string {
  return typeof v === 'string' ? v : grouped(v, row.digits);
}

/** One statistic of one row of a schedule in the JSON. */
export function scheduleValue(s: Pick<BidJson, ScheduleKey>, row: ScheduleRow, stat: StatisticKey): number | string {
  return (s[row.key] as Record<StatisticKey, number | string>)[stat];
}
