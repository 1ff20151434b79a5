/**
 * The regular lat/lon grid a layer is drawn from, checked once: sizes, ascending equal spacing,
 * and the cell *edges* that the PNG corners and the GeoTIFF tiepoint are placed at.
 * Convention: pipeline/model/grid.ts (cell centres, latitude south → north, longitude west → east).
 */
import { LayerCoordinateInvalid, LayerGridEmpty, LayerGridIrregular, LayerValuesLength } from './errors.ts';

/** What every layer function takes: cell-centre coordinates and one value per cell. */
export interface LayerGridInput {
  /** Cell-centre latitudes, ascending, equally spaced [° N]. */
  lat: Float64Array;
  /** Cell-centre longitudes, ascending, equally spaced; may run past 180 [° E]. */
  lon: Float64Array;
  /** Row-major values, `values[y * nx + x]`, row 0 the southernmost; NaN = no data [figure units]. */
  values: Float32Array;
}

/** The checked grid geometry. */
export interface LayerGeometry {
  ny: number;
  nx: number;
  /** Latitude step, > 0 [°]. */
  dLat: number;
  /** Longitude step, > 0 [°]. */
  dLon: number;
  /** Southern edge of the first row [° N]. */
  south: number;
  /** Northern edge of the last row [° N]. */
  north: number;
  /** Western edge of the first column [° E]. */
  west: number;
  /** Eastern edge of the last column [° E]. */
  east: number;
}

/**
 * Relative tolerance on the spacing of cell centres [1]: coordinates stored as float32 in NetCDF
 * carry rounding of about 1e-5 ° on a 0.1 ° grid (4e-5 relative), so 1e-3 accepts that and still
 * rejects a skipped row (100 % off).
 */
const SPACING_TOLERANCE = 1e-3;

function checkAxis(c: Float64Array, axis: 'lat' | 'lon'): number {
  const n = c.length;
  if (n < 2) throw LayerGridEmpty({ axis, length: n }, { variable: axis });
  for (let i = 0; i < n; i++) {
    const v = c[i];
    if (!Number.isFinite(v) || (axis === 'lat' && Math.abs(v) > 90)) {
      throw LayerCoordinateInvalid({ axis, index: i, value: v }, { variable: axis });
    }
  }
  const mean = (c[n - 1] - c[0]) / (n - 1);
  for (let i = 0; i + 1 < n; i++) {
    const step = c[i + 1] - c[i];
    if (!(mean > 0) || Math.abs(step - mean) > SPACING_TOLERANCE * Math.abs(mean)) {
      throw LayerGridIrregular({ axis, index: i, step, expected: mean }, { variable: axis });
    }
  }
  return mean;
}

/** Checks a layer grid and returns its geometry; throws a catalogued error on bad input. */
export function layerGeometry(grid: LayerGridInput): LayerGeometry {
  const dLat = checkAxis(grid.lat, 'lat');
  const dLon = checkAxis(grid.lon, 'lon');
  const ny = grid.lat.length;
  const nx = grid.lon.length;
  if (grid.values.length !== ny * nx) {
    throw LayerValuesLength({ length: grid.values.length, ny, nx }, { variable: 'values' });
  }
  return {
    ny,
    nx,
    dLat,
    dLon,
    south: grid.lat[0] - dLat / 2,
    north: grid.lat[ny - 1] + dLat / 2,
    west: grid.lon[0] - dLon / 2,
    east: grid.lon[nx - 1] + dLon / 2,
  };
}
