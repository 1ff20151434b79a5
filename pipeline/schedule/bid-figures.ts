/**
 * The figures of an estimate as one object: everything of the JSON `heathours estimate --json`
 * prints and the page's JSON download holds (bid-json.ts) but the fixed notes (the approximation
 * and the cautions), so the page draws from it without carrying those texts in its first script.
 * Hours, days and money to 0.01; dates as YYYY-MM-DD.
 */
import { dayOfSpan, type ScheduleSpread } from './bid.ts';
import { formatDay } from './calendar.ts';
import type { EstimateContext } from './context.ts';
import type { EstimateInputs } from './inputs.ts';
import { holidayList } from './job.ts';
import type { ResolvedPlace } from './place.ts';
import type { BidRun } from './run-bid.ts';
import type { ScenarioRun } from './scenario-runs.ts';
import { formatDays, formatSpan, hoursPerDay } from './shift-pattern.ts';
import { jobLines, lineTextC, settingLines, weatherLine } from './settings-text.ts';
import type { Spread } from './statistics.ts';

/** Format id of the JSON, bumped when a field changes meaning. */
export const BID_JSON_FORMAT = 'heathours-estimate/1';

const r2 = (v: number): number => Math.round(v * 100) / 100;

type Stat3 = { mean: number; p50: number; p90: number };
const stat = (s: Spread): Stat3 => ({ mean: r2(s.mean), p50: r2(s.p50), p90: r2(s.p90) });
const dates = (start: number, s: Spread): { mean: string; p50: string; p90: string } => ({
  mean: formatDay(dayOfSpan(start, s.mean)),
  p50: formatDay(dayOfSpan(start, s.p50)),
  p90: formatDay(dayOfSpan(start, s.p90)),
});

function scheduleFields(s: ScheduleSpread) {
  return {
    finishDate: dates(s.start, s.calendarDays),
    workingDays: stat(s.workingDays),
    calendarDays: stat(s.calendarDays),
    addedWorkingDays: stat(s.addedWorkingDays),
    addedCalendarDays: stat(s.addedCalendarDays),
    crewHoursLost: stat(s.crewHoursLost),
    crewHoursAbove: stat(s.crewHoursAbove),
    cost: stat(s.cost),
  };
}

const heatFree = (s: ScheduleSpread) => ({
  finishDate: formatDay(s.heatFree.finishDay),
  workingDays: s.heatFree.workingDays,
  calendarDays: s.heatFree.calendarDays,
});

/** The answers of one run: weather years, the schedule across them, each year, the start months, shift patterns, crew. */
function answerFields(run: BidRun) {
  const a = run.answer;
  const s = a.schedule;
  return {
    weatherYears: a.weatherYears,
    weatherYearsLeftOut: run.weather.skipped,
    heatFree: heatFree(s),
    ...scheduleFields(s),
    years: s.years.map((y) => ({
      weatherYear: y.weatherYear,
      finishDate: formatDay(y.finishDay),
      workingDays: y.workingDays,
      calendarDays: y.calendarDays,
      addedWorkingDays: y.addedWorkingDays,
      addedCalendarDays: y.addedCalendarDays,
      crewHoursLost: r2(y.crewHoursLost),
      crewHoursAbove: r2(y.crewHoursAbove),
      cost: r2(y.cost),
    })),
    startMonths: a.startMonths.map((m, i) => ({ month: i + 1, start: formatDay(m.start), heatFree: heatFree(m), ...scheduleFields(m) })),
    shiftPatterns: a.patterns.map((p) => ({
      shift: p.pattern.spans.map(formatSpan),
      days: formatDays(p.pattern.days),
      hoursPerDay: r2(hoursPerDay(p.pattern)),
      heatFree: heatFree(p),
      ...scheduleFields(p),
    })),
    crewForDeadline:
      a.crewForDeadline === null
        ? null
        : {
            deadline: formatDay(a.crewForDeadline.deadline),
            crew: a.crewForDeadline.crew,
            finishDate: dates(a.crewForDeadline.schedule.start, a.crewForDeadline.schedule.calendarDays),
            addedWorkingDays: stat(a.crewForDeadline.schedule.addedWorkingDays),
            cost: stat(a.crewForDeadline.schedule.cost),
          },
  };
}

/**
 * A scenario's entry: what it is (kind, what it changes, source, the what-if caveat) and the same
 * answers as the record's, for the same job.
 */
function scenarioEntry(sr: ScenarioRun, caveat: string) {
  const sc = sr.scenario;
  return { id: sc.id, name: sc.name, kind: sc.kind, what: sc.what, source: sc.source, caveat, ...answerFields(sr.run), deadlineProblem: sr.deadlineProblem };
}

/**
 * The figures of an estimate; `scenarios` (scenario-runs.ts) adds one entry per scenario with the
 * record's fields, after `scenarioCaveat`.
 */
export function bidFigures(run: BidRun, inputs: EstimateInputs, ctx: EstimateContext, place: ResolvedPlace, scenarios: readonly ScenarioRun[] = []) {
  const a = run.answer;
  const limit = { limitWork: run.kernel.limitWork, threshold: run.kernel.threshold };
  return {
    format: BID_JSON_FORMAT,
    invented: ctx.invented,
    atlas: {
      title: ctx.build.title,
      buildTime: ctx.build.buildTime,
      codeVersion: ctx.build.codeVersion,
      configDigest: ctx.build.configDigest,
      inputFiles: ctx.build.inputs,
      timeZone: ctx.timeZone,
    },
    place:
      place.kind === 'region'
        ? { kind: 'region' as const, id: place.id, name: place.name }
        : {
            kind: 'cell' as const,
            cell: place.cell,
            lat: place.centre.lat,
            lon: place.centre.lon,
            requested: place.requested,
            distanceKm: r2(place.distanceKm),
            movedToLand: place.movedToLand,
          },
    settings: Object.fromEntries(
      [...settingLines(inputs, ctx, place, limit), ...jobLines(inputs), weatherLine(ctx, a.weatherYears, run.weather.skipped)].map((l) => [
        l.key,
        lineTextC(l),
      ]),
    ),
    job: {
      start: formatDay(inputs.job.start),
      workHours: inputs.job.workHours,
      crew: inputs.crew,
      shift: inputs.shift.spans.map(formatSpan),
      days: inputs.shift.days,
      hoursPerDay: r2(hoursPerDay(inputs.shift)),
      holidays: holidayList(inputs.job.holidays),
      deadline: inputs.job.deadline === null ? null : formatDay(inputs.job.deadline),
      workRate: inputs.workRate,
      workloadClass: inputs.classId,
      acclimatization: inputs.acclimatization,
      exposure: inputs.exposure,
      rest: inputs.rest.kind === 'fixed' ? { kind: 'fixed', wbgtC: inputs.rest.wbgt } : { kind: inputs.rest.kind },
      clothingAdjustmentC: inputs.clothing.cav,
      limitAtWorkRateC: r2(limit.limitWork),
    },
    costs: { currency: inputs.costs.currency, ratePerCrewHour: inputs.costs.rate, dailyCost: inputs.costs.dailyCost },
    ...answerFields(run),
    scenarioCaveat: scenarios.length > 0 ? ctx.scenarioCaveat : '',
    scenarios: scenarios.map((sr) => scenarioEntry(sr, ctx.scenarioCaveat)),
  };
}

export type BidFigures = ReturnType<typeof bidFigures>;
/** One scenario's entry of {@link BidFigures}. */
export type BidScenarioFigures = BidFigures['scenarios'][number];
