/**
 * Temperature units on the pages: °C by default, °F on request (many US practitioners read WBGT
 * in °F). Pure and used both at build time and in the browser.
 *
 * The page convention (src/scripts/units.ts applies it to every page):
 * - an absolute temperature is rendered as `<span data-temp-c="31.25" data-digits="1">31.3 °C</span>`;
 * - a temperature difference (a clothing adjustment, a shift between periods) as
 *   `<span data-temp-delta-c="0.5" data-digits="1">+0.5 °C</span>` (× 9/5, no offset);
 * - a bare unit label (a table header, a legend title) as `<span data-unit-label>°C</span>`;
 * - `data-temp-signed` on an absolute temperature keeps an explicit + sign for positive values; a
 *   difference keeps the sign style it was first rendered with (a leading + or none);
 * - free text with absolute temperatures in it, where no child element can go (an SVG `<title>`,
 *   an `<option>`, a class name such as "below 29 °C"), as
 *   `<title data-temp-text="Limit: 28.2 °C">Limit: 28.2 °C</title>`: every "a °C" and "a–b °C"
 *   of the attribute is converted ({@link temperatureTextIn}); differences must not go there;
 * - a list of temperatures as `<span data-temp-list-c="11,15,29">11, 15 or 29 °C</span>`
 *   ({@link formatTemperatureList});
 * - text that names the unit of a file or of a published formula, which stays °C whatever the
 *   switch shows, sits inside an element marked `data-unit-fixed` (test/site/units.test.ts
 *   checks that no other °C text is left on a page shown in °F).
 * Scripts that draw temperatures themselves (map legend, calculator) read {@link currentUnit}
 * and listen for the {@link UNIT_EVENT} event on `document`.
 * Conversion: °F = °C × 9/5 + 32 (exact by definition of the Fahrenheit scale; common practice).
 */
import { formatFixed } from './format.ts';

export type TemperatureUnit = 'C' | 'F';

/** localStorage key and URL query parameter that hold the chosen unit. */
export const UNIT_STORAGE_KEY = 'heathours.units';
export const UNIT_QUERY_PARAM = 'units';
/** Event dispatched on `document` when the unit changes; `detail` is `{ unit }`. */
export const UNIT_EVENT = 'heathours:units';

/** °C → the unit [°C or °F]. */
export function temperatureIn(celsius: number, unit: TemperatureUnit): number {
  return unit === 'F' ? (celsius * 9) / 5 + 32 : celsius;
}

/** A °C difference → the unit [K or °F difference]. */
export function temperatureDeltaIn(deltaC: number, unit: TemperatureUnit): number {
  return unit === 'F' ? (deltaC * 9) / 5 : deltaC;
}

/** The unit's symbol, "°C" or "°F". */
export function unitSymbol(unit: TemperatureUnit): string {
  return unit === 'F' ? '°F' : '°C';
}

/** "31.3 °C" / "88.3 °F"; "–" when not finite. */
export function formatTemperature(celsius: number, unit: TemperatureUnit, digits = 1, signed = false): string {
  if (!Number.isFinite(celsius)) return '–';
  const v = temperatureIn(celsius, unit);
  const s = formatFixed(v, digits);
  return `${signed && v > 0 ? '+' : ''}${s} ${unitSymbol(unit)}`;
}

/** "+0.5 °C" / "+0.9 °F" for a difference; "–" when not finite. */
export function formatTemperatureDelta(deltaC: number, unit: TemperatureUnit, digits = 1, signed = true): string {
  if (!Number.isFinite(deltaC)) return '–';
  const v = temperatureDeltaIn(deltaC, unit);
  const s = formatFixed(v, digits);
  return `${signed && v > 0 ? '+' : ''}${s} ${unitSymbol(unit)}`;
}

/** Parses a stored or query value; anything but "F"/"f" is °C. */
export function parseUnit(value: string | null | undefined): TemperatureUnit {
  return value === 'F' || value === 'f' ? 'F' : 'C';
}

/** The unit the page shows now (set on `<html data-units>` by src/scripts/units.ts). */
export function currentUnit(): TemperatureUnit {
  return parseUnit(globalThis.document?.documentElement.dataset.units);
}

/**
 * Free text with absolute temperatures in °C ("Main band (11–15 °C)", "below 29 °C") in `unit`:
 * each "a °C" or "a–b °C" becomes °F (°F = °C × 9/5 + 32, one decimal, trailing zeros dropped);
 * other text is kept. Only for absolute temperatures: a difference would wrongly get the offset.
 */
export function temperatureTextIn(text: string, unit: TemperatureUnit): string {
  if (unit === 'C') return text;
  const f = (s: string) => String(Number(temperatureIn(Number(s.replace('\u2212', '-')), unit).toFixed(1))).replace('-', '\u2212');
  return text.replace(
    /([\u2212-]?\d+(?:\.\d+)?)(?:–([\u2212-]?\d+(?:\.\d+)?))? °C/g,
    (_m, a: string, b?: string) => `${f(a)}${b ? `–${f(b)}` : ''} ${unitSymbol(unit)}`,
  );
}

/** A list of temperatures sharing one unit: "11, 15, 20, 25 or 29 °C" [values in °C]. */
export function formatTemperatureList(celsius: readonly number[], unit: TemperatureUnit): string {
  const v = celsius.map((c) => String(Number(temperatureIn(c, unit).toFixed(1))).replace('-', '\u2212'));
  const words = v.length > 1 ? `${v.slice(0, -1).join(', ')} or ${v[v.length - 1]}` : (v[0] ?? '');
  return `${words} ${unitSymbol(unit)}`;
}
