/**
 * The worker's half of the pool (./worker-pool.ts): a worker entry calls {@link serveTasks} once
 * with what it does on set-up and per task. Tasks are handled one after another in the order they
 * came (the pool may send the next one before this one is done), each answered by its value, or
 * by an error that keeps a catalogued error's code, message and hint.
 */
import { parentPort, type Transferable } from 'node:worker_threads';
import { HeathoursError, type ErrorWhere } from '../model/errors.ts';

/** An error crossing from a worker to the pool. */
export interface WorkerFailure {
  catalogued: boolean;
  code?: string;
  title?: string;
  message: string;
  hint?: string;
  where?: ErrorWhere;
  /** Text kept for `--verbose` (e.g. the HDF5 library's diagnostics). */
  details?: string;
}

/** Messages from a worker to the pool. */
export type FromWorker<R> = { ready: true } | { id: number; value: R } | { id: number; progress: number } | { id?: number; error: WorkerFailure };

/** What a worker entry does. */
export interface TaskHandler<I, T, R> {
  /** The pool's set-up message (sent once, before any task); answered by `ready` when done. */
  init?(data: I): void | Promise<void>;
  /** One task; `progress(n)` reports n more units done. */
  run(task: T, progress: (n: number) => void): R | Promise<R>;
  /** Buffers of the value to transfer rather than copy (they become unusable here). */
  transfer?(value: R): Transferable[];
}

function failure(e: unknown): WorkerFailure {
  if (e instanceof HeathoursError)
    return { catalogued: true, code: e.code, title: e.title, message: e.message, hint: e.hint, where: e.where, details: e.details };
  return { catalogued: false, message: (e as Error)?.stack ?? String(e) };
}

/** Serves the pool's messages in this worker thread. */
export function serveTasks<I, T, R>(handler: TaskHandler<I, T, R>): void {
  const port = parentPort;
  if (!port) throw new Error('serveTasks runs in a worker thread started by pipeline/infra/worker-pool.ts');
  let chain: Promise<void> = Promise.resolve();
  port.on('message', (m: { init?: I; id?: number; task?: T }) => {
    chain = chain.then(async () => {
      try {
        if (m.init !== undefined) {
          await handler.init?.(m.init);
          port.postMessage({ ready: true } satisfies FromWorker<R>);
        } else if (m.id !== undefined) {
          const id = m.id;
          const value = await handler.run(m.task as T, (n) => port.postMessage({ id, progress: n } satisfies FromWorker<R>));
          port.postMessage({ id, value } satisfies FromWorker<R>, handler.transfer?.(value) ?? []);
        }
      } catch (e) {
        port.postMessage({ id: m.id, error: failure(e) } satisfies FromWorker<R>);
      }
    });
  });
}
