/**
 * A lock between processes on one machine: a folder created atomically with `mkdir`, holding the
 * owner's pid. A lock whose owner process no longer exists is stale and taken over. Used where
 * two runs must not overlap (Astro writes its `.astro/` folder in the project root).
 */
import { mkdir, readFile, rm, writeFile } from 'node:fs/promises';
import { join } from 'node:path';

/** Whether process `pid` runs on this machine (signal 0; EPERM means it runs as another user). */
export function processAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (e) {
    return (e as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/**
 * Runs `work` holding the lock folder `lockDir`; waits (polling every 200 ms) while another live
 * process holds it, calling `onWait` once. Throws after `timeoutMs`.
 */
export async function withProcessLock<T>(
  lockDir: string,
  work: () => Promise<T>,
  opts: { timeoutMs?: number; onWait?: (ownerPid: number) => void } = {},
): Promise<T> {
  const deadline = Date.now() + (opts.timeoutMs ?? 30 * 60_000);
  let told = false;
  for (;;) {
    try {
      await mkdir(lockDir);
      await writeFile(join(lockDir, 'pid'), String(process.pid));
      break;
    } catch (e) {
      if ((e as NodeJS.ErrnoException).code !== 'EEXIST') throw e;
      const owner = Number(await readFile(join(lockDir, 'pid'), 'utf8').catch(() => 'NaN'));
      if (Number.isInteger(owner) && !processAlive(owner)) {
        await rm(lockDir, { recursive: true, force: true });
        continue;
      }
      if (!told && opts.onWait) {
        opts.onWait(owner);
        told = true;
      }
      if (Date.now() > deadline) throw new Error(`timed out waiting for the lock ${lockDir} (held by pid ${owner})`);
      await new Promise((r) => setTimeout(r, 200));
    }
  }
  try {
    return await work();
  } finally {
    await rm(lockDir, { recursive: true, force: true });
  }
}
