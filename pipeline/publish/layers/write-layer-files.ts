/**
 * The I/O end of the layer stage: writes a figure's PNG and GeoTIFF atomically
 * (pipeline/model/effects.ts) and returns what the manifest records about them.
 */
import { createHash } from 'node:crypto';
import { join } from 'node:path';
import { writeFileAtomic } from '../../model/effects.ts';
import { writeGeoTiff, type GeoTiffMeta } from './geotiff-write.ts';
import type { LayerGridInput } from './layer-grid.ts';
import type { LegendSpec } from './legend.ts';
import type { ImageCorners, RasterOptions } from './mercator-raster.ts';
import { renderLayerPng } from './render-layer-png.ts';
import type { LayerStyle } from './style.ts';

/** One image for a MapLibre `image` source. */
export interface MapImageFile {
  /** Path relative to `dir`. */
  path: string;
  sha256: string;
  /** Top-left, top-right, bottom-right, bottom-left, within [-180, 180] [° E, ° N]. */
  coordinates: ImageCorners;
  /** [px] */
  width: number;
  /** [px] */
  height: number;
}

export interface LayerFiles {
  /** Paths relative to `dir`: the whole layer image and the GeoTIFF. */
  png: string;
  tif: string;
  /** SHA-256 of each file, hex. */
  pngSha256: string;
  tifSha256: string;
  coordinates: ImageCorners;
  /** [px] */
  width: number;
  /** [px] */
  height: number;
  units: string;
  legend: LegendSpec;
  /**
   * The images for the map: `[the whole png]`, or, for a grid across the antimeridian, two files
   * `<name>.west.png` and `<name>.east.png` cut at 180 °.
   */
  mapImages: MapImageFile[];
}

/**
 * Writes `<dir>/<name>.png` and `<dir>/<name>.tif` (and, across the antimeridian,
 * `<name>.west.png` and `<name>.east.png`); `name` is a plain file stem, no folders.
 */
export async function writeLayerFiles(
  dir: string,
  name: string,
  grid: LayerGridInput,
  style: LayerStyle,
  meta: Omit<GeoTiffMeta, 'units'>,
  opts: RasterOptions = {},
): Promise<LayerFiles> {
  const layer = renderLayerPng(grid, style, opts);
  const tif = writeGeoTiff(grid, { ...meta, units: style.units });
  const sha = (b: Uint8Array) => createHash('sha256').update(b).digest('hex');
  await writeFileAtomic(join(dir, `${name}.png`), layer.png);
  await writeFileAtomic(join(dir, `${name}.tif`), tif);
  const mapImages: MapImageFile[] = [];
  for (const [i, part] of layer.parts.entries()) {
    const path = layer.parts.length === 1 ? `${name}.png` : `${name}.${i === 0 ? 'west' : 'east'}.png`;
    if (layer.parts.length > 1) await writeFileAtomic(join(dir, path), part.png);
    mapImages.push({ path, sha256: sha(part.png), coordinates: part.coordinates, width: part.width, height: part.height });
  }
  return {
    png: `${name}.png`,
    tif: `${name}.tif`,
    pngSha256: sha(layer.png),
    tifSha256: sha(tif),
    coordinates: layer.coordinates,
    width: layer.width,
    height: layer.height,
    units: style.units,
    legend: layer.legend,
    mapImages,
  };
}
