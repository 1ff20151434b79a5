/**
 * The estimate's inputs, parsed and checked from raw strings (as a browser form or the command
 * line gives them), with catalogued errors. The /estimate/ page and `heathours estimate` both
 * call {@link parseInputs}, so they accept and refuse the same things.
 *
 * Temperatures typed in the page are in the page's unit (°C or °F): an absolute WBGT (a cooled
 * rest place) converts with the offset, a clothing adjustment value as a difference (× 5/9).
 */
import { clothingAdjustment, clothingEnsemble, CLOTHING_ENSEMBLES } from '../work/clothing.ts';
import { ACCLIMATIZATION_STATES, LIMIT_MODELS, type Acclimatization, type LimitModelId } from '../work/limit-curves.ts';
import type { Weekday } from '../work/shifts.ts';
import type { Exposure } from '../work/work-settings.ts';
import { daysFromCivil, formatDay, parseDay } from './calendar.ts';
import type { EstimateContext, EstimateGrid } from './context.ts';
import {
  EstimateCellInvalid,
  EstimateChoiceUnknown,
  EstimateMonthsEmpty,
  EstimateNumberInvalid,
  EstimatePointOutsideGrid,
  EstimateRegionUnknown,
  EstimateScenarioUnknown,
  ScheduleTooManyPatterns,
} from './errors.ts';
import { parseCrew, parseCurrency, parseDailyCost, parseHolidays, parseRate, parseWorkHours, type Costs } from './job.ts';
import { parseYearMonth, type YearMonth } from './project-period.ts';
import { makePattern, parseDays, parseShiftSpan, patternFromWorkShift, type ShiftPattern } from './shift-pattern.ts';
import type { RestChoice } from './slot-figures.ts';
import { MAX_PATTERNS } from './bid.ts';

/** The unit temperatures are typed in. */
export type TemperatureUnit = 'C' | 'F';

/** Where the estimate is for: a region, a grid cell by id, or a point (mapped to the nearest land cell, place.ts). */
export type EstimatePlace = { kind: 'region'; id: string } | { kind: 'cell'; cell: number } | { kind: 'point'; lat: number; lon: number };

/** The job: start, quantity, crew, days off, deadline. */
export interface JobInputs {
  /** First day [day number, calendar.ts]. */
  start: number;
  /** Quantity of work [crew-hours]. */
  workHours: number;
  holidays: Set<number>;
  /** Last day for the crew-for-deadline question [day number], or null. */
  deadline: number | null;
}

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
  /** The shift pattern of the job (and of the monthly table). */
  shift: ShiftPattern;
  /** Other patterns to compare (at most MAX_PATTERNS − 1). */
  otherPatterns: ShiftPattern[];
  /** Work months of the monthly table, index 0 = January. */
  workMonths: boolean[];
  period: { start: YearMonth; end: YearMonth } | null;
  /** Workers in the crew [count]. */
  crew: number;
  job: JobInputs;
  costs: Costs;
  /** Ids of the atlas's scenarios the job is also replayed on, in the atlas's order (scenario-runs.ts). */
  scenarios: string[];
}

/** The raw values: single fields as strings, multi-choice fields (days, months, compare) as lists. */
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
  /** Shift spans, `07:00-17:00`; several separated by commas, semicolons or "and". */
  shifts?: string;
  /** Weekdays (`mon`), ranges (`mon-sat`) or lists, each entry parsed and joined. */
  days?: string[];
  /** Other shift patterns to compare, each like `shifts`. */
  compare?: string[];
  months?: string[];
  'period-start'?: string;
  'period-end'?: string;
  crew?: string;
  start?: string;
  'work-hours'?: string;
  holidays?: string;
  deadline?: string;
  rate?: string;
  'daily-cost'?: string;
  currency?: string;
  /** Scenario ids to replay the job on too; `all` for every one, `none` for none (the form with every box unticked). */
  scenario?: string[];
}

export const CUSTOM = 'custom';
/** Defaults of the job when a field is not given. */
export const JOB_DEFAULTS = { workHours: '20000', crew: '10', rate: '0', dailyCost: '0', currency: '' } as const;

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
  if (cell >= g.nLat * g.nLon)
    throw EstimateCellInvalid(
      { value: text, problem: `outside the grid of ${g.nLat} × ${g.nLon} = ${g.nLat * g.nLon} cells (ids 0–${g.nLat * g.nLon - 1})` },
      { key: 'cell' },
    );
  return cell;
}

/** A latitude and longitude [° N, ° E]. Catalogued errors: EstimateNumberInvalid, EstimatePointOutsideGrid. */
export function parsePoint(latText: string | undefined, lonText: string | undefined, ctx: EstimateContext): { lat: number; lon: number } {
  if (ctx.cells === null) throw EstimateCellInvalid({ value: `${latText},${lonText}`, problem: 'this atlas publishes no per-cell data' }, { key: 'lat' });
  const lat = num(latText, 'lat', 'a latitude from −90 to 90 [° N]', (v) => v >= -90 && v <= 90);
  const lon = num(lonText, 'lon', 'a longitude from −180 to 360 [° E]', (v) => v >= -180 && v <= 360);
  cellAt(ctx.cells.grid, lat, lon); // inside the grid
  return { lat, lon };
}

/** A place from the URL's query (`?region=<id>`, `?cell=<cell_id>`, `?lat=…&lon=…`); null when none is given. */
export function placeFromQuery(search: string, ctx: EstimateContext): EstimatePlace | null {
  const q = new URLSearchParams(search);
  const cell = q.get('cell');
  if (cell !== null) return { kind: 'cell', cell: parseCellId(cell, ctx) };
  if (q.get('lat') !== null || q.get('lon') !== null) return { kind: 'point', ...parsePoint(q.get('lat') ?? '', q.get('lon') ?? '', ctx) };
  const region = q.get('region');
  if (region !== null) return { kind: 'region', id: checkRegion(region, ctx) };
  return null;
}

/** The row and column of the cell whose centre is nearest to a point, or null outside the grid. */
export function rowColAt(grid: EstimateGrid, lat: number, lon: number): { row: number; col: number } | null {
  const row = Math.round((lat - grid.lat0) / grid.dLat);
  let col = -1;
  for (const l of [lon, lon - 360, lon + 360]) {
    const c = Math.round((l - grid.lon0) / grid.dLon);
    if (c >= 0 && c < grid.nLon) col = c;
  }
  return row >= 0 && row < grid.nLat && col >= 0 ? { row, col } : null;
}

/** The grid cell whose centre is nearest to a point [° N, ° E]. Catalogued error: EstimatePointOutsideGrid. */
export function cellAt(grid: EstimateGrid, lat: number, lon: number): number {
  const rc = rowColAt(grid, lat, lon);
  if (!rc) {
    const extent = `${grid.lat0 - grid.dLat / 2} to ${grid.lat0 + (grid.nLat - 0.5) * grid.dLat}° N, ${grid.lon0 - grid.dLon / 2} to ${grid.lon0 + (grid.nLon - 0.5) * grid.dLon}° E`;
    throw EstimatePointOutsideGrid({ lat, lon, extent }, { key: 'lat' });
  }
  return rc.row * grid.nLon + rc.col;
}

/** Centre of a cell [° N, ° E]. */
export function cellCentre(grid: EstimateGrid, cell: number): { lat: number; lon: number } {
  return { lat: grid.lat0 + Math.floor(cell / grid.nLon) * grid.dLat, lon: grid.lon0 + (cell % grid.nLon) * grid.dLon };
}

/** Shift spans from text: `07:00-17:00`, `05:00-11:00, 15:00-19:00`, `05:00-11:00 and 15:00-19:00`. */
export function splitSpans(text: string): string[] {
  return text
    .split(/\s*(?:[,;+]|\band\b)\s*/)
    .map((s) => s.trim())
    .filter((s) => s !== '');
}

/** The default start of a job: 1 January of the year after the atlas was built. */
export function defaultStart(ctx: EstimateContext): string {
  const year = Number(ctx.build.buildTime.slice(0, 4));
  return formatDay(daysFromCivil((Number.isFinite(year) && year > 1900 ? year : 2026) + 1, 1, 1));
}

/**
 * Checks the raw values against the atlas and returns the inputs in °C and W.
 * Catalogued errors: EstimateRegionUnknown, EstimateCellInvalid, EstimatePointOutsideGrid,
 * EstimateNumberInvalid, EstimateChoiceUnknown, EstimateMonthsEmpty, EstimatePeriodInvalid,
 * ScheduleDateInvalid, ScheduleNumberInvalid, ScheduleShiftInvalid, ScheduleDaysInvalid,
 * ScheduleHolidayInvalid, ScheduleTooManyPatterns, EstimateScenarioUnknown, and from pipeline/work:
 * ClothingAdjustmentOutOfRange.
 */
export function parseInputs(raw: RawInputs, ctx: EstimateContext, unit: TemperatureUnit): EstimateInputs {
  const placeKind = choice(raw.place, 'place', ctx.cells ? (['region', 'cell', 'point'] as const) : (['region'] as const), 'region');
  let place: EstimatePlace;
  if (placeKind === 'region') place = { kind: 'region', id: checkRegion(raw.region ?? '', ctx) };
  else if (placeKind === 'cell') place = { kind: 'cell', cell: parseCellId(raw.cell ?? '', ctx) };
  else place = { kind: 'point', ...parsePoint(raw.lat, raw.lon, ctx) };

  const classIds = ctx.classes.map((c) => c.id);
  const work = choice(raw.work, 'work', [...classIds, CUSTOM], ctx.defaults.classId);
  const workRate =
    work === CUSTOM
      ? num(
          raw['metabolic-rate'],
          'metabolic-rate',
          `a work metabolic rate above the rest rate ${ctx.restRate} W and at most 1000 W`,
          (v) => v > ctx.restRate && v <= 1000,
        )
      : ctx.classes.find((c) => c.id === work)!.metabolicRate;

  const acclimatization = choice(raw.acclimatization, 'acclimatization', ACCLIMATIZATION_STATES, ctx.defaults.acclimatization);
  const limitModel = choice(raw['limit-model'], 'limit-model', LIMIT_MODELS, ctx.limitModel);
  const airMovement = raw['air-movement'] === undefined ? ctx.airMovement : raw['air-movement'] === 'on' || raw['air-movement'] === 'true';

  const d = ctx.defaults.clothing;
  const ensembles = CLOTHING_ENSEMBLES.map((e) => e.id);
  const ensemble = choice(raw.clothing, 'clothing', [...ensembles, CUSTOM], 'cav' in d ? CUSTOM : d.ensemble);
  let clothing: EstimateInputs['clothing'];
  if (ensemble === CUSTOM) {
    const typed =
      raw.cav === undefined && 'cav' in d
        ? d.cav
        : celsiusDeltaFrom(
            num(raw.cav, 'cav', `a clothing adjustment value [${unit === 'F' ? '°F' : '°C'}-WBGT]`, () => true),
            unit,
          );
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
      ? {
          kind: 'fixed',
          wbgt: celsiusFrom(
            num(raw['rest-wbgt'], 'rest-wbgt', `the measured WBGT of the rest place [${unit === 'F' ? '°F' : '°C'}]`, (v) => Number.isFinite(v)),
            unit,
          ),
        }
      : { kind: restKind };
  if (rest.kind === 'fixed' && !(rest.wbgt >= 0 && rest.wbgt <= 45)) {
    throw EstimateNumberInvalid(
      { name: 'rest-wbgt', value: raw['rest-wbgt'] ?? '', expected: 'a rest-place WBGT from 0 to 45 °C (32 to 113 °F)' },
      { key: 'rest-wbgt' },
    );
  }

  const atlasShift = patternFromWorkShift(ctx.defaults.shift);
  const days: Weekday[] = raw.days === undefined ? atlasShift.days : [...new Set(raw.days.flatMap((t) => parseDays(t)))];
  const spansText = (raw.shifts ?? '').trim();
  const shift = makePattern(spansText === '' ? atlasShift.spans : splitSpans(spansText).map(parseShiftSpan), days);
  const compare = (raw.compare ?? []).map((t) => t.trim()).filter((t) => t !== '');
  if (compare.length + 1 > MAX_PATTERNS) throw ScheduleTooManyPatterns({ count: compare.length + 1, max: MAX_PATTERNS }, { key: 'compare' });
  const otherPatterns = compare.map((t) => makePattern(splitSpans(t).map(parseShiftSpan), days));

  const monthIds = Array.from({ length: 12 }, (_, i) => String(i + 1));
  const months = raw.months ?? monthIds;
  for (const m of months) choice(m, 'months', monthIds);
  const wm = monthIds.map((id) => months.includes(id));
  if (!wm.some(Boolean)) throw EstimateMonthsEmpty({}, { key: 'months' });

  const ps = (raw['period-start'] ?? '').trim();
  const pe = (raw['period-end'] ?? '').trim();
  let period: EstimateInputs['period'] = null;
  if (ps !== '' || pe !== '') period = { start: parseYearMonth(ps, 'period-start'), end: parseYearMonth(pe, 'period-end') };

  const crew = parseCrew(raw.crew ?? JOB_DEFAULTS.crew);
  const text = (v: string | undefined) => (v ?? '').trim();
  const job: JobInputs = {
    start: parseDay(text(raw.start) === '' ? defaultStart(ctx) : text(raw.start), 'start'),
    workHours: parseWorkHours(text(raw['work-hours']) === '' ? JOB_DEFAULTS.workHours : raw['work-hours']),
    holidays: parseHolidays(raw.holidays ?? ''),
    deadline: text(raw.deadline) === '' ? null : parseDay(text(raw.deadline), 'deadline'),
  };
  const costs: Costs = {
    rate: parseRate(text(raw.rate) === '' ? JOB_DEFAULTS.rate : raw.rate),
    dailyCost: parseDailyCost(text(raw['daily-cost']) === '' ? JOB_DEFAULTS.dailyCost : raw['daily-cost']),
    currency: parseCurrency(raw.currency ?? JOB_DEFAULTS.currency),
  };

  const scenarios = parseScenarios(raw.scenario ?? [], ctx);
  return {
    place,
    classId: work === CUSTOM ? null : work,
    workRate,
    acclimatization,
    limitModel,
    airMovement,
    clothing,
    exposure,
    rest,
    shift,
    otherPatterns,
    workMonths: wm,
    period,
    crew,
    job,
    costs,
    scenarios,
  };
}

/**
 * The scenario ids asked for, in the atlas's order, each once: `all` stands for every scenario of
 * the atlas, `none` (and an empty entry) for none. Catalogued error: EstimateScenarioUnknown, its
 * hint listing the atlas's ids.
 */
export function parseScenarios(asked: readonly string[], ctx: EstimateContext): string[] {
  const known = ctx.scenarios.map((s) => s.id);
  const want = new Set<string>();
  for (const raw of asked) {
    const id = raw.trim();
    if (id === '' || id === 'none') continue;
    if (id === 'all') known.forEach((k) => want.add(k));
    else if (known.includes(id)) want.add(id);
    else throw EstimateScenarioUnknown({ value: id, known }, { key: 'scenario' });
  }
  return known.filter((k) => want.has(k));
}
