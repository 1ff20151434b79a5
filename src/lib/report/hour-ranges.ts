/**
 * Which local hours of each month have a typical WBGT above a class limit, as runs of
 * consecutive hours (for planning shift times): e.g. hours 10, 11, 12 and 13 above → one run
 * 10:00–14:00 (an hour is named by its start, so the run ends when its last hour does). Pure.
 */
import { HOURS, MONTHS } from '../../../pipeline/reduce/layout.ts';
import { type HourMatrix, matrixIndex } from './hour-matrix.ts';
import { isAbove, type ClassLimit } from './limits.ts';
import { clockHour } from './months.ts';

/** A run of hours [start, end) in local clock hours [h, 0–24]. */
export interface HourRun {
  start: number;
  end: number;
}

/** The runs of hours of month `month0` (0–11) whose typical WBGT is above `limit`. */
export function hoursAbove(matrix: HourMatrix, month0: number, limit: ClassLimit): HourRun[] {
  const runs: HourRun[] = [];
  let start = -1;
  for (let h = 0; h <= HOURS; h++) {
    const above = h < HOURS && isAbove(matrix.values[matrixIndex(month0, h)], limit);
    if (above && start < 0) start = h;
    if (!above && start >= 0) {
      runs.push({ start, end: h });
      start = -1;
    }
  }
  return runs;
}

/** Runs for every month, January first. */
export function hoursAboveByMonth(matrix: HourMatrix, limit: ClassLimit): HourRun[][] {
  return Array.from({ length: MONTHS }, (_, m) => hoursAbove(matrix, m, limit));
}

/** "10:00–14:00, 16:00–17:00", or "none". */
export function formatRuns(runs: readonly HourRun[]): string {
  return runs.length === 0 ? 'none' : runs.map((r) => `${clockHour(r.start)}–${clockHour(r.end)}`).join(', ');
}

/** Number of hours in the runs [h]. */
export function runHours(runs: readonly HourRun[]): number {
  return runs.reduce((s, r) => s + r.end - r.start, 0);
}
