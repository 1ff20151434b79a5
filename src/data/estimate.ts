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
import { validateShift } from '../../pipeline/work/shifts.ts';
import { makeEstimateContext, type EstimateContext } from '../../pipeline/schedule/context.ts';
import { siteDataDir } from './data-dir.ts';
import { readValidatedJson } from './read-json.ts';
import { loadManifest, manifestPath } from './manifest.ts';
import { SiteDataInvalid } from './errors.ts';
import { calculatorIndexSchema, cellChunkIndexSchema } from '../../pipeline/publish/calculator-index-schema.ts';

/** The calculator's context and the atlas title, or null when the data folder has no calculator index. */
export function loadEstimateContext(dataDir: string = siteDataDir()): { ctx: EstimateContext; atlasTitle: string } | null {
  const calcPath = join(dataDir, 'data', 'calculator', 'index.json');
  if (!existsSync(calcPath)) return null;
  const calc = readValidatedJson(calcPath, calculatorIndexSchema, 'calculator index (data/calculator/index.json)');
  const m = loadManifest(dataDir);
  const cellsPath = join(dataDir, 'data', 'calculator', 'cells', 'index.json');
  const cells = existsSync(cellsPath) ? readValidatedJson(cellsPath, cellChunkIndexSchema, 'cell tile index (data/calculator/cells/index.json)') : null;
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
