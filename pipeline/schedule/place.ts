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

export type { AtlasLoader, ResolvedPlace } from './place-types.ts';
import type { AtlasLoader, ResolvedPlace } from './place-types.ts';

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
