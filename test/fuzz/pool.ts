/**
 * Runs fuzz tasks on worker threads (worker.ts), one mutant at a time per worker, each under a
 * time limit: a worker that does not answer in time is terminated (the mutant counts as a hang)
 * and replaced, and so is one that dies (a crash). Mutants run in-process in the worker, so a
 * run costs no process start per mutant.
 */
import { Worker } from 'node:worker_threads';
import type { FuzzTask, WorkerSetup } from './worker.ts';
import type { Outcome, StepResult } from './outcome.ts';

export interface TaskResult extends FuzzTask {
  outcome: Outcome;
  steps: StepResult[];
  /** Wall time of the mutant [ms]. */
  ms: number;
  /** The mutant's file (kept when the outcome is a defect). */
  path: string;
  recipe: string[];
}

export interface PoolOptions {
  workers: number;
  /** Time limit per mutant [ms]. */
  timeoutMs: number;
  setup: WorkerSetup;
  onResult?: (r: TaskResult) => void;
  /** No task is started after this time [ms since the epoch]; the tasks not run are left out. */
  deadline?: number;
  /** Called each time a worker thread is started (the first ones and every replacement). */
  onWorkerStart?: () => void;
}

const BOOT = new URL('../../pipeline/infra/ts-boot.mjs', import.meta.url);
const ENTRY = new URL('./worker.ts', import.meta.url);

/**
 * Runs every task (or, with a deadline, those started before it); resolves with one result per
 * task run, in task order.
 */
export async function runFuzzPool(tasks: readonly FuzzTask[], o: PoolOptions): Promise<TaskResult[]> {
  const results: TaskResult[] = new Array(tasks.length);
  let next = 0;
  const lane = async (): Promise<void> => {
    let w: Worker | undefined;
    let ready: Promise<void> | undefined;
    const start = () => {
      o.onWorkerStart?.();
      w = new Worker(BOOT, { workerData: { tsEntry: ENTRY.href }, resourceLimits: { maxOldGenerationSizeMb: 1536 } });
      const ww = w;
      ready = new Promise<void>((res, rej) => {
        const onMsg = (m: { ready?: boolean }) => {
          if (m.ready) {
            ww.off('message', onMsg);
            res();
          }
        };
        ww.on('message', onMsg);
        ww.once('error', rej);
      });
      ww.postMessage({ setup: o.setup });
    };
    try {
      while (next < tasks.length && (o.deadline === undefined || Date.now() < o.deadline)) {
        const i = next++;
        const task = tasks[i];
        if (!w) start();
        await ready;
        const ww = w!;
        const r = await new Promise<TaskResult>((resolve) => {
          let started: { path: string; recipe: string[] } = { path: '', recipe: [] };
          const t0 = performance.now();
          let timer: NodeJS.Timeout;
          const finish = (res: TaskResult, restart: boolean) => {
            clearTimeout(timer);
            ww.off('message', onMsg);
            ww.off('error', onError);
            ww.off('exit', onExit);
            if (restart) {
              void ww.terminate();
              w = undefined;
            }
            resolve(res);
          };
          const fail = (outcome: Outcome, message: string) =>
            finish(
              { ...task, outcome, steps: [{ step: 'worker', outcome, message, ms: performance.now() - t0 }], ms: performance.now() - t0, ...started },
              true,
            );
          const onMsg = (m: { started?: { path: string; recipe: string[] }; done?: TaskResult; restart?: boolean; failed?: string }) => {
            if (m.started) {
              started = { path: m.started.path, recipe: m.started.recipe };
              timer = setTimeout(() => fail('hang', `no answer within ${o.timeoutMs} ms`), o.timeoutMs);
            } else if (m.done) finish(m.done, m.restart === true);
            else if (m.failed) fail('crash', `the fuzz worker failed: ${m.failed}`);
          };
          const onError = (e: Error) => fail('crash', `the worker thread died: ${e?.stack ?? e}`);
          const onExit = (code: number) => fail('crash', `the worker thread exited with code ${code}`);
          ww.on('message', onMsg);
          ww.on('error', onError);
          ww.on('exit', onExit);
          ww.postMessage({ task });
        });
        results[i] = r;
        o.onResult?.(r);
      }
    } finally {
      if (w) await w.terminate();
    }
  };
  await Promise.all(Array.from({ length: Math.max(1, o.workers) }, lane));
  return results.filter((r) => r !== undefined);
}
