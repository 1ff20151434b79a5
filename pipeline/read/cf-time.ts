/**
 * The CF time coder: `"<unit> since <reference date>"` (CF conventions §4.4 "Time Coordinate";
 * UDUNITS-2 time syntax) turned into milliseconds since 1970-01-01 UTC and back.
 *
 * Accepted: seconds / minutes / hours / days (singular, plural, abbreviated, any case); the
 * reference date as `YYYY-MM-DD`, with an optional time `hh:mm[:ss[.fff]]` after a space or
 * `T`, and an optional zone `Z`, `UTC` or `±h[h][:mm]` (e.g. "+0:00"). Months and years are
 * refused: CF §4.4 warns they are not calendar months (UDUNITS month = 30.436875 days).
 *
 * Calendars: proleptic_gregorian; standard and gregorian are treated as proleptic Gregorian,
 * which is exact for dates from 1582-10-15 on (the mixed Julian/Gregorian calendar of CF §4.4.1
 * agrees with it there), so an axis reaching before that date is refused. noleap, 365_day,
 * all_leap, 366_day, 360_day, julian and none are refused with a catalogued error.
 */
import { NetcdfCalendarUnsupported, NetcdfTimeUnits, NetcdfTimeValueInvalid } from './errors.ts';

/** A decoded time coding: `ms = referenceMs + value * unitMs`. */
export interface TimeCoding {
  /** Length of one unit [ms]. */
  unitMs: number;
  /** The reference date [ms since 1970-01-01 UTC]. */
  referenceMs: number;
  /** The calendar as written (lower case), `standard` when absent. */
  calendar: string;
  /** The unit word as written (e.g. `hours`). */
  unit: string;
}

const UNIT_MS: Record<string, number> = {
  second: 1000,
  seconds: 1000,
  sec: 1000,
  secs: 1000,
  s: 1000,
  minute: 60_000,
  minutes: 60_000,
  min: 60_000,
  mins: 60_000,
  hour: 3_600_000,
  hours: 3_600_000,
  hr: 3_600_000,
  hrs: 3_600_000,
  h: 3_600_000,
  day: 86_400_000,
  days: 86_400_000,
  d: 86_400_000,
};

/** First instant of the Gregorian calendar [ms since 1970-01-01 UTC]: 1582-10-15T00:00Z. */
export const GREGORIAN_START_MS = utcMs(1582, 10, 15, 0, 0, 0);

const DATE_RE = /^(-?\d{1,4})-(\d{1,2})-(\d{1,2})(?:(?:T|\s+)(\d{1,2}):(\d{1,2})(?::(\d{1,2}(?:\.\d*)?))?)?\s*(Z|UTC|GMT|[+-]\d{1,2}(?::?\d{2})?)?$/i;

/** Milliseconds since 1970 of a proleptic Gregorian date (works for years 0-99 too). */
export function utcMs(y: number, mo: number, d: number, h: number, mi: number, s: number): number {
  const dt = new Date(0);
  dt.setUTCFullYear(y, mo - 1, d);
  dt.setUTCHours(h, mi, 0, 0);
  return dt.getTime() + Math.round(s * 1000);
}

function daysInMonth(y: number, mo: number): number {
  return new Date(utcMs(y, mo + 1, 1, 0, 0, 0) - 86_400_000).getUTCDate();
}

/** Parses CF time `units` and `calendar` attributes into a coding. */
export function parseTimeUnits(units: string, calendar?: string): TimeCoding {
  const m = /^\s*([A-Za-z]+)\s+since\s+(.+?)\s*$/i.exec(units);
  if (!m) throw NetcdfTimeUnits({ units, detail: 'not of the form "<unit> since <date>"' });
  const unit = m[1];
  const unitMs = UNIT_MS[unit.toLowerCase()];
  if (unitMs === undefined) {
    const detail = /^(month|months|year|years|yr|yrs|common_year)$/i.test(unit)
      ? `"${unit}" has no fixed length in calendar terms (CF conventions §4.4)`
      : `unknown time unit "${unit}"`;
    throw NetcdfTimeUnits({ units, detail });
  }
  const d = DATE_RE.exec(m[2]);
  if (!d) throw NetcdfTimeUnits({ units, detail: `cannot read the reference date "${m[2]}"` });
  const [y, mo, day] = [Number(d[1]), Number(d[2]), Number(d[3])];
  const [h, mi, s] = [Number(d[4] ?? 0), Number(d[5] ?? 0), Number(d[6] ?? 0)];
  if (mo < 1 || mo > 12 || day < 1 || day > daysInMonth(y, mo) || h > 24 || mi > 59 || s >= 61) {
    throw NetcdfTimeUnits({ units, detail: `the reference date "${m[2]}" is not a valid date` });
  }
  let zoneMs = 0;
  const z = d[7];
  if (z && /^[+-]/.test(z)) {
    const zm = /^([+-])(\d{1,2})(?::?(\d{2}))?$/.exec(z)!;
    zoneMs = (zm[1] === '-' ? -1 : 1) * (Number(zm[2]) * 60 + Number(zm[3] ?? 0)) * 60_000;
  }
  const referenceMs = utcMs(y, mo, day, h, mi, s) - zoneMs;
  const cal = (calendar ?? 'standard').trim().toLowerCase() || 'standard';
  checkCalendar(cal, referenceMs, units);
  return { unitMs, referenceMs, calendar: cal, unit };
}

function checkCalendar(cal: string, referenceMs: number, units: string): void {
  if (cal === 'proleptic_gregorian') return;
  if (cal === 'standard' || cal === 'gregorian') {
    if (referenceMs < GREGORIAN_START_MS) {
      throw NetcdfCalendarUnsupported({
        calendar: cal,
        detail: `the reference date of "${units}" lies before 1582-10-15, where the ${cal} calendar is Julian; only dates from 1582-10-15 on are read (as proleptic Gregorian)`,
      });
    }
    return;
  }
  const known = ['noleap', '365_day', 'all_leap', '366_day', '360_day', 'julian', 'none'];
  throw NetcdfCalendarUnsupported({
    calendar: cal,
    detail: known.includes(cal) ? 'a model calendar whose days do not map onto real dates' : 'not a CF calendar name',
  });
}

/** Decodes time values [units of the coding] into ms since 1970-01-01 UTC (rounded to 1 ms). */
export function decodeTimes(values: ArrayLike<number>, c: TimeCoding): Float64Array {
  const out = new Float64Array(values.length);
  for (let i = 0; i < values.length; i++) {
    out[i] = c.referenceMs + Math.round(values[i] * c.unitMs);
    // ECMAScript dates reach ±8.64e15 ms (±273,790 years) around 1970: beyond is no date at all.
    if (!(Math.abs(out[i]) <= MAX_DATE_MS))
      throw NetcdfTimeValueInvalid({ index: i, value: String(values[i]), detail: 'not a date any calendar holds (a missing or damaged time value?)' });
  }
  if ((c.calendar === 'standard' || c.calendar === 'gregorian') && out.some((t) => t < GREGORIAN_START_MS)) {
    throw NetcdfCalendarUnsupported({ calendar: c.calendar, detail: 'some times lie before 1582-10-15, where this calendar is Julian' });
  }
  return out;
}

/** Encodes ms since 1970-01-01 UTC as time values [units of the coding]. */
export function encodeTimes(ms: ArrayLike<number>, c: TimeCoding): Float64Array {
  const out = new Float64Array(ms.length);
  for (let i = 0; i < ms.length; i++) out[i] = (ms[i] - c.referenceMs) / c.unitMs;
  return out;
}

/** Largest distance from 1970 of an ECMAScript date [ms] (ECMA-262 §21.4.1.1 "Time Values and Time Range"). */
const MAX_DATE_MS = 8.64e15;

/** ISO 8601 text of an instant, to the second, with Z (e.g. `2020-01-01T01:00:00Z`); outside the date range, the number. */
export function isoSeconds(ms: number): string {
  if (!(Math.abs(ms) <= MAX_DATE_MS)) return `(${ms} ms from 1970, no date)`;
  const s = new Date(ms).toISOString();
  return s.replace(/\.\d{3}Z$/, 'Z');
}
