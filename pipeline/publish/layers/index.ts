/** Map layers of gridded figures: PNG for the web map, GeoTIFF for GIS, legend JSON for the manifest. */
export { renderLayerPng, type LayerPng, type LayerPngPart } from './render-layer-png.ts';
export { antimeridianParts, type RasterPart } from './antimeridian-parts.ts';
export { writeGeoTiff, type GeoTiffMeta } from './geotiff-write.ts';
export { writeLayerFiles, type LayerFiles, type MapImageFile } from './write-layer-files.ts';
export { mercatorRaster, rasterSize, type MercatorRaster, type RasterOptions, type ImageCorners } from './mercator-raster.ts';
export { compileStyle, type LayerStyle, type ContinuousStyle, type CategoricalStyle, type CategoryClass, type CompiledStyle } from './style.ts';
export type { LegendSpec, LegendStop } from './legend.ts';
export { niceDomain, type NiceDomainOptions } from './nice-domain.ts';
export { figureStyle } from './figure-style.ts';
export { nicheClassStyle, NICHE_COLOURS } from './niche-style.ts';
export { RAMPS, RAMP_FOR_FIGURE, type RampName, type FigureKind } from './ramps.ts';
export { layerGeometry, type LayerGridInput, type LayerGeometry } from './layer-grid.ts';
export { mercatorY, mercatorLat, MERCATOR_MAX_LAT } from './mercator.ts';
