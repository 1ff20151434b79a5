/**
 * A map layer as a PNG for a MapLibre `image` source: the grid resampled to Web Mercator rows and
 * coloured by its style (mercator-raster.ts), encoded (png-encode.ts), with the corner coordinates
 * MapLibre needs and the legend for the manifest.
 */
import type { LayerGridInput } from './layer-grid.ts';
import type { LegendSpec } from './legend.ts';
import { mercatorRaster, type ImageCorners, type RasterOptions } from './mercator-raster.ts';
import { encodePngRgba } from './png-encode.ts';
import { antimeridianParts } from './antimeridian-parts.ts';
import { compileStyle, type LayerStyle } from './style.ts';

/** One image for a MapLibre `image` source, corners within [-180, 180] ° E. */
export interface LayerPngPart {
  png: Uint8Array;
  /** Top-left, top-right, bottom-right, bottom-left [° E, ° N]. */
  coordinates: ImageCorners;
  /** [px] */
  width: number;
  /** [px] */
  height: number;
}

export interface LayerPng {
  /** The whole layer as one image. */
  png: Uint8Array;
  /**
   * Top-left, top-right, bottom-right, bottom-left cell edges [° E, ° N] (Mercator-clamped); past
   * 180 when the grid crosses the antimeridian.
   */
  coordinates: ImageCorners;
  /** [px] */
  width: number;
  /** [px] */
  height: number;
  legend: LegendSpec;
  /**
   * What to give MapLibre: one image source per part. One part (the whole image) unless the grid
   * crosses the antimeridian, then two cut at 180 ° (antimeridian-parts.ts).
   */
  parts: LayerPngPart[];
}

/**
 * Renders one gridded figure as a PNG layer. NaN cells are fully transparent. Throws catalogued
 * errors for bad grids (LayerValuesLength, LayerGridIrregular, LayerGridEmpty,
 * LayerCoordinateInvalid) and bad styles (LayerDomainInvalid, LayerClassesInvalid,
 * LayerRampUnknown, LayerCategoriesInvalid).
 */
export function renderLayerPng(grid: LayerGridInput, style: LayerStyle, opts: RasterOptions = {}): LayerPng {
  const compiled = compileStyle(style);
  const r = mercatorRaster(grid, compiled, opts);
  const png = encodePngRgba(r.rgba, r.width, r.height);
  const parts = antimeridianParts(r.rgba, r.width, r.height, r.coordinates).map((p) => ({
    png: p.rgba === r.rgba ? png : encodePngRgba(p.rgba, p.width, p.height),
    coordinates: p.coordinates,
    width: p.width,
    height: p.height,
  }));
  return { png, coordinates: r.coordinates, width: r.width, height: r.height, legend: compiled.legend, parts };
}
