/**
 * A map layer as a PNG for a MapLibre `image` source: the grid resampled to Web Mercator rows and
 * coloured by its style (mercator-raster.ts), encoded (png-encode.ts), with the corner coordinates
 * MapLibre needs and the legend for the manifest.
 */
import type { LayerGridInput } from './layer-grid.ts';
import type { LegendSpec } from './legend.ts';
import { mercatorRaster, type ImageCorners, type RasterOptions } from './mercator-raster.ts';
import { encodePngRgba } from './png-encode.ts';
import { compileStyle, type LayerStyle } from './style.ts';

export interface LayerPng {
  png: Uint8Array;
  /** Top-left, top-right, bottom-right, bottom-left cell edges [° E, ° N] (Mercator-clamped). */
  coordinates: ImageCorners;
  /** [px] */
  width: number;
  /** [px] */
  height: number;
  legend: LegendSpec;
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
  return {
    png: encodePngRgba(r.rgba, r.width, r.height),
    coordinates: r.coordinates,
    width: r.width,
    height: r.height,
    legend: compiled.legend,
  };
}
