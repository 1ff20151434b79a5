/**
 * How the map explorer writes a layer's values: hours with their unit, temperatures in the
 * reader's unit (°C or °F, src/lib/units.ts), class codes as the legend's class names. Pure.
 */
import { formatFixed } from '../../../lib/format.ts';
import { formatTemperature, temperatureIn, temperatureTextIn, unitSymbol, type TemperatureUnit } from '../../../lib/units.ts';
import type { ExplorerLegend } from './catalogue.ts';

/** Is this a temperature unit that follows the °C/°F switch? */
export function isTemperature(units: string): boolean {
  return units === 'degC';
}

/** The unit as shown: `h`, `°C`/`°F`, or '' for class codes. */
export function unitLabel(units: string, unit: TemperatureUnit): string {
  if (isTemperature(units)) return unitSymbol(unit);
  if (units === '1') return '';
  return units;
}

/** A value with its unit, e.g. "12.3 h", "27.4 °C", or the class name; "–" for none. */
export function formatLayerValue(v: number | null | undefined, units: string, unit: TemperatureUnit, legend?: ExplorerLegend, digits = 1): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '–';
  if (isTemperature(units)) return formatTemperature(v, unit, digits);
  if (legend?.kind === 'categorical') return labelInUnit(legend.stops.find((s) => s.value === v)?.label ?? String(v), unit);
  return units === '1' ? formatFixed(v, digits) : `${formatFixed(v, digits)} ${units}`;
}

/**
 * A label with temperatures in it ("Main band (11–15 °C)", "below 29 °C") in the reader's unit:
 * src/lib/units.ts {@link temperatureTextIn}, the page-wide rule.
 */
export function labelInUnit(label: string, unit: TemperatureUnit): string {
  return temperatureTextIn(label, unit);
}

/** A legend tick: temperatures converted to the unit with 1 decimal, others as the legend labels them. */
export function legendTickLabel(legend: ExplorerLegend, i: number, unit: TemperatureUnit): string {
  const stop = legend.stops[i];
  if (isTemperature(legend.units)) return formatFixed(temperatureIn(stop.value, unit), 1);
  return labelInUnit(stop.label ?? legend.labels[i] ?? formatFixed(stop.value, 1), unit);
}
