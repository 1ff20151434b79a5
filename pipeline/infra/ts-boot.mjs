// The one way the TypeScript sources start outside vitest (Node 20 cannot run .ts files itself):
// bin/heathours-ts.mjs, the benchmark child processes and, under the sources, every worker thread
// (pipeline/infra/worker-pool.ts). The shipped command runs the compiled bundle instead and never
// loads this file.
//
// 1. h5wasm is loaded before tsx's hooks: under them the 4 MB module (it embeds its wasm binary)
//    costs about 600 MB of memory in the loader thread; loaded first, about 60 MB, and later
//    imports of it reuse the loaded module.
// 2. tsx's ESM loader is registered for this thread (an `--import tsx` of the parent is not
//    applied to a worker's .ts entry on Node 20).
// 3. In a worker thread started by worker-pool.ts, the module named in workerData.tsEntry runs.
import { isMainThread, workerData } from 'node:worker_threads';

await import('h5wasm/node');
const { register } = await import('tsx/esm/api');
register();
if (!isMainThread && workerData?.tsEntry) await import(workerData.tsEntry);
