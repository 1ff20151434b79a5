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

export interface LayerFiles {
  /** Paths relative to `dir`. */
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
}

/** Writes `<dir>/<name>.png` and `<dir>/<name>.tif`; `name` is a plain file stem, no folders. */
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
  };
}
