/**
 * The continuous colour ramps a layer may use, all from d3-scale-chromatic, and which ramp each
 * kind of published figure gets. Only perceptually ordered, colour-blind-friendly sequential
 * ramps are offered:
 * - viridis, magma, inferno, plasma: van der Walt & Smith's matplotlib colormaps (2015), designed to be
 *   perceptually uniform and readable with common colour-vision deficiencies;
 * - cividis: Nuñez, Anderton & Renslow (2018), PLoS ONE 13(7): e0199239, optimised for deuteranopia;
 * - YlOrRd, YlGnBu: ColorBrewer sequential schemes (Brewer, colorbrewer2.org), listed there as
 *   colour-blind safe (from memory).
 */
import {
  interpolateCividis,
  interpolateInferno,
  interpolateMagma,
  interpolatePlasma,
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
} as const satisfies Record<string, Interpolator>;

export type RampName = keyof typeof RAMPS;

/** The d3 interpolator of a ramp; throws LayerRampUnknown for any other name. */
export function rampInterpolator(name: string): Interpolator {
  const f = (RAMPS as Record<string, Interpolator>)[name];
  if (!f) throw LayerRampUnknown({ ramp: name, known: Object.keys(RAMPS) }, { key: 'style.ramp' });
  return f;
}

/**
 * Our pairing of figure kinds with ramps (a project choice, not taken from any product). Light
 * colours mean "little heat cost" on every heat figure, so `reverse` flips the dark-to-light
 * matplotlib ramps; the pairing keeps hours-based figures on warm ramps and temperatures on
 * ramps that run through blue, so the two kinds are not confused side by side.
 */
export const RAMP_FOR_FIGURE = {
  /** Hours per month with effective WBGT above the limit [h]. */
  hoursAboveLimit: { ramp: 'YlOrRd', reverse: false },
  /** Working hours lost to required rest per month [h]. */
  hoursLost: { ramp: 'inferno', reverse: true },
  /** Capacity loss, share of the working time [1] or [%]. */
  capacityLoss: { ramp: 'magma', reverse: true },
  /** Mean WBGT [°C]. */
  meanWbgt: { ramp: 'plasma', reverse: false },
  /** Mean annual temperature [°C]. */
  meanAnnualTemperature: { ramp: 'cividis', reverse: false },
  /** Person-hours lost per km² [person-h km⁻²] (the workforce weighting). */
  personHoursDensity: { ramp: 'YlGnBu', reverse: false },
  /** Any other count or amount. */
  other: { ramp: 'viridis', reverse: false },
} as const satisfies Record<string, { ramp: RampName; reverse: boolean }>;

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
