/**
 * The global heap check (pipeline/read/hdf5-heap-check.ts) against the layout of HDF5 File
 * Format Specification 3.0, §III.E "Disk Format: Level 1E - Global Heap" (collections built
 * here byte by byte from that table), against collections written by the HDF5 library itself
 * (Debian's `ncgen -k nc4`, netCDF-C over native HDF5: test/fixtures/fuzz/*-sound.nc, the
 * demo's NetCDF-4 year written by h5wasm), and against the damaged fixture on which HDF5 and
 * netCDF-C's ncdump loop for ever.
 */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import fs from 'node:fs';
import { globalHeapProblem, guardedReads, hdf5LengthBytes } from '../../pipeline/read/hdf5-heap-check.ts';
import { writeDemoDataset, yearFileName } from '../../pipeline/demo/index.ts';

const FX = new URL('../fixtures/fuzz/', import.meta.url).pathname;

/** A collection of `size` bytes (specification §III.E, 8-byte lengths) holding `objects` (index, data), the rest free space. */
function collection(size: number, objects: Array<[number, string]>, freeSize?: number): Uint8Array {
  const b = new Uint8Array(size);
  const v = new DataView(b.buffer);
  b.set([0x47, 0x43, 0x4f, 0x4c, 1]); // "GCOL", version 1, 3 reserved bytes
  v.setBigUint64(8, BigInt(size), true);
  let p = 16;
  for (const [index, text] of objects) {
    v.setUint16(p, index, true);
    v.setUint16(p + 2, 1, true); // reference count
    v.setBigUint64(p + 8, BigInt(text.length), true);
    b.set(Buffer.from(text, 'latin1'), p + 16);
    p += 16 + Math.ceil(text.length / 8) * 8;
  }
  if (p + 16 <= size) {
    v.setUint16(p, 0, true);
    v.setBigUint64(p + 8, BigInt(freeSize ?? size - p), true);
  }
  return b;
}

/** Every "GCOL" collection of a file, as it starts in the file. */
function collectionsOf(bytes: Uint8Array): number[] {
  const out: number[] = [];
  const buf = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  for (let i = buf.indexOf('GCOL'); i >= 0; i = buf.indexOf('GCOL', i + 1)) out.push(i);
  return out;
}

describe('global heap collections (HDF5 specification §III.E)', () => {
  it("a collection built by the specification's table passes: objects of 4 and 9 bytes padded to 8, free space to the end", () => {
    expect(
      globalHeapProblem(
        collection(4096, [
          [1, '0001'],
          [2, 'nine char'],
        ]),
        8,
      ),
    ).toBeNull();
    // A tail too short for an object header counts as free space (HDF5 does the same).
    const b = collection(4096, [[1, 'x'.repeat(4096 - 16 - 16 - 8)]]);
    expect(globalHeapProblem(b, 8)).toBeNull();
  });

  it("a free-space object of size 0 is refused (the walk would not advance), naming the collection and the object's byte", () => {
    const b = collection(
      4096,
      [
        [1, '0001'],
        [2, '0005'],
      ],
      0,
    );
    expect(globalHeapProblem(b, 8, 6144)).toBe(
      'the global heap collection at byte 6144 is damaged: the free space at byte 6208 claims 0 bytes, so its walk cannot advance (the HDF5 library would loop for ever)',
    );
  });

  it('an object whose padded size wraps 32-bit pointers (step 0 in the WebAssembly build), reaches past the collection or breaks the alignment is refused', () => {
    const wrap = collection(4096, [[1, '0001']]);
    new DataView(wrap.buffer).setBigUint64(16 + 8, 0xfffffff0n, true);
    expect(globalHeapProblem(wrap, 8)).toMatch(/object 1 at byte 16 claims 4294967280 bytes, beyond the collection's 4096 bytes/);
    const past = collection(4096, [[1, '0001']], 5000);
    expect(globalHeapProblem(past, 8)).toMatch(/the free space at byte 40 claims 5000 bytes, beyond/);
    const odd = collection(4096, [[1, '0001']], 4001);
    expect(globalHeapProblem(odd, 8)).toMatch(/breaks the 8-byte alignment/);
  });

  it('what is not a whole collection, or not version 1, is left to HDF5 (no verdict)', () => {
    const b = collection(8192, [[1, '0001']], 0);
    expect(globalHeapProblem(b.subarray(0, 4096), 8)).toBeNull(); // the first part of a larger collection
    const v2 = collection(4096, [[1, '0001']], 0);
    v2[4] = 2;
    expect(globalHeapProblem(v2, 8)).toBeNull();
    expect(globalHeapProblem(new Uint8Array(4096), 8)).toBeNull();
  });

  it('every collection written by the HDF5 library passes: ncgen -k nc4 (netCDF-C over HDF5) and the demo year written by h5wasm (the expver labels in collections of 64, 64, 64 and 16 KiB)', async () => {
    const sound = new Uint8Array(readFileSync(join(FX, 'netcdf4-text-length-mismatch-sound.nc')));
    expect(hdf5LengthBytes(sound)).toBe(8);
    const inSound = collectionsOf(sound);
    expect(inSound.length).toBeGreaterThan(0);
    for (const at of inSound) expect(globalHeapProblem(sound.subarray(at), 8, at)).toBeNull();
    const dir = mkdtempSync(join(tmpdir(), 'hh-heap-'));
    try {
      await writeDemoDataset({ outDir: dir, years: [2021], layout: 'netcdf4', grid: 'small', quiet: true, jobs: 1 });
      const year = new Uint8Array(readFileSync(join(dir, yearFileName(2021))));
      const found = collectionsOf(year).filter((at) => year[at + 4] === 1);
      const sizes = found.map((at) => Number(new DataView(year.buffer, at + 8, 8).getBigUint64(0, true)));
      expect(sizes).toEqual([65536, 65536, 65536, 16384]);
      for (const at of found) expect(globalHeapProblem(year.subarray(at), 8, at)).toBeNull();
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 120_000);

  it('the damaged fixture on which HDF5 loops is refused at its one collection', () => {
    const bad = new Uint8Array(readFileSync(join(FX, 'netcdf4-global-heap-empty-free-space.nc')));
    const [at] = collectionsOf(bad);
    expect(globalHeapProblem(bad.subarray(at), 8, at)).toMatch(
      /^the global heap collection at byte 6144 is damaged: the free space at byte \d+ claims 0 bytes/,
    );
  });
});

describe('guardedReads', () => {
  it('a read returning a damaged collection fails with EIO; the first part of a large one is judged by the whole collection; other reads pass; fs.readSync is restored', () => {
    const dir = mkdtempSync(join(tmpdir(), 'hh-guard-'));
    const original = fs.readSync;
    try {
      const head = new Uint8Array(48);
      head.set([0x89, 0x48, 0x44, 0x46, 0x0d, 0x0a, 0x1a, 0x0a, 2, 8, 8]); // superblock v2, 8-byte offsets and lengths
      const good = collection(4096, [[1, '0001']]);
      const bad = collection(8192, [[1, '0001']], 0);
      const file = join(dir, 'f.h5');
      fs.writeFileSync(file, Buffer.concat([head, good, bad]));
      const readAt = (pos: number, n: number) => {
        const fd = fs.openSync(file, 'r');
        try {
          const out = new Int8Array(n); // h5wasm reads into its Int8Array heap
          return fs.readSync(fd, out, 0, n, pos);
        } finally {
          fs.closeSync(fd);
        }
      };
      const ok = guardedReads(file, () => [readAt(0, 48), readAt(48, 4096)]);
      expect(ok).toEqual({ value: [48, 4096], refused: undefined });
      const r = guardedReads(file, () => readAt(48 + 4096, 4096)); // HDF5's first 4096 bytes of the 8192
      expect((r.error as NodeJS.ErrnoException).code).toBe('EIO');
      expect(r.refused).toMatch(/collection at byte 4144 is damaged: the free space at byte 4184 claims 0 bytes/);
      expect(fs.readSync).toBe(original);
    } finally {
      fs.readSync = original;
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
