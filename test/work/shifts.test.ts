import { afterEach, describe, expect, it, vi } from 'vitest';
import { DEFAULT_SHIFT, allocLocalHours, localHours, localHoursInto, validateShift, type WorkShift } from '../../pipeline/work/shifts.ts';
import { checkTimeZone, utcOffsetMs } from '../../pipeline/work/time-zone.ts';
import { expectWorkError, readFixture } from './helpers.ts';

const H = 3_600_000;
/** End-of-hour stamps [ms UTC] of `n` hours starting at `startUtc`. */
const hoursFrom = (startUtc: number, n: number) => Float64Array.from({ length: n }, (_, i) => startUtc + (i + 1) * H);
const count = (a: Uint8Array) => a.reduce((s, v) => s + v, 0);

describe('local hours and work shifts', () => {
  afterEach(() => vi.restoreAllMocks());

  it('local year, month, day, hour and ISO weekday agree with Python zoneinfo for 10 zones, 1940–1975 and 2016–2019, around every offset change (fixtures/zoneinfo-local-hours.csv)', () => {
    const rows = readFixture('zoneinfo-local-hours.csv');
    const byZone = new Map<string, Record<string, string>[]>();
    for (const r of rows) byZone.set(r.zone, [...(byZone.get(r.zone) ?? []), r]);
    expect(byZone.size).toBe(10);
    for (const [zone, rs] of byZone) {
      const out = localHours(
        rs.map((r) => Number(r.end_utc_ms)),
        zone,
      );
      rs.forEach((r, i) => {
        const got = [out.year[i], out.month[i], out.day[i], out.hour[i], out.weekday[i]];
        const want = [r.year, r.month, r.day, r.hour, r.weekday_iso].map(Number);
        expect(got, `${zone} ${new Date(Number(r.end_utc_ms)).toISOString()}`).toEqual(want);
      });
    }
  });

  it('the default shift is 07:00–17:00 Monday to Saturday: 60 hours in a week in Asia/Dubai (UTC+4, no DST)', () => {
    expect(DEFAULT_SHIFT).toEqual({ start: 7, end: 17, days: ['mon', 'tue', 'wed', 'thu', 'fri', 'sat'] });
    // Week from Monday 2024-06-03 00:00 local = 2024-06-02 20:00 UTC.
    const t = hoursFrom(Date.UTC(2024, 5, 2, 20), 7 * 24);
    const out = localHours(t, 'Asia/Dubai');
    expect(count(out.inShift)).toBe(60);
    const first = out.inShift.indexOf(1);
    expect(out.hour[first]).toBe(7);
    expect(new Date(t[first]).toISOString()).toBe('2024-06-03T04:00:00.000Z');
    expect(out.weekday[first]).toBe(1);
  });

  it('spring forward in Europe/Berlin (2024-03-31, EU rule: clocks change at 01:00 UTC, from memory): a 01–05 shift holds 3 hours, hour 2 never occurs', () => {
    const out = localHours(hoursFrom(Date.UTC(2024, 2, 30, 22), 8), 'Europe/Berlin', { start: 1, end: 5, days: ['sun'] });
    expect(Array.from(out.hour)).toEqual([23, 0, 1, 3, 4, 5, 6, 7]);
    expect(Array.from(out.inShift)).toEqual([0, 0, 1, 1, 1, 0, 0, 0]);
  });

  it('fall back in Europe/Berlin (2024-10-27): the repeated local hour 2 counts twice, so a 01–05 shift holds 5 hours', () => {
    const out = localHours(hoursFrom(Date.UTC(2024, 9, 26, 22), 8), 'Europe/Berlin', { start: 1, end: 5, days: ['sun'] });
    expect(Array.from(out.hour)).toEqual([0, 1, 2, 2, 3, 4, 5, 6]);
    expect(count(out.inShift)).toBe(5);
  });

  it('a change inside an hour (Australia/Lord_Howe, 2024-10-06: +10:30 → +11 at 15:30 UTC, per Python zoneinfo) reads the local end with the new offset: a Sunday 00–03 shift holds 2 hours', () => {
    const out = localHours(hoursFrom(Date.UTC(2024, 9, 5, 13), 4), 'Australia/Lord_Howe', { start: 0, end: 3, days: ['sun'] });
    expect(Array.from(out.hour)).toEqual([23, 0, 1, 3]);
    expect(Array.from(out.inShift)).toEqual([0, 1, 1, 0]);
  });

  it('utcOffsetMs gives +1 h and +2 h either side of the Berlin change and +5:30 for Asia/Kolkata', () => {
    expect(utcOffsetMs(Date.UTC(2024, 2, 31, 0, 59), 'Europe/Berlin')).toBe(H);
    expect(utcOffsetMs(Date.UTC(2024, 2, 31, 1, 0), 'Europe/Berlin')).toBe(2 * H);
    expect(utcOffsetMs(Date.UTC(2024, 0, 1), 'Asia/Kolkata')).toBe(5.5 * H);
  });

  it('a night shift 22–06 on Monday to Friday holds 40 hours a week; the early hours belong to the day the shift started', () => {
    const shift = validateShift({ start: 22, end: 6, days: ['mon', 'tue', 'wed', 'thu', 'fri'] });
    const t = hoursFrom(Date.UTC(2024, 5, 2, 20), 7 * 24 + 8); // Monday 00:00 Dubai to next Monday 08:00
    const out = localHours(t, 'Asia/Dubai', shift);
    expect(count(out.inShift)).toBe(40);
    for (let i = 0; i < t.length; i++) {
      if (out.weekday[i] === 1 && out.hour[i] < 6) expect(out.inShift[i]).toBe(0); // Monday early hours: Sunday's shift
      if (out.weekday[i] === 6 && out.hour[i] < 6) expect(out.inShift[i]).toBe(1); // Saturday early hours: Friday's shift
    }
  });

  it('in a half-hour zone (Asia/Kolkata, UTC+5:30) hours start at :30, so a 07–17 shift holds 9 whole hours a day', () => {
    const out = localHours(hoursFrom(Date.UTC(2024, 5, 2, 18), 25), 'Asia/Kolkata', { start: 7, end: 17, days: ['mon'] });
    expect(count(out.inShift)).toBe(9);
  });

  it('a 0–24 shift takes every hour of the listed days', () => {
    const out = localHours(hoursFrom(Date.UTC(2024, 5, 2, 20), 48), 'Asia/Dubai', { start: 0, end: 24, days: ['mon'] });
    expect(count(out.inShift)).toBe(24);
  });

  it('times need not be sorted', () => {
    const t = hoursFrom(Date.UTC(2016, 0, 1), 2000);
    const shuffled = Float64Array.from(t).reverse();
    const a = localHours(t, 'America/New_York');
    const b = localHours(shuffled, 'America/New_York');
    expect(Array.from(b.hour).reverse()).toEqual(Array.from(a.hour));
    expect(Array.from(b.inShift).reverse()).toEqual(Array.from(a.inShift));
  });

  it('50,000 hours take fewer than 3,000 Intl formatToParts calls, one per 17 hours (offsets are cached: one sample a day plus a bisection per change)', () => {
    const spy = vi.spyOn(Intl.DateTimeFormat.prototype, 'formatToParts');
    const t = hoursFrom(Date.UTC(2030, 0, 1), 50_000);
    const out = localHours(t, 'America/Chicago');
    expect(spy.mock.calls.length).toBeLessThan(3000);
    expect(count(out.inShift)).toBeGreaterThan(15_000);
  });

  const bad: [string, { start: number; end: number; days: string[] }, string, RegExp][] = [
    ['an hour above 24', { start: 7, end: 25, days: ['mon'] }, 'WorkShiftInvalid', /end 25 is not a whole hour/],
    ['a negative hour', { start: -1, end: 17, days: ['mon'] }, 'WorkShiftInvalid', /start -1/],
    ['a fractional hour', { start: 7.5, end: 17, days: ['mon'] }, 'WorkShiftInvalid', /start 7.5/],
    ['start equal to end', { start: 8, end: 8, days: ['mon'] }, 'WorkShiftInvalid', /both 8/],
    ['start 24', { start: 24, end: 6, days: ['mon'] }, 'WorkShiftInvalid', /use 0 for midnight/],
    ['no days', { start: 7, end: 17, days: [] }, 'WorkShiftInvalid', /no work days/],
    ['an unknown weekday', { start: 7, end: 17, days: ['mon', 'funday'] }, 'WorkWeekdayUnknown', /"funday"/],
  ];
  for (const [label, shift, code, match] of bad) {
    it(`a shift with ${label} is a ${code} error`, () => {
      const err = expectWorkError(() => validateShift(shift, { file: 'atlas.yaml', key: 'work.shift' }), code, match);
      expect(err.where.key).toBe('work.shift');
    });
  }

  it('output arrays shorter than the input are a WorkParameterInvalid error', () => {
    expectWorkError(() => localHoursInto(allocLocalHours(3), hoursFrom(0, 4), 'UTC'), 'WorkParameterInvalid', /out\.year length is 3/);
  });

  it('an unknown time zone is a WorkTimeZoneUnknown error', () => {
    expectWorkError(() => checkTimeZone('Mars/Olympus_Mons'), 'WorkTimeZoneUnknown', /"Mars\/Olympus_Mons"/);
    expectWorkError(() => localHours([0], 'Nowhere/City', DEFAULT_SHIFT as WorkShift), 'WorkTimeZoneUnknown');
  });
});
