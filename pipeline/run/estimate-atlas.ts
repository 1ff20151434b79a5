/**
 * Reads a built atlas for `heathours estimate`: the folder `heathours build` wrote (holding
 * `data/`) or its `data/` folder itself. Validates the parts of `data/manifest.json`,
 * `data/calculator/index.json` and `data/calculator/cells/index.json` the estimate uses (zod) and
 * makes the same context the page gets (pipeline/schedule/context.ts makeEstimateContext). Files
 * are read on demand through a loader that keeps each one once.
 */
import { existsSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { join, resolve } from 'node:path';
import { z } from 'zod';
import { makeEstimateContext, type EstimateContext } from '../schedule/context.ts';
import { EstimateAtlasInvalid, EstimateAtlasNotFound, EstimateDataUnavailable } from '../schedule/errors.ts';
import type { AtlasLoader } from '../schedule/place.ts';
import { validateShift } from '../work/shifts.ts';
import { calculatorIndexSchema, cellChunkIndexSchema } from '../publish/calculator-index-schema.ts';

const slug = z.string().regex(/^[a-z0-9][a-z0-9-]*$/);
const rate = z.number().positive().max(1000);

const manifestPartSchema = z
  .object({
    atlas: z.object({ title: z.string().min(1), invented: z.boolean() }).passthrough(),
    buildTime: z.string().min(1),
    codeVersion: z.string().min(1),
    configDigest: z.string().min(1),
    inputs: z.array(z.unknown()),
    timeZone: z.string().min(1),
    work: z
      .object({
        rest: z.object({ metabolicRate: rate }).passthrough(),
        classes: z.array(z.object({ id: slug, name: z.string().min(1), metabolicRate: rate, description: z.string() }).passthrough()).min(1),
        limitModel: z.enum(['curve-2017', 'table-1989']),
        airMovement: z.boolean(),
        acclimatization: z.array(z.enum(['acclimatized', 'unacclimatized'])).min(1),
        exposures: z.array(z.enum(['sun', 'shade', 'shelter'])).min(1),
        restLocation: z.enum(['same-place', 'shade']),
        clothing: z.object({ ensemble: z.string().optional(), hood: z.boolean().optional(), cav: z.number().optional() }),
        shift: z.object({ start: z.number(), end: z.number(), days: z.array(z.string()).min(1) }),
      })
      .passthrough(),
    scenarioCaveat: z.string().min(1).optional(),
    scenarios: z
      .array(
        z
          .object({
            id: slug,
            name: z.string().min(1),
            words: z.object({ kind: z.string().min(1), what: z.string().min(1), source: z.string().min(1) }).passthrough(),
            dataPath: z.string().regex(/^data\/scenarios\/[a-z0-9][a-z0-9-]*\/$/),
          })
          .passthrough(),
      )
      .optional(),
  })
  .passthrough();

async function readJson<T>(path: string, schema: z.ZodType<T>): Promise<T> {
  let raw: unknown;
  try {
    raw = JSON.parse(await readFile(path, 'utf8'));
  } catch (e) {
    throw EstimateAtlasInvalid({ path, problems: [`not readable JSON (${(e as Error).message})`] }, { file: path });
  }
  const r = schema.safeParse(raw);
  if (!r.success)
    throw EstimateAtlasInvalid({ path, problems: r.error.issues.slice(0, 5).map((i) => `${i.path.join('.') || '(top)'}: ${i.message}`) }, { file: path });
  return r.data;
}

/** The atlas's estimate context and a loader of its files (paths below the site root, `data/…`). */
export interface EstimateAtlas {
  /** The folder holding `data/`. */
  root: string;
  ctx: EstimateContext;
  load: AtlasLoader;
}

/**
 * Opens the atlas at `dir`. Catalogued errors: EstimateAtlasNotFound (no manifest or calculator
 * index), EstimateAtlasInvalid (a file that does not validate), and from pipeline/work the
 * shift's errors.
 */
export async function openEstimateAtlas(dir: string): Promise<EstimateAtlas> {
  const abs = resolve(dir);
  const root = existsSync(join(abs, 'data', 'manifest.json')) ? abs : existsSync(join(abs, 'manifest.json')) ? resolve(abs, '..') : null;
  if (root === null) throw EstimateAtlasNotFound({ dir: abs, missing: 'data/manifest.json (nor manifest.json)' }, { file: abs });
  const calcPath = join(root, 'data', 'calculator', 'index.json');
  if (!existsSync(calcPath))
    throw EstimateAtlasNotFound({ dir: root, missing: 'data/calculator/index.json: the atlas was built without calculator tiles' }, { file: calcPath });
  const manifestFile = join(root, 'data', 'manifest.json');
  const manifest = await readJson(manifestFile, manifestPartSchema);
  const calculator = await readJson(calcPath, calculatorIndexSchema);
  const cellsPath = join(root, 'data', 'calculator', 'cells', 'index.json');
  const cells = existsSync(cellsPath) ? await readJson(cellsPath, cellChunkIndexSchema) : null;
  if (cells && cells.years.join() !== calculator.years.join()) {
    throw EstimateAtlasInvalid(
      { path: cellsPath, problems: [`years ${cells.years.join(', ')} differ from the calculator index's ${calculator.years.join(', ')}`] },
      { file: cellsPath },
    );
  }
  const ctx = makeEstimateContext({
    manifest: manifest as Parameters<typeof makeEstimateContext>[0]['manifest'],
    shift: validateShift(manifest.work.shift, { file: manifestFile, key: 'work.shift' }),
    calculator,
    cells,
  });
  const cache = new Map<string, Promise<Uint8Array>>();
  const load: AtlasLoader = (path) => {
    let p = cache.get(path);
    if (!p) {
      const file = join(root, path);
      if (!resolve(file).startsWith(root)) throw EstimateDataUnavailable({ path, detail: 'the path leaves the atlas folder' }, { file: path });
      p = readFile(file).then(
        (b) => new Uint8Array(b.buffer, b.byteOffset, b.byteLength),
        (e: NodeJS.ErrnoException) => {
          throw EstimateDataUnavailable({ path, detail: e.code === 'ENOENT' ? 'the file is missing' : e.message }, { file });
        },
      );
      cache.set(path, p);
    }
    return p;
  };
  return { root, ctx, load };
}
