/**
 * Typed access to `data/manifest.json` (type {@link Manifest}, written by the pipeline's publish
 * step, pipeline/publish/manifest.ts): what this build is (atlas, inputs with digests, years,
 * code version, configuration digest, build time), the work settings, the figures, the layers with
 * their legends, and every published file with its kind, units, size and digest.
 *
 * The site's one reader of the file: buildSite's pre-check, the downloads and methods pages, the
 * region reports and home (atlas-manifest.ts), the map explorer (manifest-layers.ts) and the
 * estimate calculator (estimate.ts) all go through {@link loadManifest}, which parses and
 * validates it once per build (keyed by path, size and modification time).
 *
 * A zod schema that mirrors the interface (checked against it at compile time), with the checks
 * the pages rely on: paths stay inside `data/` (they become links), digests are SHA-256 hex, each
 * layer's PNG and GeoTIFF are listed among the artefacts, no path is listed twice, workload class
 * ids are slugs (they become URL parts and element ids), corners are longitude [°] in ±540 and
 * latitude [°] in ±90, every legend has a stop, the shift has a work day.
 */
import { createHash } from 'node:crypto';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { z } from 'zod';
import type { Manifest } from '../../pipeline/publish/manifest.ts';
import { siteDataDir } from './data-dir.ts';
import { readValidatedJsonOnce } from './read-json.ts';

const isoInstant = z.string().refine((s) => !Number.isNaN(Date.parse(s)), 'not an ISO 8601 date-time');
const yearRange = z.tuple([z.number().int(), z.number().int()]).refine(([a, b]) => a <= b, 'first year after last year');
const sha256 = z.string().regex(/^[0-9a-f]{64}$/, 'not a lower-case hex SHA-256');
/** A path below the site root inside data/, without `..`, backslashes or a scheme: it becomes a link. */
const dataPath = z
  .string()
  .regex(/^data\/[A-Za-z0-9._\/-]+$/, 'not a path inside data/ (letters, digits, . _ - /)')
  .refine((p) => !p.split('/').includes('..'), 'a path may not contain ..');
/** [longitude °, latitude °]; longitudes may run past ±180 on an atlas across the antimeridian. */
const lonLat = z.tuple([z.number().min(-540).max(540), z.number().min(-90).max(90)]);
const slug = z.string().regex(/^[a-z0-9][a-z0-9-]*$/, 'not a slug (lower-case letters, digits and -, not starting with -)');
const corners = z.tuple([lonLat, lonLat, lonLat, lonLat]);

const legendSchema = z.object({
  kind: z.enum(['continuous', 'stepped', 'categorical']),
  title: z.string().optional(),
  units: z.string(),
  ramp: z.string(),
  reversed: z.boolean(),
  domain: z.tuple([z.number(), z.number()]).nullable(),
  stops: z.array(z.object({ value: z.number(), color: z.string().regex(/^#[0-9a-f]{6}$/i, 'not a #rrggbb colour'), label: z.string().optional() })).min(1),
  breaks: z.array(z.number()).optional(),
  labels: z.array(z.string()),
  outOfDomain: z.enum(['clamped', 'error']),
  noData: z.object({ color: z.literal('transparent'), meaning: z.string() }),
});

const layerSchema = z.object({
  id: z.string().min(1),
  figure: z.string().min(1),
  combo: z.string().min(1),
  statistic: z.enum(['mean', 'p90', 'baseline', 'class', 'trend', 'trend-p']),
  period: z.string().regex(/^(0[1-9]|1[0-2]|year)$/, 'period must be 01–12 or year'),
  units: z.string(),
  png: dataPath,
  tif: dataPath,
  pngSha256: sha256,
  tifSha256: sha256,
  coordinates: corners,
  mapImages: z
    .array(z.object({ path: dataPath, sha256, coordinates: corners, width: z.number().int().positive(), height: z.number().int().positive() }))
    .min(1),
  legend: legendSchema,
});

const artefactSchema = z.object({
  path: dataPath,
  kind: z.enum(['table', 'layer-png', 'layer-geotiff', 'json', 'geojson', 'histogram', 'netcdf']),
  units: z.string().optional(),
  description: z.string(),
  bytes: z.number().int().nonnegative(),
  sha256,
});

const inputSchema = z.object({
  name: z.string().min(1),
  bytes: z.number().int().nonnegative(),
  sha256,
  format: z.enum(['netcdf3-classic', 'netcdf3-64bit-offset', 'netcdf4', 'zarr']),
  layout: z.enum(['era5-legacy', 'era5-cds-2024', 'era5-zarr', 'other']),
  timeStart: isoInstant.or(z.literal('')),
  timeEnd: isoInstant.or(z.literal('')),
  variables: z.array(z.string()),
});

const rateSchema = z.number().positive();

/** The work settings as the build resolved them (pipeline/run/build-atlas.ts writes them). */
export const manifestWorkSchema = z.object({
  classesFile: z.string(),
  classes: z.array(z.object({ id: slug, name: z.string().min(1), metabolicRate: rateSchema, description: z.string() })).min(1),
  limitModel: z.enum(['curve-2017', 'table-1989']),
  airMovement: z.boolean(),
  acclimatization: z.array(z.enum(['acclimatized', 'unacclimatized'])).min(1),
  exposures: z.array(z.enum(['sun', 'shade', 'shelter'])).min(1),
  restLocation: z.enum(['same-place', 'shade']),
  clothing: z.object({ ensemble: z.string().optional(), hood: z.boolean().optional(), cav: z.number().optional() }),
  shift: z.object({ start: z.number(), end: z.number(), days: z.array(z.string()).min(1) }),
  /** Clothing adjustment value used [°C-WBGT]. */
  clothingAdjustment: z.number(),
  rest: z.object({ name: z.string(), metabolicRate: rateSchema, description: z.string() }),
  cautions: z.array(z.object({ id: z.string().min(1), text: z.string().min(1), basis: z.string() })),
});

export type ManifestWork = z.infer<typeof manifestWorkSchema>;

/**
 * The workforce weighting (config `workforce`, issue 17; pipeline/publish/manifest.ts
 * `ManifestWorkforce`): the people raster's name, year and licence, shown wherever a figure made
 * from it is shown, and what became of its people.
 */
export const manifestWorkforceSchema = z.object({
  name: z.string().min(1),
  /** Year the raster describes [calendar year]. */
  year: z.number().int(),
  licence: z.string().min(1),
  invented: z.boolean(),
  raster: z.object({
    file: z.string().min(1),
    sha256,
    width: z.number().int().positive(),
    height: z.number().int().positive(),
    /** Pixel size [°] (longitude, latitude). */
    pixelDegrees: z.tuple([z.number().positive(), z.number().positive()]),
    sampleType: z.string(),
    noData: z.union([z.number(), z.string(), z.null()]),
  }),
  shares: z.object({
    file: z.string().min(1),
    sha256,
    defaults: z.object({ acclimatizedShare: z.number().min(0).max(1), sunShare: z.number().min(0).max(1) }),
  }),
  /** [people] */
  peopleOnLand: z.number().nonnegative(),
  peopleOffLand: z.number().nonnegative(),
  peopleOutsideGrid: z.number().nonnegative(),
  /** Hours of a year of the shift pattern: one full-time equivalent [h]. */
  annualHours: z.number().positive(),
  figures: z.array(z.object({ id: z.string().min(1), label: z.string().min(1), units: z.string(), combos: z.array(z.string().min(1)) })),
});

export type ManifestWorkforceInfo = z.infer<typeof manifestWorkforceSchema>;
const changeRange = z.object({ min: z.number(), max: z.number(), mean: z.number() });
const scenarioSchema = z.object({
  id: z.string().regex(/^[a-z0-9][a-z0-9-]*$/),
  name: z.string().min(1),
  description: z.string().optional(),
  definition: z.union([
    z.object({ kind: z.literal('warming'), warming: z.number() }),
    z.object({
      kind: z.literal('change-file'),
      changeFile: z.string(),
      sha256: z.string(),
      humidity: z.enum(['relative', 'specific']),
      variables: z.array(z.string()),
    }),
  ]),
  words: z.object({ kind: z.string().min(1), what: z.string().min(1), source: z.string().min(1), caveat: z.string().min(1) }),
  changes: z.object({ temperature: changeRange, humidity: changeRange.nullable(), solar: changeRange.nullable() }),
  dataPath: z.string().min(1),
  counts: z.record(z.number()),
  layers: z.array(layerSchema),
});
export type SiteScenario = z.infer<typeof scenarioSchema>;

export const manifestSchema = z
  .object({
    manifestVersion: z.literal(1),
    atlas: z.object({ id: z.string().min(1), title: z.string().min(1), invented: z.boolean(), attribution: z.string().optional() }),
    buildTime: isoInstant,
    codeVersion: z.string().min(1),
    configDigest: sha256,
    inputs: z.array(inputSchema),
    years: yearRange,
    baseline: yearRange,
    latestYear: z.number().int(),
    timeZone: z.string().min(1),
    /** Modelling choices of the physics (pipeline/physics/settings.ts): globe diameter [m]. */
    physics: z.object({ globeDiameter: z.number().positive() }),
    work: manifestWorkSchema,
    figures: z.array(z.object({ id: z.string().min(1), label: z.string().min(1), units: z.string(), combos: z.array(z.string().min(1)) })),
    statistics: z.record(z.string()),
    counts: z.record(z.number()),
    layers: z.array(layerSchema),
    artefacts: z.array(artefactSchema),
    /** The workforce weighting, when the atlas has one. */
    workforce: manifestWorkforceSchema.optional(),
    /** What every scenario is and is not, to show with any of them (pipeline/scenario/describe.ts). */
    scenarioCaveat: z.string().min(1).optional(),
    /** The what-if climates published under data/scenarios/<id>/ (same files as the record's). */
    scenarios: z.array(scenarioSchema).optional(),
  })
  .superRefine((m, ctx) => {
    const paths = new Set<string>();
    m.artefacts.forEach((a, i) => {
      if (paths.has(a.path)) ctx.addIssue({ code: 'custom', message: `${a.path} is listed twice`, path: ['artefacts', i, 'path'] });
      paths.add(a.path);
    });
    m.layers.forEach((l, i) => {
      for (const key of ['png', 'tif'] as const) {
        if (!paths.has(l[key])) ctx.addIssue({ code: 'custom', message: `${l[key]} is not among the artefacts`, path: ['layers', i, key] });
      }
    });
  });

/** The manifest as the pages see it: {@link Manifest} with its work settings typed. */
export type SiteManifest = z.infer<typeof manifestSchema>;
export type ManifestLayer = SiteManifest['layers'][number];
export type ManifestArtefact = SiteManifest['artefacts'][number];

// Compile-time proof that the schema and the published interface describe the same thing
// (the interface types `work` as unknown; the schema says what it holds).
type Parsed = z.infer<typeof manifestSchema>;
const _toInterface = (v: Parsed): Manifest => v;
const _fromInterface = (v: Omit<Manifest, 'work'>): Omit<Parsed, 'work'> => v;
void _toInterface;
void _fromInterface;

/** Path of the manifest inside a data folder. */
export function manifestPath(dataDir: string): string {
  return join(dataDir, 'data', 'manifest.json');
}

/**
 * Whether the data folder carries the atlas figures (a manifest). A folder made only of the
 * inventory and the regions (an earlier stage, or the site's own fixture) has none: the home page
 * then lists the regions without figures, no region report is built and the map says that no
 * layers are published.
 */
export function hasManifest(dataDir: string = siteDataDir()): boolean {
  return existsSync(manifestPath(dataDir));
}

/**
 * Reads and validates the manifest of `dataDir` (default: the build's data folder). Catalogued
 * errors: SiteDataMissing, SiteDataUnreadable, SiteDataInvalid (with the key). Every page reads
 * it and the file is large, so it is parsed once per path, size and modification time. The
 * result is shared by every caller: read it, never change it.
 */
export function loadManifest(dataDir: string = siteDataDir()): SiteManifest {
  return readValidatedJsonOnce(manifestPath(dataDir), manifestSchema, 'build manifest (data/manifest.json)');
}

/** Size [bytes] and SHA-256 of the manifest file itself (it cannot list its own digest). */
export function manifestFileFacts(dataDir: string = siteDataDir()): { bytes: number; sha256: string } {
  const bytes = readFileSync(manifestPath(dataDir));
  return { bytes: bytes.length, sha256: createHash('sha256').update(bytes).digest('hex') };
}
