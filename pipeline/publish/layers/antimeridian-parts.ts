/**
 * MapLibre image sources must lie within [-180, 180] ° of longitude: MapLibre 6.20 throws
 * "x=32, y=16, z=5 outside of bounds" for corners past 180 (seen in test/publish/layers, the
 * MapLibre display test). A layer whose grid crosses the antimeridian (longitudes continuous past
 * 180, pipeline/model/grid.ts) is therefore cut into two images at 180 °: the western part keeps
 * its longitudes, the eastern one is shifted by −360 °. A layer wholly east of 180 is shifted.
 *
 * The cut falls on the pixel column boundary nearest to 180 °; where 180 ° is not a pixel edge the
 * part's stretch is off by at most half a pixel [px]. On grids whose cell edges are at half-steps
 * from round longitudes (ERA5 0.25°, ERA5-Land 0.1°) at 8 px per cell the cut is exact.
 */
import type { ImageCorners } from './mercator-raster.ts';

/** One image for MapLibre, corners inside [-180, 180] [° E, ° N]. */
export interface RasterPart {
  rgba: Uint8Array;
  width: number;
  height: number;
  coordinates: ImageCorners;
}

function corners(west: number, east: number, north: number, south: number): ImageCorners {
  return [
    [west, north],
    [east, north],
    [east, south],
    [west, south],
  ];
}

function columns(rgba: Uint8Array, width: number, height: number, c0: number, c1: number): Uint8Array {
  const w = c1 - c0;
  const out = new Uint8Array(w * height * 4);
  for (let r = 0; r < height; r++) out.set(rgba.subarray((r * width + c0) * 4, (r * width + c1) * 4), r * w * 4);
  return out;
}

/** The image(s) MapLibre can take for a whole layer image with the given corners. */
export function antimeridianParts(rgba: Uint8Array, width: number, height: number, coordinates: ImageCorners): RasterPart[] {
  const [[west, north], [east], , [, south]] = coordinates;
  if (east <= 180) return [{ rgba, width, height, coordinates }];
  if (west >= 180) return [{ rgba, width, height, coordinates: corners(west - 360, east - 360, north, south) }];
  const cut = Math.round(((180 - west) / (east - west)) * width);
  const parts: RasterPart[] = [];
  if (cut > 0) parts.push({ rgba: columns(rgba, width, height, 0, cut), width: cut, height, coordinates: corners(west, 180, north, south) });
  if (cut < width)
    parts.push({ rgba: columns(rgba, width, height, cut, width), width: width - cut, height, coordinates: corners(-180, east - 360, north, south) });
  return parts;
}
