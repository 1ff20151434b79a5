/**
 * Typed access to the parts of `data/manifest.json` (pipeline/publish/manifest.ts) that the
 * report pages and the home page read: the years, the work settings with the workload classes,
 * the figures, the statistics' meanings, the layers and the list of published files. Other keys
 * pass through unchecked. The file is parsed once per build (it is large: every layer's legend),
 * keyed by path, size and modification time.
 */
import { existsSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { z } from 'zod';
import { ACCLIMATIZATION_STATES, LIMIT_MODELS } from '../../pipeline/work/limit-curves.ts';
import { siteDataDir } from './data-dir.ts';
import { readValidatedJson } from './read-json.ts';

const year = z.number().int();
const yearRange = z.tuple([year, year]).refine(([a, b]) => a <= b, 'first year after last year');

export const atlasManifestSchema = z
  .object({
    atlas: z.object({ id: z.string().min(1), title: z.string().min(1), invented: z.boolean() }).passthrough(),
    /** ISO 8601 build time. */
    buildTime: z.string().min(1),
    years: yearRange,
    baseline: yearRange,
    latestYear: year,
    timeZone: z.string().min(1),
    work: z
      .object({
        classes: z
          .array(
            z.object({
              id: z.string().regex(/^[a-z0-9][a-z0-9-]*$/),
              name: z.string().min(1),
              /** [W] */
              metabolicRate: z.number().positive(),
              description: z.string().optional(),
            }),
          )
          .min(1),
        limitModel: z.enum(LIMIT_MODELS as [string, ...string[]]),
        airMovement: z.boolean(),
        acclimatization: z.array(z.enum(ACCLIMATIZATION_STATES as [string, ...string[]])).min(1),
        exposures: z.array(z.enum(['sun', 'shade'])).min(1),
        restLocation: z.enum(['same-place', 'shade']),
        /** [°C-WBGT] */
        clothingAdjustment: z.number(),
        clothing: z.object({ ensemble: z.string().optional(), hood: z.boolean().optional(), cav: z.number().optional() }).passthrough(),
        shift: z.object({ start: z.number(), end: z.number(), days: z.array(z.string()) }),
        rest: z.object({ name: z.string(), metabolicRate: z.number().positive() }).passthrough(),
      })
      .passthrough(),
    figures: z.array(z.object({ id: z.string().min(1), label: z.string().min(1), units: z.string(), combos: z.array(z.string()) })),
    statistics: z.record(z.string()),
    layers: z.array(
      z
        .object({
          id: z.string().min(1),
          figure: z.string().min(1),
          combo: z.string(),
          statistic: z.string().min(1),
          period: z.string().min(1),
          units: z.string(),
          tif: z.string().min(1),
          png: z.string().min(1),
        })
        .passthrough(),
    ),
    artefacts: z.array(
      z.object({ path: z.string().min(1), kind: z.string().min(1), description: z.string().optional(), units: z.string().optional(), bytes: z.number().int().nonnegative() }).passthrough(),
    ),
  })
  .passthrough();

export type AtlasManifest = z.infer<typeof atlasManifestSchema>;
export type WorkloadClassInfo = AtlasManifest['work']['classes'][number];

/** Path of the manifest inside a data folder. */
export function manifestPath(dataDir: string): string {
  return join(dataDir, 'data', 'manifest.json');
}

/**
 * Whether the data folder carries the atlas figures (a manifest). A folder made only of the
 * inventory and the regions (an earlier stage, or the site's own fixture) has none: the home page
 * then lists the regions without figures and no region report is built.
 */
export function hasAtlasManifest(dataDir: string = siteDataDir()): boolean {
  return existsSync(manifestPath(dataDir));
}

const cache = new Map<string, { stamp: string; value: AtlasManifest }>();

/** Reads and validates the manifest (once per build; see the file comment). */
export function loadAtlasManifest(dataDir: string = siteDataDir()): AtlasManifest {
  const path = manifestPath(dataDir);
  const info = existsSync(path) ? statSync(path) : undefined;
  const stamp = info ? `${info.size}:${info.mtimeMs}` : '';
  const hit = cache.get(path);
  if (hit && hit.stamp === stamp && stamp !== '') return hit.value;
  const value = readValidatedJson(path, atlasManifestSchema, 'atlas manifest (data/manifest.json)');
  cache.set(path, { stamp, value });
  return value;
}
