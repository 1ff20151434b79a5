import { describe, expect, it } from 'vitest';
import { existsSync, mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { NetCDFReader } from 'netcdfjs';
import { Netcdf3Writer, type Nc3Header } from '../../pipeline/formats/netcdf3-writer.ts';
import { dataValues, ncdump } from '../demo/ncdump.ts';

// Reference: the NetCDF classic format specification (Unidata NetCDF User's Guide, "File Format
// Specifications"); checked with Debian's ncdump (the reference C library) and netcdfjs 4.0.0.

const header = (numRecords: number): Nc3Header => ({
  dims: [
    { name: 'x', length: 3 },
    { name: 'time', length: 'unlimited' },
  ],
  attrs: [
    { name: 'title', value: 'writer check (invented values)' },
    { name: 'version', value: { type: 'int', values: [3] } },
  ],
  vars: [
    { name: 'x', type: 'double', dims: ['x'], attrs: [{ name: 'units', value: 'm' }] },
    { name: 'flags', type: 'byte', dims: ['x'], attrs: [] },
    { name: 'time', type: 'int', dims: ['time'], attrs: [{ name: 'units', value: 'hours since 1900-01-01 00:00:00.0' }] },
    // 3 shorts = 6 bytes per record: padded to 8 inside each record (spec: vsize rounded up to 4).
    {
      name: 'a',
      type: 'short',
      dims: ['time', 'x'],
      attrs: [
        { name: 'scale_factor', value: { type: 'double', values: [0.5] } },
        { name: '_FillValue', value: { type: 'short', values: [-32767] } },
      ],
    },
    { name: 'b', type: 'float', dims: ['time', 'x'], attrs: [] },
  ],
  numRecords,
});

function fresh(): string {
  return mkdtempSync(join(tmpdir(), 'heathours-nc3-'));
}

describe('Netcdf3Writer (NetCDF-3 classic, CDF-1)', () => {
  it('writes a file that ncdump parses, with the dimensions, attributes and values written', () => {
    const dir = fresh();
    const path = join(dir, 'a.nc');
    const w = new Netcdf3Writer(path, header(2));
    w.writeFixed('x', [1.5, 2.5, -3.25]);
    w.writeFixed('flags', [1, -2, 127]);
    w.writeRecord({ time: [1051896], a: [-32767, 2, 32766], b: [0.25, 1e6, -7] });
    w.writeRecord({ time: [1051897], a: [-1, 0, 1], b: [NaN, 3, 4] });
    w.close();
    const cdl = ncdump(path);
    expect(cdl).toContain('time = UNLIMITED ; // (2 currently)');
    expect(cdl).toContain('x = 3 ;');
    expect(cdl).toContain(':title = "writer check (invented values)" ;');
    expect(cdl).toContain(':version = 3 ;');
    expect(cdl).toContain('short a(time, x) ;');
    expect(cdl).toContain('a:_FillValue = -32767s ;');
    expect(dataValues(cdl, 'x')).toEqual([1.5, 2.5, -3.25]);
    expect(dataValues(cdl, 'flags')).toEqual([1, -2, 127]);
    expect(dataValues(cdl, 'time')).toEqual([1051896, 1051897]);
    // ncdump prints the fill value as "_"; the other packed values as stored.
    expect(dataValues(cdl, 'a')).toEqual([NaN, 2, 32766, -1, 0, 1]);
    expect(dataValues(cdl, 'b').slice(0, 3)).toEqual([0.25, 1e6, -7]);
    expect(dataValues(cdl, 'b').slice(4)).toEqual([3, 4]);
    // netcdfjs 4.0.0 (an independent reader) agrees on the record layout; it returns each
    // record slab with its padding (vsize bytes: 4 shorts for 3 values), so compare the first 3.
    const r = new NetCDFReader(readFileSync(path));
    const a = r.getDataVariable('a') as number[][];
    expect(a.map((rec) => rec.slice(0, 3))).toEqual([
      [-32767, 2, 32766],
      [-1, 0, 1],
    ]);
    expect(r.getDataVariable('x')).toEqual([1.5, 2.5, -3.25]);
    expect(r.version).toBe('classic format');
    expect(readdirSync(dir)).toEqual(['a.nc']);
  });

  it('a single record variable of shorts is not padded within the record (spec special case)', () => {
    const path = join(fresh(), 'one.nc');
    const w = new Netcdf3Writer(path, {
      dims: [
        { name: 'time', length: 'unlimited' },
        { name: 'x', length: 3 },
      ],
      attrs: [],
      vars: [{ name: 's', type: 'short', dims: ['time', 'x'], attrs: [] }],
      numRecords: 3,
    });
    for (let k = 0; k < 3; k++) w.writeRecord({ s: [k, 10 + k, 20 + k] });
    w.close();
    expect(dataValues(ncdump(path), 's')).toEqual([0, 10, 20, 1, 11, 21, 2, 12, 22]);
    // header + 3 records × 6 bytes, no padding between records
    expect(readFileSync(path).length).toBe(
      new Netcdf3Writer(join(fresh(), 'x.nc'), {
        dims: [
          { name: 'time', length: 'unlimited' },
          { name: 'x', length: 3 },
        ],
        attrs: [],
        vars: [{ name: 's', type: 'short', dims: ['time', 'x'], attrs: [] }],
        numRecords: 0,
      }).beginOf('s') + 18,
    );
  });

  it('closing before every declared record is written throws and leaves no file, not even a temporary one', () => {
    const dir = fresh();
    const path = join(dir, 'half.nc');
    const w = new Netcdf3Writer(path, header(2));
    w.writeFixed('x', [1, 2, 3]);
    w.writeFixed('flags', [0, 0, 0]);
    w.writeRecord({ time: [1], a: [1, 2, 3], b: [1, 2, 3] });
    expect(() => w.close()).toThrow(/1\/2 records/);
    expect(existsSync(path)).toBe(false);
    expect(readdirSync(dir)).toEqual([]);
  });

  it('fixed variables must come in header order and slabs must have the declared size', () => {
    const w = new Netcdf3Writer(join(fresh(), 'o.nc'), header(1));
    expect(() => w.writeFixed('flags', [1, 2, 3])).toThrow(/expected fixed variable x/);
    w.writeFixed('x', [1, 2, 3]);
    w.writeFixed('flags', [1, 2, 3]);
    expect(() => w.writeRecord({ time: [1], a: [1, 2], b: [1, 2, 3] })).toThrow(/needs 3 values/);
    w.abort();
  });
});
