/** `heathours build`: the whole atlas, pipeline then site (pipeline/run/build-atlas.ts). */
import type { Command } from 'commander';
import { buildAtlas } from '../run/build-atlas.ts';
import { UsageError } from '../model/errors.ts';

export function register(program: Command): void {
  program
    .command('build')
    .description('build the atlas: read the inputs, compute WBGT and work figures, publish tables, layers and the site')
    .option('--config <file>', 'atlas configuration', 'content/atlas.yaml')
    .option('--out <dir>', 'output folder (default: the configuration\'s `output`)')
    .option('--jobs <n>', 'worker threads (default: all cores)')
    .option('--data-only', 'publish the data files into OUT/data without building the site')
    .option('--quiet', 'no progress output')
    .action(async (opts: { config: string; out?: string; jobs?: string; dataOnly?: boolean; quiet?: boolean }) => {
      let jobs: number | undefined;
      if (opts.jobs !== undefined) {
        jobs = Number(opts.jobs);
        if (!Number.isInteger(jobs) || jobs < 1 || jobs > 256) {
          throw UsageError({ message: `--jobs ${opts.jobs} is not a whole number from 1 to 256`, hint: 'pass the number of worker threads, e.g. --jobs 2' });
        }
      }
      await buildAtlas({ configPath: opts.config, outDir: opts.out, jobs, quiet: opts.quiet, dataOnly: opts.dataOnly });
    });
}
