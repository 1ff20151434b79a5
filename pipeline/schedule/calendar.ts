/**
 * Civil dates as whole day numbers (days since 1970-01-01, proleptic Gregorian calendar), for
 * the job's own calendar: start, holidays, deadline, weekdays. Pure integer arithmetic, no time
 * zone: a job's dates are local calendar days of the place.
 *
 * Algorithms "days_from_civil" and "civil_from_days" of H. Hinnant, "chrono-Compatible Low-Level
 * Date Algorithms" (public domain), the same as pipeline/work/shifts.ts uses.
 */
import { ScheduleDateInvalid } from './errors.ts';

/** A calendar date: year, month 1–12, day 1–31. */
export interface CivilDate {
  year: number;
  month: number;
  day: number;
}

/** Earliest and latest year accepted for a job date [year]. */
export const MIN_YEAR = 1900;
export const MAX_YEAR = 2200;

/** Day number of a civil date [days since 1970-01-01]. */
export function daysFromCivil(year: number, month: number, day: number): number {
  const y = month <= 2 ? year - 1 : year;
  const era = Math.floor(y / 400);
  const yoe = y - era * 400;
  const mp = month > 2 ? month - 3 : month + 9;
  const doy = Math.floor((153 * mp + 2) / 5) + day - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  return era * 146097 + doe - 719468;
}

/** Civil date of a day number. */
export function civilFromDays(days: number): CivilDate {
  const z = days + 719468;
  const era = Math.floor(z / 146097);
  const doe = z - era * 146097;
  const yoe = Math.floor((doe - Math.floor(doe / 1460) + Math.floor(doe / 36524) - Math.floor(doe / 146096)) / 365);
  const doy = doe - (365 * yoe + Math.floor(yoe / 4) - Math.floor(yoe / 100));
  const mp = Math.floor((5 * doy + 2) / 153);
  const day = doy - Math.floor((153 * mp + 2) / 5) + 1;
  const month = mp < 10 ? mp + 3 : mp - 9;
  return { year: yoe + era * 400 + (month <= 2 ? 1 : 0), month, day };
}

/** ISO weekday of a day number: 1 = Monday … 7 = Sunday (1970-01-01 was a Thursday). */
export function isoWeekday(days: number): number {
  return ((((days + 3) % 7) + 7) % 7) + 1;
}

/** Days in a month [days]. */
export function daysInMonth(year: number, month: number): number {
  return daysFromCivil(month === 12 ? year + 1 : year, month === 12 ? 1 : month + 1, 1) - daysFromCivil(year, month, 1);
}

const pad = (n: number, w = 2) => String(n).padStart(w, '0');

/** `YYYY-MM-DD` of a day number. */
export function formatDay(days: number): string {
  const c = civilFromDays(days);
  return `${pad(c.year, 4)}-${pad(c.month)}-${pad(c.day)}`;
}

/**
 * Day number of a `YYYY-MM-DD` date. `name` is the option or field for the error.
 * Catalogued error: ScheduleDateInvalid (not the pattern, not a real day, year outside 1900–2200).
 */
export function parseDay(text: string, name: string): number {
  const t = text.trim();
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(t);
  if (!m) throw ScheduleDateInvalid({ name, value: text, problem: 'not a date written YYYY-MM-DD' }, { key: name });
  const [year, month, day] = [Number(m[1]), Number(m[2]), Number(m[3])];
  if (year < MIN_YEAR || year > MAX_YEAR)
    throw ScheduleDateInvalid({ name, value: text, problem: `the year is outside ${MIN_YEAR}–${MAX_YEAR}` }, { key: name });
  if (month < 1 || month > 12 || day < 1 || day > daysInMonth(year, month)) {
    throw ScheduleDateInvalid({ name, value: text, problem: 'no such day in the calendar' }, { key: name });
  }
  return daysFromCivil(year, month, day);
}

/** The same day of the month in another month, clamped to the month's last day (31 March → 30 April). */
export function sameDayInMonth(year: number, month: number, day: number): number {
  return daysFromCivil(year, month, Math.min(day, daysInMonth(year, month)));
}
