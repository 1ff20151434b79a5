/**
 * The answers a bid needs for one job at one place, from its replays (replay.ts) on every
 * replayable weather year (weather-years.ts):
 * - the job's schedule: finish date, working and calendar days, days added against the heat-free
 *   schedule, crew-hours lost, as the mean, the median and the 90th-percentile year (type 7,
 *   statistics.ts), with every year listed;
 * - the cost of heat per year: lost crew-hours × labour rate + added calendar days × daily cost
 *   (our definition: the labour paid for rest breaks plus the site's time-related cost of the
 *   longer programme), its mean, median and P90;
 * - the same job started in each month of the start year (on the same day of the month, clamped
 *   to the month's length);
 * - the same job under other shift patterns, side by side;
 * - the smallest crew whose 90th-percentile finish meets a deadline.
 *
 * A statistic of dates is taken on the calendar days from the start and rounded up to a whole
 * day (a job 100.3 days long is done on day 101).
 */
import { civilFromDays, formatDay, sameDayInMonth } from './calendar.ts';
import { HeathoursError } from '../model/errors.ts';
import { ScheduleDeadlineUnreachable, ScheduleNotFinished, ScheduleTooManyPatterns } from './errors.ts';
import { MAX_CREW, type Costs, type Job } from './job.ts';
import { replay, type ReplayOutcome } from './replay.ts';
import { formatPattern, hoursPerDay, type ShiftPattern } from './shift-pattern.ts';
import { spread, type Spread } from './statistics.ts';
import type { WeatherYear } from './weather-years.ts';

/** Shift patterns compared side by side, the job's own included [count]. */
export const MAX_PATTERNS = 4;

/** What to work out. */
export interface BidQuestion {
  job: Job;
  costs: Costs;
  /** Other shift patterns to compare with the job's (at most MAX_PATTERNS − 1). */
  otherPatterns?: readonly ShiftPattern[];
  /** Last day by which the work must be done at P90 [day number], or null. */
  deadline?: number | null;
}

/** One weather year's replay of the job. */
export interface YearOutcome extends ReplayOutcome {
  /** The weather year of the job's first calendar year. */
  weatherYear: number;
  addedWorkingDays: number;
  addedCalendarDays: number;
  /** Cost of heat [currency]. */
  cost: number;
}

/** A schedule across the weather years. */
export interface ScheduleSpread {
  start: number;
  pattern: ShiftPattern;
  heatFree: ReplayOutcome;
  years: YearOutcome[];
  workingDays: Spread;
  calendarDays: Spread;
  addedWorkingDays: Spread;
  addedCalendarDays: Spread;
  crewHoursLost: Spread;
  crewHoursAbove: Spread;
  cost: Spread;
}

export interface CrewForDeadline {
  deadline: number;
  /** Smallest crew whose P90 finish is on or before the deadline [workers]. */
  crew: number;
  /** That crew's schedule. */
  schedule: ScheduleSpread;
}

/** Everything a bid needs. */
export interface BidAnswer {
  question: BidQuestion;
  weatherYears: number[];
  schedule: ScheduleSpread;
  /** January … December of the start year. */
  startMonths: ScheduleSpread[];
  /** The job's pattern first, then the others. */
  patterns: ScheduleSpread[];
  crewForDeadline: CrewForDeadline | null;
}

/** The day of a statistic of calendar days: start + ⌈days⌉ − 1. */
export function dayOfSpan(start: number, calendarDays: number): number {
  return start + Math.ceil(calendarDays - 1e-9) - 1;
}

/** The job replayed on every weather year (each as the first year of the job). */
export function scheduleSpread(job: Job, costs: Costs, weather: readonly WeatherYear[]): ScheduleSpread {
  const heatFree = replay(job, null);
  const years = weather.map((w, i): YearOutcome => {
    const r = replay(job, weather, i);
    const addedWorkingDays = r.workingDays - heatFree.workingDays;
    const addedCalendarDays = r.calendarDays - heatFree.calendarDays;
    return { ...r, weatherYear: w.year, addedWorkingDays, addedCalendarDays, cost: r.crewHoursLost * costs.rate + addedCalendarDays * costs.dailyCost };
  });
  const of = (f: (y: YearOutcome) => number) => spread(years.map(f));
  return {
    start: job.start,
    pattern: job.pattern,
    heatFree,
    years,
    workingDays: of((y) => y.workingDays),
    calendarDays: of((y) => y.calendarDays),
    addedWorkingDays: of((y) => y.addedWorkingDays),
    addedCalendarDays: of((y) => y.addedCalendarDays),
    crewHoursLost: of((y) => y.crewHoursLost),
    crewHoursAbove: of((y) => y.crewHoursAbove),
    cost: of((y) => y.cost),
  };
}

/**
 * The smallest crew whose P90 finish is on or before `deadline` (bisection: a larger crew never
 * finishes later). Catalogued errors: ScheduleDeadlineUnreachable (before the start, or not met
 * even by MAX_CREW workers), ScheduleNotFinished.
 */
export function crewForDeadline(job: Job, costs: Costs, weather: readonly WeatherYear[], deadline: number): CrewForDeadline {
  const label = formatDay(deadline);
  if (deadline < job.start)
    throw ScheduleDeadlineUnreachable({ deadline: label, problem: `it is before the start ${formatDay(job.start)}` }, { key: 'deadline' });
  const meets = (crew: number): { ok: boolean; s: ScheduleSpread | null } => {
    let s: ScheduleSpread;
    try {
      s = scheduleSpread({ ...job, crew }, costs, weather);
    } catch (e) {
      // A crew too small to finish within the replay horizon misses the deadline too.
      if (e instanceof HeathoursError && e.code === ScheduleNotFinished.code) return { ok: false, s: null };
      throw e;
    }
    return { ok: dayOfSpan(job.start, s.calendarDays.p90) <= deadline, s };
  };
  const most = meets(MAX_CREW);
  if (!most.ok || most.s === null) {
    throw ScheduleDeadlineUnreachable(
      {
        deadline: label,
        problem: `even ${MAX_CREW.toLocaleString('en-US')} workers finish at P90 on ${most.s ? formatDay(dayOfSpan(job.start, most.s.calendarDays.p90)) : 'no day within the replay horizon'} (the first working day on or after the start is the earliest possible finish)`,
      },
      { key: 'deadline' },
    );
  }
  let lo = 0; // fails (or 0 workers)
  let hi = MAX_CREW;
  let best = most.s;
  while (hi - lo > 1) {
    const mid = Math.floor((lo + hi) / 2);
    const m = meets(mid);
    if (m.ok && m.s) {
      hi = mid;
      best = m.s;
    } else lo = mid;
  }
  return { deadline, crew: hi, schedule: best };
}

/**
 * Works out the bid. Catalogued errors: ScheduleTooManyPatterns, ScheduleNotFinished,
 * ScheduleDeadlineUnreachable.
 */
export function answerBid(q: BidQuestion, weather: readonly WeatherYear[]): BidAnswer {
  const others = q.otherPatterns ?? [];
  if (others.length + 1 > MAX_PATTERNS) throw ScheduleTooManyPatterns({ count: others.length + 1, max: MAX_PATTERNS }, { key: 'compare-shift' });
  const schedule = scheduleSpread(q.job, q.costs, weather);
  const c = civilFromDays(q.job.start);
  const startMonths = Array.from({ length: 12 }, (_, m) =>
    m + 1 === c.month ? schedule : scheduleSpread({ ...q.job, start: sameDayInMonth(c.year, m + 1, c.day) }, q.costs, weather),
  );
  const patterns = [schedule, ...others.map((p) => scheduleSpread({ ...q.job, pattern: p }, q.costs, weather))];
  const deadline = q.deadline ?? null;
  return {
    question: q,
    weatherYears: weather.map((w) => w.year),
    schedule,
    startMonths,
    patterns,
    crewForDeadline: deadline === null ? null : crewForDeadline(q.job, q.costs, weather, deadline),
  };
}

/** The pattern in words with its hours: `07:00-17:00, Mon–Sat (10 h a day)`. */
export function describePattern(p: ShiftPattern): string {
  const h = hoursPerDay(p);
  return `${formatPattern(p)} (${Number.isInteger(h) ? h : h.toFixed(2)} h a day)`;
}
