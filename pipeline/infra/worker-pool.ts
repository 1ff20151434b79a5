/**
 * The one pool of worker threads. Every worker runs one of the entries of {@link WORKER_ENTRIES}
 * and serves tasks with {@link serveTasks} (./worker-side.ts): the pool sends each worker an
 * optional set-up message, then tasks; a worker answers each task with a value (transferred, not
 * copied, where it says so), progress counts while it works, or an error. Used by the shard pool
 * (pipeline/run/shard-pool.ts), the physics pool of the benchmarks (pipeline/run/physics-pool.ts)
 * and the demo's year writers (pipeline/demo/index.ts).
 *
 * One boot mechanism: from the compiled bundle a worker runs `compiled/workers/<name>.js`; from
 * the TypeScript sources it runs ./ts-boot.mjs, which registers tsx and imports the `.ts` entry.
 */
import { Worker } from 'node:worker_threads';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { HeathoursError } from '../model/errors.ts';
import { PACKAGE_ROOT } from '../model/package-root.ts';
import { COMPILED_DIR, RUNNING_COMPILED, WORKER_ENTRIES, type WorkerName } from './compiled.ts';
import type { FromWorker, WorkerFailure } from './worker-side.ts';

/** Starts one worker thread running the entry `name`, compiled or from the sources like its parent. */
export function startWorker(name: WorkerName): Worker {
  if (RUNNING_COMPILED) return new Worker(pathToFileURL(join(COMPILED_DIR, 'workers', `${name}.js`)));
  const tsEntry = pathToFileURL(join(PACKAGE_ROOT, 'pipeline', `${WORKER_ENTRIES[name]}.ts`)).href;
  return new Worker(new URL('./ts-boot.mjs', import.meta.url), { workerData: { tsEntry } });
}

/** A catalogued error stays catalogued across the thread boundary; anything else names the task. */
function toError(f: WorkerFailure, what: string): Error {
  if (f.catalogued) return new HeathoursError(f.code!, f.title!, f.message, f.hint!, f.where ?? {}, f.details);
  return new Error(`${what} failed in a worker: ${f.message}`);
}

/** How one {@link WorkerPool.run} hands out tasks and takes results. */
export interface RunOptions<T, R> {
  /** Called with each task's value as it arrives (in the main thread); a throw stops the run. */
  onResult?: (task: T, value: R, index: number) => void;
  /** Called with the counts a worker reports while it works on a task. */
  onProgress?: (task: T, n: number) => void;
  /**
   * Tasks a worker may hold at once, given how many are still queued and the pool's size;
   * default 1. More than one lets a worker start its next task while the main thread is busy.
   */
  depth?: (queued: number, workers: number) => number;
  /** Abort: no task is handed out or reported after it, and the run rejects with the reason. */
  signal?: AbortSignal;
  /**
   * On a failure: `terminate` (default) stops at once; `drain` hands out no new task but lets
   * the running ones finish first (for tasks that must not be killed half-way, e.g. file writers).
   */
  onFailure?: 'terminate' | 'drain';
}

/** Worker threads serving the tasks of one entry. */
export interface WorkerPool<T, R> {
  readonly size: number;
  /** Resolves when every worker has taken its set-up (at once without one); rejects if one failed. */
  ready(): Promise<void>;
  /** Runs the tasks, each once, on the pool's workers; resolves when all are done. One run at a time. */
  run(tasks: readonly T[], opts?: RunOptions<T, R>): Promise<void>;
  /** Stops the workers. */
  close(): Promise<void>;
}

interface Run<T, R> {
  tasks: readonly T[];
  opts: RunOptions<T, R>;
  queue: number[];
  inFlight: number[];
  failure?: unknown;
  settle(error?: unknown): void;
}

/**
 * Starts `size` workers of entry `name`, each sent `init` first (when given); `describe` names a
 * task in the message of an uncatalogued worker error (default: "task N"). `init` may be a
 * promise: the workers start (load their code) at once and are sent the set-up when it resolves,
 * so a caller can start them before it knows what they need; tasks wait for the set-up, and a
 * rejected set-up breaks the pool with that reason.
 */
export function startWorkerPool<T, R>(name: WorkerName, opts: { size: number; init?: unknown; describe?: (task: T) => string }): WorkerPool<T, R> {
  const size = Math.max(1, Math.floor(opts.size));
  const describe = opts.describe ?? ((_t: T) => `a ${name} task`);
  const workers = Array.from({ length: size }, () => startWorker(name));
  let broken: unknown;
  let closing = false;
  let current: Run<T, R> | undefined;
  let readyCount = opts.init === undefined ? size : 0;
  /** Resolves once the set-up has been posted to every worker (tasks are posted after it). */
  let initPosted: Promise<void> = Promise.resolve();
  let readyWaiters: Array<[() => void, (e: unknown) => void]> = [];
  const flushReady = () => {
    if (broken === undefined && readyCount < size) return;
    for (const [ok, fail] of readyWaiters) broken === undefined ? ok() : fail(broken);
    readyWaiters = [];
  };

  const fail = (e: unknown) => {
    if (closing) return;
    broken ??= e;
    flushReady();
    if (current) fail1(current, e);
  };

  /** Records a run's first failure; with `drain`, the run ends once nothing is in flight. */
  const fail1 = (run: Run<T, R>, e: unknown) => {
    run.failure ??= e;
    run.queue.length = 0;
    if (run.opts.onFailure === 'drain' && broken === undefined && run.inFlight.some((n) => n > 0)) return;
    // Tasks still in flight would answer into the next run: a pool whose run failed takes no other.
    if (run.inFlight.some((n) => n > 0)) broken ??= run.failure;
    run.settle(run.failure);
  };

  const feed = (run: Run<T, R>, k: number) => {
    const depth = run.opts.depth ? run.opts.depth(run.queue.length, size) : 1;
    while (run.failure === undefined && run.inFlight[k] < depth && run.queue.length > 0) {
      const index = run.queue.shift()!;
      run.inFlight[k] += 1;
      workers[k].postMessage({ id: index, task: run.tasks[index] });
    }
  };

  const finishIfIdle = (run: Run<T, R>) => {
    if (run.inFlight.some((n) => n > 0) || run.queue.length > 0) return;
    run.settle(run.failure);
  };

  workers.forEach((w, k) => {
    w.on('message', (m: FromWorker<R>) => {
      if ('ready' in m) {
        readyCount += 1;
        flushReady();
        return;
      }
      const run = current;
      if ('error' in m) {
        const task = m.id !== undefined && run ? run.tasks[m.id] : undefined;
        const err = toError(m.error, task !== undefined ? describe(task) : `a ${name} worker's start-up`);
        if (m.id === undefined || !run) return fail(err);
        run.inFlight[k] -= 1;
        fail1(run, err);
        if (run.failure !== undefined) finishIfIdle(run);
        return;
      }
      if (!run || m.id === undefined) return;
      if (run.opts.signal?.aborted) return;
      const task = run.tasks[m.id];
      if ('progress' in m) {
        run.opts.onProgress?.(task, m.progress);
        return;
      }
      run.inFlight[k] -= 1;
      // The worker gets its next task first: the main thread's work on this result then
      // overlaps the worker's computing.
      feed(run, k);
      if (run.failure === undefined) {
        try {
          run.opts.onResult?.(task, m.value, m.id);
        } catch (e) {
          fail1(run, e);
        }
      }
      finishIfIdle(run);
    });
    w.on('error', (e) => fail(e));
    w.on('exit', (code) => {
      if (code !== 0) fail(new Error(`a ${name} worker exited with code ${code}`));
    });
  });
  if (opts.init instanceof Promise) {
    initPosted = opts.init.then(
      (data: unknown) => {
        if (!closing) for (const w of workers) w.postMessage({ init: data });
      },
      (e: unknown) => {
        fail(e);
      },
    );
  } else if (opts.init !== undefined) {
    for (const w of workers) w.postMessage({ init: opts.init });
  }

  return {
    size,
    ready: () =>
      new Promise<void>((ok, no) => {
        readyWaiters.push([ok, no]);
        flushReady();
      }),
    async run(tasks, runOpts = {}) {
      if (current) throw new Error(`the ${name} pool is already running`);
      await initPosted;
      if (current) throw new Error(`the ${name} pool is already running`);
      if (broken !== undefined) throw broken;
      if (tasks.length === 0) return;
      return new Promise<void>((resolve, reject) => {
        const run: Run<T, R> = {
          tasks,
          opts: runOpts,
          queue: tasks.map((_, i) => i),
          inFlight: workers.map(() => 0),
          settle(error) {
            if (current !== run) return;
            current = undefined;
            if (error !== undefined) reject(error);
            else resolve();
          },
        };
        current = run;
        const signal = runOpts.signal;
        if (signal) {
          if (signal.aborted) return fail1(run, signal.reason);
          signal.addEventListener('abort', () => fail1(run, signal.reason), { once: true });
        }
        for (let k = 0; k < size; k++) feed(run, k);
      });
    },
    async close() {
      closing = true;
      await Promise.all(workers.map((w) => w.terminate()));
    },
  };
}

/** Starts a pool, runs the tasks on it and stops it, whatever happens. */
export async function runInWorkers<T, R>(
  name: WorkerName,
  tasks: readonly T[],
  opts: RunOptions<T, R> & { size: number; init?: unknown; describe?: (task: T) => string },
): Promise<void> {
  if (tasks.length === 0) return;
  const pool = startWorkerPool<T, R>(name, { size: Math.min(opts.size, tasks.length), init: opts.init, describe: opts.describe });
  try {
    await pool.run(tasks, opts);
  } finally {
    await pool.close();
  }
}
