/**
 * The schedule replay (docs/methods.md §13.2, our day-by-day form): from the job's first day, each
 * working day yields its shift hours minus the hours heat takes, for the whole crew, until the
 * quantity of work is done.
 *
 *   productive(d) = n · Σ_k w_k · (1 − r(y(d_k), m(d_k), h_k))        [crew-hours]
 *   lost(d)       = n · Σ_k w_k · r(y(d_k), m(d_k), h_k)              [crew-hours]
 *
 * over the local clock hours k of the day's shift pattern (shift-pattern.ts: share w_k of hour
 * h_k, on the day d_k the hour falls in: the shift's day or, for a night shift, the next), where
 * r is the weather year's expected share of a worked hour lost to rest breaks in that month and
 * local hour (weather-years.ts), n the crew. The job finishes on the first day d at which
 * Σ productive reaches the work W; that last day is worked only as long as needed, and its hours
 * lost count in the same share. A working day is a day of the pattern that is not a holiday.
 *
 * Weather: the job's first calendar year uses weather year `first`; each later calendar year the
 * next replayable year of the record, starting again with the first after the last. The
 * histograms say how hot a month and hour is in a year, not which day was hot, so every working
 * day of a month gets the month's expected loss: the approximation this replay makes against an
 * hour-by-hour one (measured in test/schedule/hourly-reference.test.ts, stated on the page).
 * A heat-free replay (`weather` null) is plain calendar arithmetic.
 */
import { civilFromDays, formatDay, isoWeekday } from './calendar.ts';
import { ScheduleNotFinished } from './errors.ts';
import type { Job } from './job.ts';
import { dayMask, hourWeights } from './shift-pattern.ts';
import type { WeatherYear } from './weather-years.ts';

/** Longest replay before a job counts as never finishing [years]. */
export const MAX_REPLAY_YEARS = 20;

/** What one replay gives. */
export interface ReplayOutcome {
  /** Day the work is done [day number]. */
  finishDay: number;
  /** Days on which work was done, the last (partly worked) day included [days]. */
  workingDays: number;
  /** Days from the first to the last, both included [days]. */
  calendarDays: number;
  /** Crew-hours lost to rest breaks [crew-hours]. */
  crewHoursLost: number;
  /** Crew-hours worked or rested in hours above the limit [crew-hours]. */
  crewHoursAbove: number;
}

/** One replayed working day, for checks: the day, the crew's paid, lost and productive hours, and the share of the day worked. */
export interface ReplayDay {
  day: number;
  paid: number;
  lost: number;
  productive: number;
  share: number;
}

/**
 * Replays `job` on `weather` from weather year index `first` (null = heat-free). `onDay` sees every
 * working day. Catalogued error: ScheduleNotFinished (not done after MAX_REPLAY_YEARS).
 */
export function replay(job: Job, weather: readonly WeatherYear[] | null, first = 0, onDay?: (d: ReplayDay) => void): ReplayOutcome {
  const weights = hourWeights(job.pattern);
  const mask = dayMask(job.pattern);
  const n = job.crew;
  const startYear = civilFromDays(job.start).year;
  const nW = weather?.length ?? 1;
  const limit = job.start + Math.round(MAX_REPLAY_YEARS * 365.25);
  let done = 0;
  let lostTotal = 0;
  let aboveTotal = 0;
  let workingDays = 0;
  for (let d = job.start; d < limit; d++) {
    if ((mask & (1 << isoWeekday(d))) === 0 || job.holidays.has(d)) continue;
    let paid = 0;
    let lost = 0;
    let above = 0;
    let cached = NaN;
    let civil = civilFromDays(d);
    for (const w of weights) {
      if (w.dayOffset !== 0 && cached !== d + w.dayOffset) {
        cached = d + w.dayOffset;
        civil = civilFromDays(cached);
      }
      paid += w.weight;
      if (weather) {
        const wy = weather[(((first + civil.year - startYear) % nW) + nW) % nW];
        const k = (civil.month - 1) * 24 + w.hour;
        lost += w.weight * wy.lostRate[k];
        above += w.weight * wy.aboveRate[k];
      }
    }
    const productive = n * (paid - lost);
    workingDays++;
    const share = productive > 0 && done + productive >= job.workHours ? (job.workHours - done) / productive : 1;
    onDay?.({ day: d, paid: n * paid * share, lost: n * lost * share, productive: productive * share, share });
    lostTotal += n * lost * share;
    aboveTotal += n * above * share;
    if (share < 1 || done + productive >= job.workHours) {
      return { finishDay: d, workingDays, calendarDays: d - job.start + 1, crewHoursLost: lostTotal, crewHoursAbove: aboveTotal };
    }
    done += productive;
  }
  throw ScheduleNotFinished({
    maxYears: MAX_REPLAY_YEARS,
    detail: `${Math.round(done)} of ${job.workHours} crew-hours done by ${formatDay(limit - 1)} with ${n} worker${n === 1 ? '' : 's'}${weather ? `, weather from ${weather[first].year}` : ''}`,
  });
}
