/**
 * The settings behind an estimate, in words, for the page (beside the table) and the head of the
 * CSV download. Temperatures are kept as numbers [°C] so the page can show them in °C or °F
 * (src/lib/units.ts) and the CSV in °C.
 */
import { CLOTHING_ENSEMBLES, HOOD_CAV } from '../../../pipeline/work/index.ts';
import { formatFixed } from '../format.ts';
import { formatTemperature, formatTemperatureDelta, type TemperatureUnit } from '../units.ts';
import type { EstimateContext } from './context.ts';
import type { EstimateResult } from './estimate.ts';
import { cellCentre } from './inputs.ts';
import { MONTH_NAMES } from './table.ts';

/** A piece of a settings line: text, an absolute temperature [°C] or a temperature difference [°C]. */
export type SummaryPart = string | { tempC: number } | { deltaC: number };

export interface SummaryLine {
  key: string;
  label: string;
  parts: SummaryPart[];
}

const DAY_NAMES: Record<string, string> = { mon: 'Mon', tue: 'Tue', wed: 'Wed', thu: 'Thu', fri: 'Fri', sat: 'Sat', sun: 'Sun' };
const pad = (n: number) => String(n).padStart(2, '0');

/** Name of the place: the region's name, or the cell with its centre. */
export function placeLabel(r: EstimateResult, ctx: EstimateContext): string {
  const p = r.inputs.place;
  if (p.kind === 'region') return `Region ${ctx.regions.find((x) => x.id === p.id)?.name ?? p.id} (${p.id})`;
  const c = ctx.cells ? cellCentre(ctx.cells.grid, p.cell) : null;
  return `Grid cell ${p.cell}${c ? ` (centre ${formatFixed(c.lat, 2)}° N, ${formatFixed(c.lon, 2)}° E)` : ''}`;
}

/** The settings lines of an estimate. */
export function summaryLines(r: EstimateResult, ctx: EstimateContext): SummaryLine[] {
  const i = r.inputs;
  const cls = ctx.classes.find((c) => c.id === i.classId);
  const ens = CLOTHING_ENSEMBLES.find((e) => e.id === i.clothing.ensemble);
  const rest =
    i.rest.kind === 'fixed'
      ? ['a rest place at a measured WBGT of ', { tempC: i.rest.wbgt }]
      : i.rest.kind === 'shade' && i.exposure === 'sun'
        ? ['in the shade (the mean shade WBGT of each month and hour; an approximation, see the notes)']
        : ['in the same place as the work'];
  const months = i.workMonths.every(Boolean) ? 'all months' : MONTH_NAMES.filter((_, m) => i.workMonths[m]).join(', ');
  const period = i.period ? `${i.period.start.year}-${pad(i.period.start.month)} to ${i.period.end.year}-${pad(i.period.end.month)}` : 'one year';
  return [
    { key: 'place', label: 'Place', parts: [placeLabel(r, ctx)] },
    { key: 'work', label: 'Work', parts: [`${cls ? cls.name : 'Custom work rate'}, ${formatFixed(i.workRate, 0)} W; rest ${formatFixed(ctx.restRate, 0)} W`] },
    {
      key: 'limit',
      label: 'Limit',
      parts: [
        `${i.acclimatization}, ${i.limitModel === 'curve-2017' ? 'continuous curves (NIOSH 2016 / ISO 7243:2017 form)' : `ISO 7243:1989 table${i.airMovement ? ', air movement' : ''}`}: `,
        { tempC: r.limitWork },
        ' WBGT at the work rate; hours count above a measured WBGT of ',
        { tempC: r.threshold },
      ],
    },
    {
      key: 'clothing',
      label: 'Clothing',
      parts: [`${ens ? ens.name : 'Clothing adjustment value typed in'}${i.clothing.hood ? ` with hood (+${HOOD_CAV})` : ''}, adjustment `, { deltaC: i.clothing.cav }],
    },
    { key: 'exposure', label: 'Exposure', parts: [i.exposure === 'sun' ? 'work in the sun' : 'work in the shade (open sky, sun removed)'] },
    { key: 'rest', label: 'Breaks', parts: rest },
    { key: 'shift', label: 'Shift', parts: [`${pad(i.shift.start)}:00–${pad(i.shift.end % 24)}:00 local time (${ctx.timeZone}), ${i.shift.days.map((d) => DAY_NAMES[d]).join(' ')}`] },
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
