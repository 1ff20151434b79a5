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
