/** The regions stage: region files, region ↔ grid-cell weights, region statistics. */
export type { Region, RegionPolygon } from './region.ts';
export { parseRegionFile, parseRegionGeoJson, checkUniqueRegionIds, REGION_ID_PATTERN, ringBbox } from './parse-regions.ts';
export { describeGridCells, cellCentre, type GridCells } from './grid-cells.ts';
export { regionCellWeights, allRegionCellWeights, regionBbox, type CellWeights } from './cell-weights.ts';
export { applyLandMask } from './land-mask.ts';
export { regionFieldStats, type RegionFieldStats, type RegionStatsOptions } from './region-stats.ts';
export { EARTH_RADIUS_KM, ringAreaSr, rectangleAreaSr } from './spherical-area.ts';
export { findEdgeContact, segmentContact, type EdgeContact } from './segment-intersection.ts';
export { ringContains, flatRingContains } from './ring-contains.ts';
export * as regionErrors from './errors.ts';
