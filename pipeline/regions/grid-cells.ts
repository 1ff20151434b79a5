/**
 * The cell rectangles of a regular latitude/longitude grid (pipeline/model/grid.ts conventions:
 * cell-centre coordinates, latitude and longitude ascending, regular spacing, longitudes
 * continuous and possibly past 180). Cell edges lie halfway between centres; latitude edges are
 * clamped to ±90° (ERA5 puts centres on the poles, so its polar cells are half cells).
 * Cell index = row · nLon + column, rows south to north (pipeline/model/fields.ts).
 */
import { cellCentre, cellRowCol, type HorizontalGrid } from '../model/grid.ts';
import { RegionGridInvalid } from './errors.ts';
import { rectangleAreaSr } from './spherical-area.ts';

export interface GridCells {
  nLat: number;
  nLon: number;
  /** Spacing of the centres [°]. */
  dLat: number;
  dLon: number;
  /** nLat + 1 latitude edges, ascending, clamped to −90…90 [° N]. */
  latEdges: Float64Array;
  /** nLon + 1 longitude edges, ascending [° E]. */
  lonEdges: Float64Array;
  /** Cell-centre coordinates as given [° N], [° E]. */
  lat: Float64Array;
  lon: Float64Array;
}

/** Relative tolerance on the regularity of the spacing [1]; float32 coordinates carry ~1e-6 noise. */
const SPACING_TOLERANCE = 1e-4;

function axisSpacing(c: Float64Array, name: string): number {
  if (c.length < 2)
    throw RegionGridInvalid({ detail: `the grid has ${c.length} ${name} centre(s); at least 2 are needed to know the cell size` }, { variable: name });
  const d = (c[c.length - 1] - c[0]) / (c.length - 1);
  if (!(d > 0)) throw RegionGridInvalid({ detail: `${name} centres are not ascending (${c[0]} … ${c[c.length - 1]})` }, { variable: name });
  for (let i = 1; i < c.length; i++) {
    if (Math.abs(c[i] - c[i - 1] - d) > SPACING_TOLERANCE * d) {
      throw RegionGridInvalid({ detail: `${name} centres are not evenly spaced: step ${c[i] - c[i - 1]} at index ${i}, mean step ${d}` }, { variable: name });
    }
  }
  return d;
}

/** Describes the cells of a horizontal grid; throws RegionGridInvalid for an irregular grid. */
export function describeGridCells(grid: HorizontalGrid): GridCells {
  const { lat, lon } = grid;
  const dLat = axisSpacing(lat, 'latitude');
  const dLon = axisSpacing(lon, 'longitude');
  if (lat[0] - dLat / 2 < -90 - dLat || lat[lat.length - 1] + dLat / 2 > 90 + dLat) {
    throw RegionGridInvalid({ detail: `latitudes ${lat[0]} … ${lat[lat.length - 1]} run past the poles` }, { variable: 'latitude' });
  }
  if (dLon * lon.length > 360 * (1 + SPACING_TOLERANCE)) {
    throw RegionGridInvalid({ detail: `${lon.length} longitudes at ${dLon}° span more than 360°` }, { variable: 'longitude' });
  }
  const latEdges = new Float64Array(lat.length + 1);
  for (let j = 0; j <= lat.length; j++) latEdges[j] = Math.min(90, Math.max(-90, lat[0] + (j - 0.5) * dLat));
  const lonEdges = new Float64Array(lon.length + 1);
  for (let i = 0; i <= lon.length; i++) lonEdges[i] = lon[0] + (i - 0.5) * dLon;
  return { nLat: lat.length, nLon: lon.length, dLat, dLon, latEdges, lonEdges, lat, lon };
}

/** Row, column and centre of a cell index (pipeline/model/grid.ts). */
export { cellCentre };

/** Area of a cell on the unit sphere, Δλ·(sin φ2 − sin φ1) between its edges [sr] (spherical-area.ts, rectangleAreaSr). */
export function cellAreaSr(cells: GridCells, cell: number): number {
  const { y, x } = cellRowCol(cells, cell);
  return rectangleAreaSr(cells.lonEdges[x], cells.lonEdges[x + 1], cells.latEdges[y], cells.latEdges[y + 1]);
}
