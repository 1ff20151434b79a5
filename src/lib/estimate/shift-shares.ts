/**
 * Which share of each month × local-hour slot of a year falls in the work shift pattern, on each
 * year's real calendar: local time in the atlas's IANA zone from the pipeline's own code
 * (pipeline/work/shifts.ts `localHours`, daylight saving via Intl), the pattern's spans and days
 * from pipeline/schedule/shift-pattern.ts (an hour covered in part counts with the covered share;
 * the hours of a night shift after midnight belong to the day it started).
 *
 * Why: the histogram tiles hold every hour of a slot (all days of the month), not the weekday of
 * each hour. The calculator therefore takes a slot's WBGT distribution as the same on work days
 * and on rest days, and scales the slot's estimate by
 *
 *   share(y, m, h) = (hours of slot m, h in year y that lie in the shift) / (hours of the slot),
 *
 * i.e. the fraction of that month's days that are work days (for a day shift), counted on the
 * real calendar of each year. The error this makes is the difference between the WBGT of the
 * work days and of all days of a month; it is measured against the region tables in
 * test/site/estimate-logic.test.ts and stated on the page.
 */
import { DEFAULT_SHIFT, localHours } from '../../../pipeline/work/shifts.ts';
import { dayMask, hourWeights, type ShiftPattern } from '../../../pipeline/schedule/shift-pattern.ts';

const HOUR_MS = 3_600_000;
/** Slots per year: 12 months × 24 local hours. */
export const MONTH_HOUR_SLOTS = 12 * 24;

/** Shares of one year: `share[m * 24 + h]` [0–1], m = 0 for January. */
export interface YearShiftShares {
  year: number;
  share: Float64Array;
  /** Hours of each slot on the calendar [h] and of those in the shift [h]. */
  slotHours: Uint16Array;
  shiftHours: Float64Array;
}

/**
 * The shares of the latest few (year, zone, pattern) asked for: a build computes the same ones for
 * every region's report (the comparison with this page, src/lib/report/estimate-difference.ts),
 * and each takes a year of local hours through Intl. Bounded: at most {@link SHARE_CACHE_SIZE}.
 */
const shareCache = new Map<string, YearShiftShares>();
const SHARE_CACHE_SIZE = 64;

/** Empties the cache of {@link shiftShares} (for tests). */
export function clearShiftShareCache(): void {
  shareCache.clear();
}

/**
 * Shift shares per slot for each local calendar year in `years`, in IANA zone `timeZone`. A year
 * asked for again with the same zone and pattern is the same object: callers only read it.
 * Catalogued errors from pipeline/work: WorkTimeZoneUnknown.
 */
export function shiftShares(years: readonly number[], timeZone: string, pattern: ShiftPattern): YearShiftShares[] {
  const key = `${timeZone}|${JSON.stringify(pattern)}|`;
  const missing = years.filter((y) => !shareCache.has(key + y));
  if (missing.length > 0) {
    for (const s of computeShiftShares(missing, timeZone, pattern)) {
      if (shareCache.size >= SHARE_CACHE_SIZE) shareCache.delete(shareCache.keys().next().value as string);
      shareCache.set(key + s.year, s);
    }
  }
  // A year pushed out by the others of this call (more than the cache holds) is computed again.
  return years.map((y) => shareCache.get(key + y) ?? computeShiftShares([y], timeZone, pattern)[0]);
}

function computeShiftShares(years: readonly number[], timeZone: string, pattern: ShiftPattern): YearShiftShares[] {
  const same = new Float64Array(24);
  const next = new Float64Array(24);
  for (const w of hourWeights(pattern)) (w.dayOffset === 0 ? same : next)[w.hour] += w.weight;
  const mask = dayMask(pattern);
  return years.map((year) => {
    // Every hour that could start in local year `year`: from two days before to two days after (any UTC offset).
    const t0 = Date.UTC(year, 0, 1) - 2 * 24 * HOUR_MS;
    const n = (Date.UTC(year + 1, 0, 1) - Date.UTC(year, 0, 1)) / HOUR_MS + 4 * 24;
    const ends = new Float64Array(n);
    for (let i = 0; i < n; i++) ends[i] = t0 + (i + 1) * HOUR_MS;
    const local = localHours(ends, timeZone, DEFAULT_SHIFT);
    const slotHours = new Uint16Array(MONTH_HOUR_SLOTS);
    const shiftHours = new Float64Array(MONTH_HOUR_SLOTS);
    for (let i = 0; i < n; i++) {
      if (local.year[i] !== year) continue;
      const h = local.hour[i];
      const s = (local.month[i] - 1) * 24 + h;
      slotHours[s]++;
      const wd = local.weekday[i];
      const prev = wd === 1 ? 7 : wd - 1;
      shiftHours[s] += ((mask >> wd) & 1) * same[h] + ((mask >> prev) & 1) * next[h];
    }
    const share = Float64Array.from(slotHours, (h, s) => (h > 0 ? shiftHours[s] / h : 0));
    return { year, share, slotHours, shiftHours };
  });
}
