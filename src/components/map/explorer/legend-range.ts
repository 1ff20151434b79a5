/**
 * What the legend says about its range: the unit in words, which views share the range (the
 * pipeline gives the twelve months of one figure × combination × statistic one range so months
 * compare, and the whole year its own, pipeline/publish/atlas-layers.ts), and, when the reader
 * switches to a view whose range differs from the one shown before, that it changed and from
 * what. Pure.
 */
import { formatFixed } from '../../../lib/format.ts';
import { temperatureIn, unitSymbol, type TemperatureUnit } from '../../../lib/units.ts';
import type { ExplorerLegend } from './catalogue.ts';
import { isTemperature } from './value-format.ts';

/** The legend shown before, for the comparison. */
export interface ShownRange {
  figure: string;
  units: string;
  domain: [number, number] | null;
}

function rangeText(domain: [number, number], units: string, unit: TemperatureUnit): string {
  if (isTemperature(units)) return `${formatFixed(temperatureIn(domain[0], unit), 1)}–${formatFixed(temperatureIn(domain[1], unit), 1)} ${unitSymbol(unit)}`;
  const d = Math.abs(domain[1] - domain[0]) < 10 ? 1 : 0;
  return `${formatFixed(domain[0], d)}–${formatFixed(domain[1], d)} ${units === '1' ? '' : units}`.trim();
}

/**
 * The legend's range note: "Unit: hours per worker per month. Colours span 0–130 h, a range
 * shared by the months of this view so they compare; the whole year has its own." plus, when the
 * range differs from `before` (same figure), "The range changed with this view (it was 0–650 h):
 * compare colours only within one range."
 */
export function legendRangeNote(
  legend: ExplorerLegend,
  view: { figure: string; period: string; unitWords: string },
  unit: TemperatureUnit,
  before?: ShownRange,
): string {
  const parts = [`Unit: ${view.unitWords}.`];
  if (legend.domain) {
    const scope =
      view.period === 'year'
        ? 'the range of the whole year; each month of this view shares another'
        : 'a range shared by the twelve months of this view, so they compare; the whole year has its own';
    parts.push(`Colours span ${rangeText(legend.domain, legend.units, unit)}, ${scope}.`);
    const b = before?.domain;
    if (b && before.figure === view.figure && before.units === legend.units && (b[0] !== legend.domain[0] || b[1] !== legend.domain[1])) {
      parts.push(`The range changed with this view (it was ${rangeText(b, legend.units, unit)}): compare colours only within one range.`);
    }
  }
  return parts.join(' ');
}

/**
 * The unit of a layer's values in words: the figure's words for a month or the year, or for the
 * record's trend "change of the yearly value per decade (h decade-1)" and, for its p-value,
 * "probability from 0 to 1 (Mann–Kendall p-value)".
 */
export function layerUnitWords(
  fig: { unitWords: { month: string; year: string } } | undefined,
  layer: { statistic: string; period: string; units: string },
): string {
  if (layer.statistic === 'trend') return `change of the yearly value per decade (${layer.units})`;
  if (layer.statistic === 'trend-p') return 'probability from 0 to 1 (Mann–Kendall p-value of the trend)';
  return fig ? fig.unitWords[layer.period === 'year' ? 'year' : 'month'] : layer.units;
}
