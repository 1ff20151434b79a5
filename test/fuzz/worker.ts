/**
 * A fuzzing worker thread (started by pool.ts through pipeline/infra/ts-boot.mjs): makes
 * the mutants it is sent, writes each to a file, runs the format's steps (targets.ts) in this
 * thread and reports how each ended. Anything written to stdout or stderr while a mutant runs
 * (HDF5 diagnostics, stray logging) is captured and reported as noise. The mutant file (and the
 * table `point` wrote from it) is removed when every step ended well and kept (its path
 * reported) otherwise.
 */
import { parentPort } from 'node:worker_threads';
import fs, { rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { loadBase, type BasePaths } from './bases.ts';
import { makeMutant, type Base, type FormatId } from './mutate.ts';
import { classify, GOOD, worst, type StepResult } from './outcome.ts';
import { stepsFor, type Depth } from './targets.ts';
import { setHdf5MetadataTimeout } from '../../pipeline/read/hdf5-meta.ts';
import { hdf5StoppedIn } from '../../pipeline/read/hdf5-file.ts';
import { FUZZ_METADATA_TIMEOUT_MS } from './fuzz-limits.ts';

setHdf5MetadataTimeout(FUZZ_METADATA_TIMEOUT_MS);

export interface WorkerSetup {
  bases: BasePaths;
  /** How much of a NetCDF mutant the build step reads (targets.ts). */
  depth?: Depth;
  /** Folder for the mutant files. */
  workDir: string;
}

export interface FuzzTask {
  format: FormatId;
  seed: number;
  index: number;
}

let setup: WorkerSetup | undefined;
const loaded = new Map<FormatId, Base>();

let noise = '';
const capture = (stream: NodeJS.WriteStream) => {
  stream.write = ((chunk: string | Uint8Array, ...rest: unknown[]) => {
    noise += typeof chunk === 'string' ? chunk : Buffer.from(chunk).toString('utf8');
    const cb = rest.find((r) => typeof r === 'function') as (() => void) | undefined;
    cb?.();
    return true;
  }) as typeof stream.write;
};
capture(process.stdout);
capture(process.stderr);
// Native code compiled to WebAssembly (h5wasm's NODERAWFS) writes stdout and stderr straight to
// file descriptors 1 and 2 with fs.writeSync: count those too.
const writeSync = fs.writeSync;
fs.writeSync = ((fd: number, buffer: string | NodeJS.ArrayBufferView, ...rest: unknown[]) => {
  if (fd === 1 || fd === 2) {
    const text = typeof buffer === 'string' ? buffer : Buffer.from(buffer.buffer, buffer.byteOffset, buffer.byteLength).toString('utf8');
    const [offset, length] = rest as [number | undefined, number | undefined];
    noise += typeof buffer === 'string' ? text : text.slice(offset ?? 0, (offset ?? 0) + (length ?? text.length));
    return typeof buffer === 'string' ? Buffer.byteLength(buffer) : (length ?? buffer.byteLength);
  }
  return (writeSync as (...a: unknown[]) => number)(fd, buffer, ...rest);
}) as typeof fs.writeSync;

export function mutantPath(s: WorkerSetup, t: FuzzTask): string {
  const ext = t.format === 'point-csv' ? '.csv' : t.format === 'atlas-yaml' ? '.yaml' : '.nc';
  const name = `mutant-${t.format}-s${t.seed}-i${t.index}${ext}`;
  return t.format === 'atlas-yaml' ? join(s.bases.yamlDir, name) : join(s.workDir, name);
}

/**
 * Runs a NetCDF format's steps once on its undamaged base (untimed, before the first mutant of that
 * format in this thread): loading the readers (and HDF5's WebAssembly, its metadata worker) is
 * the thread's start-up, not a mutant's time; on a loaded machine it took 8.6 s, counted before
 * as the first NetCDF-4 mutant's (an empty file). regenerate.ts --run does the same.
 */
async function warmUp(format: FormatId): Promise<void> {
  const s = setup!;
  if (!format.startsWith('netcdf')) return; // text readers start in milliseconds (and `point` would write beside the base)
  for (const step of stepsFor(format, s.bases.base[format], s.bases, 'quick')) await step.run().catch(() => undefined);
  noise = '';
}

async function handle(t: FuzzTask): Promise<void> {
  const s = setup!;
  let base = loaded.get(t.format);
  if (!base) {
    base = loadBase(t.format, s.bases.base[t.format]);
    loaded.set(t.format, base);
    await warmUp(t.format);
  }
  const m = makeMutant(base, t.seed, t.index);
  const path = mutantPath(s, t);
  writeFileSync(path, m.bytes);
  parentPort!.postMessage({ started: { ...t, path, recipe: m.recipe, bytes: m.bytes.length } });
  const steps: StepResult[] = [];
  const t0 = performance.now();
  for (const step of stepsFor(t.format, path, s.bases, s.depth)) {
    noise = '';
    const ts = performance.now();
    let thrown: unknown;
    try {
      await step.run();
    } catch (e) {
      thrown = e ?? new Error('undefined was thrown');
    }
    const r: StepResult = { step: step.name, ...classify(thrown, path), ms: performance.now() - ts };
    if (noise.length > 0 && GOOD.has(r.outcome)) {
      r.outcome = 'noisy';
      r.message = `${r.message ? `${r.message}\n` : ''}printed to the terminal:\n${noise.split('\n').slice(0, 8).join('\n')}`;
    }
    steps.push(r);
  }
  const outcome = worst(steps.map((r) => r.outcome));
  if (GOOD.has(outcome)) {
    rmSync(path, { force: true });
    rmSync(`${path}.out.csv`, { force: true }); // what `point` wrote for a table it read
  }
  // After HDF5 aborted in this thread its instance is gone (the reader says so for every later
  // file): ask for a fresh worker, so later mutants are not judged by this one. An abort in the
  // reader's metadata worker does not count (the reader replaces that worker itself).
  const restart = hdf5StoppedIn() !== '';
  parentPort!.postMessage({ done: { ...t, path, recipe: m.recipe, outcome, steps, ms: performance.now() - t0 }, restart });
}

parentPort!.on('message', (msg: { setup?: WorkerSetup; task?: FuzzTask }) => {
  if (msg.setup) {
    setup = msg.setup;
    parentPort!.postMessage({ ready: true });
    return;
  }
  if (msg.task) {
    handle(msg.task).catch((e) => parentPort!.postMessage({ failed: String((e as Error)?.stack ?? e) }));
  }
});
