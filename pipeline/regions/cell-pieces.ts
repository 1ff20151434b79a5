/**
 * The pieces of a region inside grid cells it only partly covers: the region's rings clipped to
 * each such cell's rectangle (clip-rectangle.ts), at every 360° offset of the region that meets
 * the cell, each ring with its sign (+1 for outer rings, −1 for holes, times the ring's winding),
 * so that the signed sum of the pieces' areas is the area of region ∩ cell (as in cell-weights.ts).
 * The people aggregation (raster-to-grid.ts) splits each pixel of such a cell among the pieces by
 * the area of the pixel inside them, so a region's people follow the raster inside the cell, not
 * an even spread of the cell's people.
 */
import { ClipBuffer, clipHalfPlane } from './clip-rectangle.ts';
import type { GridCells } from './grid-cells.ts';
import type { Region } from './region.ts';
import { planarSignedArea2 } from './ring-prep.ts';

/** Region ∩ one cell. */
export interface CellPiece {
  /** The region's index in the build's region list. */
  region: number;
  /** Global cell index (row · nLon + column). */
  cell: number;
  /** Flat open rings [lon0, lat0, …] [° E, ° N] in the grid's longitudes, and their signs. */
  rings: Float64Array[];
  signs: number[];
}

const buf = [new ClipBuffer(), new ClipBuffer(), new ClipBuffer(), new ClipBuffer(), new ClipBuffer()];

/**
 * The pieces of `region` in `cells` (global indices of cells it partly covers).
 * @param regionIndex the region's index, carried into each piece
 */
export function regionCellPieces(region: Region, regionIndex: number, g: GridCells, cells: ArrayLike<number>): CellPiece[] {
  const out: CellPiece[] = [];
  for (let q = 0; q < cells.length; q++) {
    const cell = cells[q];
    const row = Math.floor(cell / g.nLon);
    const col = cell - row * g.nLon;
    const west = g.lonEdges[col];
    const east = g.lonEdges[col + 1];
    const south = g.latEdges[row];
    const north = g.latEdges[row + 1];
    const piece: CellPiece = { region: regionIndex, cell, rings: [], signs: [] };
    for (const poly of region.polygons) {
      const [w, s, e, n] = poly.bbox;
      if (s >= north || n <= south) continue;
      for (let k = Math.ceil((west - e) / 360); k <= Math.floor((east - w) / 360); k++) {
        const shift = 360 * k;
        for (let r = 0; r < poly.rings.length; r++) {
          const src = poly.rings[r];
          const nc = src.length / 2;
          const ring = buf[0].ensure(nc);
          for (let i = 0; i < src.length; i += 2) {
            ring[i] = src[i] + shift;
            ring[i + 1] = src[i + 1];
          }
          let m = clipHalfPlane(ring, nc, 0, west, true, buf[1]);
          if (m < 3) continue;
          m = clipHalfPlane(buf[1].data, m, 0, east, false, buf[2]);
          if (m < 3) continue;
          m = clipHalfPlane(buf[2].data, m, 1, south, true, buf[3]);
          if (m < 3) continue;
          m = clipHalfPlane(buf[3].data, m, 1, north, false, buf[4]);
          if (m < 3) continue;
          piece.rings.push(buf[4].data.slice(0, 2 * m));
          piece.signs.push((r === 0 ? 1 : -1) * Math.sign(planarSignedArea2(src)));
        }
      }
    }
    if (piece.rings.length > 0) out.push(piece);
  }
  return out;
}
