/**
 * NetCDF-4 hyperslabs read from the raw chunks (hdf5-layout.ts, hdf5-chunks.ts: chunk index from
 * the HDF5 version 1 B-tree, node:zlib inflate, shuffle undone in JS) against the reference
 * library: Debian's python3-netcdf4 (netCDF-C 4.9 + HDF5 1.10 underneath) reading the same
 * files, and the HDF5 library this project already uses (h5wasm) through `SourceFile.read`.
 * Inputs: the real file test/fixtures/realdata/nc4uvt.nc (PROVENANCE.md there), and invented
 * values written by python3-netcdf4 as NetCDF-4 with deflate level 1 + shuffle and chunks that do
 * not divide the shape, and as NetCDF-3 copied with Debian's `nccopy -k nc4 -d1 -s` (netcdf-bin
 * 4.9.0 keeps one chunk per variable here: it ignores `-c` for these files).
 */
import { afterAll, describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { copyFileSync, mkdtempSync, openSync, readSync, rmSync, statSync, writeSync, closeSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { deflateSync, inflateSync } from 'node:zlib';
import { openSourceFile } from '../../pipeline/read/open-file.ts';
import { netcdf4ReadPath } from '../../pipeline/read/hdf5-file.ts';
import { describeNetcdf4 } from '../../pipeline/read/hdf5-meta.ts';
import { readChunkIndex, superblockSizes } from '../../pipeline/read/hdf5-layout.ts';
import { inflateChunkSync, unshuffle } from '../../pipeline/read/hdf5-chunks.ts';
import { helperChunksTaken, inflateHelperReady, stopInflateHelper } from '../../pipeline/read/inflate-helper.ts';
import type { RawArray, SourceFile, SourceVariable } from '../../pipeline/read/source.ts';
import { fixturePath } from '../helpers/fixtures.ts';
import { openDataset } from '../../pipeline/read/index.ts';
import { writeFixture } from '../fixtures/read/era5-cdl.ts';
import { expectCataloguedAsync } from '../helpers/catalogued.ts';

const dir = mkdtempSync(join(tmpdir(), 'heathours-nc4raw-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** Debian's Python with python3-netcdf4 (the reference library's binding). */
const PY = '/usr/bin/python3';

/** Raw stored values of a variable (no mask, no scale) as python3-netcdf4 reads them, little-endian bytes. */
function referenceBytes(file: string, variable: string): Buffer {
  const code = [
    'import sys, netCDF4, numpy',
    'd = netCDF4.Dataset(sys.argv[1])',
    'd.set_auto_maskandscale(False)',
    'v = d[sys.argv[2]]',
    'a = numpy.ascontiguousarray(v[...])',
    'sys.stdout.buffer.write(a.astype(a.dtype.newbyteorder("<")).tobytes())',
  ].join('\n');
  return execFileSync(PY, ['-c', code, file, variable], { maxBuffer: 1 << 28 });
}

function asArray(b: Buffer, like: RawArray): number[] {
  const C = like.constructor as new (b: ArrayBuffer) => RawArray;
  const copy = new Uint8Array(b.length);
  copy.set(b);
  return Array.from(new C(copy.buffer));
}

/** Values read by the HDF5 library (h5wasm) alone: the file opened with HEATHOURS_NETCDF4_RAW=0. */
async function libraryValues(file: string, name: string, start: number[], count: number[]): Promise<RawArray> {
  process.env.HEATHOURS_NETCDF4_RAW = '0';
  let sf: SourceFile;
  try {
    sf = await openSourceFile(file);
  } finally {
    delete process.env.HEATHOURS_NETCDF4_RAW;
  }
  try {
    const v = varOf(sf, name);
    expect(await netcdf4ReadPath(sf, v)).toBe('HDF5 library: HEATHOURS_NETCDF4_RAW=0');
    return await sf.read(v, start, count);
  } finally {
    await sf.close();
  }
}

/** A slab read through `readSlabs`, gathered into a dense row-major array of `count`. */
async function slab(sf: SourceFile, v: SourceVariable, start: number[], count: number[]): Promise<number[]> {
  return (await slabs(sf, [{ v, start, count }]))[0];
}

/** The values of several requests read by one `readSlabs` call, one dense array per request. */
async function slabs(sf: SourceFile, reqs: Array<{ v: SourceVariable; start: number[]; count: number[] }>): Promise<number[][]> {
  const outs = reqs.map(({ count }) => new Array<number>(count.reduce((a, b) => a * b, 1)).fill(Number.NaN));
  let calls = 0;
  await sf.readSlabs(reqs, (i, s, from, n) => {
    calls++;
    const { count } = reqs[i];
    const inner = count.slice(1).reduce((a, b) => a * b, 1);
    const out = outs[i];
    const idx = new Array<number>(count.length).fill(0);
    for (let k = 0; k < n * inner; k++) {
      let rem = k;
      for (let d = count.length - 1; d >= 1; d--) {
        idx[d] = rem % count[d];
        rem = Math.floor(rem / count[d]);
      }
      idx[0] = rem;
      let at = s.base;
      for (let d = 0; d < count.length; d++) at += idx[d] * s.strides[d];
      out[(from + idx[0]) * inner + (k % inner)] = s.data[at];
    }
  });
  expect(calls).toBeGreaterThanOrEqual(reqs.length);
  return outs;
}

/** Runs `body` with the slabs' chunks inflated in this thread alone (`sync`) or shared with the helper thread (`helper`, once it is ready). */
async function inflatedBy<T>(mode: 'helper' | 'sync', body: () => Promise<T>): Promise<T> {
  process.env.HEATHOURS_NETCDF4_INFLATE = mode;
  try {
    if (mode === 'helper') expect(await inflateHelperReady()).toBe(true);
    return await body();
  } finally {
    delete process.env.HEATHOURS_NETCDF4_INFLATE;
  }
}

/**
 * Python that writes invented values of several types (seeded): NetCDF-3 for nccopy (argv[2]
 * 'nc3'), or NetCDF-4 with deflate 1 + shuffle in chunks of 5 × 3 × 7 ('nc4').
 */
const WRITE_TYPES = `
import sys, netCDF4, numpy
r = numpy.random.default_rng(7)
nc4 = sys.argv[2] == 'nc4'
d = netCDF4.Dataset(sys.argv[1], 'w', format='NETCDF4' if nc4 else 'NETCDF3_64BIT_OFFSET')
d.createDimension('time', 23); d.createDimension('lat', 10); d.createDimension('lon', 17)
for name, t in (('f4', 'f4'), ('i2', 'i2'), ('f8', 'f8'), ('i4', 'i4'), ('u1', 'i1')):
    if nc4: v = d.createVariable(name, t, ('time', 'lat', 'lon'), zlib=True, complevel=1, shuffle=True, chunksizes=(5, 3, 7))
    else: v = d.createVariable(name, t, ('time', 'lat', 'lon'))
    x = r.normal(280, 15, (23, 10, 17))
    v[:] = x.astype(t) if t[0] == 'f' else (x * (100 if t == 'i2' else 1000 if t == 'i4' else 0.3)).astype(t)
d.close()
`;

/** Python that writes NetCDF-4 files directly: Fletcher-32 checksums, and a variable with chunks never written. */
const WRITE_NC4 = `
import sys, netCDF4, numpy
d = netCDF4.Dataset(sys.argv[1], 'w', format='NETCDF4')
d.createDimension('time', 12); d.createDimension('lat', 4); d.createDimension('lon', 5)
v = d.createVariable('fl', 'f4', ('time', 'lat', 'lon'), zlib=True, shuffle=True, fletcher32=True, chunksizes=(4, 4, 5))
v[:] = numpy.arange(240, dtype='f4').reshape(12, 4, 5) * 0.5
p = d.createVariable('part', 'f4', ('time', 'lat', 'lon'), zlib=True, shuffle=True, chunksizes=(4, 2, 5), fill_value=-99.0)
p[4:8, :, :] = numpy.arange(80, dtype='f4').reshape(4, 4, 5)
c = d.createVariable('lat', 'f8', ('lat',), contiguous=True)
c[:] = [10.5, 10.25, 10.0, 9.75]
e = d.createVariable('never', 'i2', ('lat', 'lon'), contiguous=True, fill_value=-7)
d.close()
`;

const classic = join(dir, 'types.nc');
const copied = join(dir, 'types-nccopy-d1s.nc');
execFileSync(PY, ['-c', WRITE_TYPES, classic, 'nc3']);
execFileSync('nccopy', ['-k', 'nc4', '-d', '1', '-s', classic, copied]);
const packed = join(dir, 'types-d1s.nc');
execFileSync(PY, ['-c', WRITE_TYPES, packed, 'nc4']);
const direct = join(dir, 'direct.nc');
execFileSync(PY, ['-c', WRITE_NC4, direct]);

const varOf = (sf: SourceFile, name: string) => {
  const v = sf.variables.find((x) => x.name === name);
  if (!v) throw new Error(`no ${name}`);
  return v;
};

describe('NetCDF-4 chunks read and inflated without the HDF5 library', () => {
  it('nc4uvt.nc (Debian libncarg-data, groups, shuffle + deflate 0 and 2): T, U, V in both groups go through node:zlib and equal python3-netcdf4 and the HDF5 library value for value', async () => {
    const file = fixturePath('realdata', 'nc4uvt.nc');
    const sf = await openSourceFile(file);
    try {
      for (const name of ['T', 'U', 'V', 'grp1/T', 'grp1/U', 'grp1/V']) {
        const v = varOf(sf, name);
        expect(await netcdf4ReadPath(sf, v)).toBe('node:zlib');
        const zero = v.shape.map(() => 0);
        const raw = await slab(sf, v, zero, v.shape);
        const lib = await libraryValues(file, name, zero, v.shape);
        expect(raw).toEqual(Array.from(lib));
        expect(raw).toEqual(asArray(referenceBytes(file, name), lib));
        expect(Array.from(await sf.read(v, zero, v.shape))).toEqual(raw);
      }
      // A slab inside the chunks (chunks 1 × 7 × 32 × 64): levels 3-10, rows 20-50, columns 60-70.
      const t = varOf(sf, 'T');
      const part = await slab(sf, t, [0, 3, 20, 60], [1, 8, 31, 11]);
      expect(part).toEqual(Array.from(await libraryValues(file, 'T', [0, 3, 20, 60], [1, 8, 31, 11])));
    } finally {
      await sf.close();
    }
  });

  it('deflate 1 + shuffle with edge chunks (23 × 10 × 17 in chunks 5 × 3 × 7, python3-netcdf4) and nccopy -d1 -s copies: float32, int16, float64, int32, int8 equal python3-netcdf4 in whole and in odd slabs, inflated in this thread alone or shared with the helper thread', async () => {
    await inflatedBy('sync', async () => {
      for (const file of [packed, copied]) await sameAsReference(file);
    });
    const before = helperChunksTaken();
    await inflatedBy('helper', () => sameAsReference(packed));
    // The helper did take chunks (the test would pass on this thread alone otherwise).
    expect(helperChunksTaken()).toBeGreaterThan(before);
  });

  it('one readSlabs call of several requests (the chunks of the next one inflated by the helper while this one is handed out; the same variable twice, in consecutive hours that share a chunk) equals python3-netcdf4', async () => {
    const sf = await openSourceFile(packed);
    try {
      const names = ['f4', 'i2', 'f8', 'i4', 'u1'];
      const refs = new Map<string, number[]>();
      for (const name of names) refs.set(name, asArray(referenceBytes(packed, name), (await sf.read(varOf(sf, name), [0, 0, 0], [1, 1, 1])) as RawArray));
      const reqs = [
        ...names.map((name) => ({ v: varOf(sf, name), start: [2, 0, 0], count: [11, 10, 17] })),
        // Hours 13-15 then 16-22 of f4: the second starts in the chunk (hours 15-19) the first ended in.
        { v: varOf(sf, 'f4'), start: [13, 0, 0], count: [3, 10, 17] },
        { v: varOf(sf, 'f4'), start: [16, 0, 0], count: [7, 10, 17] },
      ];
      const hours = (name: string, t0: number, nt: number) => refs.get(name)!.slice(t0 * 170, (t0 + nt) * 170);
      const want = reqs.map((r) => hours(r.v.name, r.start[0], r.count[0]));
      for (const mode of ['sync', 'helper'] as const) {
        const before = helperChunksTaken();
        // Several rounds: on a busy machine the helper may start too late to take a chunk of one.
        for (let round = 0; round < (mode === 'helper' ? 10 : 1); round++) {
          const got = await inflatedBy(mode, () => slabs(sf, reqs));
          for (let i = 0; i < reqs.length; i++) expect(got[i], `${mode}: request ${i} (${reqs[i].v.name})`).toEqual(want[i]);
        }
        if (mode === 'helper') expect(helperChunksTaken()).toBeGreaterThan(before);
      }
    } finally {
      await sf.close();
    }
  });

  it('a helper thread that stops is not started again: the reader does every chunk itself, values unchanged', async () => {
    const sf = await openSourceFile(packed);
    try {
      const v = varOf(sf, 'f4');
      const ref = asArray(referenceBytes(packed, 'f4'), new Float32Array(0));
      expect(await inflatedBy('helper', () => slab(sf, v, [0, 0, 0], v.shape))).toEqual(ref);
      await stopInflateHelper();
      const before = helperChunksTaken();
      process.env.HEATHOURS_NETCDF4_INFLATE = 'helper';
      try {
        expect(await slab(sf, v, [0, 0, 0], v.shape)).toEqual(ref);
      } finally {
        delete process.env.HEATHOURS_NETCDF4_INFLATE;
      }
      expect(helperChunksTaken()).toBe(before);
    } finally {
      await sf.close();
    }
  });

  async function sameAsReference(packed: string): Promise<void> {
    const sf = await openSourceFile(packed);
    try {
      for (const name of ['f4', 'i2', 'f8', 'i4', 'u1']) {
        const v = varOf(sf, name);
        expect(await netcdf4ReadPath(sf, v)).toBe('node:zlib');
        const lib = await libraryValues(packed, name, [0, 0, 0], v.shape);
        const ref = asArray(referenceBytes(packed, name), lib);
        expect(await slab(sf, v, [0, 0, 0], v.shape)).toEqual(ref);
        expect(Array.from(lib)).toEqual(ref);
        expect(Array.from(await sf.read(v, [0, 0, 0], v.shape))).toEqual(ref);
        // Odd slab: hours 4-20, rows 2-8, columns 6-16 (cuts chunks in every dimension).
        const want: number[] = [];
        for (let t = 4; t < 21; t++) for (let y = 2; y < 9; y++) for (let x = 6; x < 17; x++) want.push(ref[(t * 10 + y) * 17 + x]);
        expect(await slab(sf, v, [4, 2, 6], [17, 7, 11])).toEqual(want);
        // Consecutive slabs of 3 hours over chunks of 5: most start in a chunk the slab before ended in.
        const steps: number[] = [];
        for (let t0 = 0; t0 < v.shape[0]; t0 += 3) steps.push(...(await slab(sf, v, [t0, 0, 0], [Math.min(3, v.shape[0] - t0), v.shape[1], v.shape[2]])));
        expect(steps).toEqual(ref);
      }
    } finally {
      await sf.close();
    }
  }

  it('the shuffle filter is undone as HDF5 defines it: byte k of value i at k·n + i, a trailing partial value kept as is', () => {
    // Three 4-byte values 0x04030201, 0x08070605, 0x0c0b0a09 shuffled by hand, plus 2 trailing bytes.
    const src = Uint8Array.of(1, 5, 9, 2, 6, 10, 3, 7, 11, 4, 8, 12, 0xaa, 0xbb);
    const dst = new Uint8Array(14);
    unshuffle(src, dst, 4);
    expect(Array.from(dst)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 0xaa, 0xbb]);
    const odd = new Uint8Array(7);
    unshuffle(Uint8Array.of(1, 4, 2, 5, 3, 6, 9), odd, 3);
    expect(Array.from(odd)).toEqual([1, 2, 3, 4, 5, 6, 9]);
  });

  it('Fletcher-32 checksums are left to the HDF5 library (named as the reason), and chunks never written read as the fill value, both as python3-netcdf4 reads them', async () => {
    const sf = await openSourceFile(direct);
    try {
      const fl = varOf(sf, 'fl');
      expect(await netcdf4ReadPath(sf, fl)).toMatch(/^HDF5 library: filter 3 \(Fletcher-32\)/);
      const lib = await sf.read(fl, [0, 0, 0], fl.shape);
      expect(await slab(sf, fl, [0, 0, 0], fl.shape)).toEqual(asArray(referenceBytes(direct, 'fl'), lib));
      const part = varOf(sf, 'part');
      expect(await netcdf4ReadPath(sf, part)).toBe('node:zlib');
      const ref = asArray(referenceBytes(direct, 'part'), lib);
      expect(ref[0]).toBe(-99);
      expect(await slab(sf, part, [0, 0, 0], part.shape)).toEqual(ref);
      // Only written chunks: straight from the chunks.
      expect(await slab(sf, part, [4, 0, 0], [4, 4, 5])).toEqual(ref.slice(80, 160));
    } finally {
      await sf.close();
    }
  });
});

/** The byte address and stored size of chunk `lin` of a variable, from the file's own B-tree. */
async function chunkAt(file: string, name: string, lin: number) {
  const d = await describeNetcdf4(file);
  const hv = d.variables.find((x) => x.name === name)!;
  const fd = openSync(file, 'r');
  const read = async (at: number, n: number) => {
    const b = Buffer.alloc(n);
    const got = readSync(fd, b, 0, n, at);
    return b.subarray(0, got);
  };
  try {
    const s = superblockSizes(await read(0, 128));
    const idx = await readChunkIndex(read, s, hv.header!, hv.shape, hv.valueBytes, statSync(file).size);
    return { at: idx.address[lin], size: idx.size[lin], idx };
  } finally {
    closeSync(fd);
  }
}

function patch(file: string, at: number, bytes: Uint8Array): void {
  const fd = openSync(file, 'r+');
  writeSync(fd, bytes, 0, bytes.length, at);
  closeSync(fd);
}

describe('NetCDF-4 variables stored contiguously', () => {
  it('a contiguous coordinate (python3-netcdf4, contiguous=True) is read from its bytes without the HDF5 library, equal to python3-netcdf4; one never written reads as its fill value through the library', async () => {
    const sf = await openSourceFile(direct);
    try {
      const lat = varOf(sf, 'lat');
      expect(await netcdf4ReadPath(sf, lat)).toBe('contiguous');
      const values = await sf.read(lat, [0], [4]);
      expect(Array.from(values)).toEqual(asArray(referenceBytes(direct, 'lat'), values));
      expect(Array.from(values)).toEqual([10.5, 10.25, 10.0, 9.75]);
      expect(Array.from(await sf.read(lat, [1], [2]))).toEqual([10.25, 10.0]);
      expect(Array.from(await sf.readNumbers(lat))).toEqual([10.5, 10.25, 10.0, 9.75]);
      const never = varOf(sf, 'never');
      const fill = await sf.read(never, [0, 0], never.shape);
      expect(Array.from(fill)).toEqual(asArray(referenceBytes(direct, 'never'), fill));
      expect(new Set(fill)).toEqual(new Set([-7]));
    } finally {
      await sf.close();
    }
  });
});

describe('damaged chunks', () => {
  it('a chunk whose deflate stream is overwritten is NetcdfChunkDamaged naming the file, variable and chunk, and nothing is handed out, in this thread alone and shared with the helper', async () => {
    const file = join(dir, 'bad-inflate.nc');
    copyFileSync(packed, file);
    // Chunk (time 5, lat 0, lon 7): linear index (1 · 4 + 0) · 3 + 1 = 13 on the 5 × 4 × 3 chunk grid.
    const { at, size } = await chunkAt(file, 'f4', 13);
    patch(file, at + 2, new Uint8Array(Math.min(64, size - 2)).fill(0xff));
    const sf = await openSourceFile(file);
    try {
      const v = varOf(sf, 'f4');
      for (const mode of ['sync', 'helper'] as const) {
        let pieces = 0;
        const e = await inflatedBy(mode, () =>
          expectCataloguedAsync(
            sf.readSlabs([{ v, start: [0, 0, 0], count: v.shape }], () => pieces++),
            'NetcdfChunkDamaged',
            /variable f4, the chunk starting at time 5, lat 0, lon 7 .*does not inflate/,
          ),
        );
        expect(e.message).toContain(file);
        expect(pieces).toBe(0);
      }
      // Chunks before the damage still read.
      const ok = await slab(sf, v, [0, 0, 0], [5, 10, 17]);
      expect(ok).toEqual(asArray(referenceBytes(packed, 'f4'), new Float32Array(0)).slice(0, 5 * 10 * 17));
    } finally {
      await sf.close();
    }
  });

  it('the reused inflate stream gives the bytes that were deflated (zlib levels 1 and 9, as node:zlib inflateSync does), refuses a stream longer than the chunk or cut short, and inflates the next chunk right after a refusal', () => {
    const a = new Uint8Array(50_000).map((_, i) => (i * 7919) % 251);
    const b = new Uint8Array(50_000).map((_, i) => (i >> 4) & 0xff);
    for (const [src, level] of [
      [a, 1],
      [b, 9],
      [a, 9],
    ] as const) {
      const z = deflateSync(src, { level });
      const out = inflateChunkSync(z, src.length);
      expect(out.length).toBe(src.length);
      expect(Buffer.compare(Buffer.from(out), Buffer.from(src))).toBe(0);
      expect(Buffer.compare(Buffer.from(out), inflateSync(z))).toBe(0);
    }
    // One byte more than the chunk: refused as too large, then a good stream inflates right.
    expect(() => inflateChunkSync(deflateSync(a), a.length - 1)).toThrow(expect.objectContaining({ code: 'ERR_BUFFER_TOO_LARGE' }));
    expect(Buffer.compare(Buffer.from(inflateChunkSync(deflateSync(b), b.length)), Buffer.from(b))).toBe(0);
    // A stream cut short is zlib's error (as inflateSync says: unexpected end of file), then a good one inflates right.
    const z = deflateSync(a);
    expect(() => inflateSync(z.subarray(0, z.length >> 1))).toThrow(/unexpected end of file/);
    expect(() => inflateChunkSync(z.subarray(0, z.length >> 1), a.length)).toThrow(/unexpected end of file/);
    expect(() => inflateChunkSync(Uint8Array.of(1, 2, 3, 4, 5, 6), a.length)).toThrow(/incorrect header check/);
    expect(Buffer.compare(Buffer.from(inflateChunkSync(z, a.length)), Buffer.from(a))).toBe(0);
  });

  it('a chunk that inflates to more bytes than a chunk holds is NetcdfChunkDamaged saying so, in this thread alone and shared with the helper', async () => {
    const file = join(dir, 'too-long.nc');
    copyFileSync(packed, file);
    const { at, size, idx } = await chunkAt(file, 'i2', 0);
    const chunkBytes = idx.chunk.reduce((a, b) => a * b, 1) * 2;
    const long = deflateSync(new Uint8Array(chunkBytes + 6));
    expect(long.length).toBeLessThanOrEqual(size);
    patch(file, at, long);
    for (const mode of ['sync', 'helper'] as const) {
      const sf = await openSourceFile(file);
      try {
        const v = varOf(sf, 'i2');
        // The whole variable: several chunks, so the helper takes some (the damaged one is redone here, named).
        await inflatedBy(mode, () =>
          expectCataloguedAsync(
            sf.readSlabs([{ v, start: [0, 0, 0], count: v.shape }], () => undefined),
            'NetcdfChunkDamaged',
            new RegExp(`variable i2, the chunk starting at time 0, lat 0, lon 0 .*inflates to more than the ${chunkBytes} bytes of a chunk`),
          ),
        );
      } finally {
        await sf.close();
      }
    }
  });

  it('a chunk that inflates to fewer bytes than a chunk holds is NetcdfChunkDamaged saying how many', async () => {
    const file = join(dir, 'bad-size.nc');
    copyFileSync(packed, file);
    const { at, size, idx } = await chunkAt(file, 'i2', 0);
    const chunkBytes = idx.chunk.reduce((a, b) => a * b, 1) * 2;
    const short = deflateSync(new Uint8Array(chunkBytes - 6));
    expect(short.length).toBeLessThanOrEqual(size);
    patch(file, at, short);
    const sf = await openSourceFile(file);
    try {
      const v = varOf(sf, 'i2');
      await expectCataloguedAsync(
        sf.readSlabs([{ v, start: [0, 0, 0], count: [5, 3, 7] }], () => undefined),
        'NetcdfChunkDamaged',
        new RegExp(`variable i2, the chunk starting at time 0, lat 0, lon 0 .*holds ${chunkBytes - 6} bytes where a chunk has ${chunkBytes}`),
      );
    } finally {
      await sf.close();
    }
  });

  it('readBlock meeting a damaged chunk restates it as NetcdfDataUnreadable with the variable, the hours read and the chunk', async () => {
    // ncgen (netcdf-bin) writes the ERA5 2024 layout: float32, deflate 1 + shuffle, chunks of 24 h.
    const file = writeFixture(dir, 'era5-damaged', {
      layout: 'cds2024',
      start: '2020-01-01T00:00:00Z',
      hours: 60,
      lat: [10.5, 10.25, 10],
      lon: [0, 0.25, 0.5, 0.75],
      vars: ['t2m'],
      chunkHours: 24,
    });
    const { at, size } = await chunkAt(file, 't2m', 1);
    patch(file, at + 2, new Uint8Array(Math.min(32, size - 2)).fill(0xff));
    const ds = await openDataset([file], { product: 'era5', require: ['airTemperature'], digests: false });
    try {
      const tile = { y0: 0, y1: 3, x0: 0, x1: 4 };
      await ds.readBlock(0, 20, tile); // the first chunk is sound
      const e = await expectCataloguedAsync(
        ds.readBlock(20, 30, tile),
        'NetcdfDataUnreadable',
        /t2m for the hours 2020-01-01T20:00:00Z to 2020-01-03T01:00:00Z .*the chunk starting at valid_time 24, latitude 0, longitude 0/,
      );
      expect(e.where).toMatchObject({ file, variable: 't2m' });
    } finally {
      await ds.close();
    }
  });
});
