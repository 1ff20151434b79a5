/**
 * The JavaScript reader of NetCDF-4 metadata (pipeline/read/hdf5-js-describe.ts and the HDF5
 * structure readers it uses) against outside references: the HDF5 library itself (h5wasm, in the
 * metadata worker, forced with HEATHOURS_NETCDF4_JSMETA=0) describing the same files, and
 * Debian's python3-netcdf4 (netCDF-C over HDF5) reading their values. Inputs: every NetCDF-4 file
 * in test/fixtures (found by the HDF5 signature), among them the files of
 * test/fixtures/netcdf4-variety/ (written by python3-netcdf4 and nccopy, make.py there: groups,
 * an unlimited dimension, dense attributes, string and char variables, scalars, int64, packed
 * short, a dimension without a coordinate variable, shuffle + deflate, Fletcher-32), and the
 * fuzzer's NetCDF-4 bases (the demo year and land-sea mask written through h5wasm: dense links).
 */
import { afterAll, describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describeHdf5Js } from '../../pipeline/read/hdf5-js-describe.ts';
import { describeNetcdf4, hdf5MetadataWorkersStarted, netcdf4MetadataFallback } from '../../pipeline/read/hdf5-meta.ts';
import { hdf5LibraryLoaded } from '../../pipeline/read/hdf5-file.ts';
import { lookup3 } from '../../pipeline/read/hdf5-checksum.ts';
import { readSuperblock } from '../../pipeline/read/hdf5-struct.ts';
import { openSourceFile } from '../../pipeline/read/open-file.ts';
import { inspectFile } from '../../pipeline/read/index.ts';
import { prepareBases } from '../fuzz/bases.ts';
import { FIXTURES_DIR, fixturePath } from '../helpers/fixtures.ts';

const dir = mkdtempSync(join(tmpdir(), 'heathours-jsmeta-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** Debian's Python with python3-netcdf4. */
const PY = '/usr/bin/python3';

/** Every file under test/fixtures that starts with the HDF5 signature. */
function hdf5Fixtures(): string[] {
  const out: string[] = [];
  const walk = (d: string) => {
    for (const e of readdirSync(d, { withFileTypes: true })) {
      const p = join(d, e.name);
      if (e.isDirectory()) walk(p);
      else if (e.isFile() && statSync(p).size >= 8) {
        const head = readFileSync(p).subarray(0, 8);
        if (head.equals(Buffer.from([0x89, 0x48, 0x44, 0x46, 0x0d, 0x0a, 0x1a, 0x0a]))) out.push(p);
      }
    }
  };
  walk(FIXTURES_DIR);
  return out.sort();
}

/** Damaged fixtures the JavaScript reader declines, and why (the HDF5 library refuses them too). */
const DECLINED: Record<string, RegExp> = {
  'netcdf4-global-heap-empty-free-space.nc': /free space .* claims 0 bytes/,
  'netcdf4-object-header-bit-flip.nc': /object header checksum at byte \d+ does not match/,
};

/** The description made by the HDF5 library (h5wasm in the metadata worker). */
async function libraryDescription(path: string): Promise<unknown> {
  process.env.HEATHOURS_NETCDF4_JSMETA = '0';
  try {
    return await describeNetcdf4(path);
  } catch (e) {
    return { error: (e as Error).message };
  } finally {
    delete process.env.HEATHOURS_NETCDF4_JSMETA;
  }
}

const variety = ['plain.nc', 'plain-nccopy.nc', 'groups.nc', 'groups-nccopy.nc', 'many-attrs.nc', 'classic-model.nc'].map((f) =>
  fixturePath('netcdf4-variety', f),
);

describe('NetCDF-4 metadata read in JavaScript', () => {
  // First in this file: nothing before it in this thread has loaded HDF5 or started its worker.
  it('inspect of the python3-netcdf4, nccopy and real-data NetCDF-4 files without Fletcher-32 loads no HDF5 WebAssembly and starts no metadata worker', async () => {
    // many-attrs.nc is left out: its Fletcher-32 variable is read by the library (below).
    for (const f of [...variety.filter((x) => !x.endsWith('many-attrs.nc')), fixturePath('realdata', 'nc4uvt.nc')]) {
      const r = await inspectFile(f);
      expect(r.format).toBe('netcdf4');
      expect(netcdf4MetadataFallback(f), f).toBeUndefined();
    }
    expect(hdf5MetadataWorkersStarted()).toBe(0);
    expect(hdf5LibraryLoaded()).toBe(false);
  });

  it('lookup3 gives the values printed by its author\'s driver (lookup3.c, from memory): "" -> deadbeef, "Four score and seven years ago" -> 17770551 (init 0) and cd628161 (init 1)', () => {
    const e = new TextEncoder();
    expect(lookup3(new Uint8Array(0))).toBe(0xdeadbeef);
    expect(lookup3(e.encode('Four score and seven years ago'))).toBe(0x17770551);
    expect(lookup3(e.encode('Four score and seven years ago'), 1)).toBe(0xcd628161);
  });

  it('a version 2 superblock written by netCDF-C checks against its lookup3 checksum, and one flipped bit in it is refused', () => {
    const b = new Uint8Array(readFileSync(fixturePath('netcdf4-variety', 'plain.nc')).subarray(0, 128));
    const sb = readSuperblock(b);
    expect(sb.version).toBeGreaterThanOrEqual(2);
    expect(sb.offsets).toBe(8);
    b[20] ^= 0x01;
    expect(() => readSuperblock(b)).toThrow(/checksum does not match/);
  });

  it(
    'every NetCDF-4 file in test/fixtures is described exactly as the HDF5 library describes it (same JSON, order included), or declined for the damage the library refuses too',
    { timeout: 120_000 },
    async () => {
      const files = hdf5Fixtures();
      expect(files.length).toBeGreaterThanOrEqual(12);
      for (const f of files) {
        const js = await describeHdf5Js(f, statSync(f).size);
        const lib = await libraryDescription(f);
        const name = f.slice(f.lastIndexOf('/') + 1);
        if (DECLINED[name]) {
          expect('declined' in js && js.declined, f).toMatch(DECLINED[name]);
          expect(lib, f).toHaveProperty('error');
          continue;
        }
        expect('declined' in js ? js.declined : '', f).toBe('');
        expect(JSON.stringify(js), f).toBe(JSON.stringify(lib));
      }
    },
  );

  it(
    "the fuzzer's NetCDF-4 bases (demo year and land-sea mask written through h5wasm, dense links) are described exactly as the HDF5 library describes them",
    { timeout: 300_000 },
    async () => {
      const bases = await prepareBases(join(dir, 'bases'));
      for (const f of [bases.base.netcdf4, bases.lsm.netcdf4]) {
        const js = await describeHdf5Js(f, statSync(f).size);
        expect('declined' in js ? js.declined : '', f).toBe('');
        expect(JSON.stringify(js), f).toBe(JSON.stringify(await libraryDescription(f)));
      }
    },
  );

  it(
    "values read through the JavaScript description (scalars, int64, packed short, groups, Fletcher-32 through the library) equal python3-netcdf4's raw values",
    { timeout: 120_000 },
    async () => {
      const code = [
        'import sys, json, netCDF4, numpy',
        'd = netCDF4.Dataset(sys.argv[1]); d.set_auto_maskandscale(False); out = {}',
        'def walk(g, p):',
        '  for n, v in g.variables.items():',
        '    if getattr(v.dtype, "kind", "s") in "iuf": out[p + n] = numpy.asarray(v[...], dtype="f8").ravel().tolist()',
        '  for n, s in g.groups.items(): walk(s, p + n + "/")',
        'walk(d, ""); print(json.dumps(out))',
      ].join('\n');
      for (const f of variety) {
        const ref = JSON.parse(execFileSync(PY, ['-c', code, f], { encoding: 'utf8' })) as Record<string, number[]>;
        const sf = await openSourceFile(f);
        try {
          const names = sf.variables.filter((v) => v.type !== 'string').map((v) => v.name);
          expect(names.sort(), f).toEqual(Object.keys(ref).sort());
          for (const v of sf.variables) {
            if (v.type === 'string') continue;
            if (f.endsWith('many-attrs.nc')) expect(await sf.readPath?.(v)).toBe('HDF5 library: filter 3 (Fletcher-32)');
            expect(Array.from(await sf.readNumbers(v)), `${f} ${v.name}`).toEqual(ref[v.name]);
          }
        } finally {
          await sf.close();
        }
      }
    },
  );

  it('HEATHOURS_NETCDF4_JSMETA=0 leaves the description to the HDF5 library', async () => {
    const f = variety[0];
    process.env.HEATHOURS_NETCDF4_JSMETA = '0';
    try {
      await describeNetcdf4(f);
    } finally {
      delete process.env.HEATHOURS_NETCDF4_JSMETA;
    }
    expect(netcdf4MetadataFallback(f)).toBe('HEATHOURS_NETCDF4_JSMETA=0');
    await describeNetcdf4(f);
    expect(netcdf4MetadataFallback(f)).toBeUndefined();
  });

  it('a flipped bit in a fractal heap, a version 2 B-tree header or leaf, or an object header continuation block of a python3-netcdf4 file makes the reader decline, naming the checksum that does not match', async () => {
    const src = fixturePath('netcdf4-variety', 'many-attrs.nc');
    const base = readFileSync(src);
    const cases: Array<[string, RegExp]> = [
      ['FRHP', /fractal heap header checksum/],
      ['BTHD', /version 2 B-tree header checksum/],
      ['BTLF', /version 2 B-tree leaf checksum/],
      ['OCHK', /continuation block at byte \d+ does not match/],
    ];
    for (const [sig, reason] of cases) {
      const at = base.indexOf(sig);
      expect(at, sig).toBeGreaterThan(0);
      const b = Buffer.from(base);
      // A byte inside the structure, after its signature and version.
      b[at + 6] ^= 0x10;
      const f = join(dir, `damaged-${sig}.nc`);
      writeFileSync(f, b);
      const js = await describeHdf5Js(f, b.length);
      expect('declined' in js && js.declined, sig).toMatch(reason);
    }
  });

  it(
    "400 copies of a python3-netcdf4 file with a flipped bit in their metadata are each described or declined with a reason, never a throw, and a description kept is the library's",
    { timeout: 300_000 },
    async () => {
      const src = fixturePath('netcdf4-variety', 'groups.nc');
      const base = readFileSync(src);
      const size = base.length;
      // Metadata of this file lies before its first data bytes: flip bits in the first 6 KiB.
      let seed = 7;
      const rand = () => {
        seed = (seed * 1103515245 + 12345) % 2 ** 31;
        return seed / 2 ** 31;
      };
      let declined = 0;
      let described = 0;
      for (let i = 0; i < 400; i++) {
        const b = Buffer.from(base);
        const at = Math.floor(rand() * Math.min(6144, size));
        b[at] ^= 1 << Math.floor(rand() * 8);
        const f = join(dir, `mutant-${i}.nc`);
        writeFileSync(f, b);
        const js = await describeHdf5Js(f, size);
        if ('declined' in js) {
          expect(js.declined.length).toBeGreaterThan(0);
          expect(js.declined).not.toMatch(/JavaScript reader failed/);
          declined++;
        } else {
          described++;
          // A flip the checksums cannot see (version 1 structures carry none) must still give what the library gives, or the library refuses the file.
          const lib = (await libraryDescription(f)) as { error?: string };
          if (lib.error === undefined) expect(JSON.stringify(js), `mutant ${i}, byte ${at}`).toBe(JSON.stringify(lib));
        }
        rmSync(f);
      }
      expect(declined).toBeGreaterThan(0);
      expect(described).toBeGreaterThan(0);
    },
  );
});
