/**
 * SHA-256 of the input files, which the manifest lists and the cache keys hold. Hashing reads
 * every byte (about 0.4–0.6 GB/s per core here: a 3.6 GB year of a 0.1° country grid takes 6–8 s),
 * so the files of a large dataset are hashed on worker threads, one file per task; small datasets
 * are hashed on this thread, where starting threads would cost more than it saves.
 */
import { statSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { runInWorkers } from '../infra/worker-pool.ts';

/** Below this many bytes in all, the files are hashed on this thread [B]. */
export const THREADED_DIGEST_BYTES = 256 * 1024 * 1024;

/**
 * SHA-256 (hex) of each plain file of `paths`, by path; paths that are not plain files (an
 * archive's members, `archive.zip!/member.nc`; Zarr store folders and URLs) are left to their reader. Uses up to `workers`
 * threads (default: the machine's cores) when the files hold at least `minBytes` (default
 * {@link THREADED_DIGEST_BYTES}) [B]; otherwise none, and the reader hashes them on this thread.
 */
export async function fileDigests(paths: readonly string[], opts: { workers?: number; minBytes?: number } = {}): Promise<Map<string, string>> {
  const workers = opts.workers ?? availableParallelism();
  const out = new Map<string, string>();
  const plain: string[] = [];
  let bytes = 0;
  for (const p of paths) {
    if (p.includes('!/') || /^[a-z][a-z0-9+.-]*:\/\//i.test(p)) continue; // archive members, URLs (Zarr stores)
    try {
      const st = statSync(p);
      if (!st.isFile()) continue; // a Zarr store folder: its reader digests its metadata
      plain.push(p);
      bytes += st.size;
    } catch {
      return out; // a file that cannot be read is reported by its reader, with the catalogued error
    }
  }
  if (plain.length < 2 || bytes < (opts.minBytes ?? THREADED_DIGEST_BYTES) || workers < 2) return out;
  await runInWorkers<string, string>('digest', plain, {
    size: Math.min(workers, plain.length),
    describe: (p) => `the SHA-256 of ${p}`,
    onResult: (p, hex) => void out.set(p, hex),
  });
  return out;
}
