/**
 * The atlas grid in the browser: a point [° E, ° N] → the cell that holds it, a cell id → its
 * centre and outline, and one-cell steps for the keyboard cursor. Cell ids are row-major global
 * indices `y · nLon + x`, rows south → north (data/cells/index.json, the per-cell tables). Pure.
 */
import type { Feature, Polygon } from 'geojson';
import type { CellFiguresIndex } from '../../../../pipeline/publish/cell-figures.ts';

export type CellGrid = CellFiguresIndex['grid'];

/** Largest latitude Web Mercator draws [° N]. */
const MERCATOR_LAT = 85.05112878;

/** The cell (y, x) holding a point, or null outside the grid. Longitudes wrap by 360°. */
export function cellAt(g: CellGrid, lon: number, lat: number): { y: number; x: number; id: number } | null {
  if (!Number.isFinite(lon) || !Number.isFinite(lat)) return null;
  const y = Math.round((lat - g.lat0) / (g.dLat || 1));
  const dLon = g.dLon || 1;
  // Bring the longitude within [lon0 − dLon/2, lon0 − dLon/2 + 360).
  const dx = ((((lon - g.lon0 + dLon / 2) % 360) + 360) % 360) - dLon / 2;
  const x = Math.round(dx / dLon);
  if (y < 0 || y >= g.nLat || x < 0 || x >= g.nLon) return null;
  return { y, x, id: y * g.nLon + x };
}

export function cellYX(g: CellGrid, id: number): { y: number; x: number } {
  return { y: Math.floor(id / g.nLon), x: id % g.nLon };
}

/** Whether `id` is a cell of the grid. */
export function isCell(g: CellGrid, id: number): boolean {
  return Number.isInteger(id) && id >= 0 && id < g.nLat * g.nLon;
}

/** Centre of a cell [° E, ° N]. */
export function cellCentre(g: CellGrid, id: number): [number, number] {
  const { y, x } = cellYX(g, id);
  return [g.lon0 + x * g.dLon, g.lat0 + y * g.dLat];
}

/** A cell's edges as a polygon [° E, ° N], latitudes within the Web Mercator limit. */
export function cellPolygon(g: CellGrid, id: number): Feature<Polygon> {
  const [lon, lat] = cellCentre(g, id);
  const w = lon - g.dLon / 2;
  const e = lon + g.dLon / 2;
  const s = Math.max(-MERCATOR_LAT, lat - g.dLat / 2);
  const n = Math.min(MERCATOR_LAT, lat + g.dLat / 2);
  return {
    type: 'Feature',
    properties: { cell: id },
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

/** The cell `dx` columns east and `dy` rows north of `id`, kept inside the grid. */
export function moveCell(g: CellGrid, id: number, dx: number, dy: number): number {
  const { y, x } = cellYX(g, id);
  const ny = Math.min(g.nLat - 1, Math.max(0, y + dy));
  const nx = Math.min(g.nLon - 1, Math.max(0, x + dx));
  return ny * g.nLon + nx;
}

/** Chunk id of a cell (pipeline/publish/cell-figures.ts cellChunkId). */
export function chunkOfCell(index: Pick<CellFiguresIndex, 'grid' | 'tile'>, id: number): string {
  const { y, x } = cellYX(index.grid, id);
  return `r${Math.floor(y / index.tile.rows)}c${Math.floor(x / index.tile.cols)}`;
}

/** Path below the site root of the per-cell table holding grid row `y` (data/cells/index.json `tables`), or undefined. */
export function cellTableOfRow(index: Pick<CellFiguresIndex, 'tables'>, y: number): string | undefined {
  return index.tables.find((t) => y >= t.rows[0] && y < t.rows[1])?.path;
}
