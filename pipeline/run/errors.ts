/** Catalogued errors of the build orchestration. */
import { defineError } from '../model/errors.ts';

export const YearsOutsideData = defineError<{ key: string; first: number; last: number; dataFirst: string; dataLast: string }>({
  code: 'YearsOutsideData',
  title: 'Configured years are not covered by the input data',
  message: (p) => `${p.key} ${p.first}-${p.last} asks for years the data do not hold (the data run from ${p.dataFirst} to ${p.dataLast}, UTC)`,
  hint: () => 'add the missing years of input files (dataset.files), or narrow `years` / `baseline` in the configuration',
});

export const NoLandCells = defineError<{ detail: string }>({
  code: 'NoLandCells',
  title: 'No grid cell is left to compute',
  message: (p) => p.detail,
  hint: () => 'lower dataset.landSeaMask.threshold, or remove landSeaMask when the inputs are land-only (ERA5-Land)',
});

export const WorkloadClassesFileMissing = defineError<{ path: string }>({
  code: 'WorkloadClassesFileMissing',
  title: 'The workload-classes file does not exist',
  message: (p) => `no workload-classes file at ${p.path}`,
  hint: () => 'set work.classesFile (relative to the atlas configuration) or copy content/workload-classes.yaml beside it',
});

export const PartialsDuplicated = defineError<{ shardId: string; files: string[] }>({
  code: 'PartialsDuplicated',
  title: 'A shard has more than one partial',
  message: (p) => `shard ${p.shardId} is in ${p.files.length} partial files: ${p.files.join(', ')}`,
  hint: () => "the slices overlap (runs with different --shard N into one folder?): keep one run's slice-K-of-N folders and delete the others",
});

export const PartialsForeign = defineError<{ file: string; shardId: string; why: string }>({
  code: 'PartialsForeign',
  title: 'A partial was made from other inputs, settings or code',
  message: (p) => `${p.file} (shard ${p.shardId}) does not fit this build: ${p.why}`,
  hint: () => 'rerun its slice with the same configuration, input files and heathours version as the merge',
});

export const BuildLocked = defineError<{ outDir: string; pid: number }>({
  code: 'BuildLocked',
  title: 'Another build is writing the same output',
  message: (p) => `a heathours build (process ${p.pid}) is already writing ${p.outDir}`,
  hint: () => 'wait for it to finish, or build into another folder with --out; a lock left by a process that no longer runs is taken over by itself',
});

export const ShardSliceInvalid = defineError<{ text: string }>({
  code: 'ShardSliceInvalid',
  title: 'The --shard value is not K/N',
  message: (p) => `--shard "${p.text}" is not K/N with 1 ≤ K ≤ N (e.g. 3/8)`,
  hint: () => 'pass the slice as K/N, e.g. --shard 1/4 … --shard 4/4; with a Slurm array use --shard $((SLURM_ARRAY_TASK_ID))/N',
});

export const MemoryBudgetTooSmall = defineError<{ budget: number; need: number; what: string }>({
  code: 'MemoryBudgetTooSmall',
  title: 'The memory budget cannot hold one tile of the build',
  message: (p) =>
    `the memory budget of ${(p.budget / 1024 ** 2).toFixed(0)} MB is too small for ${p.what}: about ${(p.need / 1024 ** 2).toFixed(0)} MB are needed`,
  hint: () =>
    'give the build more memory (--memory or the config key `memory`, e.g. --memory 4G), use fewer workers (--jobs), make shard tiles smaller (shards.cellsPerTile) or pieces of years shorter (shards.monthsPerPiece: 1)',
});

export const MemoryBudgetInvalid = defineError<{ text: string }>({
  code: 'MemoryBudgetInvalid',
  title: 'The memory budget is not a size',
  message: (p) => `"${p.text}" is not a memory size`,
  hint: () => 'give a number with a unit: 4G, 4GB, 4 GiB, 2500M (binary units: 1 G = 1024³ bytes)',
});

export const DiskFull = defineError<{ path: string; what: string }>({
  code: 'DiskFull',
  title: 'The disk is full',
  message: (p) => `no space left on the device while ${p.what} (${p.path}); nothing was published and the previous output is untouched`,
  hint: () =>
    'free space on that disk or build elsewhere (--out, and --cache for the partials); `heathours build` prints the disk it expects to need before it starts',
});

export const BandsIncomplete = defineError<{ missing: number; blocks: number; first: string[]; dir: string }>({
  code: 'BandsIncomplete',
  title: 'Merged bands are missing',
  message: (p) =>
    `${p.missing} of the ${p.blocks} blocks of rows have no merged band under ${p.dir}: ${p.first.join(', ')}${p.missing > p.first.length ? ', …' : ''}`,
  hint: () =>
    'run every merge task (`heathours build --merge DIR --tile K/N` for K = 1 … N) to the end before `--assemble DIR`; a task that failed can be run again and keeps the bands it finished',
});

export const BandsDuplicated = defineError<{ block: string; bands: string[] }>({
  code: 'BandsDuplicated',
  title: 'Two merged bands hold the same rows',
  message: (p) => `the block of rows ${p.block} is in the bands ${p.bands.join(' and ')}`,
  hint: () =>
    "merge tasks of two different --tile K/N splits wrote into one folder: keep one run's bands (delete DIR/bands) and run the merge tasks of one N again",
});

export const BandsForeign = defineError<{ band: string; why: string }>({
  code: 'BandsForeign',
  title: 'A merged band belongs to another build',
  message: (p) => `band ${p.band} does not fit this build: ${p.why}`,
  hint: () => 'merge and assemble with the same configuration, input files, partials and heathours version; delete DIR/bands and run the merge tasks again',
});

export const MergeSliceInvalid = defineError<{ text: string }>({
  code: 'MergeSliceInvalid',
  title: 'The --tile value is not K/N',
  message: (p) => `--tile "${p.text}" is not K/N with 1 ≤ K ≤ N (e.g. 2/4)`,
  hint: () =>
    'pass the merge slice as K/N with --merge DIR, e.g. --merge /shared/partials --tile 1/4 … --tile 4/4; with a Slurm array use --tile "${SLURM_ARRAY_TASK_ID}/N"',
});

export const RegionWriteFailed = defineError<{ region: string; dataDir: string; detail: string }>({
  code: 'RegionWriteFailed',
  title: "A region's files could not be made",
  message: (p) => `region ${p.region}: its table, summary or calculator tile in ${p.dataDir} could not be made: ${p.detail}`,
  hint: () =>
    'the build stopped and published nothing; check the merged band files of the build and the free space of the output folder, then run the build again',
});
