/**
 * Units, converted once, here: each accepted source unit of a quantity maps to a linear
 * conversion into the canonical unit of pipeline/model/fields.ts (`canonical = k * source + c`),
 * and decoded values are checked against a plausible range so a wrong label is caught
 * (e.g. kelvin values labelled "C", as in Debian libncarg-data's nc4uvt.nc).
 *
 * Conversions: K → °C subtracts 273.15 (BIPM SI Brochure, 9th ed., §2.3.1); °F → °C is
 * (x − 32) · 5/9; Pa → hPa divides by 100; an hourly accumulation [J m-2] becomes the mean flux
 * over the hour [W m-2] by dividing by 3600 s (docs/methods.md §2.1); knots → m/s multiplies by
 * 0.514444 (1 kn = 1852 m / 3600 s).
 */
import { NetcdfUnitImplausible, NetcdfUnitUnknown } from './errors.ts';
import type { LinearUnit } from './decode.ts';

/**
 * The physical kinds of quantity the reader converts. The last three are the changes of a
 * scenario's change file (pipeline/read/change-file.ts): a temperature difference (K and degC
 * are the same step, never shifted by 273.15), a change of relative humidity in percentage
 * points, and a relative change (a fraction of the baseline value).
 */
export type UnitKind = 'temperature' | 'pressure' | 'speed' | 'accumulatedEnergy' | 'fraction' | 'temperatureDifference' | 'humidityPoints' | 'relativeChange';

/** A recognised unit: its conversion into the canonical unit and whether it is an accumulation. */
export interface UnitConversion extends LinearUnit {
  /** True when the source is an energy accumulated over the hour [J m-2] rather than a flux. */
  accumulated: boolean;
}

/** Lower case, no spaces, underscores, `**`, `^` or `.`; `°` and `degrees`/`degree` become `deg`. */
export function normalizeUnitText(u: string): string {
  return u
    .trim()
    .toLowerCase()
    .replace(/\*\*|\^/g, '')
    .replace(/°/g, 'deg')
    .replace(/[\s_.]+/g, '')
    .replace(/^degrees?/, 'deg')
    .replace(/(metres|meters|metre|meter)/g, 'm')
    .replace(/(seconds|second|secs|sec)/g, 's');
}

const TABLE: Record<UnitKind, Array<[string[], UnitConversion]>> = {
  temperature: [
    [['k', 'kelvin', 'degk', 'kelvins'], { k: 1, c: -273.15, accumulated: false }],
    [['c', 'degc', 'celsius', 'degcelsius'], { k: 1, c: 0, accumulated: false }],
    [['f', 'degf', 'fahrenheit', 'degfahrenheit'], { k: 5 / 9, c: (-32 * 5) / 9, accumulated: false }],
  ],
  pressure: [
    [['pa', 'pascal', 'pascals'], { k: 0.01, c: 0, accumulated: false }],
    [['hpa', 'mb', 'mbar', 'millibar', 'millibars', 'hectopascal', 'hectopascals'], { k: 1, c: 0, accumulated: false }],
    [['kpa'], { k: 10, c: 0, accumulated: false }],
  ],
  speed: [
    [['ms-1', 'm/s', 'ms1'], { k: 1, c: 0, accumulated: false }],
    [['km/h', 'kmh-1', 'kph'], { k: 1 / 3.6, c: 0, accumulated: false }],
    [['kn', 'kt', 'knot', 'knots'], { k: 1852 / 3600, c: 0, accumulated: false }],
  ],
  accumulatedEnergy: [
    [['jm-2', 'j/m2', 'jm2', 'wsm-2', 'ws/m2'], { k: 1 / 3600, c: 0, accumulated: true }],
    [['wm-2', 'w/m2', 'wm2'], { k: 1, c: 0, accumulated: false }],
  ],
  fraction: [
    [['', '1', '(0-1)', '0-1', 'fraction', 'dimensionless', 'none', '-'], { k: 1, c: 0, accumulated: false }],
    [['%', 'percent'], { k: 0.01, c: 0, accumulated: false }],
  ],
  // A difference of temperatures: one kelvin is one degree Celsius (BIPM SI Brochure, 9th ed.,
  // §2.3.1: a temperature interval has the same value in both), one degree Fahrenheit 5/9 of it.
  temperatureDifference: [
    [['k', 'kelvin', 'kelvins', 'degk', 'c', 'degc', 'celsius', 'degcelsius'], { k: 1, c: 0, accumulated: false }],
    [['f', 'degf', 'fahrenheit', 'degfahrenheit'], { k: 5 / 9, c: 0, accumulated: false }],
  ],
  // A change of relative humidity: percentage points, or a fraction of saturation (0.05 = 5 points).
  humidityPoints: [
    [['%', 'percent', 'pp', 'percentagepoints', 'percentagepoint'], { k: 1, c: 0, accumulated: false }],
    [['1', 'fraction', 'dimensionless', '0-1', '(0-1)'], { k: 100, c: 0, accumulated: false }],
  ],
  // A relative change, future/baseline − 1: a fraction or a percentage.
  relativeChange: [
    [['1', 'fraction', 'dimensionless'], { k: 1, c: 0, accumulated: false }],
    [['%', 'percent'], { k: 0.01, c: 0, accumulated: false }],
  ],
};

/** Accepted spellings of a kind, for messages. */
function accepted(kind: UnitKind): string {
  const first: Record<UnitKind, string> = {
    temperature: 'K, degC, degF',
    pressure: 'Pa, hPa, kPa',
    speed: 'm s-1, km/h, knots',
    accumulatedEnergy: 'J m-2 (hourly accumulation) or W m-2 (mean flux)',
    fraction: '1, (0 - 1), %',
    temperatureDifference: 'K or degC (a difference: the same number in both), degF',
    humidityPoints: '% (percentage points of relative humidity) or 1 (a fraction: 0.05 = 5 points)',
    relativeChange: '1 (a fraction: 0.02 = 2 %) or %',
  };
  return first[kind];
}

/** Looks up the conversion of `units` for a quantity of `kind`, or undefined. */
export function findConversion(kind: UnitKind, units: string | undefined): UnitConversion | undefined {
  const n = normalizeUnitText(units ?? '');
  for (const [names, conv] of TABLE[kind]) if (names.includes(n)) return conv;
  return undefined;
}

/** The conversion of `units` for `kind`; a catalogued error naming the variable when unknown. */
export function conversionFor(kind: UnitKind, units: string | undefined, where: { file?: string; variable?: string }): UnitConversion {
  const c = findConversion(kind, units);
  if (!c) throw NetcdfUnitUnknown({ units: units ?? '(none)', expected: accepted(kind) }, where);
  return c;
}

/** Which kind of quantity a units text names, if any (for `inspect` on arbitrary files). */
export function kindOfUnits(units: string | undefined): UnitKind | undefined {
  if (units === undefined || units.trim() === '') return undefined;
  for (const kind of ['temperature', 'pressure', 'speed', 'accumulatedEnergy'] as UnitKind[]) if (findConversion(kind, units)) return kind;
  return undefined;
}

/**
 * Plausible ranges in canonical units (common practice: the extremes of near-surface weather on
 * Earth with a margin; world records are about −89 °C and +57 °C air temperature, from memory).
 */
export const PLAUSIBLE: Record<string, [number, number]> = {
  temperature: [-95, 65],
  pressure: [300, 1100],
  speed: [-150, 150],
  windSpeed: [0, 150],
  flux: [-10, 1500],
  fraction: [-0.001, 1.001],
};

/**
 * Checks decoded values [canonical units] against the plausible range of `range`; throws a
 * catalogued error naming the variable, with a diagnosis for kelvin labelled as Celsius.
 */
export function checkPlausible(range: keyof typeof PLAUSIBLE, units: string, min: number, max: number, where: { file?: string; variable?: string }): void {
  if (!Number.isFinite(min) || !Number.isFinite(max)) return;
  const [lo, hi] = PLAUSIBLE[range];
  if (min >= lo && max <= hi) return;
  let detail = `plausible ${range} values lie within ${lo} … ${hi} in canonical units`;
  if (range === 'temperature' && normalizeUnitText(units) !== 'k' && min > 100 && max < 400) {
    detail = 'these look like kelvin values labelled as Celsius';
  }
  throw NetcdfUnitImplausible({ units, min: round(min), max: round(max), detail }, where);
}

function round(x: number): number {
  return Math.round(x * 1000) / 1000;
}
