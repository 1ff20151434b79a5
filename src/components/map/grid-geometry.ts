/**
 * The dataset grid as map geometry, from the inventory's grid description. Cell centres run from
 * (latMin, lonMin) to (latMax, lonMax) in steps (dLat, dLon); each cell spans half a step either
 * side of its centre. Coordinates in [° E, ° N].
 */
import type { Feature, FeatureCollection, LineString, Polygon } from 'geojson';
import type { DatasetInventory } from '../../../pipeline/publish/inventory-types.ts';

export type GridSpec = DatasetInventory['grid'];

/** Cell-edge bounds of the grid [° E, ° N]: [west, south, east, north]. */
export function gridEdges(g: GridSpec): [number, number, number, number] {
  return [g.lonMin - g.dLon / 2, g.latMin - g.dLat / 2, g.lonMax + g.dLon / 2, g.latMax + g.dLat / 2];
}

/** The grid's outer edge as one polygon. */
export function gridExtentPolygon(g: GridSpec): Feature<Polygon> {
  const [w, s, e, n] = gridEdges(g);
  return {
    type: 'Feature',
    properties: { kind: 'grid-extent' },
    geometry: { type: 'Polygon', coordinates: [[[w, s], [e, s], [e, n], [w, n], [w, s]]] },
  };
}

/** Most cells for which cell edges are drawn; larger grids show only their outer edge. */
export const MAX_DRAWN_CELLS = 40_000;

/** The lines between cells (meridians and parallels of the cell edges), or none for a large grid. */
export function gridCellLines(g: GridSpec): FeatureCollection<LineString> {
  const features: Feature<LineString>[] = [];
  if (g.nLat * g.nLon <= MAX_DRAWN_CELLS) {
    const [w, s, e, n] = gridEdges(g);
    for (let i = 0; i <= g.nLon; i++) {
      const lon = w + i * g.dLon;
      features.push({ type: 'Feature', properties: {}, geometry: { type: 'LineString', coordinates: [[lon, s], [lon, n]] } });
    }
    for (let j = 0; j <= g.nLat; j++) {
      const lat = s + j * g.dLat;
      features.push({ type: 'Feature', properties: {}, geometry: { type: 'LineString', coordinates: [[w, lat], [e, lat]] } });
    }
  }
  return { type: 'FeatureCollection', features };
}
