/**
 * Shift patterns of a job: one or more spans of local clock time per work day (a day shift
 * 07:00–17:00, a split shift 05:00–11:00 and 15:00–19:00, a night shift 22:00–06:00 that ends the
 * next morning) and the weekdays on which they start. Spans are in minutes, so 06:30 starts are
 * allowed; an hour of the published histograms that a span covers only in part counts with the
 * covered share of the hour.
 *
 * Rules (ours, written on the page and in the CLI help): a span ends after it starts, or the next
 * morning when its end is not later than its start; the hours after midnight belong to the day
 * the shift started (as pipeline/work/shifts.ts counts night shifts); the spans of a day, together
 * with the next day's, never overlap, so a pattern holds at most 24 hours a day.
 */
import { WEEKDAYS, type Weekday, type WorkShift } from '../work/weekdays.ts';
import { ScheduleDaysInvalid, ScheduleShiftInvalid } from './errors.ts';

/** Minutes in a day. */
export const DAY_MINUTES = 1440;

/** One span of a shift: minutes after the local midnight of the day it starts [min]; end > start, end ≤ start + 1440. */
export interface ShiftSpan {
  start: number;
  end: number;
}

/** A shift pattern: its spans (in start order) and the weekdays on which they start. */
export interface ShiftPattern {
  spans: ShiftSpan[];
  days: Weekday[];
}

/** A share of one local clock hour worked: `dayOffset` 0 = the day the shift starts, 1 = the next day. */
export interface HourWeight {
  dayOffset: number;
  /** Local clock hour [0–23]. */
  hour: number;
  /** Share of the hour inside the shift [0–1]. */
  weight: number;
}

const SPAN_RE = /^(\d{1,2})(?::(\d{2}))?\s*[-–]\s*(\d{1,2})(?::(\d{2}))?$/;

/** Parses `HH:MM-HH:MM` (or `H-H`). Catalogued error: ScheduleShiftInvalid. */
export function parseShiftSpan(text: string): ShiftSpan {
  const m = SPAN_RE.exec(text.trim());
  if (!m) throw ScheduleShiftInvalid({ value: text, problem: 'not written HH:MM-HH:MM' }, { key: 'shift' });
  const minutes = (h: string, mm: string | undefined, end: boolean): number => {
    const hour = Number(h);
    const min = mm === undefined ? 0 : Number(mm);
    if (min > 59) throw ScheduleShiftInvalid({ value: text, problem: `minute ${mm} is not 00–59` }, { key: 'shift' });
    if (hour > 24 || (hour === 24 && (min > 0 || !end))) {
      throw ScheduleShiftInvalid({ value: text, problem: `${h}:${mm ?? '00'} is not a clock time (00:00–23:59; 24:00 only as an end)` }, { key: 'shift' });
    }
    return hour * 60 + min;
  };
  const start = minutes(m[1], m[2], false);
  let end = minutes(m[3], m[4], true);
  if (end <= start) end += DAY_MINUTES;
  return { start, end };
}

/** `HH:MM` of minutes after midnight (wrapping past 24:00 for night spans, 24:00 kept for a day's end). */
export function formatClock(minutes: number): string {
  const m = minutes % DAY_MINUTES === 0 && minutes > 0 && minutes <= DAY_MINUTES ? DAY_MINUTES : minutes % DAY_MINUTES;
  return `${String(Math.floor(m / 60)).padStart(2, '0')}:${String(m % 60).padStart(2, '0')}`;
}

/** `07:00-17:00` of a span. */
export function formatSpan(s: ShiftSpan): string {
  return `${formatClock(s.start)}-${formatClock(s.end)}`;
}

/**
 * Parses weekdays: `mon-sat`, `mon,wed,fri`, `mon-thu,sat`, `sat-mon` (a range may wrap past
 * Sunday). Catalogued error: ScheduleDaysInvalid.
 */
export function parseDays(text: string): Weekday[] {
  const out = new Set<number>();
  const parts = text
    .toLowerCase()
    .split(/[,\s]+/)
    .filter((p) => p !== '');
  if (parts.length === 0) throw ScheduleDaysInvalid({ value: text, problem: 'no day given' }, { key: 'days' });
  const index = (d: string): number => {
    const i = WEEKDAYS.indexOf(d.slice(0, 3) as Weekday);
    if (i < 0 || !/^[a-z]{3,9}$/.test(d) || !WEEKDAYS[i].startsWith(d.slice(0, 3)))
      throw ScheduleDaysInvalid({ value: text, problem: `"${d}" is not a weekday` }, { key: 'days' });
    return i;
  };
  for (const part of parts) {
    const range = part.split(/[-–]/);
    if (range.length > 2) throw ScheduleDaysInvalid({ value: text, problem: `"${part}" is not a day or a range of two days` }, { key: 'days' });
    if (range.length === 1) out.add(index(range[0]));
    else {
      const [a, b] = range.map(index);
      for (let i = a; ; i = (i + 1) % 7) {
        out.add(i);
        if (i === b) break;
      }
    }
  }
  return [...out].sort((a, b) => a - b).map((i) => WEEKDAYS[i]);
}

/** `Mon–Sat` or `Mon, Wed, Fri` for a list of days. */
export function formatDays(days: readonly Weekday[]): string {
  const idx = days.map((d) => WEEKDAYS.indexOf(d)).sort((a, b) => a - b);
  const name = (i: number) => WEEKDAYS[i][0].toUpperCase() + WEEKDAYS[i].slice(1);
  const contiguous = idx.length > 2 && idx.every((v, i) => i === 0 || v === idx[i - 1] + 1);
  return contiguous ? `${name(idx[0])}–${name(idx[idx.length - 1])}` : idx.map(name).join(', ');
}

/**
 * Checks and orders a pattern's spans and days. Catalogued errors: ScheduleShiftInvalid (no span,
 * spans that overlap on the same day or into the next day's), ScheduleDaysInvalid (no day).
 */
export function makePattern(spans: readonly ShiftSpan[], days: readonly Weekday[]): ShiftPattern {
  const label = spans.map(formatSpan).join(', ');
  if (spans.length === 0) throw ScheduleShiftInvalid({ value: label, problem: 'no shift span given' }, { key: 'shift' });
  if (days.length === 0) throw ScheduleDaysInvalid({ value: '', problem: 'no work day given' }, { key: 'days' });
  const sorted = [...spans].sort((a, b) => a.start - b.start);
  // Every span of a day against every other span of the same day and of the next day.
  const all = [...sorted, ...sorted.map((s) => ({ start: s.start + DAY_MINUTES, end: s.end + DAY_MINUTES }))];
  for (let i = 0; i < sorted.length; i++) {
    for (let j = 0; j < all.length; j++) {
      if (j === i) continue;
      const a = sorted[i];
      const b = all[j];
      if (a.start < b.end && b.start < a.end) {
        throw ScheduleShiftInvalid(
          { value: label, problem: `${formatSpan(a)} overlaps ${formatSpan(b)}${j >= sorted.length ? ' of the next day' : ''}` },
          { key: 'shift' },
        );
      }
    }
  }
  return { spans: sorted, days: [...new Set(days)].sort((a, b) => WEEKDAYS.indexOf(a) - WEEKDAYS.indexOf(b)) };
}

/** A pattern from shift texts (`07:00-17:00`, several allowed) and a days text (`mon-sat`). */
export function parsePattern(shifts: readonly string[], days: string): ShiftPattern {
  return makePattern(shifts.map(parseShiftSpan), parseDays(days));
}

/** The pattern of a whole-hour work shift of the atlas (pipeline/work/shifts.ts). */
export function patternFromWorkShift(s: WorkShift): ShiftPattern {
  return makePattern([{ start: s.start * 60, end: (s.end <= s.start ? s.end + 24 : s.end) * 60 }], s.days);
}

/** The pattern in words: `07:00-17:00, Mon–Sat`. */
export function formatPattern(p: ShiftPattern): string {
  return `${p.spans.map(formatSpan).join(' and ')}, ${formatDays(p.days)}`;
}

/** Paid hours of one work day [h]. */
export function hoursPerDay(p: ShiftPattern): number {
  return p.spans.reduce((s, x) => s + (x.end - x.start) / 60, 0);
}

/** The local clock hours one work day covers, with the share of each [h]; ordered by day and hour. */
export function hourWeights(p: ShiftPattern): HourWeight[] {
  const map = new Map<number, number>();
  for (const s of p.spans) {
    for (let k = Math.floor(s.start / 60); k * 60 < s.end; k++) {
      const covered = Math.min(s.end, (k + 1) * 60) - Math.max(s.start, k * 60);
      if (covered > 0) map.set(k, (map.get(k) ?? 0) + covered / 60);
    }
  }
  return [...map.entries()].sort((a, b) => a[0] - b[0]).map(([k, weight]) => ({ dayOffset: Math.floor(k / 24), hour: k % 24, weight }));
}

/** Bit mask of the pattern's days: bit (ISO weekday) set, 1 = Monday … 7 = Sunday. */
export function dayMask(p: ShiftPattern): number {
  let m = 0;
  for (const d of p.days) m |= 1 << (WEEKDAYS.indexOf(d) + 1);
  return m;
}
