/**
 * The histograms of the estimate's place, with the place resolved: a region's tile here; a grid
 * cell's chunk, or for a point the nearest land cell, in cell-place.ts, loaded only when a cell or
 * a point is asked for (the page's first script then carries the region path only). The same code
 * serves the page (bytes fetched from the site's data/ folder) and `heathours estimate` (bytes read
 * from the atlas folder): the caller passes a loader.
 */
import type { EstimateContext } from './context.ts';
import type { EstimatePlace } from './inputs.ts';
import { regionTileHistograms } from './tiles.ts';

/** Reads a file of the atlas by its path below the site root (`data/calculator/…`). */
export type AtlasLoader = (path: string) => Promise<Uint8Array>;

/** The place an estimate is for, after a point was mapped to a cell. */
export type ResolvedPlace =
  | { kind: 'region'; id: string; name: string }
  | {
      kind: 'cell';
      cell: number;
      /** Centre of the cell [° N, ° E]. */
      centre: { lat: number; lon: number };
      /** The point asked for, when the place was given as a point [° N, ° E]. */
      requested: { lat: number; lon: number } | null;
      /** Great-circle distance from the point to the cell centre [km]; 0 for a cell id. */
      distanceKm: number;
      /** True when the point's own cell is sea and the nearest land cell was taken. */
      movedToLand: boolean;
    };

/**
 * The place resolved and its histograms, one per year of `ctx.years`. Catalogued errors of
 * tiles.ts, cell-place.ts (nearestLandCell), and whatever the loader throws (EstimateDataUnavailable).
 */
export async function loadPlace(place: EstimatePlace, ctx: EstimateContext, load: AtlasLoader): Promise<{ place: ResolvedPlace; histograms: Float64Array[] }> {
  if (place.kind === 'region') {
    const r = ctx.regions.find((x) => x.id === place.id)!;
    return { place: { kind: 'region', id: r.id, name: r.name }, histograms: regionTileHistograms(await load(r.path), r.path, ctx) };
  }
  const { loadCellPlace } = await import('./cell-place.ts');
  return loadCellPlace(place, ctx, load);
}
