/**
 * SHA-256 of a file [hex], read in pieces of {@link PIECE} bytes into buffers kept for the next
 * file: a large file is never held in memory, and a build hashing tens of thousands of files
 * (the manifest of 10,000 regions lists ~40,000) does not allocate a fresh buffer per file. On
 * this machine a fresh 1 MB buffer costs ~3 ms in page faults when first written, more than
 * reading and hashing a region table (the manifest step of 10,000 regions took 191 s with a
 * 1 MB read stream per file).
 */
import { createHash } from 'node:crypto';
import { open } from 'node:fs/promises';

/** Bytes read at a time [bytes]. */
const PIECE = 1 << 20;
/** Buffers free for the next file (one per file being hashed at the same time, at most {@link KEPT} kept). */
const free: Buffer[] = [];
const KEPT = 4;

export async function sha256OfFile(path: string): Promise<string> {
  const buf = free.pop() ?? Buffer.allocUnsafe(PIECE);
  const fh = await open(path, 'r');
  try {
    const h = createHash('sha256');
    for (let pos = 0; ; ) {
      const { bytesRead } = await fh.read(buf, 0, PIECE, pos);
      if (bytesRead === 0) break;
      h.update(buf.subarray(0, bytesRead));
      pos += bytesRead;
    }
    return h.digest('hex');
  } finally {
    await fh.close();
    if (free.length < KEPT) free.push(buf);
  }
}
