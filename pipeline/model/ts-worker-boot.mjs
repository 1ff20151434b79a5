// Generic worker entry: registers the TypeScript loader in this thread, then imports the worker
// module named in workerData.entry (a file URL). Node 20 does not apply an `--import tsx`
// execArgv to a .ts worker entry, so every TypeScript worker starts through this file.
import { workerData } from 'node:worker_threads';
import './preload-native.mjs';
import { register } from 'tsx/esm/api';

register();
await import(workerData.entry);
