/**
 * The per-cell NetCDF (data/atlas-cells.nc, pipeline/publish/cell-netcdf.ts) of a real pipeline
 * build (the invented small demo, test/site/pipeline-data.ts), read with the netCDF reference
 * library: `ncdump` (Debian's netcdf-bin) for the structure and CF attributes, and netCDF-C through
 * Python (Debian's python3-netcdf4, /usr/bin/python3) for the values, which equal the per-cell
 * tables' rows (2-decimal rounding); and the map layers' GeoTIFFs as GDAL sees them (gdalinfo,
 * Debian's gdal-bin): internal tiles of 256 × 256, EPSG:4326, the no-data value.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { readFileSync, writeFileSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { buildPipelineData } from '../site/pipeline-data.ts';
import { readCellTables } from '../helpers/cell-tables.ts';
import type { Manifest } from '../../pipeline/publish/manifest.ts';
import type { CellFiguresIndex } from '../../pipeline/publish/cell-figures.ts';
import { writeGeoTiff } from '../../pipeline/publish/layers/geotiff-write.ts';

let dataDir = '';

beforeAll(async () => {
  dataDir = join((await buildPipelineData()).dataDir, 'data');
}, 300_000);

describe('the per-cell NetCDF', () => {
  it('is a CF-1.8 NetCDF (64-bit offset) that ncdump reads: dims period × evaluation × lat × lon, units, long names, fill values', () => {
    const r = spawnSync('ncdump', ['-h', join(dataDir, 'atlas-cells.nc')], { encoding: 'utf8' });
    expect(r.status, r.stderr).toBe(0);
    const h = r.stdout;
    expect(h).toMatch(/period = 13 ;/);
    expect(h).toMatch(/evaluation = 16 ;/);
    expect(h).toMatch(/float hours_lost_shift_mean\(period, evaluation, lat, lon\) ;/);
    expect(h).toMatch(/hours_lost_shift_mean:units = "h" ;/);
    expect(h).toMatch(/hours_lost_shift_p90:_FillValue = -9999.f ;/);
    expect(h).toMatch(/short hours_above_limit_shift_years_used\(period, evaluation, lat, lon\) ;/);
    expect(h).toMatch(/float mean_annual_temperature\(lat, lon\) ;/);
    expect(h).toMatch(/niche_class:flag_meanings = "core second margin outside" ;/);
    expect(h).toMatch(/lat:units = "degrees_north" ;/);
    expect(h).toMatch(/:Conventions = "CF-1.8" ;/);
    expect(h).toMatch(/INVENTED DATA/);
    const kind = spawnSync('ncdump', ['-k', join(dataDir, 'atlas-cells.nc')], { encoding: 'utf8' });
    expect(kind.stdout.trim()).toBe('64-bit offset');
  });

  it('holds, read with netCDF-C, the numbers of every row of the per-cell tables (to their 2 decimals)', () => {
    const rows = readCellTables(dataDir).trim().split('\n');
    const head = rows[0].split(',');
    const col = (n: string) => head.indexOf(n);
    const index = JSON.parse(readFileSync(join(dataDir, 'cells/index.json'), 'utf8')) as CellFiguresIndex;
    const periods = index.periods;
    const work = mkdtempSync(join(tmpdir(), 'hh-nc-'));
    // Every row as: variable, period index, evaluation key, cell → the expected mean, median, p90, years.
    const wanted = rows.slice(1).map((line) => {
      const c = line.split(',');
      return [
        c[col('figure')].replace(/-/g, '_'),
        periods.indexOf(c[col('period')]),
        `${c[col('workload_class')]}.${c[col('acclimatization')]}.${c[col('exposure')]}`,
        Number(c[col('cell_id')]),
        c[col('mean')],
        c[col('median')],
        c[col('p90')],
        Number(c[col('years_used')]),
      ];
    });
    writeFileSync(join(work, 'rows.json'), JSON.stringify(wanted));
    const script = `
import json, netCDF4, numpy
d = netCDF4.Dataset(${JSON.stringify(join(dataDir, 'atlas-cells.nc'))})
keys = [str(k) for k in netCDF4.chartostring(d['evaluation'][:])]
nlon = len(d['lon'])
bad = 0; n = 0; nonzero = 0
for fig, p, key, cell, mean, median, p90, years in json.load(open(${JSON.stringify(join(work, 'rows.json'))})):
    e = keys.index(key); y, x = divmod(cell, nlon)
    for stat, want in (('mean', mean), ('median', median), ('p90', p90)):
        v = d[fig + '_' + stat][p, e, y, x]
        got = None if v is numpy.ma.masked else float(v)
        if want == '':
            ok = got is None
        else:
            ok = got is not None and abs(got - float(want)) <= 0.005 + 1e-4 * abs(float(want))
            nonzero += float(want) > 0
        bad += not ok; n += 1
    bad += int(d[fig + '_years_used'][p, e, y, x]) != years
print(json.dumps({'checked': n, 'bad': bad, 'nonzero': nonzero}))
`;
    const r = spawnSync('/usr/bin/python3', ['-c', script], { encoding: 'utf8', maxBuffer: 1 << 26 });
    expect(r.status, r.stderr).toBe(0);
    const out = JSON.parse(r.stdout.trim()) as { checked: number; bad: number; nonzero: number };
    expect(out.checked).toBe(3 * (rows.length - 1));
    expect(out.bad).toBe(0);
    expect(out.nonzero).toBeGreaterThan(1000);
  }, 120_000);

  it('is listed in the manifest as a NetCDF artefact, and the map chunks index names it and the band tables', () => {
    const m = JSON.parse(readFileSync(join(dataDir, 'manifest.json'), 'utf8')) as Manifest;
    expect(m.artefacts.find((a) => a.path === 'data/atlas-cells.nc')?.kind).toBe('netcdf');
    const index = JSON.parse(readFileSync(join(dataDir, 'cells/index.json'), 'utf8')) as CellFiguresIndex;
    expect(index.netcdf).toBe('data/atlas-cells.nc');
    expect(index.tables.length).toBeGreaterThan(0);
    for (const t of index.tables) expect(m.artefacts.some((a) => a.path === t.path && a.kind === 'table')).toBe(true);
  });
});

describe('the map layers as GDAL reads them', () => {
  it('are tiled GeoTIFFs (one 16 × 16 tile for the 8 × 10 grid) in EPSG:4326 with the no-data value, whose statistics gdalinfo computes', () => {
    const m = JSON.parse(readFileSync(join(dataDir, 'manifest.json'), 'utf8')) as Manifest;
    const layer = m.layers.find((l) => l.figure === 'hours-lost-shift' && l.period === '07' && l.statistic === 'mean')!;
    const r = spawnSync('gdalinfo', ['-json', '-stats', '--config', 'GDAL_PAM_ENABLED', 'NO', join(dataDir, '..', layer.tif)], { encoding: 'utf8' });
    expect(r.status, r.stderr).toBe(0);
    const info = JSON.parse(r.stdout) as {
      bands: Array<{ block: number[]; noDataValue: number; type: string; maximum?: number }>;
      coordinateSystem: { wkt: string };
    };
    expect(info.bands[0].block).toEqual([16, 16]);
    expect(info.bands[0].type).toBe('Float32');
    expect(info.bands[0].noDataValue).toBe(-9999);
    expect(info.coordinateSystem.wkt).toMatch(/ID\["EPSG",4326\]/);
    expect(info.bands[0].maximum).toBeGreaterThan(0);
  });

  it('a country-size layer (700 × 600 cells) has 256 × 256 tiles and two overviews, and GDAL reads the same values back', () => {
    const nLat = 700;
    const nLon = 600;
    const lat = Float64Array.from({ length: nLat }, (_, i) => -10 + i * 0.1);
    const lon = Float64Array.from({ length: nLon }, (_, i) => 20 + i * 0.1);
    const values = Float32Array.from({ length: nLat * nLon }, (_, i) => (i % 97 === 0 ? NaN : (i % nLon) * 0.5 + Math.floor(i / nLon) * 0.001));
    const work = mkdtempSync(join(tmpdir(), 'hh-tif-'));
    const path = join(work, 'big.tif');
    writeFileSync(path, writeGeoTiff({ lat, lon, values }, { units: 'h', description: 'invented test layer', noData: -9999 }));
    const r = spawnSync('gdalinfo', ['-json', '--config', 'GDAL_PAM_ENABLED', 'NO', path], { encoding: 'utf8' });
    expect(r.status, r.stderr).toBe(0);
    const info = JSON.parse(r.stdout) as { size: number[]; bands: Array<{ block: number[]; overviews: Array<{ size: number[] }> }>; geoTransform: number[] };
    expect(info.size).toEqual([600, 700]);
    expect(info.bands[0].block).toEqual([256, 256]);
    expect(info.bands[0].overviews.map((o) => o.size)).toEqual([
      [300, 350],
      [150, 175],
    ]);
    expect(info.geoTransform[0]).toBeCloseTo(19.95, 9);
    expect(info.geoTransform[3]).toBeCloseTo(59.95, 9);
    // A few pixels through gdal_translate to text: row 0 is the northern edge.
    const xyz = spawnSync('gdal_translate', ['-q', '-of', 'XYZ', '-srcwin', '10', '0', '3', '2', path, '/vsistdout/'], { encoding: 'utf8' });
    expect(xyz.status, xyz.stderr).toBe(0);
    const got = xyz.stdout
      .trim()
      .split('\n')
      .map((l) => Number(l.trim().split(/\s+/)[2]));
    const want = [0, 1].flatMap((row) =>
      [10, 11, 12].map((x) => {
        const i = (nLat - 1 - row) * nLon + x;
        return Number.isNaN(values[i]) ? -9999 : values[i];
      }),
    );
    got.forEach((v, i) => expect(v).toBeCloseTo(want[i], 3));
  });
});
