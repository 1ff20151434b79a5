/**
 * The estimate's workbook as plain sheets (written by pipeline/publish/workbook.ts): the schedule
 * (mean, median, P90 year, without heat), the years, the start months, the shift patterns, the
 * assumptions (every setting, the atlas build and data, how the figures are made), the
 * cautions, and with scenarios asked for a sheet of the same job on each (what it is, its source,
 * the what-if caveat, and its schedule beside the record's). Pure: numbers stay numbers.
 */
import type { CellValue, SheetSpec } from '../publish/workbook.ts';
import type { BidJson } from './bid-json.ts';
import { SCHEDULE_ROWS, STATISTICS, rowUnit, scheduleValue } from './bid-table.ts';

/** The sheets of an estimate's workbook. */
export function bidSheets(j: BidJson): SheetSpec[] {
  const cur = j.costs.currency || 'currency units';
  const hf: Record<string, CellValue> = {
    finishDate: j.heatFree.finishDate,
    workingDays: j.heatFree.workingDays,
    calendarDays: j.heatFree.calendarDays,
    addedWorkingDays: 0,
    addedCalendarDays: 0,
    crewHoursLost: 0,
    crewHoursAbove: 0,
    cost: 0,
  };
  const stats = (s: Parameters<typeof scheduleValue>[0], r: (typeof SCHEDULE_ROWS)[number]) => STATISTICS.map((st) => scheduleValue(s, r, st.key));
  return [
    {
      name: 'Schedule',
      header: ['Figure', 'Unit', ...STATISTICS.map((s) => s.label), 'Without heat'],
      rows: SCHEDULE_ROWS.map((r) => [r.label, rowUnit(r, cur), ...stats(j, r), hf[r.key] ?? null]),
      widths: [36, 14, 14, 14, 14, 14],
    },
    {
      name: 'Years',
      header: ['Weather year', ...SCHEDULE_ROWS.map((r) => `${r.label} [${rowUnit(r, cur)}]`)],
      rows: j.years.map((y) => [y.weatherYear, ...SCHEDULE_ROWS.map((r) => y[r.key])]),
    },
    {
      name: 'Start months',
      header: ['Start', ...SCHEDULE_ROWS.flatMap((r) => STATISTICS.map((s) => `${r.label}, ${s.label} [${rowUnit(r, cur)}]`))],
      rows: j.startMonths.map((m) => [m.start, ...SCHEDULE_ROWS.flatMap((r) => stats(m, r))]),
    },
    {
      name: 'Shift patterns',
      header: [
        'Shift',
        'Days',
        'Paid hours a day',
        'Finish without heat',
        ...SCHEDULE_ROWS.flatMap((r) => STATISTICS.map((s) => `${r.label}, ${s.label} [${rowUnit(r, cur)}]`)),
      ],
      rows: j.shiftPatterns.map((p) => [p.shift.join(' and '), p.days, p.hoursPerDay, p.heatFree.finishDate, ...SCHEDULE_ROWS.flatMap((r) => stats(p, r))]),
    },
    {
      name: 'Assumptions',
      header: ['Item', 'Value'],
      rows: [
        ...(j.invented ? [['Data', 'INVENTED DATA: built from invented, synthetic data; no real place or climate is described.'] as CellValue[]] : []),
        ['Atlas', j.atlas.title],
        ['Built', `${j.atlas.buildTime}, code ${j.atlas.codeVersion}, configuration ${j.atlas.configDigest}, ${j.atlas.inputFiles} input files`],
        ...Object.entries(j.settings).map(([k, v]): CellValue[] => [k, v]),
        [
          'Crew for the deadline',
          j.crewForDeadline ? `${j.crewForDeadline.crew} workers finish by ${j.crewForDeadline.deadline} in the 90th-percentile year` : 'no deadline given',
        ],
        [
          'Statistics',
          `mean, median and 90th-percentile year (Hyndman-Fan type 7) across ${j.weatherYears.length} weather years: ${j.weatherYears.join(', ')}`,
        ],
        ['Cost of heat', `crew-hours lost × ${j.costs.ratePerCrewHour} ${cur} + calendar days added × ${j.costs.dailyCost} ${cur}`],
        ['How the figures are made', j.approximation],
        ['Not a forecast', 'the figures replay the weather of past years; they say what those years would have done to this job'],
      ],
      widths: [28, 120],
    },
    { name: 'Cautions', header: ['Caution'], rows: j.cautions.map((c) => [c]), widths: [120] },
    ...(j.scenarios.length === 0
      ? []
      : [
          {
            name: 'What-if climates',
            header: ['Figure', 'Unit', 'Statistic', 'Record (past weather)', ...j.scenarios.map((sc) => `${sc.name} (${sc.id})`)],
            rows: [
              ...SCHEDULE_ROWS.flatMap((r) =>
                STATISTICS.map((st): CellValue[] => [
                  r.label,
                  rowUnit(r, cur),
                  st.label,
                  scheduleValue(j, r, st.key),
                  ...j.scenarios.map((sc) => scheduleValue(sc, r, st.key)),
                ]),
              ),
              ...j.scenarios.map((sc): CellValue[] => [`${sc.id}: ${sc.kind}`, '', '', `${sc.what} Source: ${sc.source}`]),
              ['Not a forecast', '', '', j.scenarioCaveat],
            ],
            widths: [36, 14, 14, 22, ...j.scenarios.map(() => 22)],
          } satisfies SheetSpec,
        ]),
  ];
}
