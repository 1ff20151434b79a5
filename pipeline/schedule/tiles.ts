/**
 * From the bytes of a calculator tile to one histogram array per year [h], with the pipeline's own
 * decoders: region tiles (pipeline/publish/histogram-tiles.ts) here, per-cell chunks
 * (pipeline/publish/point-tile-codec.ts) in cell-tiles.ts. Pure: the browser script fetches, these decode.
 */
import { decodeHistogramTile } from '../publish/histogram-tiles.ts';
import type { EstimateContext } from './context.ts';
import { EstimateDataUnavailable } from './errors.ts';

/** A region tile's years. Catalogued error: EstimateDataUnavailable (not a tile of this many years). */
export function regionTileHistograms(bytes: Uint8Array, path: string, ctx: EstimateContext): Float64Array[] {
  let years: Float64Array[];
  try {
    years = decodeHistogramTile(bytes, ctx.years.length);
  } catch (e) {
    throw EstimateDataUnavailable({ path, detail: `not a region tile of ${ctx.years.length} years (${(e as Error).message})` }, { file: path });
  }
  for (const h of years) {
    for (let i = 0; i < h.length; i++) {
      if (Number.isNaN(h[i]))
        throw EstimateDataUnavailable({ path, detail: `the tile ends early; it is not a region tile of ${ctx.years.length} years` }, { file: path });
    }
  }
  return years;
}
