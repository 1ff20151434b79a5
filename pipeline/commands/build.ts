/**
 * `heathours build`: the whole atlas, pipeline then site (pipeline/run/build-atlas.ts); or a step
 * of a distributed run: one slice of the shards (`--shard K/N --partials DIR`), one slice of the
 * merge (`--merge DIR --tile K/N`), the assemble step (`--assemble DIR`), or the whole merge and
 * publish on one machine (`--merge DIR`).
 */
import type { Command } from 'commander';
import { MergeSliceInvalid, ShardSliceInvalid } from '../run/errors.ts';
import { UsageError } from '../model/errors.ts';

/** Parses "K/N" (1 ≤ K ≤ N ≤ 100 000), or undefined when it is not. */
function parseSlice(text: string): { k: number; n: number } | undefined {
  const m = /^\s*(\d{1,6})\s*\/\s*(\d{1,6})\s*$/.exec(text);
  const k = m ? Number(m[1]) : NaN;
  const n = m ? Number(m[2]) : NaN;
  return !m || k < 1 || n < 1 || k > n || n > 100_000 ? undefined : { k, n };
}

/** Parses the `--shard` slice "K/N" (1 ≤ K ≤ N ≤ 100 000). */
export function parseShardSlice(text: string): { k: number; n: number } {
  const s = parseSlice(text);
  if (!s) throw ShardSliceInvalid({ text }, { key: '--shard' });
  return s;
}

/** Parses the `--tile` merge slice "K/N". */
export function parseMergeSlice(text: string): { k: number; n: number } {
  const s = parseSlice(text);
  if (!s) throw MergeSliceInvalid({ text }, { key: '--tile' });
  return s;
}

interface BuildOpts {
  config: string;
  out?: string;
  jobs?: string;
  memory?: string;
  dataOnly?: boolean;
  quiet?: boolean;
  shard?: string;
  partials?: string;
  merge?: string;
  tile?: string;
  assemble?: string;
  cache?: string | boolean;
  maxMissingHours?: string;
}

export function register(program: Command): void {
  program
    .command('build')
    .description('build the atlas: read the inputs, compute WBGT and work figures, publish tables, layers and the site')
    .option('--config <file>', 'atlas configuration', 'content/atlas.yaml')
    .option('--out <dir>', "output folder (default: the configuration's `output`)")
    .option('--jobs <n>', 'worker threads (default: all cores)')
    .option(
      '--memory <size>',
      "memory the build may use, e.g. 4G (default: the configuration's `memory`, else 3G); the build cuts its work to fit and says what it chose",
    )
    .option('--data-only', 'publish the data files into OUT/data without building the site')
    .option('--shard <K/N>', 'distributed run: compute slice K of N of the shards into --partials, publish nothing')
    .option('--partials <dir>', 'folder (shared by all slices) where --shard writes its partials')
    .option(
      '--merge <dir>',
      'distributed run: merge the partials under DIR (from every --shard K/N) and publish; with --tile, only merge one slice of the bands into DIR/bands',
    )
    .option('--tile <K/N>', 'distributed merge: merge slice K of N of the blocks of grid rows into DIR/bands (with --merge DIR), publish nothing')
    .option('--assemble <dir>', 'distributed run: join the merged bands under DIR/bands (from every --merge DIR --tile K/N) and publish')
    .option('--cache <dir>', "partial cache folder (default: the configuration's `cache`, else .heathours-cache beside the output)")
    .option('--no-cache', 'compute every shard and keep no partials')
    .option('--max-missing-hours <n>', 'completeness rule of the coverage check: a built year may miss up to N hours per variable (default 0: every hour)')
    .option('--quiet', 'no progress output')
    .action(async (opts: BuildOpts) => {
      let maxMissingHours: number | undefined;
      if (opts.maxMissingHours !== undefined) {
        maxMissingHours = Number(opts.maxMissingHours);
        if (!/^\d{1,5}$/.test(opts.maxMissingHours.trim()) || maxMissingHours > 8784) {
          throw UsageError({
            message: `--max-missing-hours ${opts.maxMissingHours} is not a whole number of hours from 0 to 8784`,
            hint: "e.g. --max-missing-hours 1 accepts a year whose last hour lies in next January's download",
          });
        }
      }
      let jobs: number | undefined;
      if (opts.jobs !== undefined) {
        jobs = Number(opts.jobs);
        if (!Number.isInteger(jobs) || jobs < 1 || jobs > 256) {
          throw UsageError({ message: `--jobs ${opts.jobs} is not a whole number from 1 to 256`, hint: 'pass the number of worker threads, e.g. --jobs 2' });
        }
      }
      if (opts.shard !== undefined && opts.merge !== undefined) {
        throw UsageError({
          message: '--shard and --merge are two steps of a distributed run, not one',
          hint: 'run every --shard K/N --partials DIR first, then one --merge DIR',
        });
      }
      if (opts.tile !== undefined && opts.merge === undefined) {
        throw UsageError({
          message: '--tile K/N slices a distributed merge and needs --merge DIR',
          hint: 'e.g. heathours build --merge /shared/partials --tile 2/4, then heathours build --assemble /shared/partials',
        });
      }
      if (opts.assemble !== undefined && (opts.shard !== undefined || opts.merge !== undefined)) {
        throw UsageError({
          message: '--assemble is the last step of a distributed run, after --shard and --merge --tile, not with them',
          hint: 'run heathours build --assemble DIR on its own, once every merge task is done',
        });
      }
      if ((opts.shard === undefined) !== (opts.partials === undefined)) {
        throw UsageError({
          message: '--shard K/N needs --partials DIR, and --partials needs --shard',
          hint: 'e.g. heathours build --shard 3/8 --partials /shared/partials',
        });
      }
      const shard = opts.shard !== undefined ? { ...parseShardSlice(opts.shard), partialsDir: opts.partials! } : undefined;
      const { buildAtlas } = await import('../run/build-atlas.ts');
      await buildAtlas({
        configPath: opts.config,
        outDir: opts.out,
        jobs,
        memory: opts.memory,
        quiet: opts.quiet,
        dataOnly: opts.dataOnly,
        shard,
        mergeDir: opts.merge,
        mergeSlice: opts.tile !== undefined ? parseMergeSlice(opts.tile) : undefined,
        assembleDir: opts.assemble,
        cache: opts.cache === false ? false : typeof opts.cache === 'string' ? opts.cache : undefined,
        maxMissingHours,
      });
    });
}
