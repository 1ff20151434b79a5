/**
 * `heathours estimate --atlas DIR …`: the /estimate/ page's schedule, cost and comparisons for one
 * job at one place, on the command line (the same code: pipeline/schedule). Prints a table, or
 * with `--json` the page's JSON download; `--csv FILE` and `--xlsx FILE` write the CSV download
 * and a workbook. Every option maps to the page's form field of the same meaning and goes through
 * the same checks (pipeline/schedule/inputs.ts), so a bad option is a catalogued error with a hint.
 */
import { readFile } from 'node:fs/promises';
import { writeFileAtomic } from '../model/effects.ts';
import './catalogue.ts';
import { bidCsv } from '../schedule/bid-csv.ts';
import { bidJson, type BidJson } from '../schedule/bid-json.ts';
import { bidSheets } from '../schedule/bid-sheets.ts';
import { SCHEDULE_ROWS, STATISTICS, rowUnit, scheduleValue, showValue } from '../schedule/bid-table.ts';
import { EstimateNumberInvalid, ScheduleHolidayInvalid } from '../schedule/errors.ts';
import { parseHolidays } from '../schedule/job.ts';
import { parseInputs, type RawInputs } from '../schedule/inputs.ts';
import { loadPlace } from '../schedule/place.ts';
import { runBid } from '../schedule/run-bid.ts';
import { runScenarios } from '../schedule/scenario-runs.ts';
import { grouped } from '../schedule/settings-text.ts';
import { openEstimateAtlas } from '../run/estimate-atlas.ts';

/** The command's options as commander gives them. */
export interface EstimateOptions {
  atlas: string;
  region?: string;
  cell?: string;
  cellId?: string;
  class?: string;
  metabolicRate?: string;
  unacclimatized?: boolean;
  shade?: boolean;
  restInShade?: boolean;
  restWbgt?: string;
  clothing?: string;
  hood?: boolean;
  cav?: string;
  limitModel?: string;
  airMovement?: boolean;
  shift?: string[];
  days?: string;
  compareShift?: string[];
  crew?: string;
  workHours?: string;
  start?: string;
  deadline?: string;
  rate?: string;
  dailyCost?: string;
  currency?: string;
  holidays?: string;
  /** Scenario ids (repeated `--scenario`). */
  scenario?: string[];
  /** `all`, or ids separated by commas. */
  scenarios?: string;
  json?: boolean;
  csv?: string;
  xlsx?: string;
}

/** The page's raw inputs from the options (and the holiday file's text). Catalogued error: EstimateNumberInvalid (a --cell that is not LAT,LON). */
export function rawFromOptions(o: EstimateOptions, holidays: string): RawInputs {
  const raw: RawInputs = {};
  if (o.cell !== undefined) {
    const m = /^\s*([^,]+),([^,]+)\s*$/.exec(o.cell);
    if (!m) throw EstimateNumberInvalid({ name: '--cell', value: o.cell, expected: 'LAT,LON in decimal degrees, e.g. --cell -12.5,151.25' }, { key: '--cell' });
    Object.assign(raw, { place: 'point', lat: m[1].trim(), lon: m[2].trim() });
  } else if (o.cellId !== undefined) Object.assign(raw, { place: 'cell', cell: o.cellId });
  else Object.assign(raw, { place: 'region', region: o.region ?? '' });
  if (o.metabolicRate !== undefined) Object.assign(raw, { work: 'custom', 'metabolic-rate': o.metabolicRate });
  else if (o.class !== undefined) raw.work = o.class;
  if (o.unacclimatized) raw.acclimatization = 'unacclimatized';
  if (o.shade) raw.exposure = 'shade';
  if (o.restWbgt !== undefined) Object.assign(raw, { rest: 'fixed', 'rest-wbgt': o.restWbgt });
  else if (o.restInShade) raw.rest = 'shade';
  if (o.cav !== undefined) Object.assign(raw, { clothing: 'custom', cav: o.cav });
  else if (o.clothing !== undefined) raw.clothing = o.clothing;
  if (o.hood !== undefined) raw.hood = o.hood ? 'on' : 'off';
  if (o.limitModel !== undefined) raw['limit-model'] = o.limitModel;
  if (o.airMovement !== undefined) raw['air-movement'] = o.airMovement ? 'on' : 'off';
  if (o.shift && o.shift.length > 0) raw.shifts = o.shift.join(', ');
  if (o.days !== undefined) raw.days = [o.days];
  raw.compare = o.compareShift ?? [];
  if (o.crew !== undefined) raw.crew = o.crew;
  if (o.workHours !== undefined) raw['work-hours'] = o.workHours;
  if (o.start !== undefined) raw.start = o.start;
  if (o.deadline !== undefined) raw.deadline = o.deadline;
  if (o.rate !== undefined) raw.rate = o.rate;
  if (o.dailyCost !== undefined) raw['daily-cost'] = o.dailyCost;
  if (o.currency !== undefined) raw.currency = o.currency;
  raw.holidays = holidays;
  raw.scenario = [...(o.scenario ?? []), ...(o.scenarios !== undefined ? o.scenarios.split(',') : [])];
  return raw;
}

/** Runs the estimate; returns the JSON object. Catalogued errors of every stage it uses. */
export async function runEstimateCommand(o: EstimateOptions): Promise<BidJson> {
  const atlas = await openEstimateAtlas(o.atlas);
  let holidays = '';
  if (o.holidays !== undefined) {
    try {
      holidays = await readFile(o.holidays, 'utf8');
    } catch (e) {
      throw ScheduleHolidayInvalid(
        { line: 0, value: o.holidays, problem: `the file cannot be read (${(e as NodeJS.ErrnoException).code ?? (e as Error).message})` },
        { file: o.holidays },
      );
    }
  }
  parseHolidays(holidays, o.holidays); // a bad line is named with the file
  const inputs = parseInputs(rawFromOptions(o, holidays), atlas.ctx, 'C');
  const { place, histograms } = await loadPlace(inputs.place, atlas.ctx, atlas.load);
  const run = runBid(histograms, inputs, atlas.ctx);
  return bidJson(run, inputs, atlas.ctx, place, await runScenarios(inputs, atlas.ctx, atlas.load));
}

const pad = (s: string, n: number, right = false) => (right ? s.padStart(n) : s.padEnd(n));

/** The human-readable report of an estimate. */
export function formatEstimate(j: BidJson): string {
  const cur = j.costs.currency || 'currency units';
  const out: string[] = [];
  out.push(`Schedule and cost of heat: ${j.atlas.title}${j.invented ? '  [INVENTED DATA]' : ''}`);
  for (const [k, v] of Object.entries(j.settings)) out.push(`  ${pad(`${k}:`, 12)} ${v}`);
  out.push('');
  const w = 50;
  out.push(
    `${pad(`Across ${j.weatherYears.length} weather years`, w)}${STATISTICS.map((s) => pad(s.label, 14, true)).join('')}${pad('Without heat', 14, true)}`,
  );
  const hf: Record<string, string | number> = { finishDate: j.heatFree.finishDate, workingDays: j.heatFree.workingDays, calendarDays: j.heatFree.calendarDays };
  for (const r of SCHEDULE_ROWS) {
    const label = `${r.label} [${rowUnit(r, cur)}]`;
    out.push(
      `${pad(label, w)}${STATISTICS.map((s) => pad(showValue(scheduleValue(j, r, s.key), r), 14, true)).join('')}${pad(hf[r.key] !== undefined ? showValue(hf[r.key], r) : '', 14, true)}`,
    );
  }
  out.push('');
  out.push(
    `${pad('Weather year', 14)}${pad('Finish', 12, true)}${pad('Work days', 11, true)}${pad('Added', 8, true)}${pad('Crew-h lost', 13, true)}${pad(`Cost [${cur}]`, 18, true)}`,
  );
  for (const y of j.years) {
    out.push(
      `${pad(String(y.weatherYear), 14)}${pad(y.finishDate, 12, true)}${pad(String(y.workingDays), 11, true)}${pad(String(y.addedWorkingDays), 8, true)}${pad(grouped(y.crewHoursLost), 13, true)}${pad(grouped(y.cost), 18, true)}`,
    );
  }
  out.push('');
  out.push(
    `${pad('Start', 12)}${pad('Added days P50', 16, true)}${pad('P90', 8, true)}${pad(`Cost P50 [${cur}]`, 22, true)}${pad('P90', 14, true)}${pad('Finish P90', 12, true)}`,
  );
  for (const m of j.startMonths) {
    out.push(
      `${pad(m.start, 12)}${pad(grouped(m.addedWorkingDays.p50, 1), 16, true)}${pad(grouped(m.addedWorkingDays.p90, 1), 8, true)}${pad(grouped(m.cost.p50), 22, true)}${pad(grouped(m.cost.p90), 14, true)}${pad(m.finishDate.p90, 12, true)}`,
    );
  }
  if (j.shiftPatterns.length > 1) {
    out.push('');
    out.push('Shift patterns (median / P90):');
    for (const p of j.shiftPatterns) {
      out.push(
        `  ${p.shift.join(' and ')}, ${p.days} (${p.hoursPerDay} h a day): finish ${p.finishDate.p50} / ${p.finishDate.p90} (without heat ${p.heatFree.finishDate}); added working days ${grouped(p.addedWorkingDays.p50, 1)} / ${grouped(p.addedWorkingDays.p90, 1)}; crew-hours lost ${grouped(p.crewHoursLost.p50)} / ${grouped(p.crewHoursLost.p90)}; cost ${grouped(p.cost.p50)} / ${grouped(p.cost.p90)} ${cur}`,
      );
    }
  }
  if (j.crewForDeadline) {
    const c = j.crewForDeadline;
    out.push('');
    out.push(`Crew for the deadline ${c.deadline} at P90: ${grouped(c.crew)} workers (P90 finish ${c.finishDate.p90}).`);
  }
  if (j.scenarios.length > 0) {
    out.push('');
    out.push("What-if climates: the same job on the record's weather with its monthly means shifted (not forecasts)");
    const cols = [{ label: 'Record', x: j }, ...j.scenarios.map((s) => ({ label: s.id, x: s }))];
    const cw = Math.max(14, ...cols.map((c) => c.label.length + 2));
    out.push(`${pad('', 40)}${cols.map((c) => pad(c.label, cw, true)).join('')}`);
    const lines: Array<[string, (x: BidJson | BidJson['scenarios'][number]) => string]> = [
      ['Finish, median year', (x) => x.finishDate.p50],
      ['Finish, P90 year', (x) => x.finishDate.p90],
      ['Working days added, median', (x) => grouped(x.addedWorkingDays.p50, 1)],
      ['Working days added, P90', (x) => grouped(x.addedWorkingDays.p90, 1)],
      [`Cost of heat, median [${cur}]`, (x) => grouped(x.cost.p50)],
      [`Cost of heat, P90 [${cur}]`, (x) => grouped(x.cost.p90)],
    ];
    for (const [label, f] of lines) out.push(`${pad(label, 40)}${cols.map((c) => pad(f(c.x), cw, true)).join('')}`);
    for (const s of j.scenarios) {
      out.push(`  ${s.id}: ${s.name} (${s.kind}). ${s.what} Source: ${s.source}`);
      if (s.deadlineProblem) out.push(`    crew for the deadline: ${s.deadlineProblem}`);
    }
    out.push(`  ${j.scenarioCaveat}`);
  }
  out.push('');
  out.push(`How: ${j.approximation}`);
  out.push(
    'Cost of heat = crew-hours lost × rate + calendar days added × daily cost. Scenario and record figures are what-ifs on past weather, not forecasts.',
  );
  out.push('Cautions:');
  for (const c of j.cautions) out.push(`  - ${c}`);
  return `${out.join('\n')}\n`;
}

/** What `heathours estimate` does once its options are parsed (loaded only when the command runs). */
export async function estimateAction(o: EstimateOptions): Promise<void> {
  const j = await runEstimateCommand(o);
  if (o.csv) await writeFileAtomic(o.csv, bidCsv(j));
  if (o.xlsx) {
    // exceljs loads only when a workbook is asked for (it would cost every command ~0.3 s of start-up).
    const { workbookBytes } = await import('../publish/workbook.ts');
    await writeFileAtomic(
      o.xlsx,
      await workbookBytes(bidSheets(j), { title: `Schedule and cost of heat: ${j.atlas.title}`, created: new Date(j.atlas.buildTime) }),
    );
  }
  process.stdout.write(o.json ? `${JSON.stringify(j, null, 1)}\n` : formatEstimate(j));
}
