/**
 * The work columns of `heathours point` (DESIGN.md §4): per workload class `limit_<class>_c` and
 * `work_fraction_<class>`, checked through a CSV row against the docs/methods.md §8.6 worked example
 * (heavy work 415 W, rest 115 W, REL/RAL curves; values computed with scipy from the equations, docs/methods.md §8.6).
 */
import { describe, it, expect } from 'vitest';
import { mkdtempSync, writeFileSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runPoint, classColumns } from '../../pipeline/commands/point.ts';
import { computePoint, type PointInput } from '../../pipeline/physics/point-row.ts';
import { globeFactors } from '../../pipeline/physics/liljegren-solve.ts';
import { D_GLOBE_STANDARD } from '../../pipeline/physics/constants.ts';

/** The globe `point` uses by default (the standard 150 mm globe). */
const GLOBE = globeFactors(D_GLOBE_STANDARD);

const dir = mkdtempSync(join(tmpdir(), 'heathours-point-work-'));

/** A night row (no solar, so sun WBGT = shade WBGT) with the air temperature left free. */
const night: Omit<PointInput, 'ta'> = {
  timeMs: Date.UTC(2010, 6, 1, 0),
  avgMinutes: 60,
  lat: 0,
  lon: 0,
  rh: 60,
  pressure: 1013.25,
  wind: 2,
  windHeight: 10,
  urban: false,
  dt: 0,
  solar: 0,
};

/** Air temperature [°C] at which the row's WBGT is `target` [°C], by bisection (WBGT rises with Ta). */
function airTemperatureFor(target: number): number {
  let lo = 10;
  let hi = 50;
  for (let k = 0; k < 80; k++) {
    const mid = 0.5 * (lo + hi);
    if (computePoint({ ...night, ta: mid }, GLOBE).wbgt < target) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

function csvFor(targets: number[]): string {
  const head = 'time_utc,lat,lon,ta_c,rh_pct,pressure_hpa,wind_ms,solar_wm2';
  const rows = targets.map((w) => `2010-07-01T00:00:00Z,0,0,${airTemperatureFor(w).toPrecision(17)},60,1013.25,2,0`);
  return `${[head, ...rows].join('\n')}\n`;
}

function readOut(path: string): { head: string[]; rows: Record<string, string>[] } {
  const lines = readFileSync(path, 'utf8').trim().split('\r\n');
  const head = lines[0].split(',');
  return { head, rows: lines.slice(1).map((l) => Object.fromEntries(l.split(',').map((v, i) => [head[i], v]))) };
}

describe('point work columns', () => {
  const inp = join(dir, 'worked.csv');
  writeFileSync(inp, csvFor([28.0, 29.5, 31.0]));

  it('the header lists, after the physics columns, limit_<class>_c and work_fraction_<class> for each default class, dashes as underscores, then status', async () => {
    await runPoint(inp, join(dir, 'a.csv'), { quiet: true });
    const { head } = readOut(join(dir, 'a.csv'));
    expect(head).toEqual([
      'time_utc',
      'lat',
      'lon',
      'ta_c',
      'rh_pct',
      'pressure_hpa',
      'wind_ms',
      'solar_wm2',
      'cos_zenith',
      'direct_fraction',
      'wind_2m_ms',
      'tg_c',
      'tnwb_c',
      'tpsy_c',
      'wbgt_c',
      'tg_shade_c',
      'tnwb_shade_c',
      'wbgt_shade_c',
      'tg_shelter_c',
      'tnwb_shelter_c',
      'wbgt_shelter_c',
      'limit_low_c',
      'work_fraction_low',
      'limit_moderate_c',
      'work_fraction_moderate',
      'limit_high_c',
      'work_fraction_high',
      'limit_very_high_c',
      'work_fraction_very_high',
      'status',
    ]);
    expect(classColumns('very-high')).toEqual(['limit_very_high_c', 'work_fraction_very_high']);
  });

  it('acclimatized (default): 415 W at WBGT 28.0 / 29.5 / 31.0 °C gives f = 0.660 / 0.390 / 0.189 (docs/methods.md §8.6 worked example) and limit 26.59 °C', async () => {
    await runPoint(inp, join(dir, 'b.csv'), { quiet: true });
    const { rows } = readOut(join(dir, 'b.csv'));
    expect(rows.map((r) => Number(r.wbgt_c))).toEqual([28, 29.5, 31]);
    const f = rows.map((r) => Number(r.work_fraction_high));
    [0.66, 0.39, 0.189].forEach((v, i) => expect(Math.abs(f[i] - v)).toBeLessThan(0.0015)); // table is rounded to 3 decimals
    // L = 56.7 − 11.5·log10(415) (docs/methods.md §8.2, NIOSH REL).
    expect(Number(rows[0].limit_high_c)).toBeCloseTo(56.7 - 11.5 * Math.log10(415), 3);
    // Lighter classes are allowed more of the hour at the same WBGT.
    for (const r of rows) expect(Number(r.work_fraction_low)).toBeGreaterThanOrEqual(Number(r.work_fraction_high));
  });

  it('--unacclimatized: f = 0.227 / 0.094 / 0 (docs/methods.md §8.6 worked example, RAL curve) and limit 59.9 − 14.1·log10 415', async () => {
    await runPoint(inp, join(dir, 'c.csv'), { quiet: true, unacclimatized: true });
    const { rows } = readOut(join(dir, 'c.csv'));
    const f = rows.map((r) => Number(r.work_fraction_high));
    [0.227, 0.094, 0].forEach((v, i) => expect(Math.abs(f[i] - v)).toBeLessThan(0.0015));
    expect(Number(rows[0].limit_high_c)).toBeCloseTo(59.9 - 14.1 * Math.log10(415), 3);
  });

  it('--cav 1.5 at WBGT 26.5 °C equals no clothing adjustment at 28.0 °C (the CAV adds to the WBGT, docs/methods.md §8.4) and lowers the stated limit by 1.5', async () => {
    const p = join(dir, 'cav.csv');
    writeFileSync(p, csvFor([26.5]));
    await runPoint(p, join(dir, 'd.csv'), { quiet: true, cav: 1.5 });
    const { rows } = readOut(join(dir, 'd.csv'));
    expect(Math.abs(Number(rows[0].work_fraction_high) - 0.66)).toBeLessThan(0.0015);
    expect(Number(rows[0].limit_high_c)).toBeCloseTo(56.7 - 11.5 * Math.log10(415) - 1.5, 3);
  });

  it('--classes FILE uses that file’s classes and rest rate; a missing or invalid file is a catalogued error', async () => {
    const yaml = join(dir, 'classes.yaml');
    writeFileSync(
      yaml,
      [
        'rest: { name: Rest, metabolicRate: 115, description: Break. }',
        'classes:',
        '  - { id: heavy-dig, name: Digging, metabolicRate: 415, description: Digging trenches. }',
      ].join('\n'),
    );
    await runPoint(inp, join(dir, 'e.csv'), { quiet: true, classesFile: yaml });
    const { head, rows } = readOut(join(dir, 'e.csv'));
    expect(head.slice(-3)).toEqual(['limit_heavy_dig_c', 'work_fraction_heavy_dig', 'status']);
    expect(Math.abs(Number(rows[0].work_fraction_heavy_dig) - 0.66)).toBeLessThan(0.0015);
    await expect(runPoint(inp, join(dir, 'f.csv'), { quiet: true, classesFile: join(dir, 'none.yaml') })).rejects.toMatchObject({
      code: 'PointClassesNotFound',
    });
    const bad = join(dir, 'bad.yaml');
    writeFileSync(
      bad,
      'rest: { name: Rest, metabolicRate: 115, description: Break. }\nclasses:\n  - { id: x, name: X, metabolicRate: 100, description: Too low. }\n',
    );
    await expect(runPoint(inp, join(dir, 'g.csv'), { quiet: true, classesFile: bad })).rejects.toMatchObject({ code: 'RestRateNotBelowWork' });
    const broken = join(dir, 'broken.yaml');
    writeFileSync(broken, 'rest: [unclosed\n');
    await expect(runPoint(inp, join(dir, 'h.csv'), { quiet: true, classesFile: broken })).rejects.toMatchObject({ code: 'PointClassesSyntax' });
    await expect(runPoint(inp, join(dir, 'i.csv'), { quiet: true, cav: 25 })).rejects.toMatchObject({ code: 'ClothingAdjustmentOutOfRange' });
  });
});
