/**
 * sha256OfFile (pipeline/model/file-sha256.ts) reads files in 1 MB pieces into buffers it keeps
 * for the next file. Checked against GNU coreutils `sha256sum` (an outside implementation): an
 * empty file, one of exactly one piece, one of three pieces and a few bytes, and eight files of
 * different contents hashed at the same time (each must get its own buffer).
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { sha256OfFile } from '../../pipeline/model/file-sha256.ts';

const dir = mkdtempSync(join(tmpdir(), 'heathours-sha256-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const sha256sum = (path: string) => execFileSync('sha256sum', [path], { encoding: 'utf8' }).split(' ')[0];

/** A file of `n` bytes of a pattern seeded by `seed`. */
function file(name: string, n: number, seed: number): string {
  const b = Buffer.alloc(n);
  for (let i = 0; i < n; i++) b[i] = (i * 31 + seed * 17 + (i >> 11)) & 255;
  const path = join(dir, name);
  writeFileSync(path, b);
  return path;
}

describe('sha256OfFile', () => {
  it('equals sha256sum for an empty file, one piece exactly, and three pieces and 7 bytes', async () => {
    for (const [name, n] of [
      ['empty', 0],
      ['one-piece', 1 << 20],
      ['three-pieces', 3 * (1 << 20) + 7],
    ] as const) {
      const path = file(name, n, n % 251);
      expect(await sha256OfFile(path), name).toBe(sha256sum(path));
    }
  });

  it('hashes eight files at the same time, each equal to sha256sum (no buffer shared between them)', async () => {
    const paths = Array.from({ length: 8 }, (_, k) => file(`f${k}`, (1 << 20) + 1000 * k + 1, k + 1));
    const got = await Promise.all(paths.map((p) => sha256OfFile(p)));
    expect(got).toEqual(paths.map(sha256sum));
  });
});
