/**
 * The pure core of a PNG layer: a lat/lon grid resampled to Web Mercator rows and coloured, as
 * RGBA bytes. MapLibre stretches an `image` source linearly between its corners in Web Mercator
 * (STACK.md gotcha 5), so output rows are equally spaced in Mercator y (mercator.ts) between the
 * grid's north and south edges, and each pixel takes the colour of the grid cell its centre falls
 * in (cell lookup, no smoothing: a cell is a cell). Columns are linear in longitude already.
 */
import { layerGeometry, type LayerGeometry, type LayerGridInput } from './layer-grid.ts';
import { clampMercatorLat, mercatorLat, mercatorY } from './mercator.ts';
import type { CompiledStyle } from './style.ts';

export interface RasterOptions {
  /** Pixels per grid column; default 8, lowered so the width stays within `maxSize` [px]. */
  pixelsPerCell?: number;
  /** Largest width or height of the image [px]; default 4096 (a safe WebGL texture size). */
  maxSize?: number;
}

/** MapLibre `image` source corners [[lon, lat] × 4]: top-left, top-right, bottom-right, bottom-left [°]. */
export type ImageCorners = [[number, number], [number, number], [number, number], [number, number]];

export interface MercatorRaster {
  /** Row-major RGBA, 4 bytes per pixel, row 0 at the north edge. */
  rgba: Uint8Array;
  width: number;
  height: number;
  /** Grid row (0 = southernmost) each image row shows; length `height`. */
  gridRowOfImageRow: Int32Array;
  /** Corners at the cell edges; north and south clamped to the Web Mercator limit [° E, ° N]. */
  coordinates: ImageCorners;
  geometry: LayerGeometry;
}

/** Pixels per cell and image size for a grid: square pixels in Mercator, capped at maxSize. */
export function rasterSize(g: LayerGeometry, opts: RasterOptions = {}): { pixelsPerCell: number; width: number; height: number; north: number; south: number } {
  const maxSize = opts.maxSize ?? 4096;
  const pixelsPerCell = Math.max(1, Math.min(Math.round(opts.pixelsPerCell ?? 8), Math.floor(maxSize / g.nx)));
  const width = g.nx * pixelsPerCell;
  const north = clampMercatorLat(g.north);
  const south = clampMercatorLat(g.south);
  // A pixel's width in Mercator units: the cell's longitude step [rad] / pixels per cell.
  const pixelY = (g.dLon * Math.PI) / 180 / pixelsPerCell;
  const height = Math.max(1, Math.min(maxSize, Math.round((mercatorY(north) - mercatorY(south)) / pixelY)));
  return { pixelsPerCell, width, height, north, south };
}

/**
 * Resamples and colours a grid. Throws the catalogued errors of layerGeometry (sizes, spacing)
 * and of the style's colour lookup (unknown category codes).
 */
export function mercatorRaster(grid: LayerGridInput, style: CompiledStyle, opts: RasterOptions = {}): MercatorRaster {
  const g = layerGeometry(grid);
  const { pixelsPerCell, width, height, north, south } = rasterSize(g, opts);
  const yN = mercatorY(north);
  const yS = mercatorY(south);

  // Image row r covers Mercator y in [yN − r·h, yN − (r+1)·h]; its centre's latitude picks the row.
  const gridRowOfImageRow = new Int32Array(height);
  const h = (yN - yS) / height;
  for (let r = 0; r < height; r++) {
    const lat = mercatorLat(yN - (r + 0.5) * h);
    const j = Math.floor((lat - g.south) / g.dLat);
    gridRowOfImageRow[r] = j < 0 ? 0 : j >= g.ny ? g.ny - 1 : j;
  }

  const rgba = new Uint8Array(width * height * 4);
  const rowBytes = width * 4;
  const pixels = new Uint32Array(rgba.buffer);
  const littleEndian = new Uint8Array(new Uint32Array([1]).buffer)[0] === 1;
  let lastRow = -1;
  for (let r = 0; r < height; r++) {
    const j = gridRowOfImageRow[r];
    if (j === lastRow) {
      rgba.copyWithin(r * rowBytes, (r - 1) * rowBytes, r * rowBytes);
      continue;
    }
    lastRow = j;
    const base = r * width;
    for (let x = 0; x < g.nx; x++) {
      const c = style.colourOf(grid.values[j * g.nx + x]);
      const p = littleEndian ? c : ((c & 255) << 24) | (((c >>> 8) & 255) << 16) | (((c >>> 16) & 255) << 8) | (c >>> 24);
      const p0 = base + x * pixelsPerCell;
      pixels.fill(p, p0, p0 + pixelsPerCell);
    }
  }

  const coordinates: ImageCorners = [
    [g.west, north],
    [g.east, north],
    [g.east, south],
    [g.west, south],
  ];
  return { rgba, width, height, gridRowOfImageRow, coordinates, geometry: g };
}
