/**
 * `heathours estimate` on the invented small test atlas (test/site/pipeline-data.ts): the JSON
 * fields the issue names, the checks across the demo (P90 ≥ median; added days grow with the work
 * rate and fall with acclimatization and shade; starting in the coolest month never costs more
 * than in the hottest on the coast; crew-hours lost are the sum over the replayed days), the
 * nearest land cell for a point at sea, the CSV and the workbook read back by outside readers
 * (Python's csv module; openpyxl 3.0.9, Debian's python3-openpyxl), and every bad option as a
 * catalogued error with a hint, never NaN.
 */
import { execFile } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { beforeAll, describe, expect, it } from 'vitest';
import { buildPipelineData } from '../site/pipeline-data.ts';
import { formatEstimate, runEstimateCommand, type EstimateOptions } from '../../pipeline/commands/estimate.ts';
import { openEstimateAtlas, type EstimateAtlas } from '../../pipeline/run/estimate-atlas.ts';
import type { BidJson } from '../../pipeline/schedule/bid-json.ts';
import { parseInputs } from '../../pipeline/schedule/inputs.ts';
import { loadPlace } from '../../pipeline/schedule/place.ts';
import { replay, type ReplayDay } from '../../pipeline/schedule/replay.ts';
import { runBid } from '../../pipeline/schedule/run-bid.ts';
import { weatherYears } from '../../pipeline/schedule/weather-years.ts';
import { inputKernel } from '../../pipeline/schedule/run-bid.ts';
import { cellCentre } from '../../pipeline/schedule/inputs.ts';
import { parsePointChunk } from '../../pipeline/publish/point-tile-codec.ts';
import { expectCataloguedAsync } from '../helpers/catalogued.ts';
import { PROJECT_ROOT } from '../site/browser.ts';

const run = promisify(execFile);
let dataDir = '';
let atlas: EstimateAtlas;
let tmp = '';

beforeAll(async () => {
  dataDir = (await buildPipelineData()).dataDir;
  atlas = await openEstimateAtlas(dataDir);
  tmp = mkdtempSync(join(tmpdir(), 'estimate-cli-'));
}, 600_000);

const base = (o: Partial<EstimateOptions> = {}): EstimateOptions => ({
  atlas: dataDir,
  region: 'sollent-coast',
  start: '2027-05-03',
  workHours: '20000',
  crew: '20',
  rate: '35',
  dailyCost: '1500',
  currency: 'EUR',
  ...o,
});

/** Every number anywhere in the JSON. */
function numbers(v: unknown, out: number[] = []): number[] {
  if (typeof v === 'number') out.push(v);
  else if (Array.isArray(v)) v.forEach((x) => numbers(x, out));
  else if (v && typeof v === 'object') Object.values(v).forEach((x) => numbers(x, out));
  return out;
}

describe('heathours estimate', () => {
  it('--json holds finishDate, addedWorkingDays and crewHoursLost as {mean,p50,p90}, cost {mean,p90}, 12 startMonths with addedWorkingDays {p50,p90}, one years entry per replayed year; no number is NaN; the process exits 0', async () => {
    const { stdout } = await run(
      process.execPath,
      [
        join(PROJECT_ROOT, 'bin/heathours.mjs'),
        'estimate',
        '--atlas',
        dataDir,
        '--region',
        'sollent-coast',
        '--start',
        '2027-05-03',
        '--work-hours',
        '20000',
        '--crew',
        '20',
        '--rate',
        '35',
        '--daily-cost',
        '1500',
        '--currency',
        'EUR',
        '--json',
      ],
      { maxBuffer: 1 << 24 },
    );
    const j = JSON.parse(stdout) as BidJson;
    for (const k of ['finishDate', 'addedWorkingDays', 'crewHoursLost'] as const) expect(Object.keys(j[k]).sort()).toEqual(['mean', 'p50', 'p90']);
    expect(j.finishDate.p90).toMatch(/^\d{4}-\d{2}-\d{2}$/);
    expect(typeof j.cost.mean).toBe('number');
    expect(typeof j.cost.p90).toBe('number');
    expect(j.startMonths).toHaveLength(12);
    for (const m of j.startMonths) expect(typeof m.addedWorkingDays.p50 + typeof m.addedWorkingDays.p90).toBe('numbernumber');
    expect(j.years.map((y) => y.weatherYear)).toEqual(j.weatherYears);
    expect(j.years.length).toBe(atlas.ctx.years.length);
    expect(numbers(j).every(Number.isFinite)).toBe(true);
    expect(j.invented).toBe(true);
    expect(j.cautions.length).toBeGreaterThanOrEqual(5);
    // The same call in-process gives the same object.
    expect(await runEstimateCommand(base())).toEqual(j);
    // The human-readable table says the same, and that the data are invented.
    const text = formatEstimate(j);
    expect(text).toContain('INVENTED DATA');
    expect(text).toContain(j.finishDate.p90);
  });

  it('across the demo: P90 ≥ median everywhere; added days grow with the work rate and fall with acclimatization and with shade', async () => {
    const added = async (o: Partial<EstimateOptions>) => (await runEstimateCommand(base(o))).addedWorkingDays;
    for (const region of atlas.ctx.regions) {
      const low = await added({ region: region.id, class: 'low' });
      const moderate = await added({ region: region.id, class: 'moderate' });
      const high = await added({ region: region.id, class: 'high' });
      const unacc = await added({ region: region.id, class: 'moderate', unacclimatized: true });
      const shade = await added({ region: region.id, class: 'moderate', shade: true });
      for (const a of [low, moderate, high, unacc, shade]) expect(a.p90).toBeGreaterThanOrEqual(a.p50);
      expect(moderate.mean, region.id).toBeGreaterThanOrEqual(low.mean);
      expect(high.mean, region.id).toBeGreaterThanOrEqual(moderate.mean);
      expect(unacc.mean, region.id).toBeGreaterThanOrEqual(moderate.mean);
      expect(shade.mean, region.id).toBeLessThanOrEqual(moderate.mean);
    }
    // Not trivially equal: on the coast the work rate and shade change the answer.
    const coast = await added({ class: 'high' });
    expect(coast.mean).toBeGreaterThan((await added({ class: 'low' })).mean);
    expect((await added({ shade: true })).mean).toBeLessThan((await added({})).mean);
  });

  it('on the coast, the same job started in the coolest month never costs more than started in the hottest (by the month’s share of shift hours lost)', async () => {
    for (const region of atlas.ctx.regions.filter((r) => r.id.endsWith('coast'))) {
      const j = await runEstimateCommand(base({ region: region.id, workHours: '4000' }));
      // Hottest and coolest month from the replayed weather itself (moderate work, in the sun).
      const inputs = parseInputs({ region: region.id }, atlas.ctx, 'C');
      const { histograms } = await loadPlace(inputs.place, atlas.ctx, atlas.load);
      const w = weatherYears(histograms, atlas.ctx.years, { kernel: inputKernel(inputs, atlas.ctx), exposure: 'sun', rest: { kind: 'same-place' } }).usable;
      const monthLoss = Array.from({ length: 12 }, (_, m) =>
        w.reduce((s, y) => s + y.lostRate.subarray(m * 24 + 7, m * 24 + 17).reduce((a, b) => a + b, 0), 0),
      );
      const hottest = monthLoss.indexOf(Math.max(...monthLoss));
      const coolest = monthLoss.indexOf(Math.min(...monthLoss));
      expect(hottest).not.toBe(coolest);
      expect(j.startMonths[coolest].cost.p50, region.id).toBeLessThanOrEqual(j.startMonths[hottest].cost.p50);
      expect(j.startMonths[coolest].cost.p90, region.id).toBeLessThanOrEqual(j.startMonths[hottest].cost.p90);
      expect(j.startMonths[hottest].cost.p50).toBeGreaterThan(0);
    }
  });

  it('crew-hours lost of each replayed year are the sum over its replayed days, and the productive hours add up to the job', async () => {
    const inputs = parseInputs({ region: 'sollent-coast', start: '2027-05-03', 'work-hours': '20000', crew: '20' }, atlas.ctx, 'C');
    const { histograms } = await loadPlace(inputs.place, atlas.ctx, atlas.load);
    const r = runBid(histograms, inputs, atlas.ctx);
    r.answer.schedule.years.forEach((y, i) => {
      const days: ReplayDay[] = [];
      replay({ start: inputs.job.start, workHours: 20000, crew: 20, pattern: inputs.shift, holidays: new Set() }, r.weather.usable, i, (d) => days.push(d));
      expect(days.reduce((s, d) => s + d.lost, 0)).toBeCloseTo(y.crewHoursLost, 6);
      expect(days.reduce((s, d) => s + d.productive, 0)).toBeCloseTo(20000, 6);
      expect(days.length).toBe(y.workingDays);
    });
  });

  it('a point on a sea cell takes the nearest land cell, with the distance from the point to its centre', async () => {
    const g = atlas.ctx.cells!.grid;
    const land = new Set<number>();
    for (const c of atlas.ctx.cells!.chunks) for (const id of parsePointChunk(await atlas.load(c.path), c.path).cells) land.add(id);
    const sea = [...Array(g.nLat * g.nLon).keys()].find((c) => !land.has(c) && [c - 1, c + 1, c - g.nLon, c + g.nLon].some((n) => land.has(n)))!;
    const p = cellCentre(g, sea);
    const j = await runEstimateCommand(base({ region: undefined, cell: `${p.lat},${p.lon}` }));
    expect(j.place.kind).toBe('cell');
    if (j.place.kind !== 'cell') return;
    expect(j.place.movedToLand).toBe(true);
    expect(land.has(j.place.cell)).toBe(true);
    // Nearest: no land cell centre is closer (brute force over every land cell).
    const rad = Math.PI / 180;
    const hav = (a: { lat: number; lon: number }) =>
      2 *
      6371.0088 *
      Math.asin(
        Math.sqrt(Math.sin(((a.lat - p.lat) * rad) / 2) ** 2 + Math.cos(a.lat * rad) * Math.cos(p.lat * rad) * Math.sin(((a.lon - p.lon) * rad) / 2) ** 2),
      );
    const best = Math.min(...[...land].map((c) => hav(cellCentre(g, c))));
    expect(j.place.distanceKm).toBeCloseTo(best, 1);
    // One grid step at these latitudes is about 111 km × the step in degrees.
    expect(j.place.distanceKm).toBeGreaterThan(0.5 * 111.19 * Math.min(g.dLat, g.dLon * Math.cos(p.lat * rad)));
    expect(j.settings.place).toMatch(/sea cell; nearest land grid cell \d+ .*km from the point/);
  });

  it('--csv and --xlsx write files that Python’s csv module and openpyxl read back with the same figures, the assumptions and the cautions', async () => {
    const csvPath = join(tmp, 'bid.csv');
    const xlsxPath = join(tmp, 'bid.xlsx');
    await run(
      process.execPath,
      [
        join(PROJECT_ROOT, 'bin/heathours.mjs'),
        'estimate',
        '--atlas',
        dataDir,
        '--region',
        'sollent-coast',
        '--start',
        '2027-05-03',
        '--crew',
        '20',
        '--rate',
        '35',
        '--daily-cost',
        '1500',
        '--currency',
        'EUR',
        '--csv',
        csvPath,
        '--xlsx',
        xlsxPath,
        '--json',
      ],
      { maxBuffer: 1 << 24 },
    );
    const j = await runEstimateCommand(base({ workHours: undefined }));
    const text = readFileSync(csvPath, 'utf8');
    expect(text.charCodeAt(0)).toBe(0xfeff);
    const py = await run('/usr/bin/python3', [
      '-c',
      [
        'import csv, json, sys',
        'rows = list(csv.reader(open(sys.argv[1], encoding="utf-8-sig")))',
        'comments = [r for r in rows if r and r[0] == "#"]',
        'data = [r for r in rows if r and r[0] != "#"]',
        'print(json.dumps({"comments": comments, "head": data[0], "rows": data[1:]}))',
      ].join('\n'),
      csvPath,
    ]);
    const parsed = JSON.parse(py.stdout) as { comments: string[][]; head: string[]; rows: string[][] };
    for (const c of parsed.comments) expect(c).toHaveLength(2);
    expect(parsed.comments.map((c) => c[1]).join('\n')).toContain('INVENTED DATA');
    expect(parsed.head).toEqual(['section', 'case', 'figure', 'statistic', 'value', 'unit']);
    const get = (section: string, figure: string, stat: string) => parsed.rows.find((r) => r[0] === section && r[2] === figure && r[3] === stat)![4];
    expect(Number(get('schedule', 'crewHoursLost', 'p90'))).toBe(j.crewHoursLost.p90);
    expect(get('schedule', 'finishDate', 'p90')).toBe(j.finishDate.p90);
    expect(Number(get('schedule', 'cost', 'mean'))).toBe(j.cost.mean);
    const xl = await run('/usr/bin/python3', [
      '-c',
      [
        'import json, sys, openpyxl',
        'wb = openpyxl.load_workbook(sys.argv[1], read_only=True)',
        'print(json.dumps({ws.title: [[c for c in row] for row in ws.iter_rows(values_only=True)] for ws in wb.worksheets}, default=str))',
      ].join('\n'),
      xlsxPath,
    ]);
    const book = JSON.parse(xl.stdout) as Record<string, Array<Array<string | number | null>>>;
    expect(Object.keys(book)).toEqual(['Schedule', 'Years', 'Start months', 'Shift patterns', 'Assumptions', 'Cautions']);
    const sched = book.Schedule;
    expect(sched[0]).toEqual(['Figure', 'Unit', 'Mean', 'Median (P50)', 'P90 year', 'Without heat']);
    const lostRow = sched.find((r) => r[0] === 'Crew-hours lost to rest breaks')!;
    expect(lostRow.slice(2, 5)).toEqual([j.crewHoursLost.mean, j.crewHoursLost.p50, j.crewHoursLost.p90]);
    expect(book.Years.length - 1).toBe(j.years.length);
    expect(book['Start months'].length - 1).toBe(12);
    expect(JSON.stringify(book.Assumptions)).toContain('INVENTED DATA');
    expect(JSON.stringify(book.Assumptions)).toContain(j.atlas.buildTime);
    expect(book.Cautions.length - 1).toBe(j.cautions.length);
  });

  it('bad options are catalogued errors with hints (exit status 2 from the command), never NaN', async () => {
    const bad = async (o: Partial<EstimateOptions>, code: string, match?: RegExp) => expectCataloguedAsync(() => runEstimateCommand(base(o)), code, match);
    await bad({ region: 'atlantis' }, 'EstimateRegionUnknown', /atlantis/);
    await bad({ region: undefined, cell: '95,10' }, 'EstimateNumberInvalid', /lat/);
    await bad({ region: undefined, cell: 'north' }, 'EstimateNumberInvalid', /LAT,LON/);
    await bad({ region: undefined, cell: '-60,10' }, 'EstimatePointOutsideGrid');
    await bad({ start: '2027-02-30' }, 'ScheduleDateInvalid', /no such day/);
    await bad({ start: 'tomorrow' }, 'ScheduleDateInvalid');
    await bad({ workHours: '0' }, 'ScheduleNumberInvalid', /work-hours/);
    await bad({ workHours: 'NaN' }, 'ScheduleNumberInvalid');
    await bad({ workHours: '1e12' }, 'ScheduleNumberInvalid');
    await bad({ crew: '2.5' }, 'ScheduleNumberInvalid', /crew/);
    await bad({ rate: '-3' }, 'ScheduleNumberInvalid', /rate/);
    await bad({ dailyCost: 'Infinity' }, 'ScheduleNumberInvalid', /daily-cost/);
    await bad({ currency: 'a very long currency name' }, 'ScheduleNumberInvalid', /currency/);
    await bad({ shift: ['07:00-12:00', '11:00-16:00'] }, 'ScheduleShiftInvalid', /overlaps/);
    await bad({ days: 'someday' }, 'ScheduleDaysInvalid');
    await bad({ compareShift: ['05:00-09:00', '06:00-10:00', '07:00-11:00', '08:00-12:00'] }, 'ScheduleTooManyPatterns');
    await bad({ class: 'sprinting' }, 'EstimateChoiceUnknown', /sprinting/);
    await bad({ metabolicRate: '2000' }, 'EstimateNumberInvalid', /metabolic-rate/);
    await bad({ deadline: '2027-05-01' }, 'ScheduleDeadlineUnreachable', /before the start/);
    await bad({ deadline: '2027-05-02', start: '2027-05-02' }, 'ScheduleDeadlineUnreachable', /100,000 workers/); // a Sunday: the first working day is the Monday
    await bad({ workHours: '90000000', crew: '1' }, 'ScheduleNotFinished', /not done 20 years/);
    const holidays = join(tmp, 'holidays.txt');
    writeFileSync(holidays, '# site holidays\n2027-06-01 Founders day\n2027-13-01\n');
    const e = await bad({ holidays }, 'ScheduleHolidayInvalid', /line 3/);
    expect(e.where.file).toBe(holidays);
    await bad({ holidays: join(tmp, 'missing.txt') }, 'ScheduleHolidayInvalid', /cannot be read/);
    await expectCataloguedAsync(() => runEstimateCommand(base({ atlas: tmp })), 'EstimateAtlasNotFound', /data\/manifest\.json/);
    // The command itself prints the error with its hint and exits with status 2.
    const r = await run(process.execPath, [
      join(PROJECT_ROOT, 'bin/heathours.mjs'),
      'estimate',
      '--atlas',
      dataDir,
      '--region',
      'sollent-coast',
      '--crew',
      'many',
    ]).catch((x: { code: number; stderr: string }) => x);
    expect((r as { code: number }).code).toBe(2);
    expect((r as { stderr: string }).stderr).toMatch(/ScheduleNumberInvalid[\s\S]*hint:/);
  });

  it('holidays push the finish: a listed working day is not worked', async () => {
    const holidays = join(tmp, 'h2.txt');
    writeFileSync(holidays, '2027-05-04\n2027-05-05\n');
    const withH = await runEstimateCommand(base({ holidays }));
    const without = await runEstimateCommand(base());
    expect(withH.heatFree.calendarDays).toBe(without.heatFree.calendarDays + 2);
    expect(withH.job.holidays).toEqual(['2027-05-04', '2027-05-05']);
  });
});
