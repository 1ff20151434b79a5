/**
 * The estimate as one tidy CSV (RFC 4180 through pipeline/formats/csv.ts), UTF-8 with a byte
 * order mark. First come comment lines `#,"text"` (the title, the invented-data label, every
 * setting, the approximation, the cautions): a reader that skips `#` lines (pandas
 * `comment="#"`, R `comment.char = "#"`) skips them, a spreadsheet shows each text whole in its
 * second column. Then one row per figure and statistic:
 *
 *   section, case, figure, statistic, value, unit
 *
 * `section` is `schedule` (the job), `year` (case = the weather year), `start-month` (case = the
 * start date), `shift-pattern` (case = the pattern), `heat-free`, `crew-for-deadline`, or
 * `scenario` (case = the scenario id: the same job on a what-if climate, described in a comment line).
 */
import { csvLine } from '../formats/csv.ts';
import type { BidJson } from './bid-json.ts';
import { SCHEDULE_ROWS, STATISTICS, rowUnit, scheduleValue } from './bid-table.ts';

export const BOM = '\uFEFF';

/** A comment line: `#` in the first column, the text in the second. */
export function commentLine(text: string): string {
  return csvLine(['#', text.replace(/[\r\n]+/g, ' ')]);
}

export const BID_CSV_COLUMNS = ['section', 'case', 'figure', 'statistic', 'value', 'unit'] as const;

/** The CSV text of an estimate. */
export function bidCsv(j: BidJson): string {
  let out = BOM + commentLine(`Schedule and cost of heat for a job: ${j.atlas.title}`);
  if (j.invented) out += commentLine('INVENTED DATA: this atlas is built from invented, synthetic data; no real place or climate is described.');
  out += commentLine('Screening estimate from histograms of modelled hourly WBGT: not safety advice, not a site measurement, not a forecast.');
  for (const [k, v] of Object.entries(j.settings)) out += commentLine(`${k}: ${v}`);
  out += commentLine(
    `Atlas build ${j.atlas.buildTime}, code ${j.atlas.codeVersion}, configuration ${j.atlas.configDigest.slice(0, 12)}, ${j.atlas.inputFiles} input files.`,
  );
  out += commentLine(`How: ${j.approximation}`);
  out += commentLine(
    `Statistics across ${j.weatherYears.length} weather years (${j.weatherYears.join(', ')}): mean, median and 90th-percentile year (Hyndman-Fan type 7); cost of heat = crew-hours lost x rate + calendar days added x daily cost.`,
  );
  for (const c of j.cautions) out += commentLine(`Caution: ${c}`);
  for (const sc of j.scenarios) out += commentLine(`Scenario ${sc.id}: ${sc.name} (${sc.kind}). ${sc.what} Source: ${sc.source}`);
  if (j.scenarios.length > 0) out += commentLine(`Scenarios: ${j.scenarioCaveat}`);
  out += csvLine([...BID_CSV_COLUMNS]);
  const cur = j.costs.currency;
  const schedule = (section: string, kase: string, s: Parameters<typeof scheduleValue>[0]) => {
    for (const row of SCHEDULE_ROWS)
      for (const st of STATISTICS) out += csvLine([section, kase, row.key, st.key, scheduleValue(s, row, st.key), rowUnit(row, cur)]);
  };
  const hf = (kase: string, h: BidJson['heatFree']) => {
    out += csvLine(['heat-free', kase, 'finishDate', 'value', h.finishDate, 'date']);
    out += csvLine(['heat-free', kase, 'workingDays', 'value', h.workingDays, 'days']);
    out += csvLine(['heat-free', kase, 'calendarDays', 'value', h.calendarDays, 'days']);
  };
  schedule('schedule', j.job.start, j);
  hf(j.job.start, j.heatFree);
  for (const y of j.years) {
    for (const row of SCHEDULE_ROWS)
      out += csvLine(['year', String(y.weatherYear), row.key, 'value', y[row.key === 'finishDate' ? 'finishDate' : row.key], rowUnit(row, cur)]);
  }
  for (const m of j.startMonths) schedule('start-month', m.start, m);
  for (const p of j.shiftPatterns) schedule('shift-pattern', `${p.shift.join(' and ')}, ${p.days}`, p);
  if (j.crewForDeadline) {
    const c = j.crewForDeadline;
    out += csvLine(['crew-for-deadline', c.deadline, 'crew', 'value', c.crew, 'workers']);
    out += csvLine(['crew-for-deadline', c.deadline, 'finishDate', 'p90', c.finishDate.p90, 'date']);
  }
  for (const sc of j.scenarios) {
    schedule('scenario', sc.id, sc);
    hf(`scenario ${sc.id}`, sc.heatFree);
  }
  return out;
}
