/**
 * The settings behind the monthly table, in words, for the page (beside the table) and the head
 * of its CSV download: the schedule's own setting lines (pipeline/schedule/settings-text.ts) plus
 * the table's months, project period, crew and baseline. Temperatures stay numbers [°C] so the
 * page can show them in °C or °F (src/lib/units.ts) and the CSV in °C.
 */
import { settingLines, type SettingLine, type SettingPart } from '../../../pipeline/schedule/settings-text.ts';
import type { EstimateContext } from '../../../pipeline/schedule/context.ts';
import type { ResolvedPlace } from '../../../pipeline/schedule/place.ts';
import { formatTemperature, formatTemperatureDelta, type TemperatureUnit } from '../units.ts';
import type { EstimateResult } from './estimate.ts';
import { MONTH_NAMES } from './table.ts';

export type SummaryPart = SettingPart;
export type SummaryLine = SettingLine;

const pad = (n: number) => String(n).padStart(2, '0');

/** The settings lines of the monthly table. */
export function summaryLines(r: EstimateResult, ctx: EstimateContext, place: ResolvedPlace): SummaryLine[] {
  const i = r.inputs;
  const months = i.workMonths.every(Boolean) ? 'all months' : MONTH_NAMES.filter((_, m) => i.workMonths[m]).join(', ');
  const period = i.period ? `${i.period.start.year}-${pad(i.period.start.month)} to ${i.period.end.year}-${pad(i.period.end.month)}` : 'one year';
  return [
    ...settingLines(i, ctx, place, { limitWork: r.limitWork, threshold: r.threshold }),
    { key: 'months', label: 'Work months', parts: [months] },
    { key: 'period', label: 'Project period', parts: [period] },
    { key: 'crew', label: 'Crew', parts: [`${i.crew} worker${i.crew === 1 ? '' : 's'}`] },
    { key: 'baseline', label: 'Weather years', parts: [`baseline ${ctx.baseline[0]}–${ctx.baseline[1]}${ctx.invented ? ' (invented data)' : ''}`] },
  ];
}

/** A line as plain text in `unit`. */
export function summaryText(line: SummaryLine, unit: TemperatureUnit): string {
  return line.parts
    .map((p) => (typeof p === 'string' ? p : 'tempC' in p ? formatTemperature(p.tempC, unit, 1) : formatTemperatureDelta(p.deltaC, unit, 1, false)))
    .join('');
}
