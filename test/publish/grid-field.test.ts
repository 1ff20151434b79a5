/**
 * The labelled grid the publish stage hands the layers and the per-cell NetCDF: a field put
 * together from merge tiles' piece files (pipeline/formats/grid-pieces.ts) carries its dims,
 * coordinates and units; the NetCDF writer refuses a field on another grid or in other units.
 * Outside checks: numpy (Debian's python3-numpy, /usr/bin/python3) reads the piece files by the
 * layout the file comment states; CF unit strings from the CF Metadata Conventions 1.8 §3.1
 * (UDUNITS names, "1" for a dimensionless number; from memory).
 */
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { closePieces, GridPiece, readGridField } from '../../pipeline/formats/grid-pieces.ts';
import { gridFields, gridFieldUnits } from '../../pipeline/publish/grid-fields.ts';
import { writeCellNetcdf } from '../../pipeline/publish/cell-netcdf.ts';
import { figureDefs } from '../../pipeline/reduce/figures.ts';
import type { Grid } from '../../pipeline/model/grid.ts';

// A 4-row × 3-column grid (coordinates invented for the test); two pieces hold rows 0–1 and 3.
const grid = { lat: Float64Array.of(-1.5, -0.5, 0.5, 1.5), lon: Float64Array.of(10, 11, 12) };

function writePieces(dir: string) {
  const a = new GridPiece([0, 2], 3, 2);
  const b = new GridPiece([3, 4], 3, 2);
  for (let f = 0; f < 2; f++) {
    for (const cell of [0, 2, 4]) a.set(f, cell, 100 * f + cell);
    for (const cell of [9, 11]) b.set(f, cell, 100 * f + cell);
  }
  return [a.write(join(dir, 'a.bin')), b.write(join(dir, 'b.bin'))];
}

describe('a gridded field put together from the pieces', () => {
  it('is a labelled grid (dims lat, lon; the grid coordinates; its units) whose values numpy reads from the piece files alike', () => {
    const dir = mkdtempSync(join(tmpdir(), 'hh-gridfield-'));
    const pieces = writePieces(dir);
    const fds = new Map<string, number>();
    let field: Grid<Float32Array>;
    try {
      field = readGridField(pieces, 1, grid, { units: 'h' }, fds);
    } finally {
      closePieces(fds);
    }
    expect(field.dims).toEqual(['lat', 'lon']);
    expect(field.coords.lat).toBe(grid.lat);
    expect(field.coords.lon).toBe(grid.lon);
    expect(field.attrs).toEqual({ units: 'h' });
    // numpy: field f of a piece of rows [y0, y1) is fromfile('<f4').reshape(2, y1 - y0, 3)[f], placed at rows y0 … y1.
    const py = [
      'import numpy as np, json, sys',
      'g = np.full((4, 3), np.nan, dtype="<f4")',
      'for path, y0, y1 in [(sys.argv[1], 0, 2), (sys.argv[2], 3, 4)]:',
      '    g[y0:y1] = np.fromfile(path, dtype="<f4").reshape(2, y1 - y0, 3)[1]',
      'print(json.dumps([None if np.isnan(v) else float(v) for v in g.ravel()]))',
    ].join('\n');
    const r = spawnSync('/usr/bin/python3', ['-c', py, pieces[0].path, pieces[1].path], { encoding: 'utf8' });
    expect(r.status, r.stderr).toBe(0);
    const expected = JSON.parse(r.stdout) as Array<number | null>;
    expect(Array.from(field.data, (v) => (Number.isNaN(v) ? null : v))).toEqual(expected);
    expect(expected).toEqual([100, null, 102, null, 104, null, null, null, null, 109, null, 111]);
  });

  it('has the units the per-cell NetCDF writes for its variable (CF 1.8 §3.1: h, h decade-1, degC, 1 for years used, p-values and classes)', () => {
    const defs = figureDefs(['moderate.acclimatized.sun']);
    const fields = gridFields(defs);
    const unitsOf = (figure: string, statistic: string) => gridFieldUnits(defs, fields.find((f) => f.figure === figure && f.statistic === statistic)!);
    expect(unitsOf('hours-lost-shift', 'mean')).toBe('h');
    expect(unitsOf('hours-lost-shift', 'years')).toBe('1');
    expect(unitsOf('hours-lost-shift', 'trend')).toBe('h decade-1');
    expect(unitsOf('hours-lost-shift', 'trend-p')).toBe('1');
    expect(unitsOf('mean-annual-temperature', 'baseline')).toBe('degC');
    expect(unitsOf('mean-annual-temperature', 'class')).toBe('1');
  });

  it('on another grid or in other units is refused by the per-cell NetCDF writer, which leaves no file', () => {
    const dir = mkdtempSync(join(tmpdir(), 'hh-gridfield-'));
    const defs = figureDefs(['moderate.acclimatized.sun']);
    const fields = gridFields(defs);
    const meta = { title: 't', invented: true, source: 's', history: 'h', baseline: [2020, 2021] as [number, number] };
    const good = (i: number): Grid<Float32Array> => ({
      dims: ['lat', 'lon'],
      coords: { lat: grid.lat, lon: grid.lon },
      attrs: { units: gridFieldUnits(defs, fields[i]) },
      data: new Float32Array(12).fill(1),
    });
    const shifted = { lat: grid.lat.map((v) => v + 1), lon: grid.lon };
    const path = join(dir, 'a.nc');
    expect(() => writeCellNetcdf(path, grid, defs, fields, meta, (i) => ({ ...good(i), coords: shifted }))).toThrow(/not on the file's \(lat, lon\) grid/);
    expect(existsSync(path)).toBe(false);
    expect(() => writeCellNetcdf(path, grid, defs, fields, meta, (i) => ({ ...good(i), attrs: { units: 'K' } }))).toThrow(/is in K, the variable in/);
    expect(existsSync(path)).toBe(false);
    writeCellNetcdf(path, grid, defs, fields, meta, good);
    const r = spawnSync('ncdump', ['-h', path], { encoding: 'utf8' });
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/lat = 4 ;/);
  });
});
