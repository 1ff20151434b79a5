/**
 * The labelled grid every stage passes on: dimensions, coordinates and attributes travel with the
 * data. Data are flat, row-major typed arrays: for dims `["time", "lat", "lon"]` the value at
 * (t, y, x) is `data[(t * ny + y) * nx + x]`.
 *
 * Conventions after `read` (one for the whole pipeline):
 * - latitude ascending (south to north) [° N];
 * - longitude ascending in [-180, 180) [° E] (a grid that crosses the antimeridian keeps its
 *   longitudes continuous and may run past 180);
 * - time: end of the hour [ms since 1970-01-01 UTC].
 */

/** Attributes of a grid: units, long name and where the values came from. */
export interface GridAttrs {
  units: string;
  long_name?: string;
  source?: string;
  [key: string]: string | number | undefined;
}

export interface Grid<A extends ArrayLike<number> = Float32Array> {
  dims: readonly string[];
  coords: Record<string, Float64Array>;
  attrs: GridAttrs;
  data: A;
}

/** The horizontal grid shared by all fields of a dataset. */
export interface HorizontalGrid {
  /** Cell-centre latitudes, ascending [° N]. */
  lat: Float64Array;
  /** Cell-centre longitudes, ascending [° E]. */
  lon: Float64Array;
}

/** A rectangular window of the horizontal grid: rows [y0, y1) and columns [x0, x1). */
export interface Tile {
  y0: number;
  y1: number;
  x0: number;
  x1: number;
}

/** Number of cells in a tile. */
export function tileSize(t: Tile): number {
  return (t.y1 - t.y0) * (t.x1 - t.x0);
}

/** Where a raster's pixels lie, in degrees (a north-up longitude/latitude raster such as a GeoTIFF in EPSG:4326). */
export interface PixelLayout {
  /** Pixels across and down [px]. */
  width: number;
  height: number;
  /** West edge of column 0 [° E] and the width of a column [°] (> 0). */
  west: number;
  dLon: number;
  /** Top edge of row 0 [° N] and the latitude step from one row to the next [°] (negative: north-up). */
  top: number;
  dLatRow: number;
}

/**
 * The land cells of a horizontal grid: which cells the pipeline computes, with their row-major ids.
 * Cell (y, x) has the id `y * nx + x` (row 0 the southernmost); `ids` lists the land cells'
 * ids ascending, so the land cells of rows [y0, y1) are `ids[rowStart[y0] … rowStart[y1])`.
 * Stages hand this on instead of raw offsets; hot loops may index with plain offsets.
 */
export interface LandCells {
  grid: HorizontalGrid;
  /** Rows (latitudes) and columns (longitudes) [cells]. */
  ny: number;
  nx: number;
  /** Land cells' row-major ids, ascending. */
  ids: Int32Array;
  /** Land cells in each row [cells] (length ny). */
  perRow: Int32Array;
  /** Position in `ids` of each row's first land cell (length ny + 1, the last = ids.length). */
  rowStart: Int32Array;
}

/**
 * The land cells of `grid` under `mask` (1 = land, row-major; undefined = every cell).
 * @param mask one byte per cell of the grid, `mask[y * nx + x]`
 */
export function landCellsOf(grid: HorizontalGrid, mask?: ArrayLike<number>): LandCells {
  const ny = grid.lat.length;
  const nx = grid.lon.length;
  const perRow = new Int32Array(ny);
  const rowStart = new Int32Array(ny + 1);
  let n = 0;
  for (let y = 0; y < ny; y++) {
    rowStart[y] = n;
    // Hot loop: plain offsets.
    for (let x = 0, i = y * nx; x < nx; x++, i++) if (!mask || mask[i] === 1) perRow[y]++;
    n += perRow[y];
  }
  rowStart[ny] = n;
  const ids = new Int32Array(n);
  for (let i = 0, k = 0; i < ny * nx; i++) if (!mask || mask[i] === 1) ids[k++] = i;
  return { grid, ny, nx, ids, perRow, rowStart };
}

/** A horizontal grid or its land cells: what the cell helpers below need (the number of columns). */
export type CellGrid = HorizontalGrid | LandCells;

/** Columns (longitudes) of a grid [cells]. */
function columns(g: CellGrid): number {
  return 'nx' in g ? g.nx : g.lon.length;
}

/** The coordinates of a grid or its land cells. */
function coordinatesOf(g: CellGrid): HorizontalGrid {
  return 'nx' in g ? g.grid : g;
}

/** Number of cells of the whole grid, land or not [cells]. */
export function gridCellCount(l: CellGrid): number {
  const g = coordinatesOf(l);
  return g.lat.length * g.lon.length;
}

/** Row-major id of cell (y, x) of the grid (land or not). */
export function cellIndex(l: CellGrid, y: number, x: number): number {
  return y * columns(l) + x;
}

/** Row y (0 the southernmost) of the cell with row-major id `id`. */
export function cellRow(l: CellGrid, id: number): number {
  return Math.floor(id / columns(l));
}

/** Row y and column x of the cell with row-major id `id`. */
export function cellRowCol(l: CellGrid, id: number): { y: number; x: number } {
  const nx = columns(l);
  const y = Math.floor(id / nx);
  return { y, x: id - y * nx };
}

/** Row, column and centre [° N, ° E] of the cell with row-major id `id`. */
export function cellCentre(l: CellGrid, id: number): { row: number; col: number; lat: number; lon: number } {
  const g = coordinatesOf(l);
  const { y, x } = cellRowCol(l, id);
  return { row: y, col: x, lat: g.lat[y], lon: g.lon[x] };
}

/** Centres of cells given by row-major ids, one entry per id [° N, ° E]. */
export function cellCentres(l: CellGrid, ids: ArrayLike<number>): HorizontalGrid {
  const g = coordinatesOf(l);
  const nx = columns(l);
  const lat = new Float64Array(ids.length);
  const lon = new Float64Array(ids.length);
  // Hot loop: plain offsets.
  for (let k = 0; k < ids.length; k++) {
    const y = Math.floor(ids[k] / nx);
    lat[k] = g.lat[y];
    lon[k] = g.lon[ids[k] - y * nx];
  }
  return { lat, lon };
}

/** Whether `id` is the row-major id of a cell of the grid (an integer in [0, cells)). */
export function isCellOf(l: CellGrid, id: number): boolean {
  return Number.isInteger(id) && id >= 0 && id < gridCellCount(l);
}

/** Positions [k0, k1) in `l.ids` of the land cells of rows [y0, y1). */
export function rowRange(l: LandCells, y0: number, y1: number): [number, number] {
  return [l.rowStart[y0], l.rowStart[y1]];
}

/** Land cells in rows [y0, y1) [cells]. */
export function landInRows(l: LandCells, y0: number, y1: number): number {
  return l.rowStart[y1] - l.rowStart[y0];
}

/**
 * Positions [k0, k1) of the cells of rows [y0, y1) in `ids`, any ascending list of row-major ids
 * (the land cells of a tile or a band, say) — {@link rowRange} for a part of the land cells.
 */
export function idsInRows(l: CellGrid, ids: Int32Array, y0: number, y1: number): [number, number] {
  const nx = columns(l);
  return [lowerBound(ids, y0 * nx), lowerBound(ids, y1 * nx)];
}

/** First index of an ascending array (cell ids, say) whose value is ≥ v (a.length when none). */
export function lowerBound(a: ArrayLike<number>, v: number): number {
  let lo = 0;
  let hi = a.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (a[mid] < v) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** The land cells' ids inside a tile, ascending. */
export function tileCells(l: LandCells, t: Tile): Int32Array {
  const out: number[] = [];
  for (let y = t.y0; y < t.y1; y++) {
    for (let k = l.rowStart[y]; k < l.rowStart[y + 1]; k++) {
      const x = l.ids[k] - y * l.nx;
      if (x >= t.x0 && x < t.x1) out.push(l.ids[k]);
    }
  }
  return Int32Array.from(out);
}
