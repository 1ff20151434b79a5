/**
 * The dataset grid as map geometry, from the inventory's grid description. Cell centres run from
 * (latMin, lonMin) to (latMax, lonMax) in steps (dLat, dLon); each cell spans half a step either
 * side of its centre. Coordinates in [° E, ° N].
 */
import type { Feature, FeatureCollection, LineString, Polygon } from 'geojson';
import type { DatasetInventory } from '../../../pipeline/read/inventory-types.ts';

export type GridSpec = DatasetInventory['grid'];

/** Cell-edge bounds of the grid [° E, ° N]: [west, south, east, north], latitudes capped at ±90°. */
export function gridEdges(g: GridSpec): [number, number, number, number] {
  return [g.lonMin - g.dLon / 2, Math.max(-90, g.latMin - g.dLat / 2), g.lonMax + g.dLon / 2, Math.min(90, g.latMax + g.dLat / 2)];
}

/** Largest latitude Web Mercator draws [° N] (MapLibre refuses bounds beyond it). */
export const MAP_LAT_LIMIT = 85.05112878;

/** {@link gridEdges} with latitudes capped at the Web Mercator limit, for drawing. */
export function gridMapEdges(g: GridSpec): [number, number, number, number] {
  const [w, s, e, n] = gridEdges(g);
  return [w, Math.max(-MAP_LAT_LIMIT, s), e, Math.min(MAP_LAT_LIMIT, n)];
}

/** The grid's outer edge as one polygon, as drawn (latitudes within the Web Mercator limit). */
export function gridExtentPolygon(g: GridSpec): Feature<Polygon> {
  const [w, s, e, n] = gridMapEdges(g);
  return {
    type: 'Feature',
    properties: { kind: 'grid-extent' },
    geometry: {
      type: 'Polygon',
      coordinates: [
        [
          [w, s],
          [e, s],
          [e, n],
          [w, n],
          [w, s],
        ],
      ],
    },
  };
}

/** Most cells for which cell edges are drawn; larger grids show only their outer edge. */
export const MAX_DRAWN_CELLS = 40_000;

/** The lines between cells (meridians and parallels of the cell edges), or none for a large grid. */
export function gridCellLines(g: GridSpec): FeatureCollection<LineString> {
  const features: Feature<LineString>[] = [];
  if (g.nLat * g.nLon <= MAX_DRAWN_CELLS) {
    const [w, s, e, n] = gridMapEdges(g);
    const south = g.latMin - g.dLat / 2;
    for (let i = 0; i <= g.nLon; i++) {
      const lon = w + i * g.dLon;
      features.push({
        type: 'Feature',
        properties: {},
        geometry: {
          type: 'LineString',
          coordinates: [
            [lon, s],
            [lon, n],
          ],
        },
      });
    }
    for (let j = 0; j <= g.nLat; j++) {
      const lat = south + j * g.dLat;
      if (lat < s || lat > n) continue;
      features.push({
        type: 'Feature',
        properties: {},
        geometry: {
          type: 'LineString',
          coordinates: [
            [w, lat],
            [e, lat],
          ],
        },
      });
    }
  }
  return { type: 'FeatureCollection', features };
}
