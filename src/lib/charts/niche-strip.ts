/**
 * Geometry of the niche strip: a mean-annual-temperature axis [°C] with the bands of the human
 * climate niche (bounds and labels from pipeline/climate/niche.ts, docs/methods.md §11: Xu et al. 2020,
 * Lenton et al. 2023; colours those of the niche map layer, pipeline/publish/layers/niche-style.ts)
 * and a marker for the region's baseline and latest mean annual temperature. Linear scale from
 * d3-scale. Pure.
 */
import { scaleLinear } from 'd3-scale';
import { NICHE_BOUNDS, NICHE_LABELS, type NicheClass } from '../../../pipeline/climate/niche.ts';
import { NICHE_COLOURS } from '../../../pipeline/publish/layers/niche-style.ts';

export interface NicheBand {
  cls: NicheClass;
  /** [°C] */
  from: number;
  /** [°C] */
  to: number;
  x: number;
  width: number;
  fill: string;
  label: string;
}

export interface NicheMarker {
  key: 'baseline' | 'latest';
  /** [°C] */
  value: number;
  x: number;
}

export interface NicheStripGeometry {
  width: number;
  height: number;
  /** The temperature axis [°C]. */
  domain: [number, number];
  band: { top: number; height: number };
  bands: NicheBand[];
  markers: NicheMarker[];
  ticks: Array<{ value: number; x: number }>;
  x(v: number): number;
}

/** The default axis [°C]: wide enough for every band and some margin below and above. */
export const NICHE_AXIS: [number, number] = [0, 35];

export function buildNicheStrip(spec: { baselineMat: number; latestMat: number; width?: number }): NicheStripGeometry {
  const width = spec.width ?? 720;
  const left = 16;
  const right = width - 16;
  let [lo, hi] = NICHE_AXIS;
  for (const v of [spec.baselineMat, spec.latestMat]) {
    if (!Number.isFinite(v)) continue;
    lo = Math.min(lo, Math.floor(v - 2));
    hi = Math.max(hi, Math.ceil(v + 2));
  }
  const x = scaleLinear().domain([lo, hi]).range([left, right]);
  const b = NICHE_BOUNDS;
  const spans: Array<[NicheClass, number, number]> = [
    ['margin', lo, b.coreLow],
    ['core', b.coreLow, b.coreHigh],
    ['margin', b.coreHigh, b.secondLow],
    ['second', b.secondLow, b.secondHigh],
    ['margin', b.secondHigh, b.outsideFrom],
    ['outside', b.outsideFrom, hi],
  ];
  const bands = spans
    .filter(([, from, to]) => to > from)
    .map(([cls, from, to]) => ({ cls, from, to, x: x(from), width: x(to) - x(from), fill: NICHE_COLOURS[cls], label: NICHE_LABELS[cls] }));
  const markers: NicheMarker[] = [];
  if (Number.isFinite(spec.baselineMat)) markers.push({ key: 'baseline', value: spec.baselineMat, x: x(spec.baselineMat) });
  if (Number.isFinite(spec.latestMat)) markers.push({ key: 'latest', value: spec.latestMat, x: x(spec.latestMat) });
  return {
    width,
    height: 104,
    domain: [lo, hi],
    band: { top: 40, height: 26 },
    bands,
    markers,
    ticks: x.ticks(8).map((value) => ({ value, x: x(value) })),
    x: (v) => x(v),
  };
}
