/**
 * A job to schedule: where it starts, how much work, the crew, the shift pattern, the days off,
 * and what time costs. Checked here so the page and the CLI refuse the same inputs with the same
 * catalogued errors.
 */
import { civilFromDays, formatDay, parseDay } from './calendar.ts';
import { ScheduleHolidayInvalid, ScheduleNumberInvalid } from './errors.ts';
import type { ShiftPattern } from './shift-pattern.ts';

/** Largest crew [workers] and quantity of work [crew-hours] accepted. */
export const MAX_CREW = 100_000;
export const MAX_WORK_HOURS = 100_000_000;
/** Largest labour rate [currency per crew-hour] and daily cost [currency per calendar day]. */
export const MAX_RATE = 1_000_000;
export const MAX_DAILY_COST = 1_000_000_000;
/** Longest currency label [characters]. */
export const MAX_CURRENCY_LENGTH = 12;

/** A job. Days are day numbers (calendar.ts). */
export interface Job {
  /** First calendar day of the job [day number]. */
  start: number;
  /** Quantity of work [crew-hours]: productive hours of one worker, summed over the crew. */
  workHours: number;
  /** Workers [count]. */
  crew: number;
  pattern: ShiftPattern;
  /** Non-working dates besides the pattern's days off [day numbers]. */
  holidays: ReadonlySet<number>;
}

/** What time costs. */
export interface Costs {
  /** Labour rate [currency per crew-hour]. */
  rate: number;
  /** Time-related cost of keeping the site open [currency per calendar day]. */
  dailyCost: number;
  /** The user's currency label (free text, e.g. `EUR`). */
  currency: string;
}

/**
 * A number from text, inside `ok`; `name` is the option or field. Catalogued error:
 * ScheduleNumberInvalid (empty, not a number, out of range; never NaN).
 */
export function parseNumber(text: string | undefined, name: string, expected: string, ok: (v: number) => boolean): number {
  const t = (text ?? '').trim();
  const v = t === '' || !/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(t) ? NaN : Number(t);
  if (!Number.isFinite(v) || !ok(v)) throw ScheduleNumberInvalid({ name, value: text ?? '', expected }, { key: name });
  return v;
}

/** Quantity of work [crew-hours]. */
export const parseWorkHours = (t: string | undefined, name = 'work-hours') =>
  parseNumber(t, name, `a quantity of work above 0 and at most ${MAX_WORK_HOURS.toLocaleString('en-US')} crew-hours`, (v) => v > 0 && v <= MAX_WORK_HOURS);
/** Crew size [workers]. */
export const parseCrew = (t: string | undefined, name = 'crew') =>
  parseNumber(t, name, `a whole number of workers from 1 to ${MAX_CREW.toLocaleString('en-US')}`, (v) => Number.isInteger(v) && v >= 1 && v <= MAX_CREW);
/** Labour rate [currency per crew-hour]. */
export const parseRate = (t: string | undefined, name = 'rate') =>
  parseNumber(t, name, `a labour rate per crew-hour from 0 to ${MAX_RATE.toLocaleString('en-US')}`, (v) => v >= 0 && v <= MAX_RATE);
/** Daily cost [currency per calendar day]. */
export const parseDailyCost = (t: string | undefined, name = 'daily-cost') =>
  parseNumber(t, name, `a cost per calendar day from 0 to ${MAX_DAILY_COST.toLocaleString('en-US')}`, (v) => v >= 0 && v <= MAX_DAILY_COST);

/** The currency label, trimmed. Catalogued error: ScheduleNumberInvalid (too long, control characters). */
export function parseCurrency(text: string | undefined, name = 'currency'): string {
  const t = (text ?? '').trim();
  // eslint-disable-next-line no-control-regex
  // biome-ignore lint/suspicious/noControlCharactersInRegex: control characters are what this test looks for
  if (t.length > MAX_CURRENCY_LENGTH || /[\u0000-\u001f\u007f]/.test(t)) {
    throw ScheduleNumberInvalid(
      { name, value: text ?? '', expected: `a currency label of at most ${MAX_CURRENCY_LENGTH} characters (e.g. EUR, USD, AED)` },
      { key: name },
    );
  }
  return t;
}

/**
 * Holidays from text: one date per line (`YYYY-MM-DD`, anything after a comma, semicolon, tab or
 * space is a name), `#` lines and empty lines skipped. `file` names the source for the error.
 * Catalogued error: ScheduleHolidayInvalid (with the line number).
 */
export function parseHolidays(text: string, file?: string): Set<number> {
  const out = new Set<number>();
  text.split(/\r?\n/).forEach((raw, i) => {
    const line = raw.replace(/^\uFEFF/, '').trim();
    if (line === '' || line.startsWith('#')) return;
    const first = line.split(/[,;\t ]/)[0].replace(/^"|"$/g, '');
    try {
      out.add(parseDay(first, 'holiday'));
    } catch (e) {
      throw ScheduleHolidayInvalid({ line: i + 1, value: first, problem: (e as Error).message.replace(/^holiday "[^"]*": /, '') }, { file, row: i + 1 });
    }
  });
  return out;
}

/** The holidays as sorted `YYYY-MM-DD` texts. */
export function holidayList(h: ReadonlySet<number>): string[] {
  return [...h].sort((a, b) => a - b).map(formatDay);
}

/** The year of a day number. */
export const yearOf = (day: number): number => civilFromDays(day).year;
