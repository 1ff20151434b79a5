/**
 * Asks the NetCDF-4 metadata worker (hdf5-meta-worker.ts) to describe a file or read a text
 * variable, under a time limit: HDF5 can loop for ever on a damaged global heap (where NetCDF-4
 * keeps DIMENSION_LIST and text), and a loop inside WebAssembly cannot be interrupted in the
 * thread that runs it. A request that takes too long stops the worker and ends in the catalogued
 * `NetcdfReadStuck`; the next request starts a new worker. One worker per thread, started on
 * first use, not keeping the process alive when idle.
 */
import { statSync } from 'node:fs';
import type { Worker } from 'node:worker_threads';
import { startWorker } from '../infra/worker-pool.ts';
import { NetcdfNotNetcdf4, NetcdfReadFailed, NetcdfReadStuck } from './errors.ts';
import type { Hdf5Description } from './hdf5-describe.ts';
import { describeHdf5Js, jsMetaOff } from './hdf5-js-describe.ts';
import type { MetaAnswer, MetaQuery } from './hdf5-meta-worker.ts';

/**
 * The reader's time limit of one metadata request [ms]: reading metadata takes milliseconds on
 * sound files (the demo's largest, 10 MB with 8 variables: 10–30 ms once the worker runs), so a
 * request still running after 10 s is HDF5 looping on damaged metadata.
 */
export const HDF5_METADATA_TIMEOUT_MS = 10_000;

let timeoutMs = HDF5_METADATA_TIMEOUT_MS;

/** Sets the time limit of a metadata request [ms] (the fuzz test lowers it; {@link HDF5_METADATA_TIMEOUT_MS} restores it). */
export function setHdf5MetadataTimeout(ms: number): void {
  timeoutMs = ms;
}

/** Whether the worker checks global heap collections before HDF5 parses them (hdf5-heap-check.ts). */
let heapCheck = true;

/**
 * Turns the global heap check off or on again: only for the test that shows the time limit
 * still ends a loop the check would have prevented.
 */
export function setHdf5HeapCheck(on: boolean): void {
  heapCheck = on;
}

let worker: { w: Worker; ready: Promise<void> } | undefined;
let nextId = 1;
/** Requests waiting for an answer; `'lost'` when their worker died on another request. */
const pending = new Map<number, (a: MetaAnswer | 'lost') => void>();

/** Metadata workers started in this process (tests: a file the JavaScript reader describes starts none). */
let started = 0;

/** How many metadata workers this process has started. */
export function hdf5MetadataWorkersStarted(): number {
  return started;
}

function start(): { w: Worker; ready: Promise<void> } {
  started++;
  const w = startWorker('hdf5-meta');
  const ready = new Promise<void>((resolve, reject) => {
    w.on('message', (m: MetaAnswer | { ready: true }) => {
      if ('ready' in m) return resolve();
      const done = pending.get(m.id);
      pending.delete(m.id);
      done?.(m);
    });
    w.on('error', (e: Error) => {
      reject(e);
      lost(w);
    });
    w.on('exit', () => lost(w));
  });
  // Idle, the worker does not keep the process alive (ask() holds it while a request waits).
  w.unref();
  return { w, ready };
}

/**
 * Ends every request still waiting on worker `w` (it died): each is asked again once on a new
 * worker (ask), since the request that stopped the worker has had its own answer already.
 */
function lost(w: Worker): void {
  if (worker?.w === w) worker = undefined;
  for (const [id, done] of pending) if (owner.get(id) === w) done('lost');
}

/** The worker each waiting request was sent to. */
const owner = new Map<number, Worker>();

/**
 * Starts the metadata worker now, if none runs, so that its start (~0.4 s: loading HDF5's
 * WebAssembly) overlaps the caller's own start instead of delaying the first NetCDF-4 file.
 * Idle, it does not keep the process alive.
 */
export function startHdf5Metadata(): void {
  worker ??= start();
}

/** Sends one request; the answer, `'timeout'`, or `'lost'` when the worker died meanwhile. */
async function send(req: MetaQuery): Promise<MetaAnswer | 'timeout' | 'lost'> {
  worker ??= start();
  const { w, ready } = worker;
  const id = nextId++;
  let timer: NodeJS.Timeout | undefined;
  w.ref();
  const answer = await new Promise<MetaAnswer | 'timeout' | 'lost'>((resolve, reject) => {
    pending.set(id, resolve);
    owner.set(id, w);
    // The limit runs from the request, not from the worker's start (seconds on a busy machine).
    ready.then(() => {
      timer = setTimeout(() => resolve('timeout'), timeoutMs);
      w.postMessage({ ...req, id, heapCheck });
    }, reject);
  }).finally(() => {
    clearTimeout(timer);
    pending.delete(id);
    owner.delete(id);
    if (![...owner.values()].includes(w)) w.unref();
  });
  if (answer === 'timeout') {
    if (worker?.w === w) worker = undefined;
    // Not awaited: a worker looping inside HDF5 takes seconds to end (2.3 s measured on a fuzz
    // mutant, more on a busy machine, as its WebAssembly memory is released); the caller has its
    // answer at the limit, and requests still waiting on this worker are asked again on a new one
    // when it exits (lost).
    w.terminate().catch(() => undefined);
  } else if (answer !== 'lost' && !answer.ok && answer.stopped && worker?.w === w) {
    // HDF5 aborted in the worker, which ends after this answer: the next request must not be
    // sent to it (it would be lost on its way out).
    worker = undefined;
  }
  return answer;
}

/**
 * Files on which a request ran out of time, by path, size and modification time: HDF5 loops on
 * damaged metadata that other requests about the same file reach too (a file whose description
 * reads may loop on the text of a variable, and the other way round), so any later request about
 * the same unchanged file fails at once instead of waiting for the limit again. The oldest are
 * forgotten beyond {@link STUCK_KEPT} (memory stays bounded).
 */
const stuck = new Map<string, { what: string; seconds: number }>();
const STUCK_KEPT = 256;

function stuckKey(req: MetaQuery): string | undefined {
  try {
    const st = statSync(req.path);
    return `${st.size}\0${st.mtimeMs}\0${req.path}`;
  } catch {
    return undefined; // gone: the worker's own open says why
  }
}

async function ask(req: MetaQuery, what: string): Promise<unknown> {
  const key = stuckKey(req);
  const before = key === undefined ? undefined : stuck.get(key);
  if (before !== undefined) throw NetcdfReadStuck({ path: req.path, what: before.what, seconds: before.seconds, again: true }, { file: req.path });
  let answer = await send(req);
  // The worker died on another request while this one waited: once more on a new worker.
  if (answer === 'lost') answer = await send(req);
  const where = req.op === 'strings' ? { file: req.path, variable: req.variable } : { file: req.path };
  if (answer === 'timeout') {
    const seconds = Math.round(timeoutMs / 100) / 10;
    if (key !== undefined) {
      stuck.set(key, { what, seconds });
      if (stuck.size > STUCK_KEPT) stuck.delete(stuck.keys().next().value as string);
    }
    throw NetcdfReadStuck({ path: req.path, what, seconds }, { file: req.path });
  }
  if (answer === 'lost') throw NetcdfReadFailed({ path: req.path, detail: `${what}: the metadata worker stopped twice while this file waited` }, where);
  if (!answer.ok) throw NetcdfReadFailed({ path: req.path, detail: `${what}: ${answer.reason}` }, where, answer.printed || undefined);
  return answer.result;
}

/** Why the last description of each file was left to the HDF5 library (tests and benchmarks; bounded like {@link stuck}). */
const declinedWhy = new Map<string, string>();

/** Why the JavaScript reader left the file at `path` to the HDF5 library when it was last described, or undefined when it described it. */
export function netcdf4MetadataFallback(path: string): string | undefined {
  return declinedWhy.get(path);
}

/**
 * Describes a NetCDF-4 file (dimensions, variables, attributes); refuses HDF5 that is not
 * NetCDF-4. The JavaScript reader (hdf5-js-describe.ts) tries first; the metadata worker, and so
 * HDF5's WebAssembly, starts only for a file it declines (or with HEATHOURS_NETCDF4_JSMETA=0).
 */
export async function describeNetcdf4(path: string): Promise<Hdf5Description> {
  let d: Hdf5Description | undefined;
  declinedWhy.delete(path);
  if (!jsMetaOff()) {
    let bytes: number | undefined;
    try {
      bytes = statSync(path).size;
    } catch {
      // gone: the worker's own open says why
    }
    const js = bytes === undefined ? { declined: 'the file could not be read' } : await describeHdf5Js(path, bytes);
    if ('declined' in js) {
      declinedWhy.set(path, js.declined);
      if (declinedWhy.size > STUCK_KEPT) declinedWhy.delete(declinedWhy.keys().next().value as string);
    } else d = js;
  } else declinedWhy.set(path, 'HEATHOURS_NETCDF4_JSMETA=0');
  d ??= (await ask({ op: 'describe', path }, 'reading the metadata')) as Hdf5Description;
  if (!d.netcdf) throw NetcdfNotNetcdf4({ path }, { file: path });
  return d;
}

/** Reads a text variable of a NetCDF-4 file, one string per outer index. */
export async function readNetcdf4Strings(path: string, variable: string, shape: number[]): Promise<string[]> {
  return (await ask({ op: 'strings', path, variable, shape }, `reading the text of variable ${variable}`)) as string[];
}
