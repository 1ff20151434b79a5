/**
 * A time zone as readers take it: the offset from UTC first, as UTC±hh:mm with a true minus
 * sign, and the IANA name beside it. Names such as `Etc/GMT+10` read the wrong way round (POSIX
 * signs: Etc/GMT+10 is ten hours behind UTC, UTC−10:00), so the offset comes from the zone
 * database through Intl (Node's and the browser's ICU), never from the name. Pure.
 */

/** One formatter per time zone: making one costs far more than using it (every region page asks). */
const formats = new Map<string, Intl.DateTimeFormat>();

/** The UTC offset of `zone` at the instant `ms` [ms since 1970 UTC], as "UTC+05:30" / "UTC−10:00" / "UTC+00:00". */
export function utcOffsetAt(zone: string, ms: number): string {
  let format = formats.get(zone);
  if (!format) {
    format = new Intl.DateTimeFormat('en-US', { timeZone: zone, timeZoneName: 'longOffset' });
    formats.set(zone, format);
  }
  const part = format.formatToParts(new Date(ms)).find((p) => p.type === 'timeZoneName')?.value ?? 'GMT';
  // "GMT-10:00", "GMT+05:30", or "GMT" for a zero offset.
  const m = /^GMT([+-])(\d{2}):(\d{2})$/.exec(part);
  if (!m) return 'UTC+00:00';
  return `UTC${m[1] === '-' ? '\u2212' : '+'}${m[2]}:${m[3]}`;
}

/**
 * "UTC−10:00 (Etc/GMT+10)"; for a zone with daylight saving in `year`, both offsets:
 * "UTC+01:00, UTC+02:00 with daylight saving (Europe/Paris)". The offsets are those of
 * 1 January and 1 July of `year`, 12:00 UTC.
 */
export function formatTimeZone(zone: string, year: number): string {
  const jan = utcOffsetAt(zone, Date.UTC(year, 0, 1, 12));
  const jul = utcOffsetAt(zone, Date.UTC(year, 6, 1, 12));
  if (jan === jul) return `${jan} (${zone})`;
  // Standard time is the smaller offset; daylight saving the larger (either hemisphere).
  const value = (o: string) => (o.includes('\u2212') ? -1 : 1) * (Number(o.slice(4, 6)) * 60 + Number(o.slice(7, 9)));
  const [std, dst] = value(jan) < value(jul) ? [jan, jul] : [jul, jan];
  return `${std}, ${dst} with daylight saving (${zone})`;
}
