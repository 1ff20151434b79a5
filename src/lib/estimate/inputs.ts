/**
 * The calculator's inputs: parsed and checked from the form's raw values (strings, as a browser
 * form gives them) or from the URL, with catalogued errors. Temperatures typed in the form are in
 * the page's unit (°C or °F, src/lib/units.ts): an absolute WBGT (fixed rest place) converts with
 * the offset, a clothing adjustment value as a difference (× 5/9, no offset).
 */
import {
  ACCLIMATIZATION_STATES,
  CLOTHING_ENSEMBLES,
  LIMIT_MODELS,
  clothingAdjustment,
  clothingEnsemble,
  validateShift,
  type Acclimatization,
  type Exposure,
  type LimitModelId,
  type WorkShift,
} from '../../../pipeline/work/index.ts';
import type { TemperatureUnit } from '../units.ts';
import type { EstimateContext, EstimateGrid } from './context.ts';
import { EstimateCellInvalid, EstimateChoiceUnknown, EstimateMonthsEmpty, EstimateNumberInvalid, EstimatePointOutsideGrid, EstimateRegionUnknown } from './errors.ts';
import type { RestChoice } from './monthly.ts';
import { parseYearMonth, type YearMonth } from './project-period.ts';

/** Where the estimate is for. */
export type EstimatePlace = { kind: 'region'; id: string } | { kind: 'cell'; cell: number };

/** Checked inputs; temperatures in °C. */
export interface EstimateInputs {
  place: EstimatePlace;
  /** Class id, or null for a custom rate. */
  classId: string | null;
  /** Work metabolic rate [W]. */
  workRate: number;
  acclimatization: Acclimatization;
  limitModel: LimitModelId;
  airMovement: boolean;
  /** Ensemble id (null for a value typed in), hood, and the clothing adjustment value [°C-WBGT]. */
  clothing: { ensemble: string | null; hood: boolean; cav: number };
  exposure: Exposure;
  rest: RestChoice;
  shift: WorkShift;
  /** Work months, index 0 = January. */
  workMonths: boolean[];
  period: { start: YearMonth; end: YearMonth } | null;
  /** Workers in the crew [count]. */
  crew: number;
}

/** The form's raw values: single fields as strings, multi-choice fields (days, months) as lists. */
export interface RawInputs {
  place?: string;
  region?: string;
  cell?: string;
  lat?: string;
  lon?: string;
  work?: string;
  'metabolic-rate'?: string;
  acclimatization?: string;
  'limit-model'?: string;
  'air-movement'?: string;
  clothing?: string;
  hood?: string;
  cav?: string;
  exposure?: string;
  rest?: string;
  'rest-wbgt'?: string;
  'shift-start'?: string;
  'shift-end'?: string;
  days?: string[];
  months?: string[];
  'period-start'?: string;
  'period-end'?: string;
  crew?: string;
}

/** Largest crew accepted [workers]. */
export const MAX_CREW = 100_000;
export const CUSTOM = 'custom';

function num(raw: string | undefined, name: string, expected: string, ok: (v: number) => boolean): number {
  const text = (raw ?? '').trim();
  const v = text === '' ? NaN : Number(text);
  if (!Number.isFinite(v) || !ok(v)) throw EstimateNumberInvalid({ name, value: raw ?? '', expected }, { key: name });
  return v;
}

function choice<T extends string>(raw: string | undefined, name: string, known: readonly T[], fallback?: T): T {
  const v = raw === undefined || raw === '' ? fallback : raw;
  if (v === undefined || !known.includes(v as T)) throw EstimateChoiceUnknown({ name, value: raw ?? '', known: [...known] }, { key: name });
  return v as T;
}

/** °C from a value typed in `unit`: absolute temperature. */
export function celsiusFrom(value: number, unit: TemperatureUnit): number {
  return unit === 'F' ? ((value - 32) * 5) / 9 : value;
}

/** °C difference from a difference typed in `unit`. */
export function celsiusDeltaFrom(value: number, unit: TemperatureUnit): number {
  return unit === 'F' ? (value * 5) / 9 : value;
}

/** A region id or cell id from the URL's query (`?region=<id>`, `?cell=<cell_id>`); null when neither is given. */
export function placeFromQuery(search: string, ctx: EstimateContext): EstimatePlace | null {
  const q = new URLSearchParams(search);
  const cell = q.get('cell');
  if (cell !== null) return { kind: 'cell', cell: parseCellId(cell, ctx) };
  const region = q.get('region');
  if (region !== null) return { kind: 'region', id: checkRegion(region, ctx) };
  return null;
}

function checkRegion(id: string, ctx: EstimateContext): string {
  if (!ctx.regions.some((r) => r.id === id)) throw EstimateRegionUnknown({ id, known: ctx.regions.map((r) => r.id) }, { key: 'region' });
  return id;
}

/** A cell id as typed or linked: a whole number inside the grid. Catalogued error: EstimateCellInvalid. */
export function parseCellId(text: string, ctx: EstimateContext): number {
  if (ctx.cells === null) throw EstimateCellInvalid({ value: text, problem: 'this atlas publishes no per-cell data' }, { key: 'cell' });
  const g = ctx.cells.grid;
  const t = text.trim();
  if (!/^\d+$/.test(t)) throw EstimateCellInvalid({ value: text, problem: 'not a whole number' }, { key: 'cell' });
  const cell = Number(t);
  if (cell >= g.nLat * g.nLon) throw EstimateCellInvalid({ value: text, problem: `outside the grid of ${g.nLat} × ${g.nLon} = ${g.nLat * g.nLon} cells (ids 0–${g.nLat * g.nLon - 1})` }, { key: 'cell' });
  return cell;
}

/** The grid cell whose centre is nearest to a point [° N, ° E]. Catalogued error: EstimatePointOutsideGrid. */
export function cellAt(grid: EstimateGrid, lat: number, lon: number): number {
  const row = Math.round((lat - grid.lat0) / grid.dLat);
  let col = -1;
  for (const l of [lon, lon - 360, lon + 360]) {
    const c = Math.round((l - grid.lon0) / grid.dLon);
    if (c >= 0 && c < grid.nLon) col = c;
  }
  if (!(row >= 0 && row < grid.nLat) || col < 0) {
    const extent = `${grid.lat0 - grid.dLat / 2} to ${grid.lat0 + (grid.nLat - 0.5) * grid.dLat}° N, ${grid.lon0 - grid.dLon / 2} to ${grid.lon0 + (grid.nLon - 0.5) * grid.dLon}° E`;
    throw EstimatePointOutsideGrid({ lat, lon, extent }, { key: 'lat' });
  }
  return row * grid.nLon + col;
}

/** Centre of a cell [° N, ° E]. */
export function cellCentre(grid: EstimateGrid, cell: number): { lat: number; lon: number } {
  return { lat: grid.lat0 + Math.floor(cell / grid.nLon) * grid.dLat, lon: grid.lon0 + (cell % grid.nLon) * grid.dLon };
}

/**
 * Checks the raw form values against the atlas and returns the inputs in °C and W.
 * Catalogued errors: EstimateRegionUnknown, EstimateCellInvalid, EstimatePointOutsideGrid,
 * EstimateNumberInvalid, EstimateChoiceUnknown, EstimateMonthsEmpty, EstimatePeriodInvalid, and
 * from pipeline/work: ClothingAdjustmentOutOfRange, WorkShiftInvalid, WorkWeekdayUnknown.
 */
export function parseInputs(raw: RawInputs, ctx: EstimateContext, unit: TemperatureUnit): EstimateInputs {
  const placeKind = choice(raw.place, 'place', ctx.cells ? (['region', 'cell', 'point'] as const) : (['region'] as const), 'region');
  let place: EstimatePlace;
  if (placeKind === 'region') place = { kind: 'region', id: checkRegion(raw.region ?? '', ctx) };
  else if (placeKind === 'cell') place = { kind: 'cell', cell: parseCellId(raw.cell ?? '', ctx) };
  else {
    const lat = num(raw.lat, 'lat', 'a latitude from −90 to 90 [° N]', (v) => v >= -90 && v <= 90);
    const lon = num(raw.lon, 'lon', 'a longitude from −180 to 360 [° E]', (v) => v >= -180 && v <= 360);
    place = { kind: 'cell', cell: cellAt(ctx.cells!.grid, lat, lon) };
  }

  const classIds = ctx.classes.map((c) => c.id);
  const work = choice(raw.work, 'work', [...classIds, CUSTOM], ctx.defaults.classId);
  const workRate =
    work === CUSTOM
      ? num(raw['metabolic-rate'], 'metabolic-rate', `a work metabolic rate above the rest rate ${ctx.restRate} W and at most 1000 W`, (v) => v > ctx.restRate && v <= 1000)
      : ctx.classes.find((c) => c.id === work)!.metabolicRate;

  const acclimatization = choice(raw.acclimatization, 'acclimatization', ACCLIMATIZATION_STATES, ctx.defaults.acclimatization);
  const limitModel = choice(raw['limit-model'], 'limit-model', LIMIT_MODELS, ctx.limitModel);
  const airMovement = raw['air-movement'] === undefined ? ctx.airMovement : raw['air-movement'] === 'on' || raw['air-movement'] === 'true';

  const d = ctx.defaults.clothing;
  const ensembles = CLOTHING_ENSEMBLES.map((e) => e.id);
  const ensemble = choice(raw.clothing, 'clothing', [...ensembles, CUSTOM], 'cav' in d ? CUSTOM : d.ensemble);
  let clothing: EstimateInputs['clothing'];
  if (ensemble === CUSTOM) {
    const typed = raw.cav === undefined && 'cav' in d ? d.cav : celsiusDeltaFrom(num(raw.cav, 'cav', `a clothing adjustment value [${unit === 'F' ? '°F' : '°C'}-WBGT]`, () => true), unit);
    clothing = { ensemble: null, hood: false, cav: clothingAdjustment({ cav: typed }, { key: 'cav' }) };
  } else {
    const hood = raw.hood === undefined ? !('cav' in d) && d.ensemble === ensemble && d.hood : raw.hood === 'on' || raw.hood === 'true';
    clothingEnsemble(ensemble, { key: 'clothing' });
    clothing = { ensemble, hood, cav: clothingAdjustment({ ensemble, hood }, { key: 'clothing' }) };
  }

  const exposure = choice(raw.exposure, 'exposure', ['sun', 'shade'] as const, ctx.defaults.exposure);
  const restKind = choice(raw.rest, 'rest', ['same-place', 'shade', 'fixed'] as const, ctx.defaults.restLocation);
  const rest: RestChoice =
    restKind === 'fixed'
      ? { kind: 'fixed', wbgt: celsiusFrom(num(raw['rest-wbgt'], 'rest-wbgt', `the measured WBGT of the rest place [${unit === 'F' ? '°F' : '°C'}]`, (v) => Number.isFinite(v)), unit) }
      : { kind: restKind };
  if (rest.kind === 'fixed' && !(rest.wbgt >= 0 && rest.wbgt <= 45)) {
    throw EstimateNumberInvalid({ name: 'rest-wbgt', value: raw['rest-wbgt'] ?? '', expected: 'a rest-place WBGT from 0 to 45 °C (32 to 113 °F)' }, { key: 'rest-wbgt' });
  }

  const s = ctx.defaults.shift;
  const shift = validateShift(
    {
      start: raw['shift-start'] === undefined ? s.start : num(raw['shift-start'], 'shift-start', 'a whole local hour from 0 to 23', () => true),
      end: raw['shift-end'] === undefined ? s.end : num(raw['shift-end'], 'shift-end', 'a whole local hour from 1 to 24', () => true),
      days: raw.days === undefined ? s.days : raw.days,
    },
    { key: 'shift' },
  );

  const monthIds = Array.from({ length: 12 }, (_, i) => String(i + 1));
  const months = raw.months ?? monthIds;
  for (const m of months) choice(m, 'months', monthIds);
  const wm = monthIds.map((id) => months.includes(id));
  if (!wm.some(Boolean)) throw EstimateMonthsEmpty({}, { key: 'months' });

  const ps = (raw['period-start'] ?? '').trim();
  const pe = (raw['period-end'] ?? '').trim();
  let period: EstimateInputs['period'] = null;
  if (ps !== '' || pe !== '') period = { start: parseYearMonth(ps, 'period-start'), end: parseYearMonth(pe, 'period-end') };

  const crew = raw.crew === undefined ? 1 : num(raw.crew, 'crew', `a whole number of workers from 1 to ${MAX_CREW}`, (v) => Number.isInteger(v) && v >= 1 && v <= MAX_CREW);

  return { place, classId: work === CUSTOM ? null : work, workRate, acclimatization, limitModel, airMovement, clothing, exposure, rest, shift, workMonths: wm, period, crew };
}

