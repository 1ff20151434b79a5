/**
 * One row of a region's tidy table (`data/regions/<region-id>.csv`, pipeline/publish/region-table.ts)
 * as the site reads it, and the row filters the readers take (region-table.ts, site-digest.ts).
 * Types only, so the readers and the report's helpers can share them without importing each other.
 */

/** One row of a region table. */
export interface RegionTableRow {
  /** `01`–`12` (month) or `year`. */
  period: string;
  figure: string;
  workloadClass: string;
  acclimatization: string;
  exposure: string;
  method: string;
  statistic: string;
  /** The value in `unit` [h or °C]; NaN when the table has none. */
  value: number;
  /** `h` or `degC`. */
  unit: string;
  /** Years behind the statistic [count]. */
  yearsUsed: number;
  /** `2021-2022` (baseline) or the latest year. */
  baseline: string;
}

/** Which rows to keep, decided from the period, figure and statistic alone (before the row is split). */
export type RowFilter = (period: string, figure: string, statistic: string) => boolean;
