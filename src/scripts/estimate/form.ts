/**
 * The calculator form in the browser: its raw values (as pipeline/schedule/inputs.ts parses them),
 * the URL that reproduces them (every input is a query parameter, lists repeated), the fields
 * shown for the current choices (`data-show-for` / `data-hide-for="name:value"`), and the
 * temperatures typed in the page's unit (°C/°F, src/lib/units.ts).
 */
import { CLOTHING_ENSEMBLES } from '../../../pipeline/work/clothing.ts';
import type { EstimateContext } from '../../../pipeline/schedule/context.ts';
import { celsiusDeltaFrom, celsiusFrom, type RawInputs } from '../../../pipeline/schedule/inputs.ts';
import { formatFixed } from '../../lib/format.ts';
import { formatTemperatureDelta, temperatureDeltaIn, temperatureIn, type TemperatureUnit } from '../../lib/units.ts';

/** Single-value fields, in the order they go into the URL. */
const SINGLE = [
  'place',
  'region',
  'cell',
  'lat',
  'lon',
  'work',
  'metabolic-rate',
  'acclimatization',
  'limit-model',
  'clothing',
  'cav',
  'exposure',
  'rest',
  'rest-wbgt',
  'shifts',
  'start',
  'work-hours',
  'crew',
  'holidays',
  'deadline',
  'rate',
  'daily-cost',
  'currency',
  'period-start',
  'period-end',
] as const;
/** Check boxes that are on or off. */
const FLAGS = ['air-movement', 'hood'] as const;
/** Multi-value fields. */
const LISTS = ['days', 'months', 'compare', 'scenario'] as const;

/** The form's values as strings (lists for the check boxes and the compared shifts). */
export function readRaw(form: HTMLFormElement): RawInputs {
  const fd = new FormData(form);
  const raw: Record<string, unknown> = {};
  for (const k of SINGLE) {
    const v = fd.get(k);
    if (typeof v === 'string') raw[k] = v;
  }
  for (const k of FLAGS) raw[k] = fd.has(k) ? 'on' : 'off';
  for (const k of LISTS) raw[k] = fd.getAll(k).filter((v): v is string => typeof v === 'string');
  // Every what-if box unticked is said in the link (`scenario=none`), so the link does not fall back to all ticked.
  if (form.querySelector('input[name="scenario"]') && (raw.scenario as string[]).length === 0) raw.scenario = ['none'];
  return raw as RawInputs;
}

/** The query string that reproduces the form (empty compared shifts left out). */
export function queryOf(raw: RawInputs): string {
  const q = new URLSearchParams();
  const r = raw as Record<string, string | string[] | undefined>;
  for (const k of [...SINGLE, ...FLAGS]) {
    const v = r[k];
    if (typeof v === 'string' && v !== '') q.set(k, v);
  }
  for (const k of LISTS) for (const v of (r[k] as string[] | undefined) ?? []) if (v.trim() !== '') q.append(k, v);
  return q.toString();
}

/** Whether a query holds form values beyond the place (a link made by {@link queryOf}). */
export function queryHasInputs(search: string): boolean {
  const q = new URLSearchParams(search);
  return [...q.keys()].some((k) => k !== 'region' && k !== 'cell' && k !== 'lat' && k !== 'lon' && k !== 'unit');
}

/** Fills the form from a query made by {@link queryOf}; a place alone (`?region=`, `?cell=`, `?lat=&lon=`) sets the place. */
export function fillFromQuery(form: HTMLFormElement, search: string): void {
  const q = new URLSearchParams(search);
  const set = (name: string, value: string) => {
    const el = form.elements.namedItem(name);
    if (el instanceof RadioNodeList) el.value = value;
    else if (el instanceof HTMLInputElement || el instanceof HTMLSelectElement || el instanceof HTMLTextAreaElement) el.value = value;
  };
  if (q.has('cell') && !q.has('place')) set('place', 'cell');
  else if ((q.has('lat') || q.has('lon')) && !q.has('place')) set('place', 'point');
  else if (q.has('region') && !q.has('place')) set('place', 'region');
  for (const k of SINGLE) {
    const v = q.get(k);
    if (v !== null) set(k, v);
  }
  const full = queryHasInputs(search);
  if (full) {
    for (const k of FLAGS) {
      const el = form.elements.namedItem(k);
      if (el instanceof HTMLInputElement) el.checked = q.get(k) === 'on';
    }
    for (const k of ['days', 'months', 'scenario'] as const) {
      if (!q.has(k)) continue;
      const want = new Set(q.getAll(k));
      for (const el of form.querySelectorAll<HTMLInputElement>(`input[name="${k}"]`)) el.checked = want.has(el.value) || want.has('all');
    }
    const compare = q.getAll('compare');
    form.querySelectorAll<HTMLInputElement>('input[name="compare"]').forEach((el, i) => {
      el.value = compare[i] ?? '';
    });
  }
}

function fieldValue(form: HTMLFormElement, name: string): string {
  const el = form.elements.namedItem(name);
  if (el instanceof RadioNodeList || el instanceof HTMLSelectElement || el instanceof HTMLInputElement) return el.value;
  return '';
}

/** Shows the fields that belong to the current choices and the description of the workload class. */
export function updateVisibility(form: HTMLFormElement, ctx: EstimateContext): void {
  for (const el of form.querySelectorAll<HTMLElement>('[data-show-for], [data-hide-for]')) {
    const show = el.dataset.showFor;
    const rule = show ?? el.dataset.hideFor ?? '';
    const [name, value] = rule.split(':');
    const match = fieldValue(form, name) === value;
    el.hidden = show !== undefined ? !match : match;
  }
  const description = form.querySelector('#work-description');
  if (description) {
    const work = fieldValue(form, 'work');
    description.textContent =
      ctx.classes.find((c) => c.id === work)?.description ??
      'A whole-body metabolic rate of your own, e.g. from ISO 8996 tables or a measurement; table estimates can be a third out.';
  }
}

/**
 * Rewrites the typed temperatures (`data-temp-input="absolute" | "delta"`) and the clothing labels
 * from unit `from` to unit `to`. A field that does not hold a number is left as typed.
 */
export function convertTemperatureFields(form: HTMLFormElement, from: TemperatureUnit, to: TemperatureUnit): void {
  if (from !== to) {
    for (const input of form.querySelectorAll<HTMLInputElement>('input[data-temp-input]')) {
      const v = Number(input.value.trim());
      if (input.value.trim() === '' || !Number.isFinite(v)) continue;
      const c = input.dataset.tempInput === 'delta' ? celsiusDeltaFrom(v, from) : celsiusFrom(v, from);
      input.value = formatFixed(input.dataset.tempInput === 'delta' ? temperatureDeltaIn(c, to) : temperatureIn(c, to), 1).replace('\u2212', '-');
    }
  }
  for (const option of form.querySelectorAll<HTMLOptionElement>('select[name="clothing"] option')) {
    const e = CLOTHING_ENSEMBLES.find((x) => x.id === option.value);
    if (e) option.textContent = `${e.name} (${formatTemperatureDelta(e.cav, to, 1)})`;
  }
}
