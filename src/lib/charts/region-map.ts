/**
 * Geometry of the home page's region map, drawn at build time with d3-geo: the region outlines in
 * a Mercator projection fitted to them, each filled by a value (annual hours lost) from the hours
 * ramp (ramp.ts), plus a graticule. GeoJSON from the pipeline follows RFC 7946 (exterior rings
 * counter-clockwise) while d3-geo reads rings as spherical polygons with clockwise exteriors; a
 * polygon whose d3 area (geoArea) is over half the sphere is therefore rewound before drawing.
 * Pure.
 */
import { geoArea, geoGraticule, geoMercator, geoPath } from 'd3-geo';
import type { Feature, FeatureCollection, MultiPolygon, Polygon, Position } from 'geojson';
import { buildLegend, colourOf, hoursColourScale, type LegendGeometry } from './ramp.ts';

type RegionGeometry = Polygon | MultiPolygon;

export interface MapRegionInput {
  id: string;
  name: string;
  geometry: RegionGeometry;
  /** [h]; NaN = no value. */
  value: number;
}

export interface MapRegion {
  id: string;
  name: string;
  /** SVG path. */
  d: string;
  fill: string;
  /** [h] */
  value: number;
  /** Projected centroid [px]. */
  centroid: [number, number];
}

export interface RegionMapGeometry {
  width: number;
  height: number;
  regions: MapRegion[];
  graticule: string;
  /** Graticule step [°]. */
  step: number;
  legend: LegendGeometry & { y: number; height: number };
  /** [° E, ° N] → [px] */
  project(lonLat: [number, number]): [number, number];
}

function reverseRings(rings: Position[][]): Position[][] {
  return rings.map((r) => [...r].reverse());
}

/** A polygon as d3-geo wants it: exterior clockwise (area below half the sphere). */
export function rewindForD3(g: RegionGeometry): RegionGeometry {
  if (g.type === 'Polygon') {
    return geoArea(g) > 2 * Math.PI ? { type: 'Polygon', coordinates: reverseRings(g.coordinates) } : g;
  }
  return {
    type: 'MultiPolygon',
    coordinates: g.coordinates.map((rings) => (geoArea({ type: 'Polygon', coordinates: rings }) > 2 * Math.PI ? reverseRings(rings) : rings)),
  };
}

/** A "nice" graticule step [°] giving about four lines across `span` [°]. */
export function graticuleStep(span: number): number {
  const raw = Math.max(span / 4, 1e-6);
  const p = 10 ** Math.floor(Math.log10(raw));
  for (const m of [1, 2, 5, 10]) if (m * p >= raw) return m * p;
  return 10 * p;
}

export function buildRegionMap(spec: { regions: MapRegionInput[]; width?: number; height?: number; domain?: [number, number] }): RegionMapGeometry {
  const width = spec.width ?? 720;
  const height = spec.height ?? 420;
  const legendSpace = 46;
  const features: Array<Feature<RegionGeometry>> = spec.regions.map((r) => ({ type: 'Feature', properties: { id: r.id }, geometry: rewindForD3(r.geometry) }));
  const fc: FeatureCollection<RegionGeometry> = { type: 'FeatureCollection', features };
  const projection = geoMercator();
  if (features.length > 0)
    projection.fitExtent(
      [
        [10, 10],
        [width - 10, height - legendSpace - 10],
      ],
      fc,
    );
  const path = geoPath(projection).digits(1);
  let top = 0;
  for (const r of spec.regions) if (Number.isFinite(r.value) && r.value > top) top = r.value;
  const domain = spec.domain ?? [0, top > 0 ? top : 1];
  const colour = hoursColourScale(domain);
  const regions = spec.regions.map((r, i) => {
    const c = features.length ? path.centroid(features[i]) : [0, 0];
    return { id: r.id, name: r.name, d: path(features[i]) ?? '', fill: colourOf(colour, r.value), value: r.value, centroid: [c[0], c[1]] as [number, number] };
  });
  // Graticule over the map frame (above the legend), in degrees from the projection's inverse.
  let step = 1;
  let graticule = '';
  if (features.length > 0) {
    const [w, n] = projection.invert!([0, 0])!;
    const [e, s] = projection.invert!([width, height - legendSpace])!;
    step = graticuleStep(Math.max(e - w, n - s));
    const g = geoGraticule()
      .step([step, step])
      .extent([
        [w, s],
        [e, n],
      ]);
    graticule = path(g()) ?? '';
  }
  const legendY = height - legendSpace + 8;
  const legend = { ...buildLegend(colour, 10, Math.min(360, width - 20)), y: legendY, height: 12 };
  return {
    width,
    height,
    regions,
    graticule,
    step,
    legend,
    project: (p) => projection(p) as [number, number],
  };
}
