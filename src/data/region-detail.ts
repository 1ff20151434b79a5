/**
 * Typed access to a region's summary `data/regions/<region-id>.json` (written by
 * pipeline/run/build-atlas.ts): the grid cells it covers, its area, and its mean annual
 * temperature against the human climate niche (pipeline/climate/niche.ts). A mean annual
 * temperature that could not be computed is `null` in the file and NaN here.
 */
import { join } from 'node:path';
import { z } from 'zod';
import { NICHE_CLASSES } from '../../pipeline/climate/niche.ts';
import { siteDataDir } from './data-dir.ts';
import { readValidatedJson } from './read-json.ts';

const nicheClass = z.enum(NICHE_CLASSES as unknown as [string, ...string[]]).nullable();
/** [°C], null → NaN. */
const celsius = z.number().nullable().transform((v) => (v === null ? NaN : v));

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
