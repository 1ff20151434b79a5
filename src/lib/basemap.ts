/**
 * The offline base map: Natural Earth outlines from world-atlas (TopoJSON) turned into GeoJSON a
 * MapLibre map can draw without crossing the map at the antimeridian (STACK.md, MapLibre gotcha 4).
 * - land: filled polygons, cut along ±180° with d3-geo's antimeridian clipping (the clipping every
 *   d3 projection applies), then rings sorted into outer rings and holes by nesting;
 * - borders: country borders as lines, split wherever a step jumps more than 180° in longitude.
 * Coordinates in [° E, ° N].
 */
import { geoEquirectangular, geoStream } from 'd3-geo';
import type { GeoStream } from 'd3-geo';
import { feature, mesh } from 'topojson-client';
import type { Topology, GeometryObject } from 'topojson-specification';
import type { Feature, FeatureCollection, MultiLineString, MultiPolygon, Position } from 'geojson';
import { ringContains } from '../../pipeline/regions/ring-contains.ts';

/** Largest latitude Web Mercator draws [° N]; the poles are clamped to it. */
export const MERCATOR_LAT_LIMIT = 85.05112878;

type Ring = Position[];

/** Twice the signed planar area of a ring in (lon, lat) [deg²]; positive = counter-clockwise. */
function ringArea2(ring: Ring): number {
  let s = 0;
  for (let i = 0, n = ring.length; i < n; i++) {
    const [x0, y0] = ring[i];
    const [x1, y1] = ring[(i + 1) % n];
    s += x0 * y1 - x1 * y0;
  }
  return s;
}

/** A point of `ring` away from the cut meridians, to test nesting with. */
function probePoint(ring: Ring): Position {
  return ring.find(([x]) => Math.abs(x) < 179.999) ?? ring[0];
}

/** Sorts planar rings into polygons: a ring inside an odd number of others is a hole of the smallest. */
function nestRings(rings: Ring[]): Position[][][] {
  const sorted = [...rings].sort((a, b) => Math.abs(ringArea2(b)) - Math.abs(ringArea2(a)));
  const polygons: Position[][][] = [];
  const outerOf: number[] = [];
  sorted.forEach((ring, i) => {
    const probe = probePoint(ring);
    const containers: number[] = [];
    for (let j = 0; j < i; j++) if (ringContains(sorted[j], probe[0], probe[1])) containers.push(j);
    if (containers.length % 2 === 1) {
      const parent = containers[containers.length - 1];
      polygons[outerOf[parent]].push(ring);
      outerOf[i] = outerOf[parent];
    } else {
      outerOf[i] = polygons.length;
      polygons.push([ring]);
    }
  });
  return polygons;
}

/** Cuts spherical polygons along the antimeridian: the rings d3-geo's clipping emits, in degrees. */
function cutAtAntimeridian(geo: Feature | FeatureCollection): Ring[][] {
  // Equirectangular with scale 180/π and no translation maps (λ, φ) to (lon, −lat) in degrees;
  // precision 0 turns resampling off, so only the antimeridian cut changes the outline.
  const projection = geoEquirectangular()
    .scale(180 / Math.PI)
    .translate([0, 0])
    .precision(0);
  const polygons: Ring[][] = [];
  let rings: Ring[] = [];
  let ring: Ring = [];
  let inPolygon = false;
  const sink: GeoStream = {
    polygonStart() {
      inPolygon = true;
      rings = [];
    },
    polygonEnd() {
      inPolygon = false;
      if (rings.length) polygons.push(rings);
    },
    lineStart() {
      ring = [];
    },
    lineEnd() {
      if (!inPolygon || ring.length < 3) return;
      const [x0, y0] = ring[0];
      const [xn, yn] = ring[ring.length - 1];
      if (x0 !== xn || y0 !== yn) ring.push([x0, y0]);
      rings.push(ring);
    },
    point(x, y) {
      const lat = Math.max(-MERCATOR_LAT_LIMIT, Math.min(MERCATOR_LAT_LIMIT, -y));
      ring.push([Math.max(-180, Math.min(180, x)), lat]);
    },
    sphere() {},
  };
  const stream = projection.stream(sink);
  const features = geo.type === 'FeatureCollection' ? geo.features : [geo];
  for (const f of features) if (f.geometry) geoStream(f, stream);
  return polygons;
}

/** Land polygons of a world-atlas topology (object `land`), cut at ±180°, as one MultiPolygon feature. */
export function landFromTopology(topology: Topology, objectName = 'land'): FeatureCollection<MultiPolygon> {
  const geo = feature(topology, topology.objects[objectName] as GeometryObject) as Feature | FeatureCollection;
  const coordinates: Position[][][] = [];
  for (const rings of cutAtAntimeridian(geo)) coordinates.push(...nestRings(rings));
  return {
    type: 'FeatureCollection',
    features: [{ type: 'Feature', properties: { kind: 'land' }, geometry: { type: 'MultiPolygon', coordinates } }],
  };
}

/** Splits a line wherever one step jumps more than 180° in longitude (a wrap at ±180°). */
export function splitAtAntimeridian(line: Position[]): Position[][] {
  const parts: Position[][] = [];
  let part: Position[] = [];
  for (const p of line) {
    const prev = part[part.length - 1];
    if (prev && Math.abs(p[0] - prev[0]) > 180) {
      if (part.length > 1) parts.push(part);
      part = [];
    }
    part.push(p);
  }
  if (part.length > 1) parts.push(part);
  return parts;
}

/** Borders between countries of a world-atlas topology (object `countries`), split at ±180°. */
export function bordersFromTopology(topology: Topology, objectName = 'countries'): FeatureCollection<MultiLineString> {
  const object = topology.objects[objectName] as GeometryObject;
  const lines = mesh(topology, object, (a, b) => a !== b);
  return {
    type: 'FeatureCollection',
    features: [
      {
        type: 'Feature',
        properties: { kind: 'border' },
        geometry: { type: 'MultiLineString', coordinates: lines.coordinates.flatMap(splitAtAntimeridian) },
      },
    ],
  };
}
