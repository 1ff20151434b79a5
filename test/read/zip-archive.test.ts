/**
 * ZIP archives as inputs (pipeline/read/zip-archive.ts). The archives are made by Info-ZIP's
 * `zip` (Debian package zip), the NetCDF members by Debian's `ncgen`, so both the container and
 * its members come from reference tools: the values read from a member must equal those read
 * from the same file unzipped, and the member's digest must be the file's SHA-256.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { copyFileSync, existsSync, readdirSync, readFileSync, rmSync, statSync, truncateSync, writeFileSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { join } from 'node:path';
import { openDataset } from '../../pipeline/read/index.ts';
import { listZipMembers } from '../../pipeline/read/zip-archive.ts';
import { tempDir, writeFixture, type FixtureSpec, type Short } from '../fixtures/read/era5-cdl.ts';
import { expectCatalogued } from './helpers.ts';

const dir = tempDir('heathours-zip-');
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const INSTANT: Short[] = ['t2m', 'd2m', 'sp', 'u10', 'v10'];
const ACCUM: Short[] = ['ssrd'];
let n = 0;
const fx = (spec: Partial<FixtureSpec> & Pick<FixtureSpec, 'layout'>, kind?: 'nc3' | 'nc4') =>
  writeFixture(
    dir,
    `f${n++}`,
    { start: '2020-01-01T00:00:00Z', hours: 24, lat: [10.5, 10.25, 10], lon: [-0.5, -0.25, 0, 0.25], vars: [...INSTANT, ...ACCUM], ...spec },
    kind,
  );

/** Zips `files` under the given member names with Info-ZIP (`-0` stored, `-9` deflated); `-j` drops folders. */
function zip(name: string, members: Record<string, string>, level: '-0' | '-9'): string {
  const sub = join(dir, `${name}-members`);
  execFileSync('mkdir', ['-p', sub]);
  for (const [m, f] of Object.entries(members)) copyFileSync(f, join(sub, m));
  const out = join(dir, `${name}.zip`);
  execFileSync('zip', ['-q', '-X', level, '-j', out, ...Object.keys(members).map((m) => join(sub, m))]);
  return out;
}

const sha = (f: string) => createHash('sha256').update(readFileSync(f)).digest('hex');
const tile = { y0: 0, y1: 3, x0: 0, x1: 4 };

async function values(paths: string[], memberCache: string) {
  const ds = await openDataset(paths, { product: 'era5', memberCache });
  try {
    const b = await ds.readBlock(0, ds.time.count, tile);
    return {
      files: ds.files,
      time: ds.time,
      notes: ds.notes,
      t2m: Array.from(b.fields.airTemperature!),
      ssrd: Array.from(b.fields.solarGlobal!),
      wind: Array.from(b.fields.windSpeed10m!),
    };
  } finally {
    await ds.close();
  }
}

describe('ZIP archives of the two streams (Info-ZIP zip, ncgen members)', () => {
  for (const [layout, kind] of [
    ['legacy', 'nc3'],
    ['cds2024', 'nc4'],
  ] as const) {
    for (const level of ['-0', '-9'] as const) {
      it(`${layout} members, ${level === '-0' ? 'stored' : 'deflated'}: the archive reads the same values, names, sizes and SHA-256 as the unzipped files`, async () => {
        const extra = layout === 'cds2024' ? { expver: Array(24).fill('0001') } : {};
        const inst = fx({ layout, vars: INSTANT, ...extra }, kind);
        const acc = fx({ layout, vars: ACCUM, ...extra }, kind);
        const names = { 'data_stream-oper_stepType-instant.nc': inst, 'data_stream-oper_stepType-accum.nc': acc };
        const archive = zip(`z${n++}`, names, level);
        const cache = join(dir, `cache${n++}`);
        const plainDir = join(dir, `plain${n++}`);
        execFileSync('mkdir', ['-p', plainDir]);
        execFileSync('unzip', ['-q', archive, '-d', plainDir]);
        const plain = readdirSync(plainDir)
          .map((f) => join(plainDir, f))
          .sort();
        const fromZip = await values([archive], cache);
        const fromFiles = await values(plain, join(dir, `cache${n++}`));
        expect(fromZip.t2m).toEqual(fromFiles.t2m);
        expect(fromZip.ssrd).toEqual(fromFiles.ssrd);
        expect(fromZip.wind).toEqual(fromFiles.wind);
        const byName = (fs: typeof fromZip.files) => [...fs].sort((a, b) => a.name.localeCompare(b.name));
        expect(byName(fromZip.files)).toEqual(byName(fromFiles.files));
        // The digest of a member is the SHA-256 of the unzipped file (sha256sum's value, via node:crypto).
        for (const f of fromZip.files) expect(f.sha256).toBe(sha(join(plainDir, f.name)));
        // Stored classic members are read in place: nothing is unpacked. Others are unpacked once.
        const unpacked = existsSync(cache) ? readdirSync(cache) : [];
        if (level === '-0' && kind === 'nc3') expect(unpacked).toEqual([]);
        else expect(unpacked.length).toBe(2);
        expect(unpacked.filter((f) => f.endsWith('.part'))).toEqual([]);
      });
    }
  }

  it('the central directory as yauzl reads it agrees with `unzip -Z -v` (methods, sizes, CRC-32)', async () => {
    const a = fx({ layout: 'legacy', vars: INSTANT });
    const b = fx({ layout: 'legacy', vars: ACCUM });
    const archive = zip(`zv${n++}`, { 'i.nc': a, 'a.nc': b }, '-9');
    const members = await listZipMembers(archive);
    const zinfo = execFileSync('unzip', ['-Z', '-v', archive]).toString();
    for (const m of members) {
      const block = zinfo.split(/There is no zipfile comment|Central directory entry #\d+:/).find((s) => s.includes(`  ${m.name}\n`))!;
      expect(block).toMatch(new RegExp(`\\n\\s+compressed size:\\s+${m.compressedSize} bytes`));
      expect(block).toMatch(new RegExp(`uncompressed size:\\s+${m.uncompressedSize} bytes`));
      expect(block).toMatch(new RegExp(`32-bit CRC value \\(hex\\):\\s+${m.crc32.toString(16).padStart(8, '0')}`));
      expect(m.method).toBe(8);
    }
  });

  it('streams of different lengths are joined on their common hours; the hours only one stream has are reported', async () => {
    const inst = fx({ layout: 'legacy', vars: INSTANT, hours: 30 });
    const acc = fx({ layout: 'legacy', vars: ACCUM, hours: 24 });
    const r = await values([inst, acc], join(dir, `cache${n++}`));
    expect(r.time).toEqual({ start: Date.UTC(2020, 0, 1), count: 24 });
    expect(r.notes).toHaveLength(5);
    expect(r.notes[0]).toMatch(/^t2m has the hours 2020-01-02T00:00:00Z to 2020-01-02T05:00:00Z \(in f\d+\.nc\) that ssrd lack\(s\)/);
  });
});

describe('ZIP archives: bad archives are catalogued errors, nothing half-written', () => {
  const good = () => zip(`g${n++}`, { 'i.nc': fx({ layout: 'legacy', vars: INSTANT }), 'a.nc': fx({ layout: 'legacy', vars: ACCUM }) }, '-0');

  it('a truncated archive (download cut short: no central directory) is ZipArchiveUnreadable', async () => {
    const z = good();
    truncateSync(z, Math.floor(statSync(z).size * 0.7));
    await expectCatalogued(openDataset([z], { product: 'era5' }), 'ZipArchiveUnreadable', /End of central directory record signature not found/);
  });

  it('a member that is not NetCDF is ZipMemberNotNetcdf naming the member', async () => {
    const txt = join(dir, 'readme.txt');
    writeFileSync(txt, 'hello');
    const z = zip(`t${n++}`, { 'i.nc': fx({ layout: 'legacy', vars: INSTANT }), 'readme.txt': txt }, '-0');
    await expectCatalogued(openDataset([z], { product: 'era5' }), 'ZipMemberNotNetcdf', /member readme\.txt of .*t\d+\.zip starts with bytes hello/);
  });

  it('a GRIB member keeps the GRIB error with its conversion command', async () => {
    const g = join(dir, 'x.grib');
    writeFileSync(g, Buffer.concat([Buffer.from('GRIB'), Buffer.alloc(60)]));
    const z = zip(`gr${n++}`, { 'x.grib': g }, '-0');
    await expectCatalogued(openDataset([z], { product: 'era5' }), 'NetcdfGribFile');
  });

  it('a stored member with a flipped data byte fails its CRC-32: ZipMemberDamaged', async () => {
    const z = good();
    const m = (await listZipMembers(z)).find((x) => x.name === 'i.nc')!;
    const buf = readFileSync(z);
    const at = m.dataStart + m.uncompressedSize - 3; // in the last record's values, not the header
    buf[at] ^= 0x55;
    const bad = join(dir, `flip${n++}.zip`);
    writeFileSync(bad, buf);
    await expectCatalogued(openDataset([bad], { product: 'era5' }), 'ZipMemberDamaged', /member i\.nc .* CRC-32/);
  });

  it('a deflated member with damaged data is ZipMemberDamaged and leaves no file of it in the member cache (the sound member read before it stays)', async () => {
    const acc = fx({ layout: 'legacy', vars: ACCUM });
    const z = zip(`d${n++}`, { 'i.nc': fx({ layout: 'legacy', vars: INSTANT }), 'a.nc': acc }, '-9');
    const m = (await listZipMembers(z)).find((x) => x.name === 'i.nc')!;
    const buf = readFileSync(z);
    for (let k = 0; k < 16; k++) buf[m.dataStart + Math.floor(m.compressedSize / 2) + k] ^= 0xff;
    const bad = join(dir, `dbad${n++}.zip`);
    writeFileSync(bad, buf);
    const cache = join(dir, `cache${n++}`);
    await expectCatalogued(openDataset([bad], { product: 'era5', memberCache: cache }), 'ZipMemberDamaged', /member i\.nc of/);
    // Members are read in name order: a.nc (sound) was unpacked before i.nc failed.
    expect(readdirSync(cache)).toHaveLength(1);
    expect(readFileSync(join(cache, readdirSync(cache)[0])).equals(readFileSync(acc))).toBe(true);
  });

  it('an archive with only a folder is ZipArchiveEmpty', async () => {
    const sub = join(dir, `emptydir${n++}`);
    execFileSync('mkdir', ['-p', join(sub, 'nothing')]);
    const z = join(dir, `e${n++}.zip`);
    execFileSync('zip', ['-q', '-r', z, 'nothing'], { cwd: sub });
    await expectCatalogued(openDataset([z], { product: 'era5' }), 'ZipArchiveEmpty');
  });

  it('an encrypted member (zip -P) is ZipMemberUnsupported saying so', async () => {
    const f = fx({ layout: 'legacy', vars: INSTANT });
    const z = join(dir, `enc${n++}.zip`);
    execFileSync('zip', ['-q', '-j', '-P', 'secret', z, f]);
    await expectCatalogued(openDataset([z], { product: 'era5' }), 'ZipMemberUnsupported', /it is encrypted/);
  });

  it('a member compressed with bzip2 (zip -Z bzip2, method 12) is ZipMemberUnsupported naming the method', async () => {
    const f = fx({ layout: 'legacy', vars: INSTANT });
    const z = join(dir, `bz${n++}.zip`);
    execFileSync('zip', ['-q', '-j', '-Z', 'bzip2', z, f]);
    await expectCatalogued(openDataset([z], { product: 'era5' }), 'ZipMemberUnsupported', /compression method 12/);
  });

  it('a member cache that cannot be made (its path is a file) is ZipMemberCacheUnwritable', async () => {
    const z = zip(`c${n++}`, { 'i.nc': fx({ layout: 'legacy', vars: INSTANT }), 'a.nc': fx({ layout: 'legacy', vars: ACCUM }) }, '-9');
    const blocker = join(dir, `not-a-folder${n++}`);
    writeFileSync(blocker, 'x');
    await expectCatalogued(openDataset([z], { product: 'era5', memberCache: join(blocker, 'cache') }), 'ZipMemberCacheUnwritable', /unpacking .*a\.nc into/);
  });
});
