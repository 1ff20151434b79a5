/**
 * Days of the week and the work shift as the configuration writes them (the types and the ISO
 * order of pipeline/work/shifts.ts, in a file of their own so code that only names days, such as
 * the estimate page's shift parser, does not carry the local-time machinery).
 */

/** Days of the week as written in the configuration. */
export type Weekday = 'mon' | 'tue' | 'wed' | 'thu' | 'fri' | 'sat' | 'sun';
/** In ISO order: index + 1 is the ISO weekday number. */
export const WEEKDAYS: readonly Weekday[] = ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'];

/** A work shift: local hours and days. */
export interface WorkShift {
  /** Local clock hour the shift starts [h, 0–23]. */
  start: number;
  /** Local clock hour the shift ends [h, 1–24]; below `start` for a night shift ending next day. */
  end: number;
  /** Days on which the shift starts. */
  days: Weekday[];
}
