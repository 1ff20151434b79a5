/**
 * What the fuzzer runs on a mutant, as a user would meet it:
 * - NetCDF: `heathours inspect` (inspectFile: header, every value, time axes), then what a build
 *   does with an input file (openDataset with the land-sea mask beside it, then every hour of
 *   the grid in month-long blocks, as the shards read them);
 * - point CSV: `heathours point` (runPoint), which also must leave no output behind on an error;
 * - atlas YAML: what `heathours build` checks before reading any data (loadConfig, the
 *   workload-classes file it names, the work settings).
 * Each step's outcome is classified on its own (outcome.ts).
 */
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import { inspectFile, openDataset } from '../../pipeline/read/index.ts';
import { runPoint } from '../../pipeline/commands/point.ts';
import { loadConfig, parseYamlStrict } from '../../pipeline/config/load.ts';
import { ConfigSyntax } from '../../pipeline/config/errors.ts';
import { parseWorkloadClasses, resolveWorkSettings } from '../../pipeline/work/index.ts';
import { WorkloadClassesFileMissing } from '../../pipeline/run/errors.ts';
import type { FormatId } from './mutate.ts';
import type { BasePaths } from './bases.ts';

/** Hours per block, as the shards read them (pipeline/run BLOCK_HOURS). */
const BLOCK_HOURS = 744;

/** One step of a target: a name and the work. */
export interface Step {
  name: string;
  run: () => Promise<void>;
}

/**
 * `full` reads every hour of the grid in the build step (the benchmark); `quick` (the suite)
 * reads the first and last month only: inspect has read every value already, and the build's
 * own path through a damaged chunk has its own test (damaged-build.test.ts).
 */
export type Depth = 'full' | 'quick';

export function stepsFor(format: FormatId, path: string, bases: BasePaths, depth: Depth = 'full'): Step[] {
  if (format === 'point-csv') {
    return [
      {
        name: 'point',
        run: async () => {
          const out = join(dirname(path), `${basename(path)}.out.csv`);
          try {
            await runPoint(path, out, { quiet: true });
          } catch (e) {
            // Nothing half-written: no output and no temporary file beside it.
            const left = readdirSync(dirname(path)).filter((f) => f.startsWith(`${basename(path)}.out`));
            if (left.length > 0) throw new Error(`a failed point run left ${left.join(', ')} behind`);
            throw e;
          }
        },
      },
    ];
  }
  if (format === 'atlas-yaml') {
    return [
      {
        name: 'config',
        run: async () => {
          const rc = await loadConfig(path);
          const classesPath = resolve(dirname(rc.path), rc.config.work.classesFile);
          if (!existsSync(classesPath)) throw WorkloadClassesFileMissing({ path: classesPath }, { file: rc.path, key: 'work.classesFile' });
          const classes = parseWorkloadClasses(
            parseYamlStrict(readFileSync(classesPath, 'utf8'), (detail) => ConfigSyntax({ detail }, { file: classesPath })),
            classesPath,
          );
          resolveWorkSettings(rc.config.work, classes, { file: rc.path });
        },
      },
    ];
  }
  const lsm = format === 'netcdf4' ? bases.lsm.netcdf4 : bases.lsm.netcdf3;
  return [
    { name: 'inspect', run: async () => void (await inspectFile(path)) },
    {
      name: 'dataset',
      run: async () => {
        const ds = await openDataset([path, lsm], {
          product: 'era5',
          landSeaMask: { variable: 'lsm', threshold: 0.5 },
          digests: false,
          reuseBlockBuffers: true,
        });
        try {
          const tile = { y0: 0, y1: ds.grid.lat.length, x0: 0, x1: ds.grid.lon.length };
          const n = ds.time.count;
          const starts =
            depth === 'full' ? Array.from({ length: Math.ceil(n / BLOCK_HOURS) }, (_, k) => k * BLOCK_HOURS) : [...new Set([0, Math.max(0, n - BLOCK_HOURS)])];
          for (const t0 of starts) await ds.readBlock(t0, Math.min(BLOCK_HOURS, n - t0), tile);
        } finally {
          await ds.close();
        }
      },
    },
  ];
}
