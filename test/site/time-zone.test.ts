/**
 * Time zones as the pages show them (src/lib/time-zone.ts): UTC±hh:mm with the IANA name beside.
 * Outside check: Python's zoneinfo (Debian's python3, the system's tz database) gives each zone's
 * UTC offset on 1 January and 1 July; POSIX sign convention of the Etc/GMT zones ("Etc/GMT+10" is
 * ten hours behind UTC) as the tz database's etcetera file states it.
 */
import { execFileSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { formatTimeZone, utcOffsetAt } from '../../src/lib/time-zone.ts';

const ZONES = ['Etc/GMT+10', 'Etc/GMT-3', 'UTC', 'Asia/Kolkata', 'Asia/Kathmandu', 'Europe/Paris', 'Australia/Sydney', 'America/St_Johns', 'Pacific/Chatham'];

/** Offsets [minutes east of UTC] on 1 January and 1 July 2024, 12:00 UTC, from Python's zoneinfo. */
function zoneinfoOffsets(): Record<string, [number, number]> {
  const code = [
    'import json, sys',
    'from datetime import datetime, timezone',
    'from zoneinfo import ZoneInfo',
    'out = {}',
    'for z in json.loads(sys.argv[1]):',
    '    f = lambda m: int(datetime(2024, m, 1, 12, tzinfo=timezone.utc).astimezone(ZoneInfo(z)).utcoffset().total_seconds() // 60)',
    '    out[z] = [f(1), f(7)]',
    'print(json.dumps(out))',
  ].join('\n');
  return JSON.parse(execFileSync('/usr/bin/python3', ['-c', code, JSON.stringify(ZONES)], { encoding: 'utf8' })) as Record<string, [number, number]>;
}

const shown = (minutes: number) =>
  `UTC${minutes < 0 ? '\u2212' : '+'}${String(Math.floor(Math.abs(minutes) / 60)).padStart(2, '0')}:${String(Math.abs(minutes) % 60).padStart(2, '0')}`;

describe('time zones in words', () => {
  it('Etc/GMT+10, which readers take for UTC+10, is shown as UTC−10:00 with its name beside', () => {
    expect(formatTimeZone('Etc/GMT+10', 2024)).toBe('UTC\u221210:00 (Etc/GMT+10)');
  });

  it("every offset equals Python zoneinfo's for 1 January and 1 July, and a zone with daylight saving shows both", () => {
    const want = zoneinfoOffsets();
    for (const z of ZONES) {
      const [jan, jul] = want[z];
      expect(utcOffsetAt(z, Date.UTC(2024, 0, 1, 12)), z).toBe(shown(jan));
      expect(utcOffsetAt(z, Date.UTC(2024, 6, 1, 12)), z).toBe(shown(jul));
      const text = formatTimeZone(z, 2024);
      if (jan === jul) expect(text, z).toBe(`${shown(jan)} (${z})`);
      else expect(text, z).toBe(`${shown(Math.min(jan, jul))}, ${shown(Math.max(jan, jul))} with daylight saving (${z})`);
    }
  });
});
