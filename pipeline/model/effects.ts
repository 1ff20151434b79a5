/**
 * The I/O the pipeline does, in one place, so that writes are atomic (temporary path, then
 * rename) and nothing half-written is ever left where a reader would take it for output.
 */
import { mkdir, rename, rm, writeFile } from 'node:fs/promises';
import { existsSync, mkdirSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { dirname, join, basename } from 'node:path';
import { randomBytes } from 'node:crypto';

/** A temporary sibling path of `path`, unique to this process and call. */
export function temporarySibling(path: string): string {
  return join(dirname(path), `.${basename(path)}.${process.pid}.${randomBytes(4).toString('hex')}.tmp`);
}

/** Writes `data` to `path` atomically: to a temporary sibling first, then renames it into place. */
export async function writeFileAtomic(path: string, data: string | Uint8Array): Promise<void> {
  await mkdir(dirname(path), { recursive: true });
  const tmp = temporarySibling(path);
  try {
    await writeFile(tmp, data);
    await rename(tmp, path);
  } catch (e) {
    await rm(tmp, { force: true });
    throw e;
  }
}

/**
 * Writes `data` to `path` atomically and synchronously (for workers and caches that write between
 * computations): to a temporary sibling first, then renamed into place; the temporary file is
 * removed when anything fails. Returns the bytes written [B].
 */
export function writeFileAtomicSync(path: string, data: string | Uint8Array): number {
  mkdirSync(dirname(path), { recursive: true });
  const tmp = temporarySibling(path);
  try {
    writeFileSync(tmp, data);
    renameSync(tmp, path);
  } catch (e) {
    rmSync(tmp, { force: true });
    throw e;
  }
  return typeof data === 'string' ? Buffer.byteLength(data) : data.byteLength;
}

/**
 * Builds a whole folder atomically: `fill` writes into a fresh temporary sibling of `dir`; on
 * success the old `dir` is replaced by it, on failure the temporary folder is removed and `dir`
 * is left as it was.
 */
export async function replaceDirAtomic(dir: string, fill: (tmpDir: string) => Promise<void>): Promise<void> {
  const tmp = temporarySibling(dir);
  await mkdir(tmp, { recursive: true });
  try {
    await fill(tmp);
  } catch (e) {
    await rm(tmp, { recursive: true, force: true });
    throw e;
  }
  const old = existsSync(dir) ? temporarySibling(dir) : undefined;
  if (old) await rename(dir, old);
  await rename(tmp, dir);
  if (old) await rm(old, { recursive: true, force: true });
}

/** Log lines of long work; quiet in tests. */
export interface Logger {
  info(msg: string): void;
  warn(msg: string): void;
}

export const consoleLogger: Logger = {
  info: (m) => process.stderr.write(`${m}\n`),
  warn: (m) => process.stderr.write(`warning: ${m}\n`),
};

export const silentLogger: Logger = { info: () => {}, warn: () => {} };
