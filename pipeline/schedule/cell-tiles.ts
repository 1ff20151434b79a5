/**
 * A grid cell's years from the bytes of its calculator chunk, with the pipeline's own decoder
 * (pipeline/publish/point-tile-codec.ts). Pure: the caller fetches or reads, these decode.
 */
import { cellHistograms, parsePointChunk } from '../publish/point-tile-codec.ts';
import type { EstimateChunk, EstimateContext } from './context.ts';
import { EstimateCellInvalid, EstimateYearsMismatch } from './errors.ts';

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
  if (years === null)
    throw EstimateCellInvalid({ value: String(cell), problem: 'not a land cell of this atlas (sea cells are not computed)' }, { key: 'cell' });
  return years;
}
