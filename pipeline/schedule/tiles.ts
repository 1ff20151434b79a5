/**
 * From the bytes of a calculator tile to one histogram array per year [h], with the pipeline's own
 * decoders: region tiles (pipeline/publish/histogram-tiles.ts) and per-cell chunks
 * (pipeline/publish/point-tile-codec.ts). Pure: the browser script fetches, these decode.
 */
import { decodeHistogramTile } from '../publish/histogram-tiles.ts';
import { cellHistograms, parsePointChunk } from '../publish/point-tile-codec.ts';
import type { EstimateChunk, EstimateContext } from './context.ts';
import { EstimateCellInvalid, EstimateDataUnavailable, EstimateYearsMismatch } from './errors.ts';

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
      if (Number.isNaN(h[i])) throw EstimateDataUnavailable({ path, detail: `the tile ends early; it is not a region tile of ${ctx.years.length} years` }, { file: path });
    }
  }
  return years;
}

/**
 * The chunk that may hold `cell` (chunks hold runs of land cells, so a cell between two runs is
 * not land). Catalogued error: EstimateCellInvalid.
 */
export function chunkForCell(ctx: EstimateContext, cell: number): EstimateChunk {
  const chunk = ctx.cells?.chunks.find((c) => cell >= c.firstCell && cell <= c.lastCell);
  if (!chunk) throw EstimateCellInvalid({ value: String(cell), problem: 'not a land cell of this atlas (sea cells are not computed)' }, { key: 'cell' });
  return chunk;
}

/**
 * A cell's years from its chunk's bytes. Catalogued errors: EstimateCellInvalid (the cell is not
 * in the chunk: a sea cell), EstimateYearsMismatch, PointTileCorrupt.
 */
export function cellTileHistograms(bytes: Uint8Array, path: string, cell: number, ctx: EstimateContext): Float64Array[] {
  const chunk = parsePointChunk(bytes, path);
  if (chunk.nYears !== ctx.years.length) throw EstimateYearsMismatch({ path, expected: ctx.years.length, got: chunk.nYears }, { file: path });
  const years = cellHistograms(chunk, cell);
  if (years === null) throw EstimateCellInvalid({ value: String(cell), problem: 'not a land cell of this atlas (sea cells are not computed)' }, { key: 'cell' });
  return years;
}
