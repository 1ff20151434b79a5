/**
 * The calculator form in the browser: its raw values (as src/lib/estimate/inputs.ts parses them),
 * the fields shown for the current choices (`data-show-for` / `data-hide-for="name:value"`), the
 * place from the URL, and the temperatures typed in the page's unit (°C/°F, src/lib/units.ts).
 */
import { CLOTHING_ENSEMBLES } from '../../../pipeline/work/index.ts';
import type { EstimateContext } from '../../lib/estimate/context.ts';
import { celsiusDeltaFrom, celsiusFrom, type EstimatePlace, type RawInputs } from '../../lib/estimate/inputs.ts';
import { formatFixed } from '../../lib/format.ts';
import { formatTemperatureDelta, temperatureDeltaIn, temperatureIn, type TemperatureUnit } from '../../lib/units.ts';

/** The form's values as strings (lists for the check boxes). */
export function readRaw(form: HTMLFormElement): RawInputs {
  const fd = new FormData(form);
  const one = (k: string): string | undefined => {
    const v = fd.get(k);
    return typeof v === 'string' ? v : undefined;
  };
  const all = (k: string) => fd.getAll(k).filter((v): v is string => typeof v === 'string');
  return {
    place: one('place'),
    region: one('region'),
    cell: one('cell'),
    lat: one('lat'),
    lon: one('lon'),
    work: one('work'),
    'metabolic-rate': one('metabolic-rate'),
    acclimatization: one('acclimatization'),
    'limit-model': one('limit-model'),
    'air-movement': fd.has('air-movement') ? 'on' : 'off',
    clothing: one('clothing'),
    hood: fd.has('hood') ? 'on' : 'off',
    cav: one('cav'),
    exposure: one('exposure'),
    rest: one('rest'),
    'rest-wbgt': one('rest-wbgt'),
    'shift-start': one('shift-start'),
    'shift-end': one('shift-end'),
    days: all('days'),
    months: all('months'),
    'period-start': one('period-start'),
    'period-end': one('period-end'),
    crew: one('crew'),
  };
}

function valueOf(form: HTMLFormElement, name: string): string {
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
    const match = valueOf(form, name) === value;
    el.hidden = show !== undefined ? !match : match;
  }
  const description = form.querySelector('#work-description');
  if (description) {
    const work = valueOf(form, 'work');
    description.textContent =
      ctx.classes.find((c) => c.id === work)?.description ??
      'A whole-body metabolic rate of your own, e.g. from ISO 8996 tables or a measurement; table estimates can be a third out.';
  }
}

/** Puts a place (from the URL) into the form. */
export function setPlace(form: HTMLFormElement, place: EstimatePlace): void {
  const set = (name: string, value: string) => {
    const el = form.elements.namedItem(name);
    if (el instanceof RadioNodeList) el.value = value;
    else if (el instanceof HTMLInputElement || el instanceof HTMLSelectElement) el.value = value;
  };
  if (place.kind === 'region') {
    set('place', 'region');
    set('region', place.id);
  } else {
    set('place', 'cell');
    set('cell', String(place.cell));
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
