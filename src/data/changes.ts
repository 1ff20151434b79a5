/**
 * Typed access to `data/changes.json` (pipeline/publish/changes.ts `BuildChanges`): what changed
 * since the previous build. Optional: a data folder without it (an older build) gives null.
 */
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { z } from 'zod';
import type { BuildChanges } from '../../pipeline/publish/changes.ts';
import { siteDataDir } from './data-dir.ts';
import { readValidatedJson } from './read-json.ts';

const yearRange = z.tuple([z.number().int(), z.number().int()]);
const move = z.object({
  regionId: z.string(),
  regionName: z.string(),
  figure: z.string(),
  workloadClass: z.string(),
  acclimatization: z.string(),
  exposure: z.string(),
  method: z.string(),
  statistic: z.string(),
  before: z.number(),
  after: z.number(),
  change: z.number(),
  unit: z.string(),
});

export const changesSchema = z.object({
  version: z.literal(2),
  hasPrevious: z.boolean(),
  previous: z.object({ buildTime: z.string(), codeVersion: z.string(), years: yearRange, baseline: yearRange }).optional(),
  yearsAdded: z.array(z.number().int()),
  yearsRemoved: z.array(z.number().int()),
  baselineChanged: z.boolean(),
  inputs: z.object({ added: z.array(z.string()), changed: z.array(z.string()), removed: z.array(z.string()) }),
  codeChanged: z.boolean(),
  configChanged: z.boolean(),
  normals: z.object({
    compared: z.number().int().nonnegative(),
    moved: z.number().int().nonnegative(),
    largest: z.number().nonnegative(),
    moves: z.array(move),
  }),
  latest: z.array(move),
  moves: z.array(move),
  regionsAdded: z.array(z.string()),
  regionsRemoved: z.array(z.string()),
});

// Compile-time check that the schema and the pipeline's type agree.
const _check: (x: z.infer<typeof changesSchema>) => BuildChanges = (x) => x as BuildChanges;
void _check;

/** The changes of this build, or null when the data folder has none. */
export function loadChanges(dataDir: string = siteDataDir()): z.infer<typeof changesSchema> | null {
  const path = join(dataDir, 'data', 'changes.json');
  if (!existsSync(path)) return null;
  return readValidatedJson(path, changesSchema, 'what changed since the previous build');
}
