/**
 * The helper thread of inflate-helper.ts: takes chunks of each slab it is given from the slab's
 * shared counter (hdf5-chunks.ts `claimChunks`) until none is left, then says so.
 */
import { parentPort } from 'node:worker_threads';
import { claimChunks } from './hdf5-chunks.ts';
import type { HelperMessage, SharedSlab } from './inflate-helper.ts';

const port = parentPort!;
port.on('message', (m: { id: number; job: SharedSlab }) => {
  const taken = claimChunks(m.job);
  port.postMessage({ id: m.id, taken } satisfies HelperMessage);
});
port.postMessage({ ready: true } satisfies HelperMessage);
