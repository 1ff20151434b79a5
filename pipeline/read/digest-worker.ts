/**
 * Worker entry `digest` (pipeline/infra/compiled.ts): the SHA-256 of one input file per task
 * (./file-digests.ts), so that the files of a large dataset are hashed side by side, one core each.
 */
import { serveTasks } from '../infra/worker-side.ts';
import { sha256File } from './dataset-file.ts';

serveTasks<undefined, string, string>({
  run: (path) => sha256File(path),
});
