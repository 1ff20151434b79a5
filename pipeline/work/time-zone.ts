/**
 * UTC offsets of an IANA time zone, from the runtime's time-zone database through `Intl` only (no
 * library, works in the browser). `Intl.DateTimeFormat.formatToParts` is slow (microseconds), so
 * offsets are cached as segments of constant offset: for each UTC calendar year asked for, the
 * offset is sampled once a day at 00:00 UTC and every change between two samples is located by
 * bisection to 1 s. Limitation (documented): two changes within the same 24 h that return to the
 * same offset would be missed; the time-zone database has no such case for working populations
 * since 1940 that we know of.
 */
import { WorkTimeZoneUnknown } from './shift-errors.ts';
import type { ErrorWhere } from '../model/errors.ts';

const DAY_MS = 86_400_000;

/** Throws the catalogued WorkTimeZoneUnknown unless `zone` is an IANA zone known to the runtime. */
export function checkTimeZone(zone: string, where: ErrorWhere = {}): void {
  zoneOffsets(zone, where);
}

/** UTC offset [ms] (local clock minus UTC) of `zone` at the instant `utcMs` [ms since 1970 UTC]. */
export function utcOffsetMs(utcMs: number, zone: string): number {
  return zoneOffsets(zone).segment(utcMs).offset;
}

/** A span of constant offset: [from, to) [ms UTC], offset [ms]. */
export interface OffsetSegment {
  from: number;
  to: number;
  offset: number;
}

interface YearSegments {
  starts: number[];
  offsets: number[];
  end: number;
}

/** Cached offsets of one zone. */
export class ZoneOffsets {
  private readonly fmt: Intl.DateTimeFormat;
  private readonly years = new Map<number, YearSegments>();

  constructor(
    readonly zone: string,
    where: ErrorWhere = {},
  ) {
    try {
      this.fmt = new Intl.DateTimeFormat('en-US', {
        timeZone: zone,
        hourCycle: 'h23',
        year: 'numeric',
        month: 'numeric',
        day: 'numeric',
        hour: 'numeric',
        minute: 'numeric',
        second: 'numeric',
      });
    } catch {
      throw WorkTimeZoneUnknown({ zone }, where);
    }
  }

  /** Offset [ms] at `utcMs`, straight from Intl (slow; the segments use it). */
  exactOffset(utcMs: number): number {
    const t = Math.floor(utcMs / 1000) * 1000;
    let y = 0,
      mo = 0,
      d = 0,
      h = 0,
      mi = 0,
      s = 0;
    for (const p of this.fmt.formatToParts(t)) {
      switch (p.type) {
        case 'year':
          y = Number(p.value);
          break;
        case 'month':
          mo = Number(p.value);
          break;
        case 'day':
          d = Number(p.value);
          break;
        case 'hour':
          h = Number(p.value) % 24;
          break;
        case 'minute':
          mi = Number(p.value);
          break;
        case 'second':
          s = Number(p.value);
          break;
      }
    }
    return Date.UTC(y, mo - 1, d, h, mi, s) - t;
  }

  /** The segment of constant offset that holds `utcMs`. */
  segment(utcMs: number): OffsetSegment {
    const year = new Date(utcMs).getUTCFullYear();
    const ys = this.yearSegments(year);
    let i = ys.starts.length - 1;
    while (ys.starts[i] > utcMs) i--;
    return { from: ys.starts[i], to: i + 1 < ys.starts.length ? ys.starts[i + 1] : ys.end, offset: ys.offsets[i] };
  }

  private yearSegments(year: number): YearSegments {
    const cached = this.years.get(year);
    if (cached) return cached;
    const t0 = Date.UTC(year, 0, 1);
    const t1 = Date.UTC(year + 1, 0, 1);
    const starts = [t0];
    const offsets = [this.exactOffset(t0)];
    let a = t0;
    let offA = offsets[0];
    while (a < t1) {
      const b = Math.min(a + DAY_MS, t1);
      const offB = this.exactOffset(b);
      // Locate every change in (a, b]: bisect for the first second with an offset other than offA.
      while (offB !== offA) {
        let lo = a;
        let hi = b;
        while (hi - lo > 1000) {
          const mid = lo + Math.floor((hi - lo) / 2000) * 1000;
          if (this.exactOffset(mid) === offA) lo = mid;
          else hi = mid;
        }
        const offHi = this.exactOffset(hi);
        if (hi < t1) {
          starts.push(hi);
          offsets.push(offHi);
        }
        a = hi;
        offA = offHi;
      }
      a = b;
      offA = offB;
    }
    const ys = { starts, offsets, end: t1 };
    this.years.set(year, ys);
    return ys;
  }
}

const zones = new Map<string, ZoneOffsets>();

/** The cached {@link ZoneOffsets} of `zone` (catalogued WorkTimeZoneUnknown if unknown). */
export function zoneOffsets(zone: string, where: ErrorWhere = {}): ZoneOffsets {
  let z = zones.get(zone);
  if (!z) {
    z = new ZoneOffsets(zone, where);
    zones.set(zone, z);
  }
  return z;
}
