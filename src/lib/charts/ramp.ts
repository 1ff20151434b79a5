/**
 * Colour ramps of the report charts and the home map, from d3-scale-chromatic's perceptually
 * uniform, colour-blind-safe ramps (Smith & van der Walt's viridis family, as d3 ships them):
 * inferno for WBGT, viridis (reversed: light = few hours, dark = many) for hours lost. Legends are
 * drawn as a row of swatches with tick values from the same d3 scale. Pure.
 */
import { scaleLinear, scaleSequential, type ScaleSequential } from 'd3-scale';
import { interpolateInferno, interpolateViridis } from 'd3-scale-chromatic';

/** Ramp names as the pages state them. */
export const WBGT_RAMP_NAME = 'inferno (d3-scale-chromatic)';
export const HOURS_RAMP_NAME = 'viridis, reversed (d3-scale-chromatic)';

/** Colour for a missing value. */
export const NO_DATA_COLOUR = '#d9d9d9';

/** Sequential WBGT colour scale over `domain` [°C], clamped. */
export function wbgtColourScale(domain: [number, number]): ScaleSequential<string> {
  return scaleSequential(interpolateInferno).domain(domain).clamp(true);
}

/** Sequential hours colour scale over `domain` [h], clamped; light for few hours, dark for many. */
export function hoursColourScale(domain: [number, number]): ScaleSequential<string> {
  return scaleSequential((t: number) => interpolateViridis(1 - t)).domain(domain).clamp(true);
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
  const pos = scaleLinear().domain([d0, d1]).range([x, x + width]);
  const w = width / n;
  const swatches: LegendSwatch[] = Array.from({ length: n }, (_, i) => {
    const value = d0 + ((i + 0.5) / n) * (d1 - d0);
    return { x: x + i * w, width: w, fill: colour(value), value };
  });
  const ticks = pos.ticks(tickCount).map((value) => ({ value, x: pos(value) }));
  return { x, width, swatches, ticks, position: (v) => pos(Math.min(d1, Math.max(d0, v))) };
}
