/**
 * Typed access to the parts of `data/manifest.json` the map explorer reads: the atlas, the
 * baseline, the work settings' classes and choices, the figures, and every published layer with
 * its images and legend (pipeline/publish/manifest.ts, atlas-layers.ts). Other keys pass through
 * unchecked. A data folder without a manifest (an inventory-only folder) gives `null`: the map
 * page then says that no layers are published.
 */
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { z } from 'zod';
import { siteDataDir } from './data-dir.ts';
import { readValidatedJson } from './read-json.ts';

const lonLat = z.tuple([z.number().min(-540).max(540), z.number().min(-90).max(90)]);
const corners = z.tuple([lonLat, lonLat, lonLat, lonLat]);
const colour = z.string().regex(/^#[0-9a-f]{6}$/i, 'not a #rrggbb colour');

export const legendSchema = z.object({
  kind: z.enum(['continuous', 'stepped', 'categorical']),
  title: z.string().optional(),
  units: z.string(),
  ramp: z.string(),
  reversed: z.boolean(),
  domain: z.tuple([z.number(), z.number()]).nullable(),
  stops: z.array(z.object({ value: z.number(), color: colour, label: z.string().optional() })).min(1),
  breaks: z.array(z.number()).optional(),
  labels: z.array(z.string()),
  outOfDomain: z.enum(['clamped', 'error']),
  noData: z.object({ color: z.literal('transparent'), meaning: z.string() }),
});

const layerSchema = z.object({
  id: z.string().min(1),
  figure: z.string().min(1),
  combo: z.string().min(1),
  statistic: z.string().min(1),
  period: z.string().regex(/^(0[1-9]|1[0-2]|year)$/, 'period must be 01-12 or year'),
  units: z.string(),
  tif: z.string().regex(/^data\//, 'a path below data/'),
  mapImages: z
    .array(z.object({ path: z.string().regex(/^data\//, 'a path below data/'), coordinates: corners, width: z.number().int().positive(), height: z.number().int().positive() }))
    .min(1),
  legend: legendSchema,
});

export const manifestLayersSchema = z
  .object({
    atlas: z.object({ id: z.string(), title: z.string(), invented: z.boolean() }).passthrough(),
    baseline: z.tuple([z.number().int(), z.number().int()]),
    latestYear: z.number().int(),
    work: z
      .object({
        classes: z.array(z.object({ id: z.string().min(1), name: z.string().min(1), metabolicRate: z.number() }).passthrough()),
        acclimatization: z.array(z.string()),
        exposures: z.array(z.string()),
      })
      .passthrough(),
    figures: z.array(z.object({ id: z.string(), label: z.string(), units: z.string(), combos: z.array(z.string()) })),
    layers: z.array(layerSchema),
  })
  .passthrough();

export type ManifestLayers = z.infer<typeof manifestLayersSchema>;
export type ManifestLayer = ManifestLayers['layers'][number];

/** Path of the manifest inside a data folder. */
export function manifestPath(dataDir: string): string {
  return join(dataDir, 'data', 'manifest.json');
}

/** The manifest's layer parts of `dataDir` (default: the build's data folder), or null without a manifest. */
export function loadManifestLayers(dataDir: string = siteDataDir()): ManifestLayers | null {
  const path = manifestPath(dataDir);
  if (!existsSync(path)) return null;
  return readValidatedJson(path, manifestLayersSchema, 'atlas manifest (data/manifest.json)');
}
