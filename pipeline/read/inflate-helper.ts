/**
 * The helper thread that shares the chunks of NetCDF-4 slabs with the thread reading them
 * (hdf5-chunks.ts `claimChunks`, run in inflate-worker.ts; the slab's description, {@link SharedSlab}, is here): on a machine of two cores a reader
 * alone leaves one idle, and inflating is most of its work. One helper per process, started on
 * first use and used once it has said it is ready (a slab never waits for it to start); idle, it
 * does not keep the process alive. A helper that fails or exits is not started again: the reading
 * thread then does every chunk itself, and does again every chunk the helper left undone.
 */
import type { Worker } from 'node:worker_threads';
import { startWorker } from '../infra/worker-pool.ts';
import type { ChunkIndex } from './hdf5-layout.ts';

/**
 * A slab whose chunks two threads share (structured-clone safe: `out` and `ctrl` are views of
 * shared memory). Per listed chunk: its linear index, file offset [bytes], stored size [bytes]
 * and filter mask.
 */
export interface SharedSlab extends Pick<ChunkIndex, 'chunk' | 'grid' | 'elementBytes' | 'filters'> {
  /** The file's descriptor, open in this process (readable from any of its threads). */
  fd: number;
  /** Bytes of one chunk [bytes]. */
  chunkBytes: number;
  off: number[];
  cnt: number[];
  /** The slab's dense bytes, on a SharedArrayBuffer. */
  out: Uint8Array;
  lins: Float64Array;
  at: Float64Array;
  size: Float64Array;
  mask: Uint32Array;
  /** [0]: the next chunk to take; [1 + k]: chunk k's state (0 while not done). */
  ctrl: Int32Array;
}

/** What the helper posts: that it is ready, or that it has finished taking chunks of job `id` (`taken` of them). */
export type HelperMessage = { ready: true } | { id: number; taken: number };

interface Helper {
  w: Worker;
  ready: boolean;
  /** Resolves true once ready, false if it stopped first. */
  readyAnswer: Promise<boolean>;
  settle: (ok: boolean) => void;
  /** Jobs posted and not yet finished, by id. */
  pending: Map<number, () => void>;
}

let helper: Helper | undefined;
let stopped = false;
let nextId = 1;
/** Chunks the helper threads of this process have inflated. */
let chunksTaken = 0;

function start(): Helper {
  const w = startWorker('inflate');
  let settle: (ok: boolean) => void = () => undefined;
  const readyAnswer = new Promise<boolean>((resolve) => {
    settle = resolve;
  });
  const h: Helper = { w, ready: false, readyAnswer, settle, pending: new Map() };
  w.on('message', (m: HelperMessage) => {
    if ('ready' in m) {
      h.ready = true;
      h.settle(true);
      return;
    }
    chunksTaken += m.taken;
    const done = h.pending.get(m.id);
    h.pending.delete(m.id);
    done?.();
    if (h.pending.size === 0) w.unref();
  });
  const lost = () => {
    h.settle(false);
    if (helper !== h) return;
    stopped = true;
    helper = undefined;
    // Every job it held is finished as far as it goes: its undone chunks are done by the reader.
    for (const done of h.pending.values()) done();
    h.pending.clear();
  };
  w.on('error', lost);
  w.on('exit', lost);
  w.unref();
  return h;
}

/** Whether a helper is ready now; starts one (for later slabs) if none runs yet. */
export function helperReady(): boolean {
  if (stopped) return false;
  helper ??= start();
  return helper.ready;
}

/** Starts the helper if none runs and resolves whether it became ready (tests, benchmarks). */
export function inflateHelperReady(): Promise<boolean> {
  if (stopped) return Promise.resolve(false);
  const h = (helper ??= start());
  if (h.ready) return Promise.resolve(true);
  // Waiting for it keeps the process alive until it answers.
  h.w.ref();
  return h.readyAnswer.then((ok) => {
    if (ok && h.pending.size === 0) h.w.unref();
    return ok;
  });
}

/** Chunks inflated by helper threads in this process so far. */
export function helperChunksTaken(): number {
  return chunksTaken;
}

/**
 * Posts `job` to the helper, which takes chunks from its counter until none is left; resolves
 * when it has stopped taking them (at once when no helper is ready).
 */
export function runOnHelper(job: SharedSlab): Promise<void> {
  const h = helper;
  if (!h?.ready) return Promise.resolve();
  const id = nextId++;
  return new Promise<void>((resolve) => {
    h.pending.set(id, resolve);
    h.w.ref();
    h.w.postMessage({ id, job });
  });
}

/** Stops the helper (tests); a later slab starts another. */
export async function stopInflateHelper(): Promise<void> {
  const h = helper;
  helper = undefined;
  if (h) {
    h.settle(false);
    for (const done of h.pending.values()) done();
    h.pending.clear();
    await h.w.terminate();
  }
}
