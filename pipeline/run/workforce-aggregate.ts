/**
 * Streams a people raster onto the atlas grid: the raster's windows that overlap the grid
 * (pipeline/regions/raster-to-grid.ts `rasterWindows`) read in strips of whole blocks of rows
 * (pipeline/read/workforce-raster.ts) and added into the land cells by the conservative
 * aggregator. Memory holds one strip of at most {@link STRIP_PIXELS} pixels (or one row of
 * blocks, if larger), the people of the land cells and one row of grid columns.
 */
import type { HorizontalGrid } from '../model/grid.ts';
import { openWorkforceRaster, type WorkforceRaster } from '../read/workforce-raster.ts';
import { describeGridCells } from '../regions/grid-cells.ts';
import { GridAggregator, rasterWindows, type PeopleOnGrid } from '../regions/raster-to-grid.ts';
import type { CellPiece } from '../regions/cell-pieces.ts';

/** Pixels read at once, at most (unless one row of the file's blocks is more) [px]. */
export const STRIP_PIXELS = 1 << 22;

export interface AggregateOutcome extends PeopleOnGrid {
  /** The raster as opened (size, georeference, no-data value, pixel type). */
  raster: Omit<WorkforceRaster, 'read' | 'close'>;
  /** Strips read [count] and the most pixels held at once [px]. */
  strips: number;
  peakStripPixels: number;
  /** People of each region piece asked for, in its order [people]. */
  pieceSums: Float64Array;
}

export interface AggregateOptions {
  /** Called with the opened raster before any pixel is read (to refuse it early). */
  check?: (raster: WorkforceRaster) => void;
  /** Region pieces of partly covered cells whose people to sum as well (pipeline/regions/cell-pieces.ts). */
  pieces?: CellPiece[];
}

/**
 * Aggregates the raster at `path` onto the land cells of `grid`.
 * @param cells the land cells (global indices, ascending)
 */
export async function aggregateRasterFile(path: string, grid: HorizontalGrid, cells: Int32Array, o: AggregateOptions = {}): Promise<AggregateOutcome> {
  const raster = await openWorkforceRaster(path);
  try {
    o.check?.(raster);
    const g = describeGridCells(grid);
    const agg = new GridAggregator(g, cells, raster, raster.noData, path);
    if (o.pieces) agg.setPieces(o.pieces);
    let strips = 0;
    let peak = 0;
    for (const win of rasterWindows(raster, g)) {
      const width = win.col1 - win.col0;
      const block = raster.blockRows;
      const rows = Math.max(block, Math.floor(STRIP_PIXELS / width / block) * block);
      // Strips end on block boundaries, so no block is decoded twice.
      for (let r0 = win.row0; r0 < win.row1; ) {
        const r1 = Math.min(win.row1, Math.floor(r0 / block) * block + rows);
        const values = await raster.read(win.col0, r0, win.col1, r1);
        agg.addRows(win, r0, r1 - r0, values);
        strips++;
        peak = Math.max(peak, (r1 - r0) * width);
        r0 = r1;
      }
    }
    const { read: _read, close: _close, ...info } = raster;
    return { ...agg.result(), raster: info, strips, peakStripPixels: peak, pieceSums: agg.pieceSums() };
  } finally {
    await raster.close();
  }
}
