export { expectCatalogued } from '../helpers/catalogued.ts';
import type { HorizontalGrid } from '../../pipeline/model/grid.ts';

/** A regular grid of cell centres: nLat rows from lat0, nLon columns from lon0, spacing d [°]. */
export function grid(lat0: number, nLat: number, lon0: number, nLon: number, d = 1): HorizontalGrid {
  return {
    lat: Float64Array.from({ length: nLat }, (_, j) => lat0 + j * d),
    lon: Float64Array.from({ length: nLon }, (_, i) => lon0 + i * d),
  };
}

type Pos = [number, number];

/** A GeoJSON Feature with a Polygon; rings are closed here if `close`. */
export function polygonFeature(id: string, rings: Pos[][], close = true, name = `Region ${id}`) {
  return {
    type: 'Feature',
    properties: { id, name },
    geometry: { type: 'Polygon', coordinates: rings.map((r) => (close ? [...r, r[0]] : r)) },
  };
}

export function collection(...features: unknown[]) {
  return { type: 'FeatureCollection', features };
}

/** Axis-aligned rectangle ring, counter-clockwise [° E, ° N]. */
export function rect(w: number, s: number, e: number, n: number): Pos[] {
  return [
    [w, s],
    [e, s],
    [e, n],
    [w, n],
  ];
}
