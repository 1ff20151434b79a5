/**
 * A build from data-store style ZIP archives (one member per stream) publishes byte for byte the
 * atlas built from the same files unzipped, and monthly files the same figures as the year. The
 * streams are cut from the invented small demo with Debian's `nccopy -V` (netcdf-bin), the
 * months with SciPy's NetCDF-3 writer (python3-scipy), the archives made with Info-ZIP's `zip`.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { writeDemoDataset } from '../../pipeline/demo/index.ts';
import { buildAtlas } from '../../pipeline/run/build-atlas.ts';
import { testAtlasYaml } from '../helpers/atlas-yaml.ts';
import { readTree, treeDifferences } from '../helpers/file-tree.ts';

let dir = '';
const INSTANT = 'time,latitude,longitude,t2m,d2m,sp,u10,v10';
const ACCUM = 'time,latitude,longitude,ssrd,fdir,strd';

/** The same configuration text for every build (its digest is part of what is published). */
const ATLAS_YAML = `${testAtlasYaml({ id: 'small', title: 'Small test atlas (invented data)', years: [2022, 2022], files: 'inputs/*' })}`;

/** Builds the atlas of folder `name` (its inputs/ already there). */
async function build(name: string): Promise<Map<string, Buffer>> {
  const cfg = join(dir, name, 'atlas.yaml');
  writeFileSync(cfg, ATLAS_YAML);
  await buildAtlas({ configPath: cfg, outDir: join(dir, name, 'out'), jobs: 1, quiet: true, dataOnly: true, cache: false });
  return readTree(join(dir, name, 'out'));
}

/**
 * Cuts a legacy-layout year into monthly files with scipy.io.netcdf_file (SciPy, the reference
 * Python library), values and attributes copied as stored (packed int16, same scale and offset).
 */
const SPLIT_PY = String.raw`import sys, numpy as np
from datetime import datetime, timedelta, timezone
from scipy.io import netcdf_file
src, outdir = sys.argv[1], sys.argv[2]
f = netcdf_file(src, 'r', mmap=False, maskandscale=False)
t = f.variables['time']
hours = t.data.astype('int64')  # hours since 1900-01-01 (the legacy layout)
base = datetime(1900, 1, 1, tzinfo=timezone.utc)
starts = [base + timedelta(hours=int(h) - 1) for h in hours]  # the hour each stamp ends
months = sorted({(s.year, s.month) for s in starts})
for (y, m) in months:
    idx = np.array([i for i, s in enumerate(starts) if (s.year, s.month) == (y, m)])
    out = netcdf_file(f"{outdir}/era5-{y}-{m:02d}.nc", 'w', version=1)
    for k, v in f._attributes.items():
        setattr(out, k, v)
    for d, n in sorted(f.dimensions.items(), key=lambda kv: kv[1] is not None):
        out.createDimension(d, n)
    for name, v in f.variables.items():
        nv = out.createVariable(name, v.data.dtype, v.dimensions)
        for k, a in v._attributes.items():
            setattr(nv, k, a)
        nv[:] = v.data[idx] if v.dimensions and v.dimensions[0] == 'time' else v.data
    out.close()
f.close()
`;

const savedTime = process.env.HEATHOURS_BUILD_TIME;
beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'hh-zip-build-'));
  process.env.HEATHOURS_BUILD_TIME = '2026-01-01T00:00:00.000Z';
  await writeDemoDataset({ outDir: join(dir, 'demo'), years: [2022], layout: 'legacy', grid: 'small', quiet: true });
  // The two streams of the year, as the data store splits them, and the mask.
  const streams = join(dir, 'plain/inputs');
  mkdirSync(streams, { recursive: true });
  execFileSync('nccopy', ['-V', INSTANT, join(dir, 'demo/era5-demo-2022.nc'), join(streams, 'era5-2022-instant.nc')]);
  execFileSync('nccopy', ['-V', ACCUM, join(dir, 'demo/era5-demo-2022.nc'), join(streams, 'era5-2022-accum.nc')]);
  execFileSync('cp', [join(dir, 'demo/era5-demo-lsm.nc'), join(streams, 'era5-lsm.nc')]);
  const members = ['era5-2022-instant.nc', 'era5-2022-accum.nc', 'era5-lsm.nc'].map((m) => join(streams, m));
  // The same year cut into monthly files (an hour in the month it starts in) by SciPy's NetCDF-3 writer.
  const monthly = join(dir, 'monthly/inputs');
  mkdirSync(monthly, { recursive: true });
  writeFileSync(join(dir, 'split.py'), SPLIT_PY);
  execFileSync('python3', [join(dir, 'split.py'), join(dir, 'demo/era5-demo-2022.nc'), monthly]);
  execFileSync('cp', [join(dir, 'demo/era5-demo-lsm.nc'), join(monthly, 'era5-lsm.nc')]);
  for (const [name, level] of [
    ['stored', '-0'],
    ['deflated', '-6'],
  ]) {
    mkdirSync(join(dir, name, 'inputs'), { recursive: true });
    execFileSync('zip', ['-q', '-X', level, '-j', join(dir, name, 'inputs/era5-2022.zip'), ...members]);
  }
}, 300_000);

afterAll(() => {
  if (savedTime === undefined) delete process.env.HEATHOURS_BUILD_TIME;
  else process.env.HEATHOURS_BUILD_TIME = savedTime;
  rmSync(dir, { recursive: true, force: true });
});

describe('build from ZIP archives of the two streams', () => {
  it('the stored archive (read in place), the deflated archive and the unzipped stream files publish byte-identical atlases', async () => {
    const plain = await build('plain');
    const stored = await build('stored');
    const deflated = await build('deflated');
    expect(plain.size).toBeGreaterThan(50);
    for (const other of [stored, deflated]) {
      expect(treeDifferences(plain, other)).toEqual([]);
    }
    // The inventory lists the members under the names unzip gives them, with the stream files' SHA-256.
    const inv = JSON.parse(plain.get('data/inventory.json')!.toString('utf8')) as { files: Array<{ name: string }> };
    expect(inv.files.map((f) => f.name).sort()).toEqual(['era5-2022-accum.nc', 'era5-2022-instant.nc', 'era5-lsm.nc']);
    // Only the deflated archive's three members were unpacked into the build's cache folder;
    // stored NetCDF-3 members are read in place.
    const unpacked = (name: string) =>
      existsSync(join(dir, name, '.heathours-cache/zip-members')) ? readdirSync(join(dir, name, '.heathours-cache/zip-members')) : [];
    expect(unpacked('stored')).toEqual([]);
    expect(unpacked('deflated').filter((f) => f.endsWith('.nc'))).toHaveLength(3);
  }, 600_000);

  it('monthly files of the same hours publish the same figures as the yearly streams: only the files that list the inputs differ', async () => {
    const plain = readTree(join(dir, 'plain/out'));
    const monthly = await build('monthly');
    const differing = treeDifferences(plain, monthly);
    // inventory.json lists the input files; manifest.json lists them and the digests of the
    // others; each region workbook and the per-cell NetCDF's `source` attribute state the number
    // of input files (3 against 13).
    expect(differing).toEqual(
      ['data/atlas-cells.nc', 'data/inventory.json', 'data/manifest.json', ...[...plain.keys()].filter((p) => p.endsWith('.xlsx'))].sort(),
    );
    // The per-cell NetCDF differs in that attribute only: netCDF-C's ncdump prints the same header and values otherwise.
    const dump = (name: string) =>
      execFileSync('ncdump', [join(dir, name, 'out/data/atlas-cells.nc')], { maxBuffer: 1 << 28 })
        .toString()
        .split('\n')
        .slice(1)
        .filter((l) => !/^\t\t:source = /.test(l));
    const [a, b] = [dump('plain'), dump('monthly')];
    expect(a.length).toBeGreaterThan(100);
    expect(b).toEqual(a);
    const inv = JSON.parse(monthly.get('data/inventory.json')!.toString('utf8')) as { files: Array<{ name: string }>; variables: unknown };
    expect(inv.files).toHaveLength(13);
    expect(inv.variables).toEqual(JSON.parse(plain.get('data/inventory.json')!.toString('utf8')).variables);
  }, 600_000);
});
