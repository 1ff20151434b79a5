/**
 * How close the day-by-day replay on the published histograms comes to an hour-by-hour replay of
 * the same weather, for grid cells of the invented small test atlas (test/site/pipeline-data.ts).
 *
 * The hourly reference is built here from the pipeline's own stages, independently of the
 * histograms: pipeline/read reads the demo NetCDF files of one cell, pipeline/physics computes its
 * hourly WBGT in the sun (Liljegren et al. 2008), pipeline/work gives each hour's allowable work
 * fraction (docs/methods.md §8.6), and the job is replayed day by day with each working day's actual
 * hours (local time from pipeline/work/shifts.ts; the calendar from JavaScript's Date, not from
 * pipeline/schedule/calendar.ts). The schedule stage instead gives every working day of a month the
 * month's expected loss at that hour. The largest differences found are printed and must stay
 * within what pipeline/schedule/approximation.ts states on the page and in the CLI help.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { buildPipelineData } from '../site/pipeline-data.ts';
import { openEstimateAtlas, type EstimateAtlas } from '../../pipeline/run/estimate-atlas.ts';
import { openDataset } from '../../pipeline/read/index.ts';
import { computeHourlyBlock } from '../../pipeline/physics/block.ts';
import { localHours } from '../../pipeline/work/shifts.ts';
import { allowableWorkFraction, prepareWorkKernel, type WorkKernel } from '../../pipeline/work/work-fraction.ts';
import { loadPlace } from '../../pipeline/schedule/place.ts';
import { weatherYears } from '../../pipeline/schedule/weather-years.ts';
import { scheduleSpread } from '../../pipeline/schedule/bid.ts';
import { parseDay } from '../../pipeline/schedule/calendar.ts';
import { parsePattern, hourWeights, dayMask } from '../../pipeline/schedule/shift-pattern.ts';
import { spread } from '../../pipeline/schedule/statistics.ts';
import { MEASURED } from '../../pipeline/schedule/approximation.ts';

let atlas: EstimateAtlas;
let inputs: string[] = [];
/** The globe diameter the atlas was built with [m] (its manifest): the reference uses the same physics. */
let globeDiameter = 0;

beforeAll(async () => {
  const data = await buildPipelineData();
  atlas = await openEstimateAtlas(data.dataDir);
  globeDiameter = (JSON.parse(readFileSync(join(data.dataDir, 'data', 'manifest.json'), 'utf8')) as { physics: { globeDiameter: number } }).physics
    .globeDiameter;
  const dir = join(dirname(data.configPath), 'inputs');
  inputs = readdirSync(dir)
    .filter((f) => f.endsWith('.nc'))
    .map((f) => join(dir, f));
}, 600_000);

const DAY = 86_400_000;
const key = (y: number, m: number, d: number, h: number) => ((y * 13 + m) * 32 + d) * 24 + h;

/** Hourly WBGT in the sun of one cell by local (year, month, day, hour). */
async function hourlyWbgt(cell: number): Promise<Map<number, number>> {
  const ds = await openDataset(inputs, { product: 'era5', landSeaMask: { variable: 'lsm', threshold: 0.5 } } as never);
  const nLon = ds.grid.lon.length;
  const tile = { y0: Math.floor(cell / nLon), y1: Math.floor(cell / nLon) + 1, x0: cell % nLon, x1: (cell % nLon) + 1 };
  const out = new Map<number, number>();
  const step = 24 * 62;
  try {
    for (let t0 = 0; t0 < ds.time.count; t0 += step) {
      const block = await ds.readBlock(t0, Math.min(step, ds.time.count - t0), tile);
      const phys = computeHourlyBlock(block, { globeDiameter });
      const local = localHours(block.time, atlas.ctx.timeZone);
      for (let i = 0; i < block.time.length; i++) {
        if (Number.isFinite(phys.wbgtSun[i])) out.set(key(local.year[i], local.month[i], local.day[i], local.hour[i]), phys.wbgtSun[i]);
      }
    }
  } finally {
    await ds.close();
  }
  return out;
}

interface HourlyOutcome {
  workingDays: number;
  crewHoursLost: number;
}

/**
 * Hour-by-hour replay: job calendar from `start` (JavaScript Date, UTC days), weather year
 * `years[(first + job year offset) mod n]` on the same month and day (29 February → 28 in a
 * common year); a missing hour takes the same hour of the day before.
 */
function hourlyReplay(
  wbgt: Map<number, number>,
  years: number[],
  first: number,
  start: string,
  work: number,
  crew: number,
  kernel: WorkKernel,
  pattern: ReturnType<typeof parsePattern>,
): HourlyOutcome {
  const weights = hourWeights(pattern);
  const mask = dayMask(pattern);
  const t0 = Date.parse(`${start}T00:00:00Z`);
  const y0 = new Date(t0).getUTCFullYear();
  let done = 0;
  let lost = 0;
  let workingDays = 0;
  for (let t = t0; ; t += DAY) {
    const date = new Date(t);
    const wd = ((date.getUTCDay() + 6) % 7) + 1;
    if ((mask & (1 << wd)) === 0) continue;
    let paid = 0;
    let dayLost = 0;
    for (const w of weights) {
      const hd = new Date(t + w.dayOffset * DAY);
      const wy = years[(first + hd.getUTCFullYear() - y0) % years.length];
      const m = hd.getUTCMonth() + 1;
      let d = hd.getUTCDate();
      if (m === 2 && d === 29 && new Date(Date.UTC(wy, 1, 29)).getUTCMonth() !== 1) d = 28;
      let v = wbgt.get(key(wy, m, d, w.hour));
      for (let back = 1; v === undefined && back < 5; back++) {
        const p = new Date(Date.UTC(wy, m - 1, d) - back * DAY);
        v = wbgt.get(key(p.getUTCFullYear(), p.getUTCMonth() + 1, p.getUTCDate(), w.hour));
      }
      if (v === undefined) throw new Error(`no WBGT for ${wy}-${m}-${d} ${w.hour}h`);
      paid += w.weight;
      dayLost += w.weight * (1 - allowableWorkFraction(v, null, kernel));
    }
    const productive = crew * (paid - dayLost);
    workingDays++;
    const share = done + productive >= work ? (work - done) / productive : 1;
    lost += crew * dayLost * share;
    if (share < 1 || done + productive >= work) return { workingDays, crewHoursLost: lost };
    done += productive;
  }
}

describe('the day-by-day replay against an hour-by-hour replay of the same weather (grid cells of the invented test atlas)', () => {
  it(`for 4 cells × 2 work settings × 12 start months of a 100-day job, added working days differ by at most ${MEASURED.addedDaysP50} days at P50 and ${MEASURED.addedDaysP90} at P90, crew-hours lost by at most ${100 * MEASURED.lostShareOfJob} % of the job and ${100 * MEASURED.lostShareWhenLarge} % where heat takes 1,000 crew-hours or more`, async () => {
    const chunks = atlas.ctx.cells!.chunks;
    const land: number[] = [];
    for (const c of chunks) {
      const { parsePointChunk } = await import('../../pipeline/publish/point-tile-codec.ts');
      land.push(...parsePointChunk(await atlas.load(c.path), c.path).cells);
    }
    const cells = [land[0], land[Math.floor(land.length / 3)], land[Math.floor((2 * land.length) / 3)], land[land.length - 1]];
    const pattern = parsePattern(['07:00-17:00'], 'mon-sat');
    const settings = [
      { name: 'moderate, acclimatized', workRate: 300, acclimatization: 'acclimatized' as const },
      { name: 'high, unacclimatized', workRate: 415, acclimatization: 'unacclimatized' as const },
    ];
    let worstP50 = 0;
    let worstP90 = 0;
    let worstLost = 0;
    let worstOfJob = 0;
    let worstWhat = '';
    const p50s: number[] = [];
    const rels: number[] = [];
    let cases = 0;
    let hot = 0;
    for (const cell of cells) {
      const wbgt = await hourlyWbgt(cell);
      const { histograms } = await loadPlace({ kind: 'cell', cell }, atlas.ctx, atlas.load);
      for (const s of settings) {
        const kernel = prepareWorkKernel({
          workRate: s.workRate,
          restRate: atlas.ctx.restRate,
          limit: { model: 'curve-2017', acclimatization: s.acclimatization },
        });
        const weather = weatherYears(histograms, atlas.ctx.years, { kernel, exposure: 'sun', rest: { kind: 'same-place' } }).usable;
        const years = weather.map((w) => w.year);
        for (let m = 1; m <= 12; m++) {
          const start = `2027-${String(m).padStart(2, '0')}-01`;
          const job = { start: parseDay(start, 'start'), workHours: 20_000, crew: 20, pattern, holidays: new Set<number>() };
          const fromHist = scheduleSpread(job, { rate: 0, dailyCost: 0, currency: '' }, weather);
          const heatFree = fromHist.heatFree.workingDays;
          const hourly = years.map((_, i) => hourlyReplay(wbgt, years, i, start, 20_000, 20, kernel, pattern));
          const added = spread(hourly.map((h) => h.workingDays - heatFree));
          const lost = hourly.map((h) => h.crewHoursLost);
          const dP50 = Math.abs(fromHist.addedWorkingDays.p50 - added.p50);
          const dP90 = Math.abs(fromHist.addedWorkingDays.p90 - added.p90);
          worstP50 = Math.max(worstP50, dP50);
          worstP90 = Math.max(worstP90, dP90);
          p50s.push(dP50);
          fromHist.years.forEach((y, i) => {
            worstOfJob = Math.max(worstOfJob, Math.abs(y.crewHoursLost - lost[i]) / 20_000);
            // Relative to the hourly figure, where heat takes at least 5 % of the job's hours.
            if (lost[i] < 1000) return;
            hot++;
            rels.push(Math.abs(y.crewHoursLost - lost[i]) / lost[i]);
            const rel = Math.abs(y.crewHoursLost - lost[i]) / lost[i];
            if (rel > worstLost) {
              worstLost = rel;
              worstWhat = `cell ${cell}, ${s.name}, start ${start}, weather ${y.weatherYear}: ${y.crewHoursLost.toFixed(0)} vs ${lost[i].toFixed(0)} crew-hours`;
            }
          });
          cases++;
        }
      }
    }
    const median = (a: number[]) => spread(a).p50;
    process.stderr.write(
      `day-by-day vs hour-by-hour, ${cases} cases of a 20,000 crew-hour job (100 working days without heat): added working days P50 at most ±${worstP50.toFixed(2)} (median ±${median(p50s).toFixed(2)}), P90 at most ±${worstP90.toFixed(2)}; ` +
        `crew-hours lost at most ±${(100 * worstOfJob).toFixed(2)} % of the job, and in the ${hot} replays losing ≥ 1,000 crew-hours at most ±${(100 * worstLost).toFixed(1)} % (median ±${(100 * median(rels)).toFixed(1)} %; ${worstWhat})\n`,
    );
    expect(cases).toBe(cells.length * settings.length * 12);
    expect(hot, 'the test cells lose real time to heat').toBeGreaterThan(20);
    expect(worstP50).toBeLessThanOrEqual(MEASURED.addedDaysP50);
    expect(worstP90).toBeLessThanOrEqual(MEASURED.addedDaysP90);
    expect(worstOfJob).toBeLessThanOrEqual(MEASURED.lostShareOfJob);
    expect(worstLost).toBeLessThanOrEqual(MEASURED.lostShareWhenLarge);
  }, 600_000);
});
