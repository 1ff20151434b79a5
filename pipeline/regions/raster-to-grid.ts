/**
 * Conservative aggregation of a raster of counts (people per pixel) onto the atlas grid: every
 * pixel's count is split among the grid cells it overlaps in proportion to the area of the
 * overlap on the sphere, and summed, never averaged. Pixels and cells are both rectangles in
 * longitude/latitude, so the overlap's share of a pixel's area separates into a longitude share
 * and a latitude share (common practice for conservative remapping between lon/lat grids):
 *
 *   share(pixel → cell) = [Δλ(pixel ∩ cell) / Δλ(pixel)] · [Δ sin φ(pixel ∩ cell) / Δ sin φ(pixel)]
 *
 * the area of a lon/lat rectangle on the sphere being R²·Δλ·Δ sin φ (spherical-area.ts). Counts
 * over grid cells outside the land mask are summed into `offLand`, parts of pixels outside the
 * grid into `outsideGrid`, so nothing is lost silently: Σ people + offLand + outsideGrid = the
 * raster's total over the pixels read.
 *
 * Regions that cover a cell only in part get its people from the pixels inside them, not an even
 * share of the cell: given the pieces region ∩ cell (cell-pieces.ts), each pixel of such a cell is
 * also split among the pieces by the area of the pixel inside each piece, on the sphere (the
 * piece's rings clipped to the pixel and measured exactly, spherical-area.ts).
 *
 * Streaming: pixels come in windows of whole rows (`addRows`), in any order of rows; memory holds
 * the people of the land cells, one row of grid columns, the column shares of the window and the
 * pieces, never an array per grid cell or the raster. Pure: arrays in, arrays out; a negative or
 * NaN count is the catalogued WorkforceCountInvalid naming the pixel.
 */
import type { PixelLayout } from '../model/grid.ts';
import type { GridCells } from './grid-cells.ts';
import { WorkforceCountInvalid } from './errors.ts';
import type { CellPiece } from './cell-pieces.ts';
import { ClipBuffer, clipHalfPlane } from './clip-rectangle.ts';
import { ringAreaSr } from './spherical-area.ts';

const RAD = Math.PI / 180;

/**
 * A window of pixels that overlaps the grid: columns [col0, col1) and rows [row0, row1) of the
 * raster, its longitudes moved by `shift` [°] (a multiple of 360) to meet the grid's longitudes.
 */
export interface RasterWindow {
  col0: number;
  col1: number;
  row0: number;
  row1: number;
  shift: number;
}

/** What the aggregation gives. */
export interface PeopleOnGrid {
  /** The land cells (global indices, ascending) and the people assigned to each [people]. */
  cells: Int32Array;
  people: Float64Array;
  /** People over grid cells outside the land mask [people]. */
  offLand: number;
  /** People in the parts of the pixels read that lie outside the grid [people]. */
  outsideGrid: number;
  /** Pixels read, and those among them marked as no data [count]. */
  pixels: number;
  noDataPixels: number;
}

/**
 * The windows of the raster that overlap the grid, one per 360° shift of the raster that meets
 * the grid's longitudes (a raster in −180…180 meets a grid running 170…190 twice), by shift.
 */
export function rasterWindows(layout: PixelLayout, g: GridCells): RasterWindow[] {
  const gridW = g.lonEdges[0];
  const gridE = g.lonEdges[g.nLon];
  const rasterE = layout.west + layout.width * layout.dLon;
  const gridS = g.latEdges[0];
  const gridN = g.latEdges[g.nLat];
  // Rows whose latitude span meets [gridS, gridN].
  const d = layout.dLatRow;
  const a = d < 0 ? (layout.top - gridN) / -d : (gridS - layout.top) / d;
  const b = d < 0 ? (layout.top - gridS) / -d : (gridN - layout.top) / d;
  const row0 = Math.max(0, Math.floor(a));
  const row1 = Math.min(layout.height, Math.ceil(b));
  const out: RasterWindow[] = [];
  if (row0 >= row1) return out;
  for (let k = Math.ceil((gridW - rasterE) / 360); k <= Math.floor((gridE - layout.west) / 360); k++) {
    const shift = 360 * k;
    const col0 = Math.max(0, Math.floor((gridW - layout.west - shift) / layout.dLon));
    const col1 = Math.min(layout.width, Math.ceil((gridE - layout.west - shift) / layout.dLon));
    if (col0 < col1) out.push({ col0, col1, row0, row1, shift });
  }
  return out;
}

/** Shares of each pixel column of a window in the grid's columns (compressed rows: column i's shares are ptr[i] … ptr[i+1]). */
interface ColumnShares {
  ptr: Int32Array;
  cell: Int32Array;
  share: Float64Array;
  /** Share of each column outside the grid [1]. */
  outside: Float64Array;
  /** Lowest and highest grid column met. */
  cMin: number;
  cMax: number;
}

function columnShares(layout: PixelLayout, g: GridCells, win: RasterWindow): ColumnShares {
  const n = win.col1 - win.col0;
  const ptr = new Int32Array(n + 1);
  const cells: number[] = [];
  const shares: number[] = [];
  const outside = new Float64Array(n);
  const W = g.lonEdges[0];
  let cMin = g.nLon;
  let cMax = -1;
  for (let i = 0; i < n; i++) {
    const a = layout.west + (win.col0 + i) * layout.dLon + win.shift;
    const b = a + layout.dLon;
    let inside = 0;
    for (let c = Math.max(0, Math.floor((a - W) / g.dLon) - 1); c < g.nLon && g.lonEdges[c] < b; c++) {
      const w = Math.min(b, g.lonEdges[c + 1]) - Math.max(a, g.lonEdges[c]);
      if (!(w > 0)) continue;
      const s = w / layout.dLon;
      cells.push(c);
      shares.push(s);
      inside += s;
      if (c < cMin) cMin = c;
      if (c > cMax) cMax = c;
    }
    const out = 1 - inside;
    outside[i] = out > 1e-12 ? out : 0;
    ptr[i + 1] = cells.length;
  }
  return { ptr, cell: Int32Array.from(cells), share: Float64Array.from(shares), outside, cMin, cMax };
}

/** Adds pixels row by row into the land cells of a grid. */
export class GridAggregator {
  private readonly people: Float64Array;
  /** First land cell of each grid row in `cells` (nLat + 1 entries). */
  private readonly rowStart: Int32Array;
  private offLand = 0;
  private outsideGrid = 0;
  private pixels = 0;
  private noDataPixels = 0;
  private cols: ColumnShares | undefined;
  private colsOf: RasterWindow | undefined;
  private rowAcc = new Float64Array(0);
  private rowRows: number[] = [];
  private rowShares: number[] = [];
  /** The current pixel row's latitude span, clamped to the poles [° N], and Δ sin φ over it. */
  private rowS = 0;
  private rowN = 0;
  private rowSpan = 0;
  /** Region pieces of partly covered cells, by grid row, and the people of each piece. */
  private pieces: CellPiece[] = [];
  private piecesByRow = new Map<number, number[]>();
  private piecePeople = new Float64Array(0);
  private readonly clip = [new ClipBuffer(), new ClipBuffer(), new ClipBuffer(), new ClipBuffer()];

  /**
   * @param g the atlas grid's cells
   * @param cells the land cells (global indices, ascending)
   * @param layout where the raster's pixels lie
   * @param noData the raster's no-data value (NaN for "nan"), null when none
   * @param file the raster's path, for messages
   */
  constructor(
    private readonly g: GridCells,
    private readonly cells: Int32Array,
    private readonly layout: PixelLayout,
    private readonly noData: number | null,
    private readonly file: string,
  ) {
    this.people = new Float64Array(cells.length);
    this.rowStart = new Int32Array(g.nLat + 1);
    let k = 0;
    for (let r = 0; r <= g.nLat; r++) {
      const first = r * g.nLon;
      while (k < cells.length && cells[k] < first) k++;
      this.rowStart[r] = k;
    }
  }

  /** Sets the region pieces whose people to sum (before any row is added). */
  setPieces(pieces: CellPiece[]): void {
    this.pieces = pieces;
    this.piecePeople = new Float64Array(pieces.length);
    this.piecesByRow.clear();
    pieces.forEach((p, i) => {
      const r = Math.floor(p.cell / this.g.nLon);
      const list = this.piecesByRow.get(r) ?? [];
      list.push(i);
      this.piecesByRow.set(r, list);
    });
  }

  /** People of each piece set with {@link setPieces}, in its order [people]. */
  pieceSums(): Float64Array {
    return this.piecePeople;
  }

  /**
   * Adds rows [row0, row0 + nRows) of a window.
   * @param values the window's pixels of those rows, row-major, (col1 − col0) per row [people]
   */
  addRows(win: RasterWindow, row0: number, nRows: number, values: ArrayLike<number>): void {
    if (this.colsOf !== win) {
      this.cols = columnShares(this.layout, this.g, win);
      this.colsOf = win;
      this.rowAcc = new Float64Array(Math.max(0, this.cols.cMax - this.cols.cMin + 1));
    }
    const cs = this.cols!;
    const width = win.col1 - win.col0;
    if (values.length !== width * nRows) throw new RangeError(`expected ${width * nRows} pixels for ${nRows} rows, got ${values.length}`);
    const nd = this.noData;
    const ndNaN = nd !== null && Number.isNaN(nd);
    const nd32 = nd === null || ndNaN ? NaN : Math.fround(nd);
    const acc = this.rowAcc;
    const { ptr, cell, share, outside, cMin } = cs;
    for (let j = 0; j < nRows; j++) {
      const row = row0 + j;
      acc.fill(0);
      let outsideCols = 0;
      let rowTotal = 0;
      const base = j * width;
      for (let i = 0; i < width; i++) {
        const v = values[base + i];
        if (nd !== null && (ndNaN ? v !== v : v === nd || v === nd32)) {
          this.noDataPixels++;
          continue;
        }
        if (!(v >= 0) || v === Infinity) {
          throw WorkforceCountInvalid({ file: this.file, col: win.col0 + i, row, value: String(v) }, { file: this.file, variable: 'band 1' });
        }
        if (v === 0) continue;
        rowTotal += v;
        for (let k = ptr[i]; k < ptr[i + 1]; k++) acc[cell[k] - cMin] += v * share[k];
        if (outside[i] !== 0) outsideCols += v * outside[i];
      }
      this.pixels += width;
      if (rowTotal === 0) continue;
      const inCols = rowTotal - outsideCols;
      const rowOutside = this.latitudeShares(row);
      this.outsideGrid += outsideCols + inCols * rowOutside;
      for (let q = 0; q < this.rowRows.length; q++) {
        this.addToRow(this.rowRows[q], this.rowShares[q], cMin);
        const pieces = this.piecesByRow.get(this.rowRows[q]);
        if (pieces) for (const pi of pieces) this.addPieceRow(pi, win, values, base, nd, ndNaN, nd32);
      }
    }
  }

  /** Adds the pixels of the current pixel row that lie inside piece `pi`, each by the share of its area inside. */
  private addPieceRow(pi: number, win: RasterWindow, values: ArrayLike<number>, base: number, nd: number | null, ndNaN: boolean, nd32: number): void {
    const { g, layout, clip } = this;
    const piece = this.pieces[pi];
    const col = piece.cell % g.nLon;
    const x0 = layout.west + win.shift;
    const width = win.col1 - win.col0;
    const i0 = Math.max(0, Math.floor((g.lonEdges[col] - x0) / layout.dLon) - win.col0);
    const i1 = Math.min(width, Math.ceil((g.lonEdges[col + 1] - x0) / layout.dLon) - win.col0);
    if (i0 >= i1) return;
    const pixelSr = layout.dLon * RAD * this.rowSpan;
    let sum = 0;
    for (let k = 0; k < piece.rings.length; k++) {
      const ring = piece.rings[k];
      let m = clipHalfPlane(ring, ring.length / 2, 1, this.rowS, true, clip[0]);
      if (m < 3) continue;
      m = clipHalfPlane(clip[0].data, m, 1, this.rowN, false, clip[1]);
      if (m < 3) continue;
      const strip = clip[1].data;
      for (let i = i0; i < i1; i++) {
        const v = values[base + i];
        if (v === 0 || (nd !== null && (ndNaN ? v !== v : v === nd || v === nd32))) continue;
        const a = x0 + (win.col0 + i) * layout.dLon;
        let q = clipHalfPlane(strip, m, 0, a, true, clip[2]);
        if (q < 3) continue;
        q = clipHalfPlane(clip[2].data, q, 0, a + layout.dLon, false, clip[3]);
        if (q < 3) continue;
        sum += piece.signs[k] * v * (ringAreaSr(clip[3].data, q) / pixelSr);
      }
    }
    this.piecePeople[pi] += sum;
  }

  /** The grid rows pixel row `row` overlaps and their shares, in rowRows/rowShares; returns the share outside the grid [1]. */
  private latitudeShares(row: number): number {
    const { g, layout } = this;
    this.rowRows.length = 0;
    this.rowShares.length = 0;
    const y1 = layout.top + row * layout.dLatRow;
    const y2 = y1 + layout.dLatRow;
    const s = Math.max(-90, Math.min(y1, y2));
    const n = Math.min(90, Math.max(y1, y2));
    const sinS = Math.sin(s * RAD);
    const span = Math.sin(n * RAD) - sinS;
    this.rowS = s;
    this.rowN = n;
    this.rowSpan = span;
    if (!(span > 0)) return 1;
    const lat0 = g.lat[0] - g.dLat / 2;
    let inside = 0;
    for (let r = Math.max(0, Math.floor((s - lat0) / g.dLat) - 1); r < g.nLat && g.latEdges[r] < n; r++) {
      const lo = Math.max(s, g.latEdges[r]);
      const hi = Math.min(n, g.latEdges[r + 1]);
      if (!(hi > lo)) continue;
      const f = (Math.sin(hi * RAD) - Math.sin(lo * RAD)) / span;
      this.rowRows.push(r);
      this.rowShares.push(f);
      inside += f;
    }
    const out = 1 - inside;
    return out > 1e-12 ? out : 0;
  }

  /** Adds the row accumulator, times a latitude share, into grid row r. */
  private addToRow(r: number, f: number, cMin: number): void {
    const acc = this.rowAcc;
    const base = r * this.g.nLon;
    let p = this.rowStart[r];
    const end = this.rowStart[r + 1];
    const cells = this.cells;
    for (let c = 0; c < acc.length; c++) {
      const x = acc[c];
      if (x === 0) continue;
      const id = base + cMin + c;
      while (p < end && cells[p] < id) p++;
      if (p < end && cells[p] === id) this.people[p] += x * f;
      else this.offLand += x * f;
    }
  }

  result(): PeopleOnGrid {
    return {
      cells: this.cells,
      people: this.people,
      offLand: this.offLand,
      outsideGrid: this.outsideGrid,
      pixels: this.pixels,
      noDataPixels: this.noDataPixels,
    };
  }
}
export type { PixelLayout } from '../model/grid.ts';
