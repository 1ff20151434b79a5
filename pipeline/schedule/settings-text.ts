/**
 * The settings behind an estimate, in words: for the page (beside the results, temperatures as
 * numbers so the page can show °C or °F), the one-page bid summary, the CSV and JSON downloads and
 * `heathours estimate` (°C). Each line has a key, a label and parts: text, an absolute
 * temperature [°C] or a temperature difference [°C].
 */
import { CLOTHING_ENSEMBLES, HOOD_CAV } from '../work/clothing.ts';
import { formatDay } from './calendar.ts';
import type { EstimateContext } from './context.ts';
import type { EstimateInputs } from './inputs.ts';
import { holidayList } from './job.ts';
import type { ResolvedPlace } from './place.ts';
import { formatPattern, hoursPerDay } from './shift-pattern.ts';

export type SettingPart = string | { tempC: number } | { deltaC: number };

export interface SettingLine {
  key: string;
  label: string;
  parts: SettingPart[];
}

/** Fixed decimals with a real minus sign. */
export function fixed(x: number, digits: number): string {
  if (!Number.isFinite(x)) return '–';
  const s = x.toFixed(digits);
  return s.startsWith('-') ? (/^-0(\.0+)?$/.test(s) ? s.slice(1) : `\u2212${s.slice(1)}`) : s;
}

/** A number with thousands separators and `digits` decimals (`20,000`, `1,234.5`). */
export function grouped(x: number, digits = 0): string {
  if (!Number.isFinite(x)) return '–';
  const [i, f] = Math.abs(x).toFixed(digits).split('.');
  return `${x < 0 && Number(x.toFixed(digits)) !== 0 ? '\u2212' : ''}${i.replace(/\B(?=(\d{3})+(?!\d))/g, ',')}${f ? `.${f}` : ''}`;
}

/** Name of the place, with the cell centre and, for a point, the distance to it. */
export function placeText(p: ResolvedPlace): string {
  if (p.kind === 'region') return `Region ${p.name} (${p.id})`;
  const c = `grid cell ${p.cell} (centre ${fixed(p.centre.lat, 2)}° N, ${fixed(p.centre.lon, 2)}° E)`;
  if (!p.requested) return c[0].toUpperCase() + c.slice(1);
  const at = `${fixed(p.requested.lat, 3)}° N, ${fixed(p.requested.lon, 3)}° E`;
  return p.movedToLand
    ? `The point ${at} lies on a sea cell; nearest land ${c}, ${fixed(p.distanceKm, 1)} km from the point`
    : `The point ${at}: ${c}, ${fixed(p.distanceKm, 1)} km from the point`;
}

/** The work, limit, clothing and break settings, and the shift. */
export function settingLines(i: EstimateInputs, ctx: EstimateContext, place: ResolvedPlace, limit: { limitWork: number; threshold: number }): SettingLine[] {
  const cls = ctx.classes.find((c) => c.id === i.classId);
  const ens = CLOTHING_ENSEMBLES.find((e) => e.id === i.clothing.ensemble);
  const rest: SettingPart[] =
    i.rest.kind === 'fixed'
      ? ['a rest place at a measured WBGT of ', { tempC: i.rest.wbgt }]
      : i.rest.kind === 'shade' && i.exposure === 'sun'
        ? ['in the shade (each sun hour paired with the shade WBGT of the same rank; an approximation, see the notes)']
        : ['in the same place as the work'];
  return [
    { key: 'place', label: 'Place', parts: [placeText(place)] },
    { key: 'work', label: 'Work', parts: [`${cls ? cls.name : 'Custom work rate'}, ${fixed(i.workRate, 0)} W; rest ${fixed(ctx.restRate, 0)} W`] },
    {
      key: 'limit',
      label: 'Limit',
      parts: [
        `${i.acclimatization}, ${i.limitModel === 'curve-2017' ? 'continuous curves (NIOSH 2016 / ISO 7243:2017 form)' : `ISO 7243:1989 table${i.airMovement ? ', air movement' : ''}`}: `,
        { tempC: limit.limitWork },
        ' WBGT at the work rate; hours count above a measured WBGT of ',
        { tempC: limit.threshold },
      ],
    },
    {
      key: 'clothing',
      label: 'Clothing',
      parts: [
        `${ens ? ens.name : 'Clothing adjustment value typed in'}${i.clothing.hood ? ` with hood (+${HOOD_CAV})` : ''}, adjustment `,
        { deltaC: i.clothing.cav },
      ],
    },
    { key: 'exposure', label: 'Exposure', parts: [i.exposure === 'sun' ? 'work in the sun' : 'work in the shade (open sky, sun removed)'] },
    { key: 'rest', label: 'Breaks', parts: rest },
    {
      key: 'shift',
      label: 'Shift',
      parts: [`${formatPattern(i.shift)}, local time (${ctx.timeZone}), ${fixed(hoursPerDay(i.shift), 2)} paid hours a work day`],
    },
  ];
}

/** The job and its costs. */
export function jobLines(i: EstimateInputs): SettingLine[] {
  const cur = i.costs.currency === '' ? '(no currency given)' : i.costs.currency;
  const hol = holidayList(i.job.holidays);
  return [
    { key: 'start', label: 'Start', parts: [formatDay(i.job.start)] },
    { key: 'work-hours', label: 'Quantity of work', parts: [`${grouped(i.job.workHours, 1).replace(/\.0$/, '')} crew-hours`] },
    { key: 'crew', label: 'Crew', parts: [`${grouped(i.crew)} worker${i.crew === 1 ? '' : 's'}`] },
    { key: 'holidays', label: 'Holidays', parts: [hol.length === 0 ? 'none listed' : `${hol.length}: ${hol.join(', ')}`] },
    {
      key: 'costs',
      label: 'Costs',
      parts: [`${grouped(i.costs.rate, 2)} ${cur} per crew-hour; ${grouped(i.costs.dailyCost, 2)} ${cur} per calendar day of site overheads`],
    },
    { key: 'deadline', label: 'Deadline', parts: [i.job.deadline === null ? 'none given' : formatDay(i.job.deadline)] },
  ];
}

/** The weather years behind the figures. */
export function weatherLine(ctx: EstimateContext, years: readonly number[], skipped: ReadonlyArray<{ year: number }>): SettingLine {
  const left = skipped.length > 0 ? `; left out as incomplete: ${skipped.map((s) => s.year).join(', ')}` : '';
  return {
    key: 'weather',
    label: 'Weather years',
    parts: [`${years.length} year${years.length === 1 ? '' : 's'} of the record replayed (${years.join(', ')})${left}${ctx.invented ? '; invented data' : ''}`],
  };
}

/** A line as plain text in °C. */
export function lineTextC(line: SettingLine): string {
  return line.parts
    .map((p) => (typeof p === 'string' ? p : 'tempC' in p ? `${fixed(p.tempC, 1)} °C` : `${p.deltaC > 0 ? '+' : ''}${fixed(p.deltaC, 1)} °C`))
    .join('');
}
