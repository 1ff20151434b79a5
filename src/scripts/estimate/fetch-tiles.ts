/**
 * Fetches a place's histogram tile from the site's own data/ folder (the only origin the
 * Content-Security-Policy allows) and decodes it with src/lib/estimate/tiles.ts. Each file is
 * fetched once per page; a cell's chunk serves every cell in it.
 */
import type { EstimateContext } from '../../lib/estimate/context.ts';
import { EstimateDataUnavailable } from '../../lib/estimate/errors.ts';
import type { EstimatePlace } from '../../lib/estimate/inputs.ts';
import { cellTileHistograms, chunkForCell, regionTileHistograms } from '../../lib/estimate/tiles.ts';
import { sitePath } from '../../lib/nav.ts';

const files = new Map<string, Promise<Uint8Array>>();

async function fetchBytes(base: string, path: string): Promise<Uint8Array> {
  let p = files.get(path);
  if (!p) {
    p = (async () => {
      let res: Response;
      try {
        res = await fetch(sitePath(base, path));
      } catch (e) {
        throw EstimateDataUnavailable({ path, detail: `the request failed (${(e as Error).message})` }, { file: path });
      }
      if (!res.ok) throw EstimateDataUnavailable({ path, detail: `the server answered ${res.status} ${res.statusText}` }, { file: path });
      return new Uint8Array(await res.arrayBuffer());
    })();
    files.set(path, p);
    p.catch(() => files.delete(path));
  }
  return p;
}

/** One histogram array per year of `ctx.years` for the place. Catalogued errors of tiles.ts and EstimateDataUnavailable. */
export async function placeHistograms(place: EstimatePlace, ctx: EstimateContext, base: string): Promise<Float64Array[]> {
  if (place.kind === 'region') {
    const r = ctx.regions.find((x) => x.id === place.id)!;
    return regionTileHistograms(await fetchBytes(base, r.path), r.path, ctx);
  }
  const chunk = chunkForCell(ctx, place.cell);
  return cellTileHistograms(await fetchBytes(base, chunk.path), chunk.path, place.cell, ctx);
}
