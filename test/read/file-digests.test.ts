/**
 * The input files' SHA-256 hashed side by side on worker threads equal coreutils' `sha256sum`
 * (GNU coreutils, an outside implementation) of the same files.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileDigests } from '../../pipeline/read/file-digests.ts';

const dir = mkdtempSync(join(tmpdir(), 'hh-digests-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('input file digests', () => {
  const files = [0, 1, 2].map((i) => {
    const p = join(dir, `f${i}.nc`);
    const b = Buffer.alloc(3_000_000 + i * 7919);
    for (let k = 0; k < b.length; k++) b[k] = (k * 31 + i * 17) & 255;
    writeFileSync(p, b);
    return p;
  });

  it('hashes each file on a worker thread to the SHA-256 sha256sum gives', async () => {
    const got = await fileDigests(files, { workers: 2, minBytes: 0 });
    const want = execFileSync('sha256sum', files, { encoding: 'utf8' })
      .trim()
      .split('\n')
      .map((l) => l.split(/\s+/)[0]);
    expect(files.map((f) => got.get(f))).toEqual(want);
  });

  it('leaves small datasets and archive members to the reader (no threads started for them)', async () => {
    expect((await fileDigests(files, { workers: 2 })).size).toBe(0);
    expect((await fileDigests([`${files[0]}.zip!/member.nc`, files[1]], { workers: 2, minBytes: 0 })).size).toBe(0);
    // A Zarr store's folder and a store's URL beside the files: only the files are hashed here.
    const got = await fileDigests([dir, 'https://example.invalid/era5.zarr', ...files], { workers: 2, minBytes: 0 });
    expect([...got.keys()]).toEqual(expect.arrayContaining(files));
    expect(got.size).toBe(files.length);
  });
});
