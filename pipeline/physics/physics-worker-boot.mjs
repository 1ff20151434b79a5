// Worker entry: registers the TypeScript loader in this thread, then loads the worker proper.
// (Node 20 does not apply an `--import tsx` execArgv to a .ts worker entry itself.)
import '../model/preload-native.mjs';
import { register } from 'tsx/esm/api';

register();
await import('./physics-worker.ts');
