/**
 * Files the reader must refuse, each with a catalogued error naming the file: empty, truncated
 * (classic and NetCDF-4), CDF-5 (written by Debian's `ncgen -k nc5`), GRIB magic, HDF5 that is
 * not NetCDF-4 (written with h5wasm), and unknown bytes.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import h5wasm from 'h5wasm/node';
import { inspectFile, openDataset } from '../../pipeline/read/index.ts';
import { era5Cdl, ncgen, tempDir } from '../fixtures/read/era5-cdl.ts';
import { expectCatalogued } from './helpers.ts';

const dir = tempDir();
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const small = { layout: 'legacy' as const, start: '2020-01-01T00:00:00Z', hours: 6, lat: [1, 0], lon: [0, 1], vars: ['t2m' as const] };

describe('files that are not (supported) NetCDF', () => {
  it('an empty file is NetcdfFileEmpty', async () => {
    const p = join(dir, 'empty.nc');
    writeFileSync(p, '');
    const e = await expectCatalogued(inspectFile(p), 'NetcdfFileEmpty');
    expect(e.where.file).toBe(p);
  });

  it('a missing file is NetcdfFileNotFound', async () => {
    await expectCatalogued(inspectFile(join(dir, 'nope.nc')), 'NetcdfFileNotFound', /nope\.nc/);
  });

  it('a classic file cut in its data section is NetcdfFileTruncated with the size its header needs', async () => {
    const full = readFileSync(ncgen(dir, 'whole', era5Cdl(small)));
    const p = join(dir, 'cut.nc');
    writeFileSync(p, full.subarray(0, full.length - 10));
    await expectCatalogued(inspectFile(p), 'NetcdfFileTruncated', new RegExp(`needs at least ${full.length}`));
    await expectCatalogued(openDataset([p], { product: 'era5', require: ['airTemperature'] }), 'NetcdfFileTruncated', /cut\.nc/);
  });

  it('a classic file cut inside its header is NetcdfFileTruncated', async () => {
    const full = readFileSync(ncgen(dir, 'whole2', era5Cdl(small)));
    const p = join(dir, 'cuthead.nc');
    writeFileSync(p, full.subarray(0, 60));
    await expectCatalogued(inspectFile(p), 'NetcdfFileTruncated', /cuthead\.nc/);
  });

  it('a NetCDF-4 file cut short is NetcdfFileTruncated (its HDF5 superblock records the full length)', async () => {
    const full = readFileSync(ncgen(dir, 'whole4', era5Cdl({ ...small, layout: 'cds2024' }), 'nc4'));
    const p = join(dir, 'cut4.nc');
    writeFileSync(p, full.subarray(0, Math.floor(full.length / 2)));
    await expectCatalogued(inspectFile(p), 'NetcdfFileTruncated', /cut4\.nc.*superblock/);
  });

  it('a CDF-5 file (ncgen -k nc5) is NetcdfCdf5Unsupported with the nccopy command to convert it', async () => {
    const p = ncgen(dir, 'cdf5', era5Cdl(small), 'nc5');
    expect(readFileSync(p).subarray(0, 4)).toEqual(Buffer.from('CDF\x05', 'latin1'));
    await expectCatalogued(inspectFile(p), 'NetcdfCdf5Unsupported', /nccopy -k nc4/);
  });

  it('a GRIB file is NetcdfGribFile naming grib_to_netcdf and cdo', async () => {
    const p = join(dir, 'x.grib');
    writeFileSync(p, Buffer.concat([Buffer.from('GRIB'), Buffer.alloc(100)]));
    await expectCatalogued(inspectFile(p), 'NetcdfGribFile', /grib_to_netcdf.*cdo/);
  });

  it('an HDF5 file without dimension scales or netCDF attributes (written with h5wasm) is NetcdfNotNetcdf4', async () => {
    await h5wasm.ready;
    const p = join(dir, 'plain.h5');
    const f = new h5wasm.File(p, 'w');
    f.create_dataset({ name: 'values', data: new Float32Array([1, 2, 3, 4]), shape: [2, 2] });
    f.close();
    await expectCatalogued(inspectFile(p), 'NetcdfNotNetcdf4', /plain\.h5/);
  });

  it('unknown bytes are NetcdfUnknownFormat showing the first bytes', async () => {
    const p = join(dir, 'text.nc');
    writeFileSync(p, 'hello world, not netcdf');
    await expectCatalogued(inspectFile(p), 'NetcdfUnknownFormat', /hello wo/);
  });

  it('a time axis off the whole hour is NetcdfTimeNotHourly', async () => {
    const cdl = era5Cdl(small).replace('time:units = "hours since 1900-01-01 00:00:00.0"', 'time:units = "minutes since 1900-01-01 00:30:00"');
    await expectCatalogued(openDataset([ncgen(dir, 'half', cdl)], { product: 'era5', require: ['airTemperature'] }), 'NetcdfTimeNotHourly', /half\.nc/);
  });
});
