/**
 * The compiled JavaScript the command runs (scripts/compile.ts writes it at install time): where
 * it lives, which worker entries it holds, and whether the running code is that bundle or the
 * TypeScript sources (vitest, bin/heathours-ts.mjs, the benchmarks).
 */
import { join } from 'node:path';
import { PACKAGE_ROOT } from '../model/package-root.ts';

/** Folder of the compiled bundle, git-ignored: `compiled/cli.js`, `compiled/workers/<name>.js`. */
export const COMPILED_DIR: string = join(PACKAGE_ROOT, 'compiled');

/**
 * Every worker thread the pipeline starts, by name: the module it runs, relative to pipeline/
 * and without extension. scripts/compile.ts compiles each to `compiled/workers/<name>.js`; under
 * the sources, pipeline/infra/ts-boot.mjs loads the `.ts` module.
 */
export const WORKER_ENTRIES = {
  shard: 'run/shard-worker',
  physics: 'run/physics-worker',
  'demo-year': 'demo/year-worker',
  'hdf5-meta': 'read/hdf5-meta-worker',
  digest: 'read/digest-worker',
  'site-digest': 'run/site-digest-worker',
  region: 'run/region-worker',
  inflate: 'read/inflate-worker',
} as const;

export type WorkerName = keyof typeof WORKER_ENTRIES;

/**
 * True when this module runs from the compiled bundle (its URL ends in `.js`), false when it
 * runs from the TypeScript sources: workers are then started the same way as their parent.
 */
export const RUNNING_COMPILED: boolean = !import.meta.url.endsWith('.ts');
