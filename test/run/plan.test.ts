import { describe, expect, it } from 'vitest';
import { landCellsOf } from '../../pipeline/model/grid.ts';
import { planShards, sliceShards, yearPieces } from '../../pipeline/run/plan.ts';

const HOUR = 3_600_000;
// Hourly data with end-of-hour stamps from 2021-01-01 01:00 UTC to 2024-01-01 00:00 UTC (three UTC years).
const time = { start: Date.UTC(2021, 0, 1, 1), count: 3 * 8760 };
// A 4-row × 3-column grid (coordinates invented for the test).
const grid43 = { lat: Float64Array.of(0, 1, 2, 3), lon: Float64Array.of(10, 11, 12) };
const stamp = (h: number) => new Date(time.start + h * HOUR).toISOString();

describe('the shard plan', () => {
  it('cuts a local year where the UTC year of its hours changes: UTC−10 gives the year and a 10-hour piece of the next UTC year', () => {
    const p = yearPieces(time, 2022, 'Etc/GMT+10');
    expect(p.map((x) => x.utcYear)).toEqual([2022, 2023]);
    // The hours starting in UTC 2022 (stamps 01:00 on 1 January to 00:00 on 1 January 2023) …
    expect([stamp(p[0].hours[0]), stamp(p[0].hours[1] - 1)]).toEqual(['2022-01-01T01:00:00.000Z', '2023-01-01T00:00:00.000Z']);
    // … and the 26-hour margin into UTC 2023 (the accumulator keeps only its 10 hours of local 2022).
    expect([stamp(p[1].hours[0]), p[1].hours[1] - p[1].hours[0]]).toEqual(['2023-01-01T01:00:00.000Z', 26]);
    // The margin before (stamps to 2022-01-01 00:00, local 2021) holds no local-2022 hour: no piece.
  });

  it('east of UTC (Asia/Dubai, UTC+4) the local year starts in the previous UTC year and needs no piece of the next', () => {
    const p = yearPieces(time, 2022, 'Asia/Dubai');
    expect(p.map((x) => x.utcYear)).toEqual([2021, 2022]);
  });

  it('names shards by tile, year and piece, and slices K of N take every N-th shard', () => {
    const land = Uint8Array.from({ length: 4 * 3 }, (_, i) => (i % 3 === 0 ? 0 : 1));
    const shards = planShards(landCellsOf(grid43, land), [2022], (y) => yearPieces(time, y, 'Etc/GMT+10'), 4);
    expect(shards.map((s) => s.id)).toEqual(['t00-y2022', 't01-y2022', 't00-y2022-u2023', 't01-y2022-u2023']);
    expect(shards.every((s) => s.cells.length === 4)).toBe(true);
    expect(sliceShards(shards, 2, 3).map((s) => s.id)).toEqual(['t01-y2022']);
    expect([1, 2, 3].flatMap((k) => sliceShards(shards, k, 3)).length).toBe(shards.length);
  });

  it('cuts each UTC year into local quarters: the pieces cover every hour of the range once, each inside one quarter, named by its first local month', () => {
    const p = yearPieces(time, 2022, 'Etc/GMT+10', 3);
    expect(p.map((x) => [x.utcYear, x.months])).toEqual([
      [2022, [0, 3]],
      [2022, [3, 6]],
      [2022, [6, 9]],
      [2022, [9, 12]],
      [2023, [11, 12]],
    ]);
    // Contiguous and complete: the same hours as the whole-year pieces.
    const whole = yearPieces(time, 2022, 'Etc/GMT+10');
    expect(p[0].hours[0]).toBe(whole[0].hours[0]);
    expect(p[p.length - 1].hours[1]).toBe(whole[whole.length - 1].hours[1]);
    for (let i = 1; i < p.length; i++) expect(p[i].hours[0]).toBe(p[i - 1].hours[1]);
    // The second quarter starts at local 1 April 00:00 = 10:00 UTC (its first hour ends 11:00).
    expect(stamp(p[1].hours[0])).toBe('2022-04-01T11:00:00.000Z');
    const land = Uint8Array.from({ length: 4 * 3 }, () => 1);
    const shards = planShards(landCellsOf(grid43, land), [2022], (y) => yearPieces(time, y, 'Etc/GMT+10', 3), 1024, 3);
    expect(shards.map((s) => s.id)).toEqual(['t00-y2022-m01', 't00-y2022-m04', 't00-y2022-m07', 't00-y2022-m10', 't00-y2022-u2023-m12']);
  });

  it('with daylight saving (Europe/Berlin) a quarter still starts at local midnight of its first day', () => {
    const p = yearPieces(time, 2022, 'Europe/Berlin', 3);
    // Local 1 April 2022 00:00 is 31 March 22:00 UTC (summer time, UTC+2): the first hour ends 23:00.
    expect(stamp(p.find((x) => x.months[0] === 3)!.hours[0])).toBe('2022-03-31T23:00:00.000Z');
    // Local 1 October 00:00 is 30 September 22:00 UTC.
    expect(stamp(p.find((x) => x.months[0] === 9)!.hours[0])).toBe('2022-09-30T23:00:00.000Z');
  });
});
