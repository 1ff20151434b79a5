/**
 * How a layer's values become colours: a continuous ramp over a domain (optionally stepped into
 * classes) or a categorical set of classes. `compileStyle` checks a style once and returns the
 * colour lookup the renderer uses and the legend the manifest carries, so the two cannot drift.
 */
import { LayerCategoriesInvalid, LayerClassesInvalid, LayerDomainInvalid } from './errors.ts';
import { RAMP_SAMPLES, rampInterpolator, sampleRamp, toHex, type RampName } from './ramps.ts';
import type { LegendSpec, LegendStop } from './legend.ts';

/** What an uncoloured (transparent) pixel means unless a style says otherwise. */
export const DEFAULT_NO_DATA_MEANING = 'no data: sea, masked out or not computed';

interface StyleCommon {
  /** Units of the values, as in the figure's attrs, e.g. `h` or `degC`. */
  units: string;
  /** Short title for the legend, e.g. "Hours above the limit, July". */
  title?: string;
  /** What a transparent pixel means; default {@link DEFAULT_NO_DATA_MEANING}. */
  noDataMeaning?: string;
}

/** A ramp over [min, max]; values outside are drawn in the end colours (clamped). */
export interface ContinuousStyle extends StyleCommon {
  kind: 'continuous';
  ramp: RampName;
  /** Run the ramp from its light end to its dark end (t → 1 − t). */
  reverse?: boolean;
  /** Values mapped to the ramp's ends [units]; min < max. */
  domain: [number, number];
  /** When set (2–20), equal-width classes, each one flat colour: a stepped legend. */
  classes?: number;
}

/** One class of a categorical layer. */
export interface CategoryClass {
  /** The integer code cells carry. */
  value: number;
  label: string;
  /** `#rrggbb`. */
  color: string;
}

/** Integer codes, each with its own colour and label (e.g. the niche classes). */
export interface CategoricalStyle extends StyleCommon {
  kind: 'categorical';
  classes: CategoryClass[];
  /** Name of the palette, recorded in the legend; default `categorical`. */
  paletteName?: string;
  /** Codes that mean "no value" and are drawn transparent, like NaN (e.g. 255). */
  noDataCodes?: number[];
}

export type LayerStyle = ContinuousStyle | CategoricalStyle;

/** A checked style: colour of a value (packed RGBA, 0 = transparent) and its legend. */
export interface CompiledStyle {
  /** Packed colour of a value: r | g << 8 | b << 16 | a << 24 as an unsigned 32-bit number; 0 for NaN. */
  colourOf(value: number): number;
  legend: LegendSpec;
}

const OPAQUE = 0xff000000;

function pack(r: number, g: number, b: number): number {
  return (OPAQUE | (b << 16) | (g << 8) | r) >>> 0;
}

/** `#rrggbb` of a packed colour. */
export function packedToHex(c: number): string {
  return toHex({ r: c & 255, g: (c >>> 8) & 255, b: (c >>> 16) & 255 });
}

/** A number written for a legend: no float noise (0.30000000000000004 → 0.3). */
export function formatLegendNumber(v: number): string {
  return String(Number(v.toPrecision(6)));
}

function checkDomain(domain: [number, number]): void {
  const [min, max] = domain;
  if (!Number.isFinite(min) || !Number.isFinite(max) || !(min < max)) {
    throw LayerDomainInvalid({ min, max }, { key: 'style.domain' });
  }
}

function compileContinuous(style: ContinuousStyle): CompiledStyle {
  rampInterpolator(style.ramp); // throws LayerRampUnknown
  checkDomain(style.domain);
  const [min, max] = style.domain;
  const span = max - min;
  const reverse = style.reverse ?? false;
  const common = {
    title: style.title,
    units: style.units,
    ramp: style.ramp,
    reversed: reverse,
    domain: [min, max] as [number, number],
    outOfDomain: 'clamped' as const,
    noData: { color: 'transparent' as const, meaning: style.noDataMeaning ?? DEFAULT_NO_DATA_MEANING },
  };

  if (style.classes !== undefined) {
    const n = style.classes;
    if (!Number.isInteger(n) || n < 2 || n > 20) throw LayerClassesInvalid({ classes: n }, { key: 'style.classes' });
    // Class k covers [min + k·w, min + (k+1)·w), the last one includes max; class colours sample
    // the whole ramp, t_k = k / (n − 1), so the end classes get the ramp's end colours.
    const table = sampleRamp(style.ramp, reverse, n);
    const colours = new Uint32Array(n);
    for (let k = 0; k < n; k++) colours[k] = pack(table[3 * k], table[3 * k + 1], table[3 * k + 2]);
    const breaks = Array.from({ length: n + 1 }, (_, k) => (k === n ? max : min + (k * span) / n));
    const colourOf = (v: number): number => {
      if (Number.isNaN(v)) return 0;
      const k = Math.floor(((v - min) / span) * n);
      return colours[k < 0 ? 0 : k >= n ? n - 1 : k];
    };
    const stops: LegendStop[] = Array.from(colours, (c, k) => ({
      value: breaks[k],
      color: packedToHex(c),
      label: `${formatLegendNumber(breaks[k])} – ${formatLegendNumber(breaks[k + 1])}`,
    }));
    return {
      colourOf,
      legend: { kind: 'stepped', ...common, stops, breaks, labels: stops.map((s) => s.label!) },
    };
  }

  const table = sampleRamp(style.ramp, reverse);
  const colours = new Uint32Array(RAMP_SAMPLES);
  for (let i = 0; i < RAMP_SAMPLES; i++) colours[i] = pack(table[3 * i], table[3 * i + 1], table[3 * i + 2]);
  const last = RAMP_SAMPLES - 1;
  const colourOf = (v: number): number => {
    if (Number.isNaN(v)) return 0;
    const i = Math.round(((v - min) / span) * last);
    return colours[i < 0 ? 0 : i > last ? last : i];
  };
  // 11 stops, every tenth of the domain: enough for a smooth CSS gradient of these ramps.
  const stops: LegendStop[] = Array.from({ length: 11 }, (_, k) => {
    const value = k === 10 ? max : min + (k * span) / 10;
    return { value, color: packedToHex(colourOf(value)), label: formatLegendNumber(value) };
  });
  return { colourOf, legend: { kind: 'continuous', ...common, stops, labels: stops.map((s) => s.label!) } };
}

function compileCategorical(style: CategoricalStyle): CompiledStyle {
  if (style.classes.length === 0) throw LayerCategoriesInvalid({ problem: 'no classes given' }, { key: 'style.classes' });
  const byValue = new Map<number, number>();
  for (const [i, c] of style.classes.entries()) {
    const where = { key: `style.classes[${i}]` };
    if (!Number.isInteger(c.value)) throw LayerCategoriesInvalid({ problem: `class "${c.label}" has a non-integer code ${c.value}` }, where);
    if (byValue.has(c.value)) throw LayerCategoriesInvalid({ problem: `code ${c.value} is used twice` }, where);
    const m = /^#([0-9a-f]{6})$/i.exec(c.color);
    if (!m) throw LayerCategoriesInvalid({ problem: `class "${c.label}" has colour "${c.color}", not #rrggbb` }, where);
    if (!c.label.trim()) throw LayerCategoriesInvalid({ problem: `code ${c.value} has an empty label` }, where);
    const n = parseInt(m[1], 16);
    byValue.set(c.value, pack((n >> 16) & 255, (n >> 8) & 255, n & 255));
  }
  const transparent = new Set(style.noDataCodes ?? []);
  for (const code of transparent) {
    if (byValue.has(code)) throw LayerCategoriesInvalid({ problem: `code ${code} is both a class and a no-data code` }, { key: 'style.noDataCodes' });
  }
  const colourOf = (v: number): number => {
    if (Number.isNaN(v) || transparent.has(v)) return 0;
    const c = byValue.get(v);
    if (c === undefined) {
      throw LayerCategoriesInvalid(
        { problem: `a cell holds ${v}, which is not the code of any class (${[...byValue.keys()].join(', ')})` },
        { variable: 'values' },
      );
    }
    return c;
  };
  const sorted = [...style.classes].sort((a, b) => a.value - b.value);
  const stops: LegendStop[] = sorted.map((c) => ({ value: c.value, color: c.color.toLowerCase(), label: c.label }));
  return {
    colourOf,
    legend: {
      kind: 'categorical',
      title: style.title,
      units: style.units,
      ramp: style.paletteName ?? 'categorical',
      reversed: false,
      domain: null,
      outOfDomain: 'error',
      stops,
      labels: sorted.map((c) => c.label),
      noData: { color: 'transparent', meaning: style.noDataMeaning ?? DEFAULT_NO_DATA_MEANING },
    },
  };
}

/** Checks a style (catalogued errors on bad domains, classes, ramps) and compiles it. */
export function compileStyle(style: LayerStyle): CompiledStyle {
  return style.kind === 'categorical' ? compileCategorical(style) : compileContinuous(style);
}
