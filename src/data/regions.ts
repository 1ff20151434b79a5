/**
 * Typed access to `data/regions.geojson`: a FeatureCollection whose features carry `id` (a slug,
 * used in URLs) and `name` (free text, shown escaped). Geometry is a Polygon or MultiPolygon in
 * [° E, ° N].
 */
import { join } from 'node:path';
import { z } from 'zod';
import { siteDataDir } from './data-dir.ts';
import { readValidatedJson } from './read-json.ts';

const position = z.tuple([z.number().min(-360).max(360), z.number().min(-90).max(90)]).rest(z.number());
const ring = z.array(position).min(4);
const geometry = z.discriminatedUnion('type', [
  z.object({ type: z.literal('Polygon'), coordinates: z.array(ring).min(1) }),
  z.object({ type: z.literal('MultiPolygon'), coordinates: z.array(z.array(ring).min(1)).min(1) }),
]);

export const regionsSchema = z
  .object({
    type: z.literal('FeatureCollection'),
    features: z.array(
      z.object({
        type: z.literal('Feature'),
        properties: z
          .object({
            id: z.string().regex(/^[a-z0-9]+(?:-[a-z0-9]+)*$/, 'id must be a slug (a-z, 0-9, hyphens)'),
            name: z.string().min(1),
          })
          .passthrough(),
        geometry,
      }),
    ),
  })
  .refine((fc) => new Set(fc.features.map((f) => f.properties.id)).size === fc.features.length, {
    message: 'two regions share an id',
    path: ['features'],
  });

export type RegionCollection = z.infer<typeof regionsSchema>;

/** One region as the pages list it. */
export interface RegionSummary {
  id: string;
  name: string;
}

/** Path of the regions file inside a data folder. */
export function regionsPath(dataDir: string): string {
  return join(dataDir, 'data', 'regions.geojson');
}

/** Reads and validates the regions of `dataDir` (default: the build's data folder). */
export function loadRegions(dataDir: string = siteDataDir()): RegionCollection {
  return readValidatedJson(regionsPath(dataDir), regionsSchema, 'regions file (data/regions.geojson)');
}

/** Id and name of each region, sorted by name. */
export function regionSummaries(fc: RegionCollection): RegionSummary[] {
  return fc.features.map((f) => ({ id: f.properties.id, name: f.properties.name })).sort((a, b) => a.name.localeCompare(b.name));
}
