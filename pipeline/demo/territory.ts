/**
 * The invented territory of the demo: an island on open ocean in the central North Pacific
 * (about 16.5–23.7° N, 149.6–142.1° W, far from any land), its districts, its landmarks, and the
 * grids the demo data are written on. Everything here is invented; no real place is implied.
 *
 * Shape: a superellipse `|x/a|^n + |y/b|^n = 1` (n = 3) with a few fixed harmonic bumps, sampled
 * at 48 vertices every 7.5° of polar angle around the centre (a star-shaped, hence simple, ring).
 * Districts partition it: three coastal strips between the outline and an inner core (the same
 * ring scaled by {@link CORE_SCALE}), and the core split into a dry basin (west) and an upland
 * (east). All polygons share the same rounded vertices, so they tile the island exactly.
 */
import type { LonLat } from './geometry.ts';

/** Name of the invented territory. */
export const TERRITORY_NAME = 'Quellmar';

/** Centre of the island [° E (−180..180), ° N]. */
export const CENTRE: LonLat = [-145.875, 20.125];

/** Half-widths of the superellipse [° of longitude, ° of latitude] and its exponent [–]. */
const HALF_LON = 3.5;
const HALF_LAT = 3.3;
const EXPONENT = 3;
/** Number of outline vertices [–]; vertex k sits at polar angle k·360°/N_VERTICES. */
export const N_VERTICES = 48;
/** Radius of the inner core relative to the outline [–]. */
export const CORE_SCALE = 0.55;

/** Upland summit [° E, ° N], its height [m] and its Gaussian width [° of great circle]. */
export const UPLAND = { centre: [-144.3, 20.9] as LonLat, peakM: 1350, sigmaDeg: 0.9 };
/** Centre of the dry interior basin [° E, ° N] and its Gaussian width [°]. */
export const BASIN = { centre: [-147.2, 19.7] as LonLat, sigmaDeg: 1.1 };

const round4 = (x: number): number => Math.round(x * 1e4) / 1e4;

/** Outline radius factor at polar angle θ [rad] relative to the plain superellipse [–]. */
function bump(theta: number): number {
  return 1 + 0.05 * Math.sin(3 * theta + 0.7) + 0.03 * Math.sin(5 * theta + 2.1) - 0.02 * Math.cos(7 * theta);
}

function ringAt(scale: number): LonLat[] {
  const ring: LonLat[] = [];
  for (let k = 0; k < N_VERTICES; k++) {
    const t = (2 * Math.PI * k) / N_VERTICES;
    const c = Math.cos(t);
    const s = Math.sin(t);
    const r = bump(t) / Math.pow(Math.pow(Math.abs(c / HALF_LON), EXPONENT) + Math.pow(Math.abs(s / HALF_LAT), EXPONENT), 1 / EXPONENT);
    ring.push([round4(CENTRE[0] + scale * r * c), round4(CENTRE[1] + scale * r * s)]);
  }
  return ring;
}

/** The island's coastline: open ring, counter-clockwise, [° E, ° N] rounded to 1e-4°. */
export const OUTLINE: readonly LonLat[] = ringAt(1);
/** The inner core ring (same angles, scaled by {@link CORE_SCALE}). */
export const CORE: readonly LonLat[] = ringAt(CORE_SCALE);

/** The climate zone a district was drawn around. */
export type DistrictKind = 'coast' | 'basin' | 'upland';

export interface District {
  /** Lower-case slug, also the GeoJSON file name. */
  id: string;
  /** Invented name. */
  name: string;
  kind: DistrictKind;
  /** Closed ring (first vertex repeated last), counter-clockwise, [° E, ° N]. */
  ring: LonLat[];
}

/** Vertices k = from..to (inclusive, indices modulo N_VERTICES) of a ring. */
function arc(ring: readonly LonLat[], from: number, to: number): LonLat[] {
  const out: LonLat[] = [];
  for (let k = from; k <= to; k++) out.push(ring[((k % N_VERTICES) + N_VERTICES) % N_VERTICES]);
  return out;
}

/** A strip between the coastline and the core, from vertex index a to b (counter-clockwise). */
function coastalStrip(a: number, b: number): LonLat[] {
  const ring = [...arc(OUTLINE, a, b), ...arc(CORE, a, b).reverse()];
  return [...ring, ring[0]];
}

/** A sector of the core from vertex index a to b, closed through the centre. */
function coreSector(a: number, b: number): LonLat[] {
  const ring: LonLat[] = [CENTRE, ...arc(CORE, a, b)];
  return [...ring, ring[0]];
}

/**
 * The districts (invented names). Vertex index k is at polar angle 7.5°·k from east,
 * counter-clockwise: north coast 30°–150°, west coast 150°–270°, south-east coast 270°–390°;
 * basin core 105°–285° (west), upland core 285°–465° (east).
 */
export const DISTRICTS: readonly District[] = [
  { id: 'varn-shore', name: 'Varn Shore', kind: 'coast', ring: coastalStrip(4, 20) },
  { id: 'sollent-coast', name: 'Sollent Coast', kind: 'coast', ring: coastalStrip(20, 36) },
  { id: 'tessick-coast', name: 'Tessick Coast', kind: 'coast', ring: coastalStrip(36, 52) },
  { id: 'drovan-basin', name: 'Drovan Basin', kind: 'basin', ring: coreSector(14, 38) },
  { id: 'kell-highlands', name: 'Kell Highlands', kind: 'upland', ring: coreSector(38, 62) },
];

/** A regular latitude–longitude grid. */
export interface GridSpec {
  nLat: number;
  nLon: number;
  /** Spacing [°]. */
  resolution: number;
}

/** The default demo grid: 32 × 34 cells at 0.25° (ERA5's grid), 24.0–16.25° N, 210.0–218.25° E. */
export const DEFAULT_GRID: GridSpec = { nLat: 32, nLon: 34, resolution: 0.25 };
/** A small grid for tests: 8 × 10 cells at 1°, the whole island with a ring of sea. */
export const SMALL_GRID: GridSpec = { nLat: 8, nLon: 10, resolution: 1 };
/**
 * A country-size grid for scale tests and benchmarks: 160 × 160 cells at 0.1° (ERA5-Land's
 * spacing), 16° × 16° centred on the island (about 3,600 cells of island, the rest open ocean with
 * its own invented marine weather). Built without a land-sea mask, every one of its 25,600 cells
 * is computed, as a country of that many land cells would be.
 */
export const COUNTRY_GRID: GridSpec = { nLat: 160, nLon: 160, resolution: 0.1 };

/** Cell-centre coordinates of a grid, ERA5 legacy order: latitude descending, longitude 0..360. */
export interface DemoGrid extends GridSpec {
  /** Latitudes, north to south [° N]. */
  lat: Float64Array;
  /** Longitudes, west to east, in 0..360 form [° E]. */
  lon360: Float64Array;
}

/**
 * Places a grid of the given size centred on the island, its points on multiples of the
 * resolution (as ERA5's grids are). @param spec grid size and spacing [°]
 */
export function placeGrid(spec: GridSpec): DemoGrid {
  const { nLat, nLon, resolution: r } = spec;
  const snap = (x: number) => Math.round(x / r) * r;
  const north = snap(CENTRE[1] + ((nLat - 1) / 2) * r);
  const west = snap(CENTRE[0] + 360 - ((nLon - 1) / 2) * r);
  const lat = new Float64Array(nLat);
  const lon360 = new Float64Array(nLon);
  for (let i = 0; i < nLat; i++) lat[i] = +(north - i * r).toFixed(6);
  for (let j = 0; j < nLon; j++) lon360[j] = +(west + j * r).toFixed(6);
  return { ...spec, lat, lon360 };
}
