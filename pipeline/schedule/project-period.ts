/**
 * The project period: how often each calendar month occurs between a first and a last month
 * (both included), e.g. 2027-11 to 2028-02 holds November, December, January and February once
 * each. Without a period the project is one year: each calendar month once.
 */
import { EstimatePeriodInvalid } from './errors.ts';

/** A calendar month: year and month 1–12. */
export interface YearMonth {
  year: number;
  month: number;
}

/** Longest project period accepted [months] (20 years). */
export const MAX_PERIOD_MONTHS = 240;

/** Parses "YYYY-MM" (the value of an `<input type="month">`). Catalogued error: EstimatePeriodInvalid. */
export function parseYearMonth(text: string, name: string): YearMonth {
  const m = /^(\d{4})-(\d{2})$/.exec(text.trim());
  const month = m ? Number(m[2]) : NaN;
  if (!m || month < 1 || month > 12) throw EstimatePeriodInvalid({ problem: `${name} "${text}" is not a month written YYYY-MM` }, { key: name });
  return { year: Number(m[1]), month };
}

/** Months from `a` to `b`, both included [months]. */
export function monthsBetween(a: YearMonth, b: YearMonth): number {
  return (b.year - a.year) * 12 + (b.month - a.month) + 1;
}

/**
 * Occurrences of each calendar month (index 0 = January) in the period; `null` = one year.
 * Catalogued error: EstimatePeriodInvalid (last before first, longer than 20 years).
 */
export function monthOccurrences(period: { start: YearMonth; end: YearMonth } | null): Uint16Array {
  const occ = new Uint16Array(12);
  if (period === null) return occ.fill(1);
  const n = monthsBetween(period.start, period.end);
  const label = (x: YearMonth) => `${x.year}-${String(x.month).padStart(2, '0')}`;
  if (n < 1) throw EstimatePeriodInvalid({ problem: `the last month ${label(period.end)} is before the first ${label(period.start)}` }, { key: 'period-end' });
  if (n > MAX_PERIOD_MONTHS)
    throw EstimatePeriodInvalid(
      { problem: `${n} months from ${label(period.start)} to ${label(period.end)}; at most ${MAX_PERIOD_MONTHS}` },
      { key: 'period-end' },
    );
  for (let i = 0; i < n; i++) occ[(period.start.month - 1 + i) % 12]++;
  return occ;
}
