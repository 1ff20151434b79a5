/**
 * `npm run compile` (run by `npm ci` / `npm install` through the `prepare` script): compiles the
 * command line, the pipeline and the worker entries from TypeScript to JavaScript with esbuild,
 * so the shipped command transpiles nothing when it starts. Writes `compiled/` (git-ignored):
 * - `cli.js`: pipeline/cli.ts, the module bin/heathours.mjs runs;
 * - `workers/<name>.js`: each entry of pipeline/infra/compiled.ts `WORKER_ENTRIES`;
 * - `build-atlas.js`, `site-stage.js`: pipeline/run/build-atlas.ts and site-stage.ts, the build
 *   and the site stage as functions (the whole-build benchmarks time the shipped code through them);
 * - `chunks/*.js`: code shared between them, and the parts each command imports only when it
 *   runs (`import()`), so `--help` loads little;
 * - `sources.json`: the source files that went in, for bin/heathours.mjs's check that the
 *   compiled code is not older than the sources.
 * npm packages stay outside the bundle (imported from node_modules as usual). The folder is
 * replaced atomically (pipeline/model/effects.ts), so a running command never sees half of it.
 */
import { build } from 'esbuild';
import { writeFile } from 'node:fs/promises';
import { join, relative } from 'node:path';
import { replaceDirAtomic } from '../pipeline/model/effects.ts';
import { PACKAGE_ROOT } from '../pipeline/model/package-root.ts';
import { COMPILED_DIR, WORKER_ENTRIES } from '../pipeline/infra/compiled.ts';

/** What bin/heathours.mjs reads to tell whether a source changed after compiling. */
interface CompiledSources {
  /** When the compile started [ms since 1970]; a source modified later makes the bundle stale. */
  compiledAtMs: number;
  /** Source files of the bundle, relative to the package root. */
  files: string[];
}

/** Compiles into `outDir` (default compiled/); returns the number of source files and output bytes. */
async function compile(outDir = COMPILED_DIR): Promise<{ sources: number; bytes: number }> {
  const compiledAtMs = Date.now();
  // `build-atlas.js`, `site-stage.js`: the build and the site stage as functions, for the
  // benchmarks that time the shipped code (bench/compiled-code.ts).
  const entryPoints: Record<string, string> = {
    cli: join(PACKAGE_ROOT, 'pipeline/cli.ts'),
    'build-atlas': join(PACKAGE_ROOT, 'pipeline/run/build-atlas.ts'),
    'site-stage': join(PACKAGE_ROOT, 'pipeline/run/site-stage.ts'),
  };
  for (const [name, entry] of Object.entries(WORKER_ENTRIES)) entryPoints[`workers/${name}`] = join(PACKAGE_ROOT, 'pipeline', `${entry}.ts`);
  let result: { sources: number; bytes: number } = { sources: 0, bytes: 0 };
  await replaceDirAtomic(outDir, async (tmp) => {
    const r = await build({
      absWorkingDir: PACKAGE_ROOT,
      entryPoints,
      outdir: tmp,
      bundle: true,
      splitting: true,
      format: 'esm',
      platform: 'node',
      target: 'node20',
      packages: 'external',
      chunkNames: 'chunks/[name]-[hash]',
      sourcemap: 'linked',
      keepNames: true,
      metafile: true,
      logLevel: 'warning',
    });
    const files = Object.keys(r.metafile.inputs)
      .filter((f) => !f.includes('node_modules'))
      .sort();
    const manifest: CompiledSources = { compiledAtMs, files: files.map((f) => relative(PACKAGE_ROOT, join(PACKAGE_ROOT, f))) };
    await writeFile(join(tmp, 'sources.json'), `${JSON.stringify(manifest)}\n`);
    result = { sources: files.length, bytes: Object.values(r.metafile.outputs).reduce((s, o) => s + o.bytes, 0) };
  });
  return result;
}

const t0 = performance.now();
const r = await compile();
process.stdout.write(
  `heathours: compiled ${r.sources} source files into ${relative(process.cwd(), COMPILED_DIR) || '.'} (${(r.bytes / 1e6).toFixed(1)} MB with source maps) in ${((performance.now() - t0) / 1000).toFixed(1)} s\n`,
);
