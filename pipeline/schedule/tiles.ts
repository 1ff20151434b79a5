/**
 * From the bytes of a calculator tile to one histogram array per year [h], with the pipeline's own
 * decoders: region tiles (pipeline/publish/histogram-tiles.ts) here, per-cell chunks
 * (pipeline/publish/point-tile-codec.ts) in cell-tiles.ts. Pure: the browser script fetches, these decode.
 */
import { decodeHistogramTile } from '../publish/histogram-tiles.ts';
import type { EstimateContext } from './context.ts';
import { EstimateDataUnavailable } from './errors.ts';

/**
 * A region tile's years, decoded into `into` when given (decodeHistogramTile). Catalogued error:
 * EstimateDataUnavailable (not a tile of this many years: it ends early, its bins run past the
 * histogram, or bytes are left over).
 */
export function regionTileHistograms(bytes: Uint8Array, path: string, ctx: EstimateContext, into?: Float64Array[]): Float64Array[] {
  try {
    return decodeHistogramTile(bytes, ctx.years.length, into);
  } catch (e) {
    throw EstimateDataUnavailable({ path, detail: `not a region tile of ${ctx.years.length} years (${(e as Error).message})` }, { file: path });
  }
}
