/**
 * The continuous colour ramps a layer may use, all from d3-scale-chromatic, and the one colour
 * language of the site: one ramp per kind of figure, on every page (the map layers, the home
 * map, the report's charts), so more hours always read the same way. Only perceptually ordered,
 * colour-blind-friendly sequential ramps are offered for levels:
 * - viridis, magma, inferno, plasma: van der Walt & Smith's matplotlib colormaps (2015), designed to be
 *   perceptually uniform and readable with common colour-vision deficiencies;
 * - cividis: Nuñez, Anderton & Renslow (2018), PLoS ONE 13(7): e0199239, optimised for deuteranopia;
 * - YlOrRd, YlGnBu, Reds, Purples: ColorBrewer sequential schemes (Brewer, colorbrewer2.org), listed there as
 *   colour-blind safe (from memory).
 * Diverging ramps are for changes only (a value either side of no change): RdBu, a ColorBrewer
 * diverging scheme (colour-blind safe per colorbrewer2.org, from memory). Lightness order and
 * class separation under simulated colour-vision deficiencies are tested in test/publish/layers.
 */
import {
  interpolateCividis,
  interpolateInferno,
  interpolateMagma,
  interpolatePurples,
  interpolatePlasma,
  interpolateRdBu,
  interpolateReds,
  interpolateViridis,
  interpolateYlGnBu,
  interpolateYlOrRd,
} from 'd3-scale-chromatic';
import { LayerRampUnknown } from './errors.ts';

/** A d3 interpolator: t in [0, 1] → a CSS colour string. */
export type Interpolator = (t: number) => string;

export const RAMPS = {
  viridis: interpolateViridis,
  cividis: interpolateCividis,
  magma: interpolateMagma,
  inferno: interpolateInferno,
  plasma: interpolatePlasma,
  YlOrRd: interpolateYlOrRd,
  YlGnBu: interpolateYlGnBu,
  Reds: interpolateReds,
  Purples: interpolatePurples,
} as const satisfies Record<string, Interpolator>;

/** Diverging ramps: for changes only (test/publish/layers checks no level figure uses one). */
export const DIVERGING_RAMPS = {
  RdBu: interpolateRdBu,
} as const satisfies Record<string, Interpolator>;

export type RampName = keyof typeof RAMPS | keyof typeof DIVERGING_RAMPS;

/** The d3 interpolator of a ramp; throws LayerRampUnknown for any other name. */
export function rampInterpolator(name: string): Interpolator {
  const f = (RAMPS as Record<string, Interpolator>)[name] ?? (DIVERGING_RAMPS as Record<string, Interpolator>)[name];
  if (!f) throw LayerRampUnknown({ ramp: name, known: [...Object.keys(RAMPS), ...Object.keys(DIVERGING_RAMPS)] }, { key: 'style.ramp' });
  return f;
}

/** One kind of figure's colours: the ramp, its direction, and the colours in words for legends. */
export interface ColourKind {
  ramp: RampName;
  reverse: boolean;
  /** E.g. "white for no hours, dark red for many". */
  words: string;
}

/**
 * The site's colour language (a project choice, not taken from any product): every figure counted
 * in hours (above the limit, lost to rest breaks, capacity lost) on one ramp from white (none) to
 * dark red (many); every temperature (WBGT, air) on one ramp from dark blue (cool) to yellow (hot),
 * which holds no red, so a temperature is never read as hours; a change on a diverging ramp, blue
 * for less and red for more, white for none; a probability (the p-value of a trend) on one ramp
 * from dark purple (0: a steady change, unlikely by chance) to white (1), which holds neither the
 * red of hours nor the blue of the change ramp's "less".
 */
export const COLOUR_KINDS = {
  hours: { ramp: 'Reds', reverse: false, words: 'white for no hours, dark red for many' },
  temperature: { ramp: 'cividis', reverse: false, words: 'dark blue for cool, yellow for hot' },
  change: { ramp: 'RdBu', reverse: true, words: 'blue for less, white for no change, red for more' },
  probability: { ramp: 'Purples', reverse: true, words: 'dark purple for a small p-value (a steady change), white for 1' },
} as const satisfies Record<string, ColourKind>;

export type ColourKindName = keyof typeof COLOUR_KINDS;

/** Which colour kind each kind of published figure takes. */
export const RAMP_FOR_FIGURE = {
  /** Hours per month with effective WBGT above the limit [h]. */
  hoursAboveLimit: COLOUR_KINDS.hours,
  /** Working hours lost to required rest per month [h]. */
  hoursLost: COLOUR_KINDS.hours,
  /** Capacity loss in hours per month [h]. */
  capacityLoss: COLOUR_KINDS.hours,
  /** Mean WBGT [°C]. */
  meanWbgt: COLOUR_KINDS.temperature,
  /** Mean annual temperature [°C]. */
  meanAnnualTemperature: COLOUR_KINDS.temperature,
  /** A change between two values of one figure [its units]. */
  change: COLOUR_KINDS.change,
  /** Person-hours lost per km² [person-h km⁻²] (the workforce weighting): hours, so the hours ramp. */
  personHoursDensity: COLOUR_KINDS.hours,
  /** A probability [–], 0–1: the Mann–Kendall p-value of a trend. */
  probability: COLOUR_KINDS.probability,
} as const satisfies Record<string, ColourKind>;

export type FigureKind = keyof typeof RAMP_FOR_FIGURE;

/** An sRGB colour, 8 bits per channel. */
export interface Rgb {
  r: number;
  g: number;
  b: number;
}

/** Parses the colour strings d3 interpolators return: `#rrggbb` or `rgb(r, g, b)`. */
export function parseCssColour(s: string): Rgb {
  const hex = /^#([0-9a-f]{6})$/i.exec(s);
  if (hex) {
    const n = parseInt(hex[1], 16);
    return { r: (n >> 16) & 255, g: (n >> 8) & 255, b: n & 255 };
  }
  const rgb = /^rgb\(\s*([\d.]+)\s*,\s*([\d.]+)\s*,\s*([\d.]+)\s*\)$/.exec(s);
  if (rgb) return { r: clampByte(+rgb[1]), g: clampByte(+rgb[2]), b: clampByte(+rgb[3]) };
  throw new Error(`unparseable colour ${s}`);
}

function clampByte(v: number): number {
  return Math.max(0, Math.min(255, Math.round(v)));
}

/** `#rrggbb` of a colour. */
export function toHex(c: Rgb): string {
  return `#${((1 << 24) | (c.r << 16) | (c.g << 8) | c.b).toString(16).slice(1)}`;
}

/** Entries of a sampled ramp: 1024 keeps neighbours within 1 of 255 per channel on these ramps. */
export const RAMP_SAMPLES = 1024;

/**
 * A ramp sampled at `RAMP_SAMPLES` evenly spaced t (t_i = i / (n − 1)), packed as RGB bytes,
 * optionally reversed (t → 1 − t). Cached per (ramp, reverse, n): callers must not modify it.
 */
const sampled = new Map<string, Uint8Array>();

export function sampleRamp(name: string, reverse = false, n = RAMP_SAMPLES): Uint8Array {
  const f = rampInterpolator(name);
  const key = `${name}|${reverse}|${n}`;
  const cached = sampled.get(key);
  if (cached) return cached;
  const out = new Uint8Array(n * 3);
  for (let i = 0; i < n; i++) {
    const t = i / (n - 1);
    const c = parseCssColour(f(reverse ? 1 - t : t));
    out[i * 3] = c.r;
    out[i * 3 + 1] = c.g;
    out[i * 3 + 2] = c.b;
  }
  sampled.set(key, out);
  return out;
}
