/**
 * Catalogued errors of work shifts in local time (shifts.ts, time-zone.ts): a shift that is not a
 * span of whole local hours, a day that is not a weekday, an unknown IANA time zone. Kept apart
 * from errors.ts so code that does not place hours in local time, such as the estimate page's
 * first script, does not carry them. Registered in pipeline/commands/catalogue.ts.
 */
import { defineError } from '../model/errors.ts';

export const WorkShiftInvalid = defineError<{ problem: string }>({
  code: 'WorkShiftInvalid',
  title: 'The work shift is not a valid span of local hours',
  message: (p) => p.problem,
  hint: () =>
    'give start and end as whole local hours from 0 to 24 (e.g. start: 7, end: 17); an end before the start means a night shift that ends the next day; start and end must differ',
});

export const WorkWeekdayUnknown = defineError<{ day: string }>({
  code: 'WorkWeekdayUnknown',
  title: 'A work day is not a known day of the week',
  message: (p) => `"${p.day}" is not a day of the week`,
  hint: () => 'use mon, tue, wed, thu, fri, sat, sun',
});

export const WorkTimeZoneUnknown = defineError<{ zone: string }>({
  code: 'WorkTimeZoneUnknown',
  title: 'The time zone is not a known IANA time zone',
  message: (p) => `unknown IANA time zone "${p.zone}"`,
  hint: () => 'use a zone name such as "Asia/Dubai", "America/Phoenix" or "Etc/GMT-4" (note the inverted sign of Etc/GMT zones)',
});
