/**
 * The `point` command's input (pipeline/physics/point-input.ts, pipeline/formats/csv.ts): times
 * are UTC whatever the machine's time zone (two TZ values, each in its own process), and every
 * damaged table (unbalanced quotes, wrong column counts, cells that are not numbers, values too
 * large to be numbers, a byte order mark, CRLF line ends) is read or ends in a catalogued error
 * naming the file and row, with nothing left behind. Rows are invented.
 */
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runPoint } from '../../pipeline/commands/point.ts';
import { parseUtcStamp } from '../../pipeline/physics/point-input.ts';
import { expectCatalogued, expectCataloguedAsync } from '../helpers/catalogued.ts';

const ROOT = new URL('../../', import.meta.url).pathname;
const dir = mkdtempSync(join(tmpdir(), 'hh-point-input-'));
const HEAD = 'time_utc,lat,lon,ta_c,rh_pct,pressure_hpa,wind_ms,solar_wm2';
const ROW = (t: string, ta = '32') => `${t},41.88,-87.63,${ta},50,1000,3,800`;
let n = 0;
const file = (text: string) => {
  const p = join(dir, `in${n++}.csv`);
  writeFileSync(p, text);
  return p;
};
const out = () => join(dir, `out${n++}.csv`);
/** What a run writing `o` left: the output itself or a temporary file beside it. */
const leftovers = (o: string) => readdirSync(dir).filter((f) => o.endsWith(`/${f}`) || f.includes('.tmp'));

function wbgtOf(path: string): string[] {
  const [head, ...rows] = readFileSync(path, 'utf8').trim().split('\r\n');
  const k = head.split(',').indexOf('wbgt_c');
  return rows.map((r) => r.split(',')[k]);
}

describe('time_utc is UTC', () => {
  it('a time without a zone gives the same WBGT with TZ=UTC and TZ=Asia/Tokyo (each a separate `heathours point` process), equal to the same time written with Z', () => {
    const inp = file(`${HEAD}\n${ROW('2024-07-15 12:00')}\n${ROW('2024-07-15T12:00Z')}\n`);
    const results = ['UTC', 'Asia/Tokyo'].map((tz) => {
      const o = out();
      const r = spawnSync(process.execPath, [join(ROOT, 'bin/heathours.mjs'), 'point', '--in', inp, '--out', o, '--quiet'], {
        encoding: 'utf8',
        env: { ...process.env, TZ: tz },
      });
      expect(r.status, r.stderr).toBe(0);
      return wbgtOf(o);
    });
    expect(results[0][0]).not.toBe('');
    expect(results[1]).toEqual(results[0]);
    expect(results[0][1]).toBe(results[0][0]);
  });

  it('Z, +00:00, -0000 and a space or T are accepted; a contradicting offset is PointTimeNotUtc, an impossible date PointBadTime, naming the row', async () => {
    const at = { path: 'x.csv', row: 7 };
    const t = Date.UTC(2024, 6, 15, 12);
    for (const s of ['2024-07-15T12:00Z', '2024-07-15 12:00:00+00:00', '2024-07-15T12:00:00.000-0000', '2024-07-15T12:00'])
      expect(parseUtcStamp(s, at)).toBe(t);
    expectCatalogued(() => parseUtcStamp('2024-07-15T12:00+09:00', at), 'PointTimeNotUtc', /offset \+09:00[\s\S]*row 7/);
    expectCatalogued(() => parseUtcStamp('2024-02-30T12:00Z', at), 'PointBadTime', /not a date and time of the calendar/);
    expectCatalogued(() => parseUtcStamp('15/07/2024 12:00', at), 'PointBadTime', /ISO 8601/);
    const inp = file(`${HEAD}\n${ROW('2024-07-15T12:00Z')}\n${ROW('2024-07-15T21:00+09:00')}\n`);
    const o = out();
    await expectCataloguedAsync(runPoint(inp, o, { quiet: true }), 'PointTimeNotUtc', new RegExp(`at: file ${inp}, key time_utc, row 3`));
    expect(leftovers(o)).toEqual([]);
  });
});

describe('damaged point tables', () => {
  it('a UTF-8 byte order mark and CRLF line ends are read like plain LF', async () => {
    const plain = file(`${HEAD}\n${ROW('2024-07-15T12:00Z')}\n`);
    const bom = file(`\ufeff${HEAD}\r\n${ROW('2024-07-15T12:00Z')}\r\n`);
    const [a, b] = [out(), out()];
    await runPoint(plain, a, { quiet: true });
    await runPoint(bom, b, { quiet: true });
    expect(readFileSync(b, 'utf8')).toBe(readFileSync(a, 'utf8'));
  });

  it('an unbalanced quote after the header is the catalogued CsvMalformed naming the line: the CLI exits 2 with its hint, no stream error, nothing left behind', () => {
    const inp = file(`site,${HEAD}\n"Yard 4, north gate\n`);
    const o = out();
    const r = spawnSync(process.execPath, [join(ROOT, 'bin/heathours.mjs'), 'point', '--in', inp, '--out', o, '--quiet'], { encoding: 'utf8' });
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/error \[CsvMalformed\][\s\S]*opened on line 2 is never closed[\s\S]*hint:/);
    expect(r.stderr).not.toMatch(/ERR_STREAM_DESTROYED|internal error/);
    expect(leftovers(o)).toEqual([]);
  });

  it('a row with more or fewer fields than the header is PointBadRow naming the line', async () => {
    await expectCataloguedAsync(
      runPoint(file(`${HEAD}\n${ROW('2024-07-15T12:00Z')},9\n`), out(), { quiet: true }),
      'PointBadRow',
      /line 2 has 9 field\(s\), the header has 8/,
    );
    await expectCataloguedAsync(
      runPoint(file(`${HEAD}\n${ROW('2024-07-15T12:00Z').replace(/,800$/, '')}\n`), out(), { quiet: true }),
      'PointBadRow',
      /line 2 has 7 field/,
    );
    await expectCataloguedAsync(runPoint(file(`${HEAD},lat\n`), out(), { quiet: true }), 'PointBadRow', /names column "lat" twice/);
  });

  it('a cell that is not a decimal number, or too large to be one, is PointBadValue naming row and column; NA, NaN and empty are missing; 1e300 °C is a row status', async () => {
    for (const bad of ['12abc', '0x1F', '1,5', 'Infinity', '1e309', '9'.repeat(400)]) {
      const inp = file(`${HEAD}\n${ROW('2024-07-15T12:00Z', bad.includes(',') ? `"${bad}"` : bad)}\n`);
      await expectCataloguedAsync(
        runPoint(inp, out(), { quiet: true }),
        'PointBadValue',
        /ta_c is "[^"]*"; expected a (finite )?decimal number[\s\S]*key ta_c, row 2/,
      );
    }
    const inp = file(`${HEAD}\n${ROW('2024-07-15T12:00Z', 'NA')}\n${ROW('2024-07-15T12:00Z', '')}\n${ROW('2024-07-15T12:00Z', '1e300')}\n`);
    const s = await runPoint(inp, out(), { quiet: true });
    expect(s.byStatus).toEqual({ missingInput: 2, airTemperatureOutOfRange: 1 });
    expect(readdirSync(dir).filter((f) => f.includes('.tmp'))).toEqual([]);
  });
});
