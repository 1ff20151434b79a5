/**
 * The calendar month of CF time values, for files whose time axis is a climatological year of
 * months (a scenario's change file, pipeline/read/change-file.ts). Such files come from climate
 * models as often as from observations, so besides the real-world calendars (standard, gregorian,
 * proleptic_gregorian: cf-time.ts) the model calendars of CF conventions §4.4.1 are read here:
 * `noleap` / `365_day` (February always 28 days), `all_leap` / `366_day` (always 29) and `360_day`
 * (twelve months of 30 days). Only the month is wanted, so a day count is enough for them.
 * `julian` and `none` are refused (catalogued NetcdfCalendarUnsupported).
 */
import { decodeTimes, parseTimeUnits } from './cf-time.ts';
import { NetcdfCalendarUnsupported, NetcdfTimeUnits } from './errors.ts';

const NOLEAP = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];
const ALL_LEAP = [31, 29, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];
const DAY_360 = new Array<number>(12).fill(30);

/** Month lengths of the model calendars [days]. */
const MODEL_CALENDARS: Record<string, number[]> = {
  noleap: NOLEAP,
  '365_day': NOLEAP,
  all_leap: ALL_LEAP,
  '366_day': ALL_LEAP,
  '360_day': DAY_360,
};

/** Length of one unit of a time axis [days]. */
const UNIT_DAYS: Record<string, number> = {
  second: 1 / 86400,
  seconds: 1 / 86400,
  sec: 1 / 86400,
  secs: 1 / 86400,
  s: 1 / 86400,
  minute: 1 / 1440,
  minutes: 1 / 1440,
  min: 1 / 1440,
  mins: 1 / 1440,
  hour: 1 / 24,
  hours: 1 / 24,
  hr: 1 / 24,
  hrs: 1 / 24,
  h: 1 / 24,
  day: 1,
  days: 1,
  d: 1,
};

const UNITS_RE = /^\s*([A-Za-z]+)\s+since\s+(-?\d{1,4})-(\d{1,2})-(\d{1,2})(?:(?:T|\s+)(\d{1,2}):(\d{1,2})(?::(\d{1,2}(?:\.\d*)?))?)?\s*(?:Z|UTC)?\s*$/i;

/**
 * The month (1–12) of each time value.
 * @param values time coordinate values [units of `units`]
 * @param units CF time units, `<unit> since <date>`
 * @param calendar CF calendar attribute (default `standard`)
 */
export function monthsOfTimes(values: ArrayLike<number>, units: string, calendar?: string): number[] {
  const cal = (calendar ?? 'standard').trim().toLowerCase() || 'standard';
  const lengths = MODEL_CALENDARS[cal];
  if (lengths === undefined) {
    if (cal === 'julian' || cal === 'none') {
      throw NetcdfCalendarUnsupported({ calendar: cal, detail: 'the months of this calendar cannot be read' });
    }
    const coding = parseTimeUnits(units, cal);
    return Array.from(decodeTimes(Float64Array.from(values), coding), (ms) => new Date(ms).getUTCMonth() + 1);
  }
  const m = UNITS_RE.exec(units);
  if (!m) throw NetcdfTimeUnits({ units, detail: 'not of the form "<unit> since <date>"' });
  const unitDays = UNIT_DAYS[m[1].toLowerCase()];
  if (unitDays === undefined) throw NetcdfTimeUnits({ units, detail: `"${m[1]}" is not a unit of fixed length (CF conventions §4.4)` });
  const [month, day] = [Number(m[3]), Number(m[4])];
  if (month < 1 || month > 12 || day < 1 || day > lengths[month - 1])
    throw NetcdfTimeUnits({ units, detail: `the reference date is not a date of the ${cal} calendar` });
  const yearDays = lengths.reduce((s, x) => s + x, 0);
  // Day of the year of the reference instant (0 = 1 January 00:00), fractional.
  let ref = day - 1 + (Number(m[5] ?? 0) * 60 + Number(m[6] ?? 0) + Number(m[7] ?? 0) / 60) / 1440;
  for (let k = 0; k < month - 1; k++) ref += lengths[k];
  return Array.from(values, (v) => {
    const d = ref + v * unitDays;
    let doy = d - Math.floor(d / yearDays) * yearDays;
    let k = 0;
    while (k < 11 && doy >= lengths[k]) doy -= lengths[k++];
    return k + 1;
  });
}
