/**
 * Typed access to a region's summary `data/regions/<region-id>.json` (written by
 * pipeline/run/build-atlas.ts): the grid cells it covers, its area, and its mean annual
 * temperature against the human climate niche (pipeline/climate/niche.ts). A mean annual
 * temperature that could not be computed is `null` in the file and NaN here; with the config's
 * `workforce`, the people assigned to it (`workforce.people`) and its annual person-hours.
 */
import { join } from 'node:path';
import { z } from 'zod';
import { NICHE_CLASSES } from '../../pipeline/climate/niche.ts';
import { siteDataDir } from './data-dir.ts';
import { readValidatedJson } from './read-json.ts';

const nicheClass = z.enum(NICHE_CLASSES as unknown as [string, ...string[]]).nullable();
/** [°C], null → NaN. */
const celsius = z
  .number()
  .nullable()
  .transform((v) => (v === null ? NaN : v));

/** An annual workforce figure: baseline mean and 90th-percentile year, null when withheld. */
const annualFigure = z.object({ mean: z.number().nullable(), p90: z.number().nullable(), yearsUsed: z.number().int().nonnegative() });

/**
 * The region's workforce part (pipeline/run/region-stage.ts, config `workforce`, issue 17): its
 * people, the shares of outdoor work it takes, the raster it comes from.
 */
export const regionWorkforceSchema = z.object({
  /** People assigned to the region's land cells [people]. */
  people: z.number().nonnegative(),
  /** People × Σ class shares [people]. */
  outdoorWorkers: z.number().nonnegative(),
  shares: z.array(
    z.object({ workloadClass: z.string().min(1), share: z.number().min(0).max(1), acclimatized: z.number().min(0).max(1), sun: z.number().min(0).max(1) }),
  ),
  /** Whose rows of the shares table: the default rows or the region's own. */
  sharesFrom: z.string().min(1),
  defaults: z.object({ acclimatizedShare: z.number(), sunShare: z.number() }),
  /** Hours of a year of the shift pattern: one full-time equivalent [h]. */
  annualHours: z.number().positive(),
  raster: z.object({ name: z.string().min(1), year: z.number().int(), licence: z.string().min(1), invented: z.boolean() }),
  /** All classes together, whole year [person-h, person-h, FTE, %]. */
  year: z.object({
    personHoursAbove: annualFigure,
    personHoursLost: annualFigure,
    fullTimeEquivalentsLost: annualFigure,
    outdoorWorkTimeLostPercent: annualFigure,
  }),
});

export type RegionWorkforce = z.infer<typeof regionWorkforceSchema>;

export const regionDetailSchema = z
  .object({
    id: z.string().min(1),
    name: z.string().min(1),
    /** Global row-major cell indices. */
    cells: z.array(z.number().int().nonnegative()),
    /** Share of the region's area inside computed grid cells [0–1]. */
    coveredFraction: z.number().min(0).max(1.000001),
    /** [km²] */
    areaKm2: z.number().nonnegative(),
    niche: z.object({
      baselineMat: celsius,
      latestMat: celsius,
      shift: celsius,
      baselineClass: nicheClass,
      latestClass: nicheClass,
      labels: z.record(z.string()),
      caveat: z.string().min(1),
    }),
    /** Present when the atlas weights by a workforce raster. */
    workforce: regionWorkforceSchema.optional(),
  })
  .passthrough();

export type RegionDetail = z.infer<typeof regionDetailSchema>;

/** Path of a region's summary inside a data folder. */
export function regionDetailPath(dataDir: string, regionId: string): string {
  return join(dataDir, 'data', 'regions', `${regionId}.json`);
}

/** Reads and validates the summary of region `regionId`; its `id` must match. */
export function loadRegionDetail(regionId: string, dataDir: string = siteDataDir()): RegionDetail {
  const path = regionDetailPath(dataDir, regionId);
  const schema = regionDetailSchema.refine((d) => d.id === regionId, { message: `the file describes another region than "${regionId}"`, path: ['id'] });
  return readValidatedJson(path, schema, `summary of region "${regionId}" (data/regions/${regionId}.json)`);
}
