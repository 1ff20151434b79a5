/**
 * Catalogued errors of the regions stage: region GeoJSON files (content/regions/*.geojson) and the
 * matching of regions to the grid. Each names the file and, where there is one, the feature
 * (`key`: `features[3]`, or `features[3].geometry.coordinates[0][1]` for a ring) and the region id.
 */
import { defineError } from '../model/errors.ts';

const FORMAT_HINT =
  'each region file is GeoJSON (RFC 7946): a Feature or a FeatureCollection of Features with a Polygon or MultiPolygon geometry and properties "id" (a lower-case slug) and "name"';

export const RegionNotGeoJson = defineError<{ detail: string }>({
  code: 'RegionNotGeoJson',
  title: 'A region file is not GeoJSON',
  message: (p) => p.detail,
  hint: () => FORMAT_HINT,
});

export const RegionNoFeatures = defineError<Record<string, never>>({
  code: 'RegionNoFeatures',
  title: 'A region file holds no region',
  message: () => 'the FeatureCollection has no features',
  hint: () => 'add at least one Feature, or remove the file from the regions folder',
});

export const RegionWrongGeometry = defineError<{ region: string; type: string }>({
  code: 'RegionWrongGeometry',
  title: 'A region has a geometry that is not an area',
  message: (p) => `region ${p.region} has geometry type ${p.type}; only Polygon and MultiPolygon outline an area`,
  hint: () => 'draw the region as a Polygon or MultiPolygon (points and lines have no area to average over)',
});

export const RegionMissingId = defineError<{ feature: number }>({
  code: 'RegionMissingId',
  title: 'A region has no id',
  message: (p) => `feature ${p.feature} has no string property "id"`,
  hint: () => 'give every Feature a property "id": a unique lower-case slug such as "north-coast"; it names the region page and its CSV file',
});

export const RegionBadId = defineError<{ id: string }>({
  code: 'RegionBadId',
  title: 'A region id is not a slug',
  message: (p) => `region id "${p.id}" is not a lower-case slug`,
  hint: () => 'use lower-case letters, digits and single dashes, starting with a letter or digit, e.g. "north-coast-2"',
});

export const RegionMissingName = defineError<{ region: string }>({
  code: 'RegionMissingName',
  title: 'A region has no name',
  message: (p) => `region ${p.region} has no non-empty string property "name"`,
  hint: () => 'add a property "name" with the name to show on pages, e.g. "North Coast"',
});

export const RegionDuplicateId = defineError<{ id: string; first: string; second: string }>({
  code: 'RegionDuplicateId',
  title: 'Two regions share an id',
  message: (p) => `region id "${p.id}" is used by ${p.first} and by ${p.second}`,
  hint: () => 'region ids must be unique across all region files; rename one of them',
});

export const RegionRingTooShort = defineError<{ region: string; positions: number }>({
  code: 'RegionRingTooShort',
  title: 'A polygon ring has fewer than 4 positions',
  message: (p) => `region ${p.region}: a ring has ${p.positions} positions (distinct corners and the closing position); a ring needs at least 4`,
  hint: () => 'a ring lists at least three distinct corners and repeats the first position at the end (RFC 7946 §3.1.6)',
});

export const RegionRingNotClosed = defineError<{ region: string; first: string; last: string }>({
  code: 'RegionRingNotClosed',
  title: 'A polygon ring is not closed',
  message: (p) => `region ${p.region}: a ring starts at ${p.first} but ends at ${p.last}`,
  hint: () => 'repeat the first position as the last one (RFC 7946 §3.1.6)',
});

export const RegionBadPosition = defineError<{ region: string; position: number; value: string }>({
  code: 'RegionBadPosition',
  title: 'A position is not a pair of numbers',
  message: (p) => `region ${p.region}: position ${p.position} of a ring is ${p.value}`,
  hint: () => 'write each position as [longitude, latitude] in decimal degrees',
});

export const RegionCoordinateOutOfRange = defineError<{ region: string; position: number; lon: number; lat: number }>({
  code: 'RegionCoordinateOutOfRange',
  title: 'A coordinate is outside the range of longitude or latitude',
  message: (p) => `region ${p.region}: position ${p.position} is [${p.lon}, ${p.lat}]; latitude must lie in −90…90 and longitude in −360…360`,
  hint: () => 'check the order: GeoJSON positions are [longitude, latitude] (east, north) in degrees',
});

export const RegionRingDegenerate = defineError<{ region: string }>({
  code: 'RegionRingDegenerate',
  title: 'A polygon ring encloses no area',
  message: (p) => `region ${p.region}: a ring's corners all lie on one line (or repeat one point)`,
  hint: () => 'remove the ring, or give it at least three corners that are not on one line',
});

export const RegionSelfIntersecting = defineError<{ region: string; detail: string }>({
  code: 'RegionSelfIntersecting',
  title: 'A region outline crosses itself',
  message: (p) => `region ${p.region}: ${p.detail}`,
  hint: () => 'fix the outline so no two edges cross (a "bow-tie" must be drawn as two polygons); holes must not cross the outer ring or each other',
});

export const RegionHoleOutside = defineError<{ region: string; detail: string }>({
  code: 'RegionHoleOutside',
  title: 'A hole of a region is not inside its outer ring',
  message: (p) => `region ${p.region}: ${p.detail}`,
  hint: () => 'in a Polygon the first ring is the outer outline and every further ring is a hole lying inside it; draw separate areas as a MultiPolygon',
});

export const RegionAroundPole = defineError<{ region: string }>({
  code: 'RegionAroundPole',
  title: 'A region ring goes around a pole',
  message: (p) => `region ${p.region}: a ring winds once around the Earth (its longitudes gain 360°), so it encloses a pole`,
  hint: () => 'split the region at the antimeridian and close each part along it, or leave polar caps out',
});

export const RegionOutsideGrid = defineError<{ region: string; bbox: string; grid: string }>({
  code: 'RegionOutsideGrid',
  title: 'A region does not overlap the data grid',
  message: (p) => `region ${p.region} (${p.bbox}) does not overlap any cell of the grid (${p.grid})`,
  hint: () => 'check the region\'s coordinates, or extend the data files to cover it; remove the region if it belongs to another atlas',
});

export const RegionNoLandCells = defineError<{ region: string }>({
  code: 'RegionNoLandCells',
  title: 'A region has no land cell under the land-sea mask',
  message: (p) => `region ${p.region} overlaps the grid only where the land-sea mask is 0`,
  hint: () => 'lower the land-sea mask threshold in atlas.yaml (dataset.landSeaMask.threshold), or remove the region',
});

export const RegionGridInvalid = defineError<{ detail: string }>({
  code: 'RegionGridInvalid',
  title: 'The grid cannot be matched to regions',
  message: (p) => p.detail,
  hint: () => 'regions need a regular latitude/longitude grid: at least 2 cell centres per axis, ascending, evenly spaced',
});

export const RegionFieldShape = defineError<{ detail: string }>({
  code: 'RegionFieldShape',
  title: 'A field does not fit the grid',
  message: (p) => p.detail,
  hint: () => 'pass fields as a fields × cells matrix, value[f * nCells + cell], cells row-major (south to north, west to east)',
});
