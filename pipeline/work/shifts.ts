/**
 * Work shifts in local time. For each hour of data (stamped at its END, in UTC, as ERA5 stamps
 * accumulations) this gives the local calendar fields of the hour's START and whether the hour is
 * in the shift, in the IANA time zone of the atlas, with daylight saving from the runtime's
 * time-zone database (time-zone.ts, Intl only).
 *
 * Rules (documented in README.md):
 * - A shift is whole local hours `start`–`end` (0–24) on the listed days. `end < start` is a night
 *   shift: it starts on a listed day and ends the next morning. `start = end` is an error.
 * - An hour counts as in the shift when its whole span, in local clock time, lies inside one shift:
 *   local start ≥ shift start and local end ≤ shift end. In zones whose offset is not a whole
 *   number of hours (e.g. UTC+5:30) hours start at :30 local, so a 07–17 shift holds 9 whole hours.
 * - Across a daylight-saving change the local end is read with the offset in force just before
 *   the hour ends, so the hour skipped in spring never appears and the repeated hour in autumn
 *   counts twice (both are real worked hours).
 * - Weekday is ISO 8601: 1 = Monday … 7 = Sunday, of the local day the hour starts in.
 * - Default shift: 07:00–17:00, Monday to Saturday (our choice: a daytime shift with six working
 *   days, a common pattern on building sites in hot countries — common practice).
 */
import { WorkParameterInvalid } from './errors.ts';
import { WorkShiftInvalid, WorkWeekdayUnknown } from './shift-errors.ts';
import type { ErrorWhere } from '../model/errors.ts';
import { zoneOffsets } from './time-zone.ts';

import { WEEKDAYS, type Weekday, type WorkShift } from './weekdays.ts';

export { WEEKDAYS, type Weekday, type WorkShift };

/** The default shift: 07:00–17:00 local, Monday to Saturday (common practice; see file comment). */
export const DEFAULT_SHIFT: WorkShift = { start: 7, end: 17, days: ['mon', 'tue', 'wed', 'thu', 'fri', 'sat'] };

/** Weeks in a year of work, for a year's hours of a shift pattern [weeks] (common practice, no source). */
export const WEEKS_PER_YEAR = 52;

/**
 * Hours of one shift [h]: end − start, or past midnight for a night shift (end below start).
 * @param shift a validated shift
 */
export function shiftLengthHours(shift: WorkShift): number {
  return shift.end > shift.start ? shift.end - shift.start : shift.end + 24 - shift.start;
}

/**
 * Hours of a year of the shift pattern [h]: hours per shift × shift days per week ×
 * {@link WEEKS_PER_YEAR} (07–17, Monday–Saturday: 10 × 6 × 52 = 3120 h). The yardstick of a
 * full-time equivalent (pipeline/regions/person-hours.ts).
 */
export function annualShiftHours(shift: WorkShift): number {
  return shiftLengthHours(shift) * shift.days.length * WEEKS_PER_YEAR;
}

/**
 * Validates a shift (as parsed from YAML) and returns it. Catalogued errors: WorkShiftInvalid
 * (hours not whole, outside 0–24, start = end, start 24, no days), WorkWeekdayUnknown.
 */
export function validateShift(raw: { start: number; end: number; days: readonly string[] }, where: ErrorWhere = {}): WorkShift {
  const { start, end } = raw;
  for (const [name, v] of [
    ['start', start],
    ['end', end],
  ] as const) {
    if (!Number.isInteger(v) || v < 0 || v > 24) {
      throw WorkShiftInvalid({ problem: `shift ${name} ${v} is not a whole hour from 0 to 24` }, where);
    }
  }
  if (start === 24) throw WorkShiftInvalid({ problem: 'shift start 24 is the end of the day; use 0 for midnight' }, where);
  if (start === end) throw WorkShiftInvalid({ problem: `shift start and end are both ${start}: the shift would be empty or 24 h long` }, where);
  if (raw.days.length === 0) throw WorkShiftInvalid({ problem: 'the shift has no work days' }, where);
  const days: Weekday[] = [];
  for (const d of raw.days) {
    const day = String(d).toLowerCase() as Weekday;
    if (!WEEKDAYS.includes(day)) throw WorkWeekdayUnknown({ day: String(d) }, where);
    if (!days.includes(day)) days.push(day);
  }
  return { start, end, days };
}

/** Local calendar fields per hour (of the hour's start) and shift membership. */
export interface LocalHours {
  /** Local year. */
  year: Uint16Array;
  /** Local month [1–12]. */
  month: Uint8Array;
  /** Local day of month [1–31]. */
  day: Uint8Array;
  /** Local clock hour of the hour's start [0–23]. */
  hour: Uint8Array;
  /** ISO weekday of the local day the hour starts in [1 = Monday … 7 = Sunday]. */
  weekday: Uint8Array;
  /** 1 when the whole hour is inside the shift, else 0. */
  inShift: Uint8Array;
}

/** Allocates the output arrays for `n` hours. */
export function allocLocalHours(n: number): LocalHours {
  return {
    year: new Uint16Array(n),
    month: new Uint8Array(n),
    day: new Uint8Array(n),
    hour: new Uint8Array(n),
    weekday: new Uint8Array(n),
    inShift: new Uint8Array(n),
  };
}

/**
 * Local fields and shift membership for hours ending at `endTimesUtc` [ms since 1970 UTC] in IANA
 * zone `timeZone`. Catalogued WorkTimeZoneUnknown for an unknown zone. Times need not be sorted
 * (sorted times are fastest). The shift must come from {@link validateShift} or be built the same way.
 */
export function localHours(endTimesUtc: ArrayLike<number>, timeZone: string, shift: WorkShift = DEFAULT_SHIFT): LocalHours {
  return localHoursInto(allocLocalHours(endTimesUtc.length), endTimesUtc, timeZone, shift);
}

const HOUR_MS = 3_600_000;
const DAY_MS = 86_400_000;

/** As {@link localHours}, writing into `out` (arrays of at least endTimesUtc.length). */
export function localHoursInto(out: LocalHours, endTimesUtc: ArrayLike<number>, timeZone: string, shift: WorkShift = DEFAULT_SHIFT): LocalHours {
  const zone = zoneOffsets(timeZone);
  const n = endTimesUtc.length;
  for (const [name, a] of Object.entries(out) as [string, ArrayLike<number>][]) {
    if (a.length < n) throw WorkParameterInvalid({ name: `out.${name} length`, value: String(a.length), expected: `at least ${n} (one per hour)` });
  }
  const dayMask = shiftDayMask(shift);
  const night = shift.end < shift.start;
  const startMs = shift.start * HOUR_MS;
  const endMs = shift.end * HOUR_MS;
  let segFrom = Infinity;
  let segTo = -Infinity;
  let offset = 0;
  for (let i = 0; i < n; i++) {
    const te = endTimesUtc[i];
    const ts = te - HOUR_MS;
    if (!(ts >= segFrom && ts < segTo)) {
      const s = zone.segment(ts);
      segFrom = s.from;
      segTo = s.to;
      offset = s.offset;
    }
    const ls = ts + offset;
    // Offset in force just before the hour ends (a change strictly inside the hour moves the end).
    const offEnd = te - 1 < segTo ? offset : zone.segment(te - 1).offset;
    const le = te + offEnd;
    const dayIndex = Math.floor(ls / DAY_MS);
    const dayStart = dayIndex * DAY_MS;
    civilFromDays(dayIndex, out, i);
    out.hour[i] = Math.floor((ls - dayStart) / HOUR_MS);
    const wd = isoWeekday(dayIndex);
    out.weekday[i] = wd;
    let inShift = false;
    if (!night) {
      inShift = (dayMask & (1 << wd)) !== 0 && ls >= dayStart + startMs && le <= dayStart + endMs;
    } else if (ls >= dayStart + startMs) {
      inShift = (dayMask & (1 << wd)) !== 0 && le <= dayStart + DAY_MS + endMs;
    } else if (ls < dayStart + endMs) {
      const prev = wd === 1 ? 7 : wd - 1;
      inShift = (dayMask & (1 << prev)) !== 0 && le <= dayStart + endMs;
    }
    out.inShift[i] = inShift ? 1 : 0;
  }
  return out;
}

function shiftDayMask(shift: WorkShift): number {
  let m = 0;
  for (const d of shift.days) {
    const k = WEEKDAYS.indexOf(d);
    if (k < 0) throw WorkWeekdayUnknown({ day: String(d) });
    m |= 1 << (k + 1);
  }
  return m;
}

/** ISO weekday of a day count since 1970-01-01 (a Thursday): 1 = Monday … 7 = Sunday. */
function isoWeekday(days: number): number {
  return ((((days + 3) % 7) + 7) % 7) + 1;
}

/**
 * Civil date from a day count since 1970-01-01 (proleptic Gregorian), written into out[i].
 * Algorithm "civil_from_days" of H. Hinnant, "chrono-Compatible Low-Level Date Algorithms".
 */
function civilFromDays(z0: number, out: LocalHours, i: number): void {
  const z = z0 + 719468;
  const era = Math.floor(z / 146097);
  const doe = z - era * 146097;
  const yoe = Math.floor((doe - Math.floor(doe / 1460) + Math.floor(doe / 36524) - Math.floor(doe / 146096)) / 365);
  const doy = doe - (365 * yoe + Math.floor(yoe / 4) - Math.floor(yoe / 100));
  const mp = Math.floor((5 * doy + 2) / 153);
  const d = doy - Math.floor((153 * mp + 2) / 5) + 1;
  const m = mp < 10 ? mp + 3 : mp - 9;
  out.year[i] = yoe + era * 400 + (m <= 2 ? 1 : 0);
  out.month[i] = m;
  out.day[i] = d;
}
