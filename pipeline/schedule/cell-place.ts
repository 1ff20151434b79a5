/**
 * The estimate's place when it is a grid cell (its chunk) or a point: the grid cell whose centre is nearest and, when that cell is sea (only
 * land cells are computed), the nearest land cell with the distance from the point to its centre.
 * The same code serves the page (bytes fetched from the site's data/ folder) and `heathours
 * estimate` (bytes read from the atlas folder): the caller passes a loader.
 *
 * Nearest land cell: great-circle distance (haversine on a sphere of the mean Earth radius
 * 6371.0088 km, IUGG; common practice, no source beyond that radius) from the point to the centres
 * of land cells (the point's own cell when it is land), searched ring by ring around the point's own cell until no farther ring can hold
 * a nearer centre. A chunk's header lists its land cells (point-tile-codec.ts), so only the chunks
 * near the point are read.
 */
import { parsePointChunk, type PointChunk } from '../publish/point-tile-codec.ts';
import type { EstimateContext } from './context.ts';
import { cellTileHistograms, chunkForCell } from './cell-tiles.ts';
import { EstimateCellInvalid } from './errors.ts';
import { cellCentre, rowColAt, type EstimatePlace } from './inputs.ts';
import type { AtlasLoader, ResolvedPlace } from './place-types.ts';

/** Mean Earth radius [km] (IUGG). */
export const EARTH_RADIUS_KM = 6371.0088;

/** Great-circle distance between two points [km] (haversine). */
export function greatCircleKm(lat1: number, lon1: number, lat2: number, lon2: number): number {
  const rad = Math.PI / 180;
  const dLat = (lat2 - lat1) * rad;
  const dLon = (lon2 - lon1) * rad;
  const a = Math.sin(dLat / 2) ** 2 + Math.cos(lat1 * rad) * Math.cos(lat2 * rad) * Math.sin(dLon / 2) ** 2;
  return 2 * EARTH_RADIUS_KM * Math.asin(Math.min(1, Math.sqrt(a)));
}

/**
 * The nearest land cell to a point and its distance [km]. Catalogued errors:
 * EstimatePointOutsideGrid (via rowColAt's caller), EstimateCellInvalid (no land cell at all).
 */
export async function nearestLandCell(
  ctx: EstimateContext,
  lat: number,
  lon: number,
  load: AtlasLoader,
): Promise<{ cell: number; distanceKm: number; chunk: PointChunk }> {
  const cells = ctx.cells;
  if (!cells) throw EstimateCellInvalid({ value: `${lat},${lon}`, problem: 'this atlas publishes no per-cell data' }, { key: 'lat' });
  const g = cells.grid;
  const rc = rowColAt(g, lat, lon);
  if (!rc) throw EstimateCellInvalid({ value: `${lat},${lon}`, problem: 'the point is outside the grid' }, { key: 'lat' });
  const chunks = new Map<string, PointChunk>();
  const landChunk = async (cell: number): Promise<PointChunk | null> => {
    const c = cells.chunks.find((x) => cell >= x.firstCell && cell <= x.lastCell);
    if (!c) return null;
    let chunk = chunks.get(c.path);
    if (!chunk) {
      chunk = parsePointChunk(await load(c.path), c.path);
      chunks.set(c.path, chunk);
    }
    const ids = chunk.cells;
    let lo = 0;
    let hi = ids.length - 1;
    while (lo <= hi) {
      const mid = (lo + hi) >> 1;
      if (ids[mid] < cell) lo = mid + 1;
      else if (ids[mid] > cell) hi = mid - 1;
      else return chunk;
    }
    return null;
  };
  const globalLon = Math.abs(g.nLon * g.dLon - 360) < 1e-6;
  // Smallest distance a cell r rings away can have: (r − 1) steps of the shorter side [km].
  const latMax = Math.min(90, Math.max(Math.abs(g.lat0), Math.abs(g.lat0 + (g.nLat - 1) * g.dLat)) + Math.abs(g.dLat));
  const stepKm = (Math.PI / 180) * EARTH_RADIUS_KM * Math.min(Math.abs(g.dLat), Math.abs(g.dLon) * Math.cos((latMax * Math.PI) / 180));
  // The point's own cell (nearest centre, as cellAt picks it) when it is land.
  const own = rc.row * g.nLon + rc.col;
  const ownChunk = await landChunk(own);
  if (ownChunk) {
    const c = cellCentre(g, own);
    return { cell: own, distanceKm: greatCircleKm(lat, lon, c.lat, c.lon), chunk: ownChunk };
  }
  let best: { cell: number; distanceKm: number; chunk: PointChunk } | null = null;
  const maxRing = Math.max(g.nLat, g.nLon);
  for (let r = 0; r <= maxRing; r++) {
    if (best && (r - 1) * stepKm > best.distanceKm) break;
    for (let dr = -r; dr <= r; dr++) {
      for (let dc = -r; dc <= r; dc++) {
        if (Math.max(Math.abs(dr), Math.abs(dc)) !== r) continue;
        const row = rc.row + dr;
        let col = rc.col + dc;
        if (row < 0 || row >= g.nLat) continue;
        if (globalLon) col = ((col % g.nLon) + g.nLon) % g.nLon;
        else if (col < 0 || col >= g.nLon) continue;
        const cell = row * g.nLon + col;
        const chunk = await landChunk(cell);
        if (!chunk) continue;
        const c = cellCentre(g, cell);
        const distanceKm = greatCircleKm(lat, lon, c.lat, c.lon);
        if (!best || distanceKm < best.distanceKm || (distanceKm === best.distanceKm && cell < best.cell)) best = { cell, distanceKm, chunk };
      }
    }
  }
  if (!best) throw EstimateCellInvalid({ value: `${lat},${lon}`, problem: 'the atlas has no land cell' }, { key: 'lat' });
  return best;
}

/**
 * A grid cell or a point resolved and its histograms (place.ts loadPlace for these kinds).
 * Catalogued errors of cell-tiles.ts, nearestLandCell, and whatever the loader throws.
 */
export async function loadCellPlace(
  place: Exclude<EstimatePlace, { kind: 'region' }>,
  ctx: EstimateContext,
  load: AtlasLoader,
): Promise<{ place: ResolvedPlace; histograms: Float64Array[] }> {
  const grid = ctx.cells!.grid;
  if (place.kind === 'cell') {
    const chunk = chunkForCell(ctx, place.cell);
    const histograms = cellTileHistograms(await load(chunk.path), chunk.path, place.cell, ctx);
    return { place: { kind: 'cell', cell: place.cell, centre: cellCentre(grid, place.cell), requested: null, distanceKm: 0, movedToLand: false }, histograms };
  }
  const own = rowColAt(grid, place.lat, place.lon)!;
  const found = await nearestLandCell(ctx, place.lat, place.lon, load);
  const histograms = cellTileHistograms(found.chunk.bytes, found.chunk.path, found.cell, ctx);
  return {
    place: {
      kind: 'cell',
      cell: found.cell,
      centre: cellCentre(grid, found.cell),
      requested: { lat: place.lat, lon: place.lon },
      distanceKm: found.distanceKm,
      movedToLand: found.cell !== own.row * grid.nLon + own.col,
    },
    histograms,
  };
}
