import { describe, expect, it } from 'vitest';
import { planShards, sliceShards, yearPieces } from '../../pipeline/run/plan.ts';

const HOUR = 3_600_000;
// Hourly data with end-of-hour stamps from 2021-01-01 01:00 UTC to 2024-01-01 00:00 UTC (three UTC years).
const time = { start: Date.UTC(2021, 0, 1, 1), count: 3 * 8760 };
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
    const shards = planShards(4, 3, land, [2022], (y) => yearPieces(time, y, 'Etc/GMT+10'), 4);
    expect(shards.map((s) => s.id)).toEqual(['t00-y2022', 't01-y2022', 't00-y2022-u2023', 't01-y2022-u2023']);
    expect(shards.every((s) => s.cells.length === 4)).toBe(true);
    expect(sliceShards(shards, 2, 3).map((s) => s.id)).toEqual(['t01-y2022']);
    expect([1, 2, 3].flatMap((k) => sliceShards(shards, k, 3)).length).toBe(shards.length);
  });
});
