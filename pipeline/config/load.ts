/**
 * Loads and validates content/atlas.yaml: YAML syntax, then the zod schema, then that the files
 * it names exist. Every failure is a catalogued error naming the file and the key.
 */
import { readFile, readdir } from 'node:fs/promises';
import { existsSync, statSync } from 'node:fs';
import { dirname, resolve, join } from 'node:path';
import { parseAllDocuments } from 'yaml';
import { globSync } from 'tinyglobby';
import { atlasSchema, type AtlasConfig } from './schema.ts';
import { ConfigInputMissing, ConfigInvalid, ConfigNotFound, ConfigRegionsMissing, ConfigSyntax, ConfigWorkforceFileMissing } from './errors.ts';
import { checkScenarioIds } from '../scenario/settings.ts';
import { ScenarioChangeFileMissing } from '../scenario/errors.ts';

/** A validated configuration with every path resolved to an absolute one. */
export interface ResolvedConfig {
  config: AtlasConfig;
  /** Absolute path of the config file. */
  path: string;
  /** The raw text of the config file (for its digest). */
  text: string;
  /** Absolute paths of the input files, sorted. */
  inputFiles: string[];
  /** Absolute paths of the region GeoJSON files, sorted. */
  regionFiles: string[];
  /** Absolute path of the output folder. */
  outputDir: string;
  /** Absolute path of the partial cache folder (`cache`, default `.heathours-cache` beside the output). */
  cacheDir: string;
  /** Absolute paths of the workforce raster and shares table, when `workforce` is configured. */
  workforce?: { raster: string; shares: string };
  /** Absolute path of each scenario's change file, by scenario id (scenarios with `changeFile`). */
  changeFiles: Record<string, string>;
}

/**
 * Parses YAML text strictly: syntax errors, warnings (an unknown tag such as `!!js/function`),
 * aliases that do not resolve or expand too far (the library's limit against alias bombs),
 * nesting too deep to read, and a second document after `---` all become `fail(detail)`, a
 * catalogued error of the caller.
 */
export function parseYamlStrict(text: string, fail: (detail: string) => Error): unknown {
  let docs: ReturnType<typeof parseAllDocuments>;
  try {
    docs = parseAllDocuments(text, { prettyErrors: true, logLevel: 'silent' });
  } catch (e) {
    throw fail((e as Error).message ?? String(e));
  }
  // No document at all (an empty file, or only comments): nothing, as a one-document parse gives.
  if (docs.length === 0) return null;
  const doc = docs[0];
  const problem = doc.errors[0] ?? doc.warnings[0];
  if (!problem && docs.length > 1) {
    // The library keeps a second document quietly when asked to be silent: its settings would be
    // ignored without a word.
    const second = docs[1].range?.[0] ?? text.length;
    const line = text.slice(0, second).split('\n').length;
    throw fail(`the file holds ${docs.length} YAML documents (the second starts on line ${line}, after "---"); a configuration is one document`);
  }
  if (problem) throw fail(problem.message);
  try {
    return doc.toJS({ maxAliasCount: 100 });
  } catch (e) {
    throw fail(e instanceof RangeError ? 'the values are nested too deeply to read' : ((e as Error).message ?? String(e)));
  }
}

/** Parses and validates a config text; `file` is used in error messages only. */
export function parseConfig(text: string, file: string): AtlasConfig {
  const raw = parseYamlStrict(text, (detail) => ConfigSyntax({ detail }, { file }));
  const result = atlasSchema.safeParse(raw);
  if (!result.success) {
    const problems = result.error.issues.map((i) => {
      const key = i.path.join('.') || '(top level)';
      if (i.code === 'unrecognized_keys') return `${key === '(top level)' ? '' : key + ': '}unknown key(s) ${i.keys.map((k) => `"${k}"`).join(', ')}`;
      return `${key}: ${i.message}`;
    });
    const firstKey = result.error.issues[0]?.path.join('.');
    throw ConfigInvalid({ problems }, { file, key: firstKey || undefined });
  }
  checkScenarioIds(result.data.scenarios, file);
  return result.data;
}

/** Whether a glob match is an input: a file, or a Zarr store's folder (named `*.zarr`). */
function isInput(m: string): boolean {
  const s = statSync(m);
  return s.isFile() || (s.isDirectory() && /\.zarr$/i.test(m));
}

/** Loads the config at `path`, validates it and resolves its files. */
export async function loadConfig(path: string): Promise<ResolvedConfig> {
  const abs = resolve(path);
  if (!existsSync(abs)) throw ConfigNotFound({ path: abs }, { file: abs });
  const text = await readFile(abs, 'utf8');
  const config = parseConfig(text, abs);
  const baseDir = dirname(abs);
  const inputFiles: string[] = [];
  for (const pattern of config.dataset.files) {
    const matches = globSync(pattern, { cwd: baseDir, absolute: true, onlyFiles: false, ignore: ['**/*.zarr/*', '**/*.zarr/**/*'] })
      .map((m) => resolve(m))
      .filter((m) => isInput(m));
    if (matches.length === 0) throw ConfigInputMissing({ pattern, baseDir }, { file: abs, key: 'dataset.files' });
    inputFiles.push(...matches);
  }
  // Zarr stores: URLs as written, folders relative to the config file (their absence is the reader's NetcdfFileNotFound).
  for (const store of config.dataset.zarr)
    inputFiles.push(/^https?:\/\//i.test(store) ? store.replace(/\/+$/, '') : resolve(baseDir, store).replace(/\/+$/, ''));
  const regionsDir = resolve(baseDir, config.regions);
  const regionFiles =
    existsSync(regionsDir) && statSync(regionsDir).isDirectory()
      ? (await readdir(regionsDir)).filter((f) => f.endsWith('.geojson')).map((f) => join(regionsDir, f))
      : [];
  if (regionFiles.length === 0) throw ConfigRegionsMissing({ path: regionsDir }, { file: abs, key: 'regions' });
  let workforce: ResolvedConfig['workforce'];
  if (config.workforce) {
    const raster = resolve(baseDir, config.workforce.raster);
    const shares = resolve(baseDir, config.workforce.shares);
    for (const [key, path] of [
      ['workforce.raster', raster],
      ['workforce.shares', shares],
    ] as const) {
      if (!existsSync(path) || !statSync(path).isFile())
        throw ConfigWorkforceFileMissing({ key, path, invented: config.workforce.invented }, { file: abs, key });
    }
    workforce = { raster, shares };
  }
  const changeFiles: Record<string, string> = {};
  config.scenarios.forEach((s, i) => {
    if (s.changeFile === undefined) return;
    const p = resolve(baseDir, s.changeFile);
    if (!existsSync(p) || !statSync(p).isFile()) throw ScenarioChangeFileMissing({ path: p, id: s.id }, { file: abs, key: `scenarios[${i}].changeFile` });
    changeFiles[s.id] = p;
  });
  return {
    config,
    path: abs,
    text,
    inputFiles: [...new Set(inputFiles)].sort(),
    regionFiles: regionFiles.sort(),
    outputDir: resolve(baseDir, config.output),
    cacheDir: config.cache !== undefined ? resolve(baseDir, config.cache) : join(dirname(resolve(baseDir, config.output)), '.heathours-cache'),
    workforce,
    changeFiles,
  };
}
