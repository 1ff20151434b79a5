/**
 * One test per defect class the fuzzer found, each on the smallest damaged file that showed it
 * (test/fixtures/fuzz, made by make-fixtures.ts from the invented demo files; README there).
 * Before the fixes each ended in an internal error, a hang, HDF5's diagnostics on the terminal,
 * a crash or a wrong error; now each is the catalogued error named here, and nothing is printed.
 * Debian's netCDF-C tools (ncdump) agree that each NetCDF fixture is damaged.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { copyFileSync, mkdtempSync, readFileSync, readdirSync, rmSync, truncateSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { inspectFile, openDataset } from '../../pipeline/read/index.ts';
import { parseClassicHeader } from '../../pipeline/read/classic-header.ts';
import { describeNetcdf4, HDF5_METADATA_TIMEOUT_MS, readNetcdf4Strings, setHdf5HeapCheck, setHdf5MetadataTimeout } from '../../pipeline/read/hdf5-meta.ts';
import { parseConfig } from '../../pipeline/config/load.ts';
import { runPoint } from '../../pipeline/commands/point.ts';
import { buildAtlas } from '../../pipeline/run/build-atlas.ts';
import { expectCataloguedAsync, expectCatalogued } from '../helpers/catalogued.ts';

const FX = new URL('../fixtures/fuzz/', import.meta.url).pathname;
const ROOT = new URL('../../', import.meta.url).pathname;
const out = mkdtempSync(join(tmpdir(), 'hh-regressions-'));
afterAll(() => rmSync(out, { recursive: true, force: true }));

/** Runs the CLI's `inspect` on a fixture: exit status and what it printed to stderr. */
function cliInspect(file: string, ...flags: string[]): { status: number | null; stderr: string } {
  const r = spawnSync(process.execPath, [join(ROOT, 'bin/heathours.mjs'), 'inspect', ...flags, file], { encoding: 'utf8', timeout: 120_000 });
  return { status: r.status, stderr: r.stderr };
}

/** netCDF-C's ncdump fails (or does not finish within 10 s) on the file. */
function ncdumpRefuses(file: string): boolean {
  const r = spawnSync('ncdump', ['-h', file], { timeout: 10_000, stdio: 'ignore' });
  return r.status !== 0;
}

describe('NetCDF-3 header damage', () => {
  it('a variable naming a dimension the file lacks (was: TypeError reading "name") is NetcdfHeaderInvalid naming the variable and byte', async () => {
    const f = join(FX, 'classic-dimension-id-out-of-range.nc');
    expect(ncdumpRefuses(f)).toBe(true);
    const e = await expectCataloguedAsync(
      inspectFile(f),
      'NetcdfHeaderInvalid',
      /variable lsm names dimension 7, but the file has 3 dimension\(s\) \(header byte \d+\)/,
    );
    expect(e.where).toMatchObject({ file: f, variable: 'lsm' });
  });

  it('a name length beyond the file (was: reported as a file cut short) is NetcdfHeaderInvalid, not NetcdfFileTruncated', async () => {
    const f = join(FX, 'classic-name-length-beyond-file.nc');
    expect(ncdumpRefuses(f)).toBe(true);
    await expectCataloguedAsync(inspectFile(f), 'NetcdfHeaderInvalid', /is 32767 bytes long \(1 to 256 allowed\)/);
  });

  it('an attribute whose count has a flipped bit (was: megabytes read as its value, then an error about the bytes after it) is NetcdfHeaderInvalid naming that attribute, read no further', async () => {
    const f = join(FX, 'classic-attribute-length-bit-flip.nc');
    expect(ncdumpRefuses(f)).toBe(true);
    await expectCataloguedAsync(
      inspectFile(f),
      'NetcdfHeaderInvalid',
      /attribute Conventions of the file claims 2097158 values, more than the file holds \(header byte 92\)/,
    );
    // Padded with zeros to 3 MiB, the file could hold the 2 MiB the count claims: the cap on an
    // attribute's size names it (before: "the name of attribute 2 of the file is 0 bytes long
    // (header byte 2097256)", after reading 2 MiB of data as its value).
    const padded = join(out, 'padded.nc');
    copyFileSync(f, padded);
    truncateSync(padded, 3 << 20);
    try {
      expect(ncdumpRefuses(padded)).toBe(true);
      await expectCataloguedAsync(
        inspectFile(padded),
        'NetcdfHeaderInvalid',
        /attribute Conventions of the file claims 2097158 values \(2097158 bytes\), more than the 1 MiB an attribute may hold: its length is damaged \(header byte 92\)/,
      );
    } finally {
      rmSync(padded);
    }
  });

  it('a header of many attributes, each under the cap, that would run past 16 MiB is NetcdfHeaderInvalid, not read whole', () => {
    // CDF-1, no records, no dimensions, 20 global byte attributes of 1,000,000 values each, no
    // variables (the grammar of the NetCDF classic format specification).
    const n = 20;
    const each = 4 + 4 + 4 + 4 + 1_000_000; // name length, name "aNN" padded, type, count, values (a multiple of 4)
    const head = new Uint8Array(4 + 4 + 8 + 8 + n * each + 8);
    const v = new DataView(head.buffer);
    head.set([0x43, 0x44, 0x46, 1]);
    let p = 16;
    v.setUint32(p, 12);
    v.setUint32(p + 4, n);
    p += 8;
    for (let i = 0; i < n; i++) {
      v.setUint32(p, 3);
      head.set([0x61, 0x30 + Math.floor(i / 10), 0x30 + (i % 10)], p + 4);
      v.setUint32(p + 8, 1);
      v.setUint32(p + 12, 1_000_000);
      p += each;
    }
    expectCatalogued(
      () => parseClassicHeader(head, head.length, 'many-attributes.nc'),
      'NetcdfHeaderInvalid',
      /attribute a16 of the file would end the header after 17000\d+ bytes, beyond the 16 MiB a header may take/,
    );
    // 16 of them (16 MB, under 16 MiB) are a header like any other.
    const sixteen = head.slice(0, 24 + 16 * each + 8);
    new DataView(sixteen.buffer).setUint32(20, 16);
    sixteen.fill(0, sixteen.length - 8); // the variable list: absent
    expect(parseClassicHeader(sixteen, sixteen.length, 'sixteen-attributes.nc').globalAttributes).toHaveLength(16);
  });

  it("a time value beyond any date (was: RangeError) is NetcdfTimeValueInvalid at the file and time variable; inspect lists it as the axis's problem", async () => {
    const f = join(FX, 'classic-time-beyond-any-date.nc');
    const e = await expectCataloguedAsync(
      openDataset([f], { product: 'era5', require: ['airTemperature'] }),
      'NetcdfTimeValueInvalid',
      /time value 1e\+300 \(step 2\)/,
    );
    expect(e.where).toMatchObject({ file: f, variable: 'time' });
    const r = await inspectFile(f);
    expect(r.timeAxes[0].problem?.code).toBe('NetcdfTimeValueInvalid');
  });
});

describe('NetCDF-4 (HDF5) damage', () => {
  it('a flipped bit in an object header (was: "error - name not defined!" as an internal error, HDF5-DIAG on the terminal) is NetcdfReadFailed with HDF5\'s reason; its diagnostics only with --verbose', async () => {
    const f = join(FX, 'netcdf4-object-header-bit-flip.nc');
    expect(ncdumpRefuses(f)).toBe(true);
    const e = await expectCataloguedAsync(inspectFile(f), 'NetcdfReadFailed', /the HDF5 library says: .*checksum/);
    expect(e.details).toMatch(/HDF5-DIAG: Error detected/);
    const plain = cliInspect(f);
    // A damaged input file is an input-data error: exit 3 (pipeline/commands/exit-codes.ts).
    expect(plain.status).toBe(3);
    expect(plain.stderr).toMatch(/^error \[NetcdfReadFailed\][\s\S]*run with --verbose for details/);
    expect(plain.stderr).not.toMatch(/HDF5-DIAG|major:|minor:|internal error/);
    const verbose = cliInspect(f, '--verbose');
    expect(verbose.status).toBe(3);
    expect(verbose.stderr).toMatch(/details:\n {4}HDF5-DIAG: Error detected[\s\S]*minor:/);
  });

  it('a global heap whose free space has size 0 (was: HDF5 looping for ever, then the time limit; ncdump loops too) is NetcdfReadFailed naming the collection, before the time limit', async () => {
    const f = join(FX, 'netcdf4-global-heap-empty-free-space.nc');
    const nc = spawnSync('ncdump', ['-h', f], { timeout: 5_000, stdio: 'ignore' });
    expect(nc.signal ?? nc.error?.message).toBeTruthy(); // killed at its time limit: it loops
    setHdf5MetadataTimeout(3_000);
    try {
      const e = await expectCataloguedAsync(
        inspectFile(f),
        'NetcdfReadFailed',
        /reading the metadata: the global heap collection at byte 6144 is damaged: the free space at byte \d+ claims 0 bytes, so its walk cannot advance/,
      );
      // Refused by the check, not ended by the 3 s time limit (that is NetcdfReadStuck).
      expect(e.where).toMatchObject({ file: f });
    } finally {
      setHdf5MetadataTimeout(HDF5_METADATA_TIMEOUT_MS);
    }
  });

  it('a global heap collection read by HDF5 in two parts (first 4096 bytes, then the rest) whose free space has size 0 (was: the time limit, NetcdfReadStuck; ncdump loops) is NetcdfReadFailed naming the file, expver and the collection, before the time limit', async () => {
    const f = join(FX, 'netcdf4-global-heap-two-part-read.nc');
    const nc = spawnSync('ncdump', ['-v', 'expver', f], { timeout: 5_000, stdio: 'ignore' });
    expect(nc.signal ?? nc.error?.message).toBeTruthy(); // killed at its time limit: it loops
    setHdf5MetadataTimeout(3_000);
    try {
      const e = await expectCataloguedAsync(
        openDataset([f], { product: 'era5', require: ['airTemperature'], digests: false }),
        'NetcdfReadFailed',
        /reading the text of variable expver: the global heap collection at byte 8792 is damaged: the free space at byte \d+ claims 0 bytes/,
      );
      // Refused by the check, not ended by the 3 s time limit (that is NetcdfReadStuck).
      expect(e.where).toMatchObject({ file: f, variable: 'expver' });
    } finally {
      setHdf5MetadataTimeout(HDF5_METADATA_TIMEOUT_MS);
    }
  });

  it('the same file with the global heap check off still ends (NetcdfReadStuck after the time limit), the next file reads, and the same unchanged file fails at once', async () => {
    const f = join(FX, 'netcdf4-global-heap-empty-free-space.nc');
    setHdf5MetadataTimeout(3_000);
    setHdf5HeapCheck(false);
    const copy = join(out, 'stuck.nc');
    copyFileSync(f, copy);
    try {
      const t0 = performance.now();
      await expectCataloguedAsync(inspectFile(copy), 'NetcdfReadStuck', /did not finish within 3 s; the HDF5/);
      expect(performance.now() - t0).toBeLessThan(20_000);
      // A sound file right after: the metadata worker was replaced.
      const ok = await inspectFile(join(FX, 'netcdf4-object-header-bit-flip.nc')).catch((e) => e);
      expect(ok.code).toBe('NetcdfReadFailed');
      // The same unchanged file again (as `build` opens it after `inspect`): at once, not after
      // another 3 s of looping.
      const t1 = performance.now();
      await expectCataloguedAsync(inspectFile(copy), 'NetcdfReadStuck', /did not finish within 3 s earlier in this run, and the file has not changed since/);
      expect(performance.now() - t1).toBeLessThan(1_500);
      // Another request about the same file (its description, its text) fails at once too, naming
      // the request that looped.
      for (const other of [() => describeNetcdf4(copy), () => readNetcdf4Strings(copy, 'expver', [1])]) {
        const t = performance.now();
        await expectCataloguedAsync(other(), 'NetcdfReadStuck', /reading the metadata did not finish within 3 s earlier in this run/);
        expect(performance.now() - t).toBeLessThan(1_500);
      }
      // Changed (here only its time stamp): asked again, and HDF5 loops again.
      utimesSync(copy, new Date(), new Date(Date.now() + 60_000));
      const t2 = performance.now();
      await expectCataloguedAsync(inspectFile(copy), 'NetcdfReadStuck', /did not finish within 3 s; the HDF5/);
      expect(performance.now() - t2).toBeGreaterThanOrEqual(2_900);
    } finally {
      rmSync(copy, { force: true });
      setHdf5MetadataTimeout(HDF5_METADATA_TIMEOUT_MS);
      setHdf5HeapCheck(true);
    }
  });

  it('a text label longer than its object in the global heap (was: HDF5 aborted in the metadata worker and the file asked about next was reported unreadable) is NetcdfReadFailed naming the file and expver; the next file reads', async () => {
    const f = join(FX, 'netcdf4-text-length-mismatch.nc');
    const sound = join(FX, 'netcdf4-text-length-mismatch-sound.nc');
    // Debian's ncdump (netCDF-C over native HDF5) prints the labels of both files: the damage is
    // found by the HDF5 build inside h5wasm, which checks the object's size and aborts.
    expect(spawnSync('ncdump', ['-v', 'expver', sound], { encoding: 'utf8' }).stdout).toMatch(/expver = "0001", "0005" ;/);
    const e = await expectCataloguedAsync(
      openDataset([f], { product: 'era5', require: ['airTemperature'], digests: false }),
      'NetcdfReadFailed',
      /reading the text of variable expver: .*Aborted[\s\S]*object size does not match/,
    );
    expect(e.where).toMatchObject({ file: f, variable: 'expver' });
    // Asked right after (the worker that aborted is still on its way out): a new worker answers.
    expect((await describeNetcdf4(sound)).variables.map((v) => v.name)).toContain('expver');
    // Asked in the same moment: the request queued behind the aborting one is asked again.
    const [bad, good] = await Promise.allSettled([readNetcdf4Strings(f, 'expver', [2]), readNetcdf4Strings(sound, 'expver', [2])]);
    expect(bad.status === 'rejected' && (bad.reason as { code?: string }).code).toBe('NetcdfReadFailed');
    expect(good).toEqual({ status: 'fulfilled', value: ['0001', '0005'] });
  });
});

describe('text inputs', () => {
  it('a quote never closed after the header (was: the process died of an unhandled stream error) is CsvMalformed naming line 2, with no output left', async () => {
    const o = join(out, 'quote.csv');
    await expectCataloguedAsync(
      runPoint(join(FX, 'point-unclosed-quote.csv'), o, { quiet: true }),
      'CsvMalformed',
      /opened on line 2 is never closed[\s\S]*row 2/,
    );
    expect(readdirSync(out)).toEqual([]);
  });

  it('a workload-classes file that is not YAML stops `build` with ConfigSyntax naming it (was: internal YAMLParseError), before any data is read', async () => {
    const classes = join(out, 'classes.yaml');
    writeFileSync(classes, 'classes:\n  - id: low\n   metabolicRate: [180\n');
    writeFileSync(join(out, 'x.nc'), '');
    const cfg = join(out, 'atlas.yaml');
    // The demo's atlas.yaml without its workforce and scenarios (their files are not there: this is about the classes file).
    const demo = readFileSync(join(ROOT, 'content/atlas.yaml'), 'utf8').replace(/^(workforce|scenarios):\n(?:(?: .*|#.*)?\n)*/gm, '');
    writeFileSync(
      cfg,
      demo.replace('../data/demo/*.nc', 'x.nc').replace('regions: regions', `regions: ${join(ROOT, 'content/regions')}\nwork:\n  classesFile: classes.yaml`),
    );
    const e = await expectCataloguedAsync(
      buildAtlas({ configPath: cfg, outDir: join(out, 'dist'), jobs: 1, quiet: true, dataOnly: true, cache: false }),
      'ConfigSyntax',
    );
    expect(e.where.file).toBe(classes);
    for (const f of ['classes.yaml', 'x.nc', 'atlas.yaml']) rmSync(join(out, f));
  });

  it('aliases that expand too far, or come before their anchor (was: ReferenceError), are ConfigSyntax naming the file', () => {
    for (const [name, re] of [
      ['atlas-alias-bomb.yaml', /alias/i],
      ['atlas-alias-before-anchor.yaml', /alias|anchor/i],
    ] as const) {
      const f = join(FX, name);
      expectCatalogued(() => parseConfig(readFileSync(f, 'utf8'), f), 'ConfigSyntax', re);
    }
  });
});
