/**
 * Grid piece files: one merge tile's rows of every gridded field (pipeline/publish/grid-fields.ts),
 * float32 little-endian, field-major: field f's rows [y0, y1) × all columns start at byte
 * f · (y1 − y0) · nLon · 4, row-major, NaN where no land cell is. A scratch file of the build; the
 * publish stage reads one field from every piece at a time ({@link readGridField}).
 */
import { closeSync, openSync, readSync, writeSync } from 'node:fs';
import type { Grid, GridAttrs, HorizontalGrid } from '../model/grid.ts';

/** Where a tile's piece file is and which rows it holds. */
export interface GridPieceRef {
  path: string;
  /** Grid rows [y0, y1) (row 0 the southernmost). */
  rows: [number, number];
}

/** A tile's fields in memory while the tile is merged: fill with {@link GridPiece.set}, then write. */
export class GridPiece {
  readonly values: Float32Array;
  private readonly perField: number;

  constructor(
    readonly rows: [number, number],
    readonly nLon: number,
    readonly nFields: number,
  ) {
    this.perField = (rows[1] - rows[0]) * nLon;
    this.values = new Float32Array(nFields * this.perField).fill(NaN);
  }

  /** Sets field `f` at global cell `cell` (row-major y · nLon + x, y inside the rows). */
  set(f: number, cell: number, v: number): void {
    this.values[f * this.perField + cell - this.rows[0] * this.nLon] = v;
  }

  write(path: string): GridPieceRef {
    const fd = openSync(path, 'w');
    try {
      const b = Buffer.from(this.values.buffer, this.values.byteOffset, this.values.byteLength);
      let done = 0;
      while (done < b.length) done += writeSync(fd, b, done, b.length - done);
    } finally {
      closeSync(fd);
    }
    return { path, rows: [this.rows[0], this.rows[1]] };
  }
}

/**
 * Field `f` of the whole grid from the tiles' pieces, as a labelled grid: dims `["lat", "lon"]`,
 * the grid's coordinates, `attrs` (its units), data a Float32Array of nLat · nLon (row-major, NaN
 * outside the pieces' land cells). `fds` caches open file descriptors by path (close with
 * {@link closePieces}); `out` (nLat · nLon) is filled and returned as the data when given.
 */
export function readGridField(
  pieces: readonly GridPieceRef[],
  f: number,
  horizontal: HorizontalGrid,
  attrs: GridAttrs,
  fds: Map<string, number>,
  out?: Float32Array,
): Grid<Float32Array> {
  const nLat = horizontal.lat.length;
  const nLon = horizontal.lon.length;
  const data = out ?? new Float32Array(nLat * nLon);
  data.fill(NaN);
  const bytes = Buffer.from(data.buffer, data.byteOffset, data.byteLength);
  for (const p of pieces) {
    let fd = fds.get(p.path);
    if (fd === undefined) {
      fd = openSync(p.path, 'r');
      fds.set(p.path, fd);
    }
    // Byte offsets of the piece's rows in the field: whole rows, so plain offsets.
    const perField = (p.rows[1] - p.rows[0]) * nLon * 4;
    const at = p.rows[0] * nLon * 4;
    let done = 0;
    while (done < perField) {
      const n = readSync(fd, bytes, at + done, perField - done, f * perField + done);
      if (n === 0) throw new RangeError(`grid piece ${p.path} ends before field ${f}`);
      done += n;
    }
  }
  return { dims: ['lat', 'lon'], coords: { lat: horizontal.lat, lon: horizontal.lon }, attrs, data };
}

export function closePieces(fds: Map<string, number>): void {
  for (const fd of fds.values()) closeSync(fd);
  fds.clear();
}
