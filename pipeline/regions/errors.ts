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
  hint: () => "check the region's coordinates, or extend the data files to cover it; remove the region if it belongs to another atlas",
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

// The workforce weighting (raster-to-grid.ts, workforce-shares.ts, workforce coverage).

export const WorkforceCountInvalid = defineError<{ file: string; col: number; row: number; value: string }>({
  code: 'WorkforceCountInvalid',
  title: 'The workforce raster holds a negative or NaN count of people',
  message: (p) => `${p.file}: pixel (column ${p.col}, row ${p.row}, counted from 0 at the top left) holds ${p.value}; a count of people must be 0 or more`,
  hint: () =>
    'mark pixels without data with a no-data value instead (gdal_translate -a_nodata -99999 IN.tif OUT.tif, or gdal_calc.py to set them), ' +
    'or correct the raster; `gdallocationinfo FILE COLUMN ROW` shows the pixel',
});

export const WorkforceRasterNotCovering = defineError<{ file: string; region: string; covered: string; extent: string }>({
  code: 'WorkforceRasterNotCovering',
  title: 'The workforce raster does not cover a region',
  message: (p) => `${p.file} (${p.extent}) covers ${p.covered} of region ${p.region} inside the grid; at least 99.5 % is needed`,
  hint: () => 'use a raster that spans every region (a larger extent, or a mosaic: gdalbuildvrt then gdal_translate), or remove the region from the atlas',
});

export const WorkforceSharesColumns = defineError<{ file: string; detail: string }>({
  code: 'WorkforceSharesColumns',
  title: 'The workforce shares table has missing or unknown columns',
  message: (p) => `${p.file}: ${p.detail}`,
  hint: () => 'the header is `region_id,workload_class,share`, optionally with `acclimatized_share` and `sun_share` (content/README.md shows an example)',
});

export const WorkforceSharesEmpty = defineError<{ file: string }>({
  code: 'WorkforceSharesEmpty',
  title: 'The workforce shares table has no rows',
  message: (p) => `${p.file} has a header but no shares`,
  hint: () => 'add a row per workload class of outdoor work, e.g. `*,heavy,0.05` (the share of the people who do heavy outdoor work, in every region)',
});

export const WorkforceSharesBadValue = defineError<{ file: string; row: number; column: string; value: string; detail: string }>({
  code: 'WorkforceSharesBadValue',
  title: 'A value of the workforce shares table is not a share from 0 to 1',
  message: (p) => `${p.file} line ${p.row}: ${p.column} "${p.value}" ${p.detail}`,
  hint: () =>
    'write shares as fractions from 0 to 1 with a decimal point (0.12, not 12 % or 0,12); leave acclimatized_share or sun_share empty for the stated default',
});

export const WorkforceSharesDuplicate = defineError<{ file: string; row: number; first: number; region: string; workloadClass: string }>({
  code: 'WorkforceSharesDuplicate',
  title: 'The workforce shares table names a region and class twice',
  message: (p) => `${p.file} line ${p.row}: region ${p.region}, class ${p.workloadClass} is already given on line ${p.first}`,
  hint: () => 'keep one row per region and workload class',
});

export const WorkforceSharesRegionUnknown = defineError<{ file: string; row: number; region: string; known: string }>({
  code: 'WorkforceSharesRegionUnknown',
  title: 'The workforce shares table names a region the atlas does not have',
  message: (p) => `${p.file} line ${p.row}: region_id "${p.region}" is not a region of this atlas (regions: ${p.known})`,
  hint: () => 'use the region ids of the region GeoJSON files (property `id`), or `*` for the default of every region',
});

export const WorkforceSharesClassUnknown = defineError<{ file: string; row: number; workloadClass: string; known: string }>({
  code: 'WorkforceSharesClassUnknown',
  title: 'The workforce shares table names a workload class the atlas does not evaluate',
  message: (p) => `${p.file} line ${p.row}: workload_class "${p.workloadClass}" is not evaluated by this atlas (classes: ${p.known})`,
  hint: () => 'use the ids of work.classes (content/workload-classes.yaml), or add the class to work.classes in atlas.yaml',
});

export const WorkforceSharesSum = defineError<{ file: string; region: string; sum: number; rows: string }>({
  code: 'WorkforceSharesSum',
  title: "A region's workforce shares add up to more than 1",
  message: (p) =>
    `${p.file}: the shares of region ${p.region} add up to ${p.sum.toFixed(4)} (lines ${p.rows}); a person does one class of outdoor work, so they cannot exceed 1`,
  hint: () =>
    'each share is the fraction of all people who do that class of outdoor work; lower them so they add up to 1 or less (the rest do no outdoor work)',
});

export const WorkforceSharesMissing = defineError<{ file: string; region: string }>({
  code: 'WorkforceSharesMissing',
  title: 'A region has no workforce shares and there is no default',
  message: (p) => `${p.file} has no row for region ${p.region} and no default rows (region_id *)`,
  hint: () => 'add rows for the region, or default rows with region_id `*` that every region without rows of its own takes',
});

export const WorkforceSharesEvaluation = defineError<{ file: string; row: number; needs: string; evaluated: string }>({
  code: 'WorkforceSharesEvaluation',
  title: 'The workforce shares need a figure the atlas does not compute',
  message: (p) => `${p.file} line ${p.row}: the shares put outdoor workers in ${p.needs}, which this atlas does not evaluate (it evaluates ${p.evaluated})`,
  hint: () => 'set acclimatized_share / sun_share to 1 or 0 to match work.acclimatization and work.exposures, or add the missing state or exposure there',
});
