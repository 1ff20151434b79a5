/**
 * The schedule replay and the bid's answers, worked by hand (pipeline/schedule): a heat-free job is
 * plain calendar arithmetic; a job with known monthly losses matches a hand computation; costs,
 * start months, shift patterns and the crew for a deadline follow; crew-hours lost are the sum of
 * the replayed days; bad inputs give catalogued errors and never NaN.
 *
 * Outside checks: weekdays from the Gregorian calendar (Python's datetime: 2027-03-01 is a Monday,
 * 2027-03-23 a Tuesday, 2027-03-29 a Monday); the allowable work fraction's closed form of
 * docs/methods.md §8.6 (NIOSH 2016 REL, moderate work 300 W, rest 115 W: f = 0.48423 at 30.125 °C);
 * the type-7 quantile of docs/methods.md §10.1 (numpy.percentile's default).
 */
import { describe, expect, it } from 'vitest';
import { answerBid, crewForDeadline, scheduleSpread } from '../../pipeline/schedule/bid.ts';
import { daysFromCivil, formatDay, isoWeekday, parseDay } from '../../pipeline/schedule/calendar.ts';
import { parseHolidays, type Costs, type Job } from '../../pipeline/schedule/job.ts';
import { replay, type ReplayDay } from '../../pipeline/schedule/replay.ts';
import { formatPattern, hourWeights, parseDays, parsePattern, parseShiftSpan } from '../../pipeline/schedule/shift-pattern.ts';
import { YEAR_HISTOGRAM_SIZE, YEAR_SLOTS } from '../../pipeline/schedule/slot-figures.ts';
import { weatherYears, type WeatherYear } from '../../pipeline/schedule/weather-years.ts';
import { prepareWorkKernel } from '../../pipeline/work/work-fraction.ts';
import { WBGT_HISTOGRAM_LENGTH, wbgtBinIndex } from '../../pipeline/work/wbgt-bins.ts';
import { expectCatalogued } from '../helpers/catalogued.ts';

const day = (s: string) => parseDay(s, 'test');
const dayShift = parsePattern(['07:00-17:00'], 'mon-sat');

/** A weather year with `lostRate` per month (index 0 = January) at every hour of the day. */
function weather(year: number, lostByMonth: number[], aboveByMonth = lostByMonth.map((l) => (l > 0 ? 1 : 0))): WeatherYear {
  const lostRate = new Float64Array(YEAR_SLOTS);
  const aboveRate = new Float64Array(YEAR_SLOTS);
  for (let k = 0; k < YEAR_SLOTS; k++) {
    lostRate[k] = lostByMonth[Math.floor(k / 24)];
    aboveRate[k] = aboveByMonth[Math.floor(k / 24)];
  }
  return { year, lostRate, aboveRate };
}

const marchOnly = (rate: number) => Array.from({ length: 12 }, (_, m) => (m === 2 ? rate : 0));

describe('calendar and shift patterns', () => {
  it('day numbers and weekdays follow the Gregorian calendar: 2027-03-01 is a Monday, 2024-02-29 exists, 2027-02-29 does not', () => {
    expect(isoWeekday(day('2027-03-01'))).toBe(1);
    expect(isoWeekday(day('1970-01-01'))).toBe(4);
    expect(formatDay(day('2024-02-29'))).toBe('2024-02-29');
    expect(day('2028-01-01') - day('2027-01-01')).toBe(365);
    expect(daysFromCivil(2000, 3, 1) - daysFromCivil(2000, 2, 28)).toBe(2);
    expectCatalogued(() => parseDay('2027-02-29', 'start'), 'ScheduleDateInvalid', /no such day/);
    expectCatalogued(() => parseDay('1.3.2027', 'start'), 'ScheduleDateInvalid', /YYYY-MM-DD/);
    expectCatalogued(() => parseDay('2400-01-01', 'start'), 'ScheduleDateInvalid', /1900/);
  });

  it('a split shift 05:00–11:00 and 15:30–19:00 covers hours 5–10 whole, 15 half and 16–18 whole (9.5 h); a night shift 22:00–06:00 runs into the next day', () => {
    const split = parsePattern(['05:00-11:00', '15:30-19:00'], 'mon-fri');
    const w = hourWeights(split);
    expect(w.reduce((s, x) => s + x.weight, 0)).toBeCloseTo(9.5, 12);
    expect(w.find((x) => x.hour === 15)!.weight).toBe(0.5);
    expect(w.map((x) => x.hour)).toEqual([5, 6, 7, 8, 9, 10, 15, 16, 17, 18]);
    const night = hourWeights(parsePattern(['22:00-06:00'], 'mon-fri'));
    expect(night.map((x) => `${x.dayOffset}:${x.hour}`)).toEqual(['0:22', '0:23', '1:0', '1:1', '1:2', '1:3', '1:4', '1:5']);
    expect(formatPattern(split)).toBe('05:00-11:00 and 15:30-19:00, Mon–Fri');
    expect(parseDays('mon-thu,sat')).toEqual(['mon', 'tue', 'wed', 'thu', 'sat']);
    expect(parseDays('sat-mon')).toEqual(['mon', 'sat', 'sun']);
  });

  it('overlapping spans, a span into the next day’s shift, bad clock times and bad days are catalogued errors', () => {
    expectCatalogued(() => parsePattern(['07:00-12:00', '11:00-15:00'], 'mon-fri'), 'ScheduleShiftInvalid', /overlaps/);
    expectCatalogued(() => parsePattern(['05:00-11:00', '20:00-06:00'], 'mon-fri'), 'ScheduleShiftInvalid', /next day/);
    expectCatalogued(() => parseShiftSpan('25:00-26:00'), 'ScheduleShiftInvalid');
    expectCatalogued(() => parseShiftSpan('07:60-17:00'), 'ScheduleShiftInvalid', /minute/);
    expectCatalogued(() => parseShiftSpan('seven to five'), 'ScheduleShiftInvalid', /HH:MM/);
    expectCatalogued(() => parseDays('funday'), 'ScheduleDaysInvalid', /not a weekday/);
    expectCatalogued(() => parseDays(''), 'ScheduleDaysInvalid');
  });
});

describe('the replay, worked by hand', () => {
  const job = (over: Partial<Job> = {}): Job => ({ start: day('2027-03-01'), workHours: 1000, crew: 5, pattern: dayShift, holidays: new Set(), ...over });

  it('heat-free: 1,000 crew-hours, 5 workers × 10 h = 50 crew-hours a day → 20 working days Mon–Sat from Monday 1 March 2027: done Tuesday 23 March, 23 calendar days; a holiday on Wednesday 10 March adds one day', () => {
    // 3 weeks of 6 days (1–20 March) = 18 days, then Monday 22 and Tuesday 23.
    const r = replay(job(), null);
    expect(formatDay(r.finishDay)).toBe('2027-03-23');
    expect(r.workingDays).toBe(20);
    expect(r.calendarDays).toBe(23);
    expect(r.crewHoursLost).toBe(0);
    const h = replay(job({ holidays: parseHolidays('# company days\n2027-03-10, Founders day\n') }), null);
    expect(formatDay(h.finishDay)).toBe('2027-03-24');
    expect(h.workingDays).toBe(20);
  });

  it('a March that loses 20 % of every hour: 40 crew-hours a day → 25 working days, done Monday 29 March; 5 added working days, 6 added calendar days, 250 crew-hours lost; at 40 EUR a crew-hour and 1,500 EUR a day the heat costs 19,000 EUR', () => {
    const w = [weather(2021, marchOnly(0.2))];
    const costs: Costs = { rate: 40, dailyCost: 1500, currency: 'EUR' };
    const s = scheduleSpread(job(), costs, w);
    const y = s.years[0];
    // 25 working days: 4 weeks of 6 days (1–27 March) = 24, then Monday 29 March.
    expect(formatDay(y.finishDay)).toBe('2027-03-29');
    expect(y.workingDays).toBe(25);
    expect(y.addedWorkingDays).toBe(5);
    expect(y.addedCalendarDays).toBe(29 - 23);
    expect(y.crewHoursLost).toBeCloseTo(25 * 5 * 10 * 0.2, 9);
    expect(y.crewHoursAbove).toBeCloseTo(25 * 5 * 10, 9);
    expect(y.cost).toBeCloseTo(250 * 40 + 6 * 1500, 6);
  });

  it('1,010 crew-hours: the 26th day is worked for a quarter (10 of its 40 crew-hours), so 252.5 crew-hours are lost; they are the sum over the replayed days', () => {
    const days: ReplayDay[] = [];
    const r = replay(job({ workHours: 1010 }), [weather(2021, marchOnly(0.2))], 0, (d) => days.push(d));
    expect(formatDay(r.finishDay)).toBe('2027-03-30');
    expect(r.workingDays).toBe(26);
    expect(days[25].share).toBeCloseTo(0.25, 12);
    expect(r.crewHoursLost).toBeCloseTo(25 * 10 + 0.25 * 10, 9);
    expect(days.reduce((s, d) => s + d.lost, 0)).toBeCloseTo(r.crewHoursLost, 9);
    expect(days.reduce((s, d) => s + d.productive, 0)).toBeCloseTo(1010, 9);
    expect(days.reduce((s, d) => s + d.paid, 0)).toBeCloseTo(1010 + r.crewHoursLost, 9);
  });

  it('a job longer than the record wraps to its first year: two weather years, a job starting in December in each', () => {
    // Weather A loses nothing, B loses half of every January hour.
    const A = weather(2021, new Array(12).fill(0));
    const B = weather(
      2022,
      Array.from({ length: 12 }, (_, m) => (m === 0 ? 0.5 : 0)),
    );
    const j = job({ start: day('2027-12-01'), workHours: 50 * 40 });
    const fromA = replay(j, [A, B], 0); // December 2027 with A, January 2028 with B
    const fromB = replay(j, [A, B], 1); // December 2027 with B, January 2028 with A (wrapped)
    expect(fromA.crewHoursLost).toBeGreaterThan(0);
    expect(fromB.crewHoursLost).toBe(0);
    expect(fromB.finishDay).toBe(replay(j, null).finishDay);
  });

  it('a night shift 22:00–06:00 on 31 March takes the hours after midnight from April’s weather', () => {
    const night = parsePattern(['22:00-06:00'], 'mon-sun');
    const w = [
      weather(
        2021,
        Array.from({ length: 12 }, (_, m) => (m === 3 ? 0.5 : 0)),
      ),
    ];
    const days: ReplayDay[] = [];
    replay({ start: day('2027-03-31'), workHours: 8, crew: 1, pattern: night, holidays: new Set() }, w, 0, (d) => days.push(d));
    // 2 h in March (no loss) + 6 h in April losing half: 5 productive, so a second night is needed.
    expect(days[0].lost).toBeCloseTo(3, 12);
    expect(days[0].productive).toBeCloseTo(5, 12);
    expect(days.length).toBe(2);
  });
});

describe('the bid’s answers', () => {
  // Five invented weather years: hours lost in July grow from 10 % to 50 %.
  const years = [0.1, 0.2, 0.3, 0.4, 0.5].map((l, i) =>
    weather(
      2020 + i,
      Array.from({ length: 12 }, (_, m) => (m === 6 ? l : m === 5 || m === 7 ? l / 2 : 0)),
    ),
  );
  const j: Job = { start: day('2027-06-01'), workHours: 20_000, crew: 20, pattern: dayShift, holidays: new Set() };
  const costs: Costs = { rate: 30, dailyCost: 2000, currency: 'XYZ' };

  it('mean, median and P90 year of the five replays follow the type-7 rule; P90 ≥ median; every figure is finite', () => {
    const a = answerBid({ job: j, costs }, years);
    const lost = a.schedule.years.map((y) => y.crewHoursLost).sort((x, y) => x - y);
    expect(a.schedule.crewHoursLost.p50).toBeCloseTo(lost[2], 9);
    // n = 5: h = 4 · 0.9 = 3.6 → x(4) + 0.6 · (x(5) − x(4)) (docs/methods.md §10.1, numpy default).
    expect(a.schedule.crewHoursLost.p90).toBeCloseTo(lost[3] + 0.6 * (lost[4] - lost[3]), 9);
    expect(a.schedule.crewHoursLost.mean).toBeCloseTo(lost.reduce((s, x) => s + x, 0) / 5, 9);
    for (const k of ['addedWorkingDays', 'calendarDays', 'cost', 'crewHoursLost'] as const) {
      expect(a.schedule[k].p90).toBeGreaterThanOrEqual(a.schedule[k].p50);
      expect(Number.isFinite(a.schedule[k].mean)).toBe(true);
    }
    expect(a.startMonths.length).toBe(12);
    expect(a.startMonths[5]).toBe(a.schedule);
    expect(formatDay(a.startMonths[0].start)).toBe('2027-01-01');
    // Starting in January (no heat in the job's 100 working days: 20,000 / 200) costs nothing.
    expect(a.startMonths[0].cost.p90).toBe(0);
    expect(a.startMonths[6].cost.p50).toBeGreaterThan(0);
  });

  it('the crew for a deadline is the smallest whose P90 finish meets it: one worker fewer misses it', () => {
    const heatFree = replay(j, null);
    const deadline = heatFree.finishDay + 10;
    const c = crewForDeadline(j, costs, years, deadline);
    const finishP90 = (crew: number) => {
      const s = scheduleSpread({ ...j, crew }, costs, years);
      return j.start + Math.ceil(s.calendarDays.p90 - 1e-9) - 1;
    };
    expect(finishP90(c.crew)).toBeLessThanOrEqual(deadline);
    expect(finishP90(c.crew - 1)).toBeGreaterThan(deadline);
    expect(c.crew).toBeGreaterThanOrEqual(20);
  });

  it('a deadline before the start, or before the first working day, cannot be met; a job that never finishes, too many patterns and a year without complete months are refused', () => {
    expectCatalogued(() => crewForDeadline(j, costs, years, j.start - 1), 'ScheduleDeadlineUnreachable', /before the start/);
    const sunday = day('2027-06-06');
    expectCatalogued(() => crewForDeadline({ ...j, start: sunday }, costs, years, sunday), 'ScheduleDeadlineUnreachable', /100,000 workers/);
    const allLost = [weather(2021, new Array(12).fill(1))];
    expectCatalogued(() => replay(j, allLost), 'ScheduleNotFinished', /not done 20 years/);
    const p = parsePattern(['06:00-10:00'], 'mon-fri');
    expectCatalogued(() => answerBid({ job: j, costs, otherPatterns: [p, p, p, p] }, years), 'ScheduleTooManyPatterns');
    const empty = new Float64Array(YEAR_HISTOGRAM_SIZE);
    const kernel = prepareWorkKernel({ workRate: 300, restRate: 115, limit: { model: 'curve-2017', acclimatization: 'acclimatized' } });
    expectCatalogued(
      () => weatherYears([empty], [2021], { kernel, exposure: 'sun', rest: { kind: 'same-place' } }),
      'ScheduleNoWeatherYears',
      /month 1 lacks 744/,
    );
  });
});

describe('rates from a histogram', () => {
  it('every hour of a year at 30.125 °C in the sun, moderate work (300 W), acclimatized: the share lost is 1 − f with f = 0.48423 (docs/methods.md §8.6 closed form)', () => {
    const hist = new Float64Array(YEAR_HISTOGRAM_SIZE);
    const L = WBGT_HISTOGRAM_LENGTH;
    // 2021: every month × hour slot holds its days' hours at 30.125 °C in the sun and 28.1 °C in the shade.
    for (let m = 0; m < 12; m++) {
      const days = new Date(Date.UTC(2021, m + 1, 0)).getUTCDate();
      for (let h = 0; h < 24; h++) {
        const slot = m * 24 + h;
        hist[slot * 2 * L + wbgtBinIndex(30.1)] = days;
        hist[(slot * 2 + 1) * L + wbgtBinIndex(28.1)] = days;
      }
    }
    const kernel = prepareWorkKernel({ workRate: 300, restRate: 115, limit: { model: 'curve-2017', acclimatization: 'acclimatized' } });
    const w = weatherYears([hist], [2021], { kernel, exposure: 'sun', rest: { kind: 'same-place' } });
    const f = (10 ** ((56.7 - 30.125) / 11.5) - 115) / (300 - 115);
    expect(f).toBeCloseTo(0.48423, 5);
    expect(w.usable[0].lostRate[6 * 24 + 12]).toBeCloseTo(1 - f, 10);
    expect(w.usable[0].aboveRate[0]).toBe(1);
  });
});
