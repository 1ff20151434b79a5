import { beforeAll, describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { existsSync, mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Netcdf4Writer, h5wasmReady, type Nc4Spec } from '../../pipeline/demo/netcdf4-writer.ts';
import { dataStrings, dataValues, ncdump } from './ncdump.ts';

// Reference: the NetCDF-4 format (NetCDF User's Guide, "NetCDF-4 format" appendix: dimension
// scales, _Netcdf4Dimid); proved by Debian's ncdump (the reference C library) reading the files.

const spec = (): Nc4Spec => ({
  dims: [
    { name: 'valid_time', values: new BigInt64Array([3600n, 7200n, 10800n]), attrs: [['units', 'seconds since 1970-01-01']] },
    { name: 'latitude', values: new Float64Array([1, 0]), attrs: [['stored_direction', 'decreasing']] },
    { name: 'longitude', values: new Float64Array([10, 11]), attrs: [['units', 'degrees_east']] },
  ],
  coords: [
    { kind: 'scalar-int64', name: 'number', value: 0n, attrs: [['units', '1']] },
    { kind: 'strings', name: 'expver', dim: 'valid_time', values: ['0001', '0001', '0005'], attrs: [] },
  ],
  vars: [
    {
      name: 'x',
      dims: ['valid_time', 'latitude', 'longitude'],
      attrs: [
        ['units', 'K'],
        ['scale', { dtype: '<d', value: 0.5 }],
      ],
      chunks: [2, 2, 2],
      deflateLevel: 1,
    },
  ],
  globalAttrs: [['title', 'writer check (invented values)']],
});

beforeAll(async () => {
  await h5wasmReady();
});

describe('Netcdf4Writer (NetCDF-4 through h5wasm)', () => {
  it('ncdump reads the dimensions in the declared order, the coordinates, attributes and block-written values', () => {
    const dir = mkdtempSync(join(tmpdir(), 'heathours-nc4-'));
    const path = join(dir, 'x.nc');
    const w = new Netcdf4Writer(path, spec());
    w.writeBlock('x', 2, new Float32Array([1, 2, 3, 4, 5, 6, 7, 8]));
    w.writeBlock('x', 1, new Float32Array([9, NaN, 11, 12.5]));
    w.close();
    const cdl = ncdump(path);
    expect(cdl).toMatch(/dimensions:\n\tvalid_time = 3 ;\n\tlatitude = 2 ;\n\tlongitude = 2 ;/);
    expect(cdl).toContain('float x(valid_time, latitude, longitude) ;');
    expect(cdl).toContain('x:units = "K" ;');
    expect(cdl).toContain('x:scale = 0.5 ;');
    expect(cdl).toContain(':title = "writer check (invented values)" ;');
    expect(dataValues(cdl, 'x')).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, NaN, 11, 12.5]);
    expect(dataValues(cdl, 'valid_time')).toEqual([3600, 7200, 10800]);
    expect(dataStrings(cdl, 'expver')).toEqual(['0001', '0001', '0005']);
    expect(readdirSync(dir)).toEqual(['x.nc']);
  });

  it('two writes of the same content give the same bytes (HDF5 object times are pinned)', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'heathours-nc4-'));
    const write = (p: string) => {
      const w = new Netcdf4Writer(p, spec());
      w.writeBlock('x', 3, new Float32Array(12).fill(1));
      w.close();
      return createHash('sha256').update(readFileSync(p)).digest('hex');
    };
    const a = write(join(dir, 'a.nc'));
    await new Promise((r) => setTimeout(r, 1100));
    expect(write(join(dir, 'b.nc'))).toBe(a);
  });

  it('closing with steps missing throws and leaves no file behind', () => {
    const dir = mkdtempSync(join(tmpdir(), 'heathours-nc4-'));
    const path = join(dir, 'half.nc');
    const w = new Netcdf4Writer(path, spec());
    w.writeBlock('x', 2, new Float32Array(8));
    expect(() => w.close()).toThrow(/2\/3 steps/);
    expect(existsSync(path)).toBe(false);
    expect(readdirSync(dir)).toEqual([]);
  });
});
