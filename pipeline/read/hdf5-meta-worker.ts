/**
 * The NetCDF-4 metadata worker (started by hdf5-meta.ts): describes files (hdf5-describe.ts) and
 * reads their text variables, each request on a fresh open of the file, answering with plain
 * data or with what went wrong and what HDF5 printed about it. It runs apart from the thread
 * that asked, which stops it when a request takes too long (HDF5 can loop for ever on a damaged
 * global heap) and starts another when HDF5 aborts.
 */
import { parentPort } from 'node:worker_threads';
import h5wasm from 'h5wasm/node';
import { describeHdf5, readHdf5Strings } from './hdf5-describe.ts';
import { hdf5Reason, isAbort, quietly } from './hdf5-quiet.ts';
import { guardedReads } from './hdf5-heap-check.ts';

export type MetaQuery = { op: 'describe'; path: string } | { op: 'strings'; path: string; variable: string; shape: number[] };
/** `heapCheck: false` leaves global heap collections unchecked (hdf5-heap-check.ts; tests only). */
export type MetaRequest = MetaQuery & { id: number; heapCheck?: boolean };
export type MetaAnswer = { id: number; ok: true; result: unknown } | { id: number; ok: false; reason: string; printed: string; stopped: boolean };

await h5wasm.ready;
const classes = { Group: h5wasm.Group, Dataset: h5wasm.Dataset };

function work(req: MetaRequest): unknown {
  const f = new h5wasm.File(req.path, 'r');
  try {
    return req.op === 'describe' ? describeHdf5(f, classes) : readHdf5Strings(f, req.variable, classes, req.shape);
  } finally {
    try {
      f.close();
    } catch {
      // closing a damaged file can fail too; the answer is already made
    }
  }
}

parentPort!.on('message', (req: MetaRequest) => {
  // Every read HDF5 makes is checked for global heap collections it would loop on (refused as an
  // I/O error, the reason kept here).
  let refused: string | undefined;
  const r = quietly(() => {
    if (req.heapCheck === false) return work(req);
    const g = guardedReads(req.path, () => work(req));
    refused = g.refused;
    if ('error' in g) throw g.error;
    // A refused collection is damage even where the description went on without it.
    if (refused !== undefined) throw new Error(refused);
    return g.value;
  });
  const stopped = r.error !== undefined && isAbort(r.error);
  const answer: MetaAnswer =
    r.error === undefined
      ? { id: req.id, ok: true, result: r.value }
      : { id: req.id, ok: false, reason: refused ?? hdf5Reason(r.error, r.printed), printed: r.printed, stopped };
  parentPort!.postMessage(answer);
  // An aborted WebAssembly instance cannot be used again: end, and the next request starts a new worker.
  if (stopped) process.exit(0);
});
parentPort!.postMessage({ ready: true });
