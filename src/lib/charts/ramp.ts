/**
 * Colour ramps of the report charts and the home map: the site's one colour language
 * (pipeline/publish/layers/ramps.ts COLOUR_KINDS, the ramps the map layers use too), hours from
 * white to dark red, temperatures from dark blue to yellow, from d3-scale-chromatic. Legends are
 * drawn as a row of swatches with tick values from the same d3 scale. Pure.
 */
import { scaleLinear, scaleSequential, type ScaleSequential } from 'd3-scale';
import { COLOUR_KINDS, parseCssColour, rampInterpolator, toHex, type ColourKind } from '../../../pipeline/publish/layers/ramps.ts';

/** A ramp as the pages name it: "Reds (d3-scale-chromatic): white for no hours, dark red for many". */
export function rampName(kind: ColourKind): string {
  return `${kind.ramp}${kind.reverse ? ', reversed' : ''} (d3-scale-chromatic): ${kind.words}`;
}

/** Ramp names as the pages state them. */
export const WBGT_RAMP_NAME = rampName(COLOUR_KINDS.temperature);
export const HOURS_RAMP_NAME = rampName(COLOUR_KINDS.hours);
export const CHANGE_RAMP_NAME = rampName(COLOUR_KINDS.change);

/** t in [0, 1] → `#rrggbb` of a colour kind (its direction applied). */
export function kindInterpolator(kind: ColourKind): (t: number) => string {
  const f = rampInterpolator(kind.ramp);
  return (t) => toHex(parseCssColour(f(kind.reverse ? 1 - t : t)));
}

/** Colour for a missing value. */
export const NO_DATA_COLOUR = '#d9d9d9';

/** Sequential WBGT colour scale over `domain` [°C], clamped: the temperature ramp. */
export function wbgtColourScale(domain: [number, number]): ScaleSequential<string> {
  return scaleSequential(kindInterpolator(COLOUR_KINDS.temperature)).domain(domain).clamp(true);
}

/** Sequential hours colour scale over `domain` [h], clamped: the hours ramp, light for few hours, dark for many. */
export function hoursColourScale(domain: [number, number]): ScaleSequential<string> {
  return scaleSequential(kindInterpolator(COLOUR_KINDS.hours)).domain(domain).clamp(true);
}

/**
 * Colour of a change `v` on the diverging change ramp, symmetric about no change over
 * [−`largest`, +`largest`] [units of the change]: blue for less, white for none, red for more.
 */
export function changeColour(v: number, largest: number): string {
  if (!Number.isFinite(v)) return NO_DATA_COLOUR;
  const m = largest > 0 ? largest : 1;
  return kindInterpolator(COLOUR_KINDS.change)(Math.min(1, Math.max(0, 0.5 + v / (2 * m))));
}

/** A colour of a scale, or {@link NO_DATA_COLOUR} for a value that is not finite. */
export function colourOf(scale: ScaleSequential<string>, v: number): string {
  return Number.isFinite(v) ? scale(v) : NO_DATA_COLOUR;
}

export interface LegendSwatch {
  x: number;
  width: number;
  fill: string;
  /** Value at the swatch's middle. */
  value: number;
}

export interface LegendTick {
  value: number;
  x: number;
}

export interface LegendGeometry {
  x: number;
  width: number;
  swatches: LegendSwatch[];
  ticks: LegendTick[];
  /** value → x on the legend. */
  position(v: number): number;
}

/** A horizontal legend of `n` swatches from `x` to `x + width` for `colour` over its domain. */
export function buildLegend(colour: ScaleSequential<string>, x: number, width: number, n = 24, tickCount = 6): LegendGeometry {
  const [d0, d1] = colour.domain();
  const pos = scaleLinear()
    .domain([d0, d1])
    .range([x, x + width]);
  const w = width / n;
  const swatches: LegendSwatch[] = Array.from({ length: n }, (_, i) => {
    const value = d0 + ((i + 0.5) / n) * (d1 - d0);
    return { x: x + i * w, width: w, fill: colour(value), value };
  });
  const ticks = pos.ticks(tickCount).map((value) => ({ value, x: pos(value) }));
  return { x, width, swatches, ticks, position: (v) => pos(Math.min(d1, Math.max(d0, v))) };
}
