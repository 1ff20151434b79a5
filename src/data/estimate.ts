/**
 * What the estimate calculator needs from the data folder, read at build time: the work settings
 * and time zone from `data/manifest.json`, years and region tiles from
 * `data/calculator/index.json`, and the grid and cell chunks from `data/calculator/cells/index.json`
 * (optional: without it the calculator offers regions only). Validated with zod (the manifest by
 * the site's one reader, manifest.ts); catalogued errors from errors.ts. Returns null when the atlas publishes no calculator index at all (an older or a
 * fixture data folder): the page then says so instead of failing the build.
 */
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { z } from 'zod';
import { validateShift } from '../../pipeline/work/shifts.ts';
import { makeEstimateContext, type EstimateContext } from '../../pipeline/schedule/context.ts';
import { siteDataDir } from './data-dir.ts';
import { readValidatedJson } from './read-json.ts';
import { loadManifest, manifestPath } from './manifest.ts';
import { SiteDataInvalid } from './errors.ts';

const slug = z.string().regex(/^[a-z0-9][a-z0-9-]*$/);
const year = z.number().int();

const calculatorSchema = z
  .object({
    version: z.literal(1),
    years: z.array(year).min(1),
    baseline: z.tuple([year, year]),
    regions: z.array(z.object({ id: slug, name: z.string().min(1), path: z.string().min(1) })),
  })
  .passthrough();

const cellsSchema = z
  .object({
    version: z.literal(1),
    years: z.array(year).min(1),
    grid: z.object({
      nLat: z.number().int().positive(),
      nLon: z.number().int().positive(),
      lat0: z.number(),
      dLat: z.number(),
      lon0: z.number(),
      dLon: z.number(),
    }),
    chunks: z.array(z.object({ path: z.string().min(1), firstCell: z.number().int().nonnegative(), lastCell: z.number().int().nonnegative() }).passthrough()),
  })
  .passthrough();

/** The calculator's context and the atlas title, or null when the data folder has no calculator index. */
export function loadEstimateContext(dataDir: string = siteDataDir()): { ctx: EstimateContext; atlasTitle: string } | null {
  const calcPath = join(dataDir, 'data', 'calculator', 'index.json');
  if (!existsSync(calcPath)) return null;
  const calc = readValidatedJson(calcPath, calculatorSchema, 'calculator index (data/calculator/index.json)');
  const m = loadManifest(dataDir);
  const cellsPath = join(dataDir, 'data', 'calculator', 'cells', 'index.json');
  const cells = existsSync(cellsPath) ? readValidatedJson(cellsPath, cellsSchema, 'cell tile index (data/calculator/cells/index.json)') : null;
  if (cells && cells.years.join() !== calc.years.join()) {
    throw SiteDataInvalid(
      { path: cellsPath, problems: [`years ${cells.years.join(', ')} differ from the calculator index's ${calc.years.join(', ')}`] },
      { file: cellsPath, key: 'years' },
    );
  }
  const ctx = makeEstimateContext({
    manifest: m,
    shift: validateShift(m.work.shift, { file: manifestPath(dataDir), key: 'work.shift' }),
    calculator: calc,
    cells,
  });
  return { ctx, atlasTitle: m.atlas.title };
}
