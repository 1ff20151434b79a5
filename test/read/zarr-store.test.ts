/**
 * Zarr stores as inputs (pipeline/read/zarr-store.ts). The NetCDF files are written by Debian's
 * `ncgen` (netCDF-C) from invented CDL (test/fixtures/read/era5-cdl.ts); the stores hold the same
 * raw values under the analysis-ready ERA5 layout's array names, written by test/helpers/
 * write-zarr.ts per the Zarr v2 storage specification (zlib chunks, consolidated `.zmetadata`)
 * and the Zarr v3 core specification (gzip chunks, no consolidated metadata). The values read
 * from a store must equal those read from the NetCDF file, from disk and over HTTP (node:http on
 * 127.0.0.1); each broken store ends in its catalogued error.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createServer, type Server } from 'node:http';
import { cpSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { createReadStream, statSync } from 'node:fs';
import { join, normalize } from 'node:path';
import type { AddressInfo } from 'node:net';
import { openDataset } from '../../pipeline/read/index.ts';
import { openZarrStore } from '../../pipeline/read/zarr-store.ts';
import { checkCoverage } from '../../pipeline/read/coverage.ts';
import { tempDir, writeFixture, type FixtureSpec, type Short } from '../fixtures/read/era5-cdl.ts';
import { writeZarrFromNetcdf } from '../helpers/write-zarr.ts';
import { expectCatalogued } from './helpers.ts';

const dir = tempDir('heathours-zarr-');
const VARS: Short[] = ['t2m', 'd2m', 'sp', 'u10', 'v10', 'ssrd', 'fdir', 'strd'];
const LAT = [10.5, 10.25, 10];
const LON = [359.5, 359.75, 0, 0.25];
const tile = { y0: 0, y1: 3, x0: 0, x1: 4 };
let n = 0;
const fx = (spec: Partial<FixtureSpec> & Pick<FixtureSpec, 'layout'>, kind?: 'nc3' | 'nc4') =>
  writeFixture(dir, `f${n++}`, { start: '2020-01-01T00:00:00Z', hours: 30, lat: LAT, lon: LON, vars: VARS, chunkHours: 8, ...spec }, kind);

/** Serves `root` read-only over HTTP on 127.0.0.1 (404 for anything missing). */
let server: Server;
let baseUrl = '';
beforeAll(async () => {
  server = createServer((req, res) => {
    const rel = normalize(decodeURIComponent(new URL(req.url ?? '/', 'http://x').pathname)).replace(/^\/+/, '');
    const p = join(dir, rel);
    if (!p.startsWith(dir) || !statSync(p, { throwIfNoEntry: false })?.isFile()) {
      res.writeHead(404).end();
      return;
    }
    res.writeHead(200, { 'content-type': 'application/octet-stream' });
    createReadStream(p).pipe(res);
  });
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
  baseUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});
afterAll(async () => {
  await new Promise((r) => server.close(r));
  rmSync(dir, { recursive: true, force: true });
});

async function values(paths: string[]) {
  const ds = await openDataset(paths, {
    product: 'era5',
    require: ['airTemperature', 'dewPointTemperature', 'surfacePressure', 'windSpeed10m', 'solarGlobal', 'solarDirect', 'thermalDown'],
  });
  try {
    const b = await ds.readBlock(0, ds.time.count, tile);
    const fields = Object.fromEntries(Object.entries(b.fields).map(([k, x]) => [k, Array.from(x!)]));
    return { grid: { lat: Array.from(ds.grid.lat), lon: Array.from(ds.grid.lon) }, time: ds.time, variables: ds.variables, fields, files: ds.files };
  } finally {
    await ds.close();
  }
}

describe('a Zarr store in the analysis-ready ERA5 layout reads the values of the same NetCDF file', () => {
  for (const [layout, kind] of [
    ['legacy', 'nc3'],
    ['cds2024', 'nc4'],
  ] as const) {
    for (const version of [2, 3] as const) {
      it(`${layout} values (ncgen ${kind}) as a Zarr v${version} store: same grid, hours and decoded fields, from disk and over HTTP`, async () => {
        const nc = fx({ layout }, kind);
        const name = `s${n++}.zarr`;
        const written = await writeZarrFromNetcdf([nc], join(dir, name), { version, chunkHours: 7 });
        expect(written).toContain('2m_temperature');
        expect(written).toContain('surface_solar_radiation_downwards');
        const ref = await values([nc]);
        const local = await values([join(dir, name)]);
        expect(local.grid).toEqual(ref.grid);
        expect(local.time).toEqual(ref.time);
        expect(local.variables).toEqual(ref.variables);
        expect(local.fields).toEqual(ref.fields);
        expect(ref.fields.airTemperature.length).toBe(30 * 12);
        expect(local.files[0]).toMatchObject({ name, format: 'zarr', layout: 'era5-zarr', timeStart: ref.files[0].timeStart, timeEnd: ref.files[0].timeEnd });
        expect(local.files[0].sha256).toMatch(/^[0-9a-f]{64}$/);
        if (version === 2) {
          // Over HTTP (consolidated metadata; a v3 store without it cannot be listed over HTTP: below).
          const remote = await values([`${baseUrl}/${name}`]);
          expect(remote.fields).toEqual(ref.fields);
          expect(remote.files[0].sha256).toBe(local.files[0].sha256);
        }
      });
    }
  }

  it('a store with the variables split over two stores (instant and accumulated) joins them as the NetCDF streams are joined', async () => {
    const nc = fx({ layout: 'legacy' });
    await writeZarrFromNetcdf([nc], join(dir, 'inst.zarr'), {
      version: 2,
      chunkHours: 5,
      omit: ['surface_solar_radiation_downwards', 'total_sky_direct_solar_radiation_at_surface', 'surface_thermal_radiation_downwards'],
    });
    await writeZarrFromNetcdf([nc], join(dir, 'acc.zarr'), {
      version: 2,
      chunkHours: 5,
      omit: ['2m_temperature', '2m_dewpoint_temperature', 'surface_pressure', '10m_u_component_of_wind', '10m_v_component_of_wind'],
    });
    expect((await values([join(dir, 'inst.zarr'), join(dir, 'acc.zarr')])).fields).toEqual((await values([nc])).fields);
  });
});

describe('broken Zarr stores end in catalogued errors', () => {
  let good = '';
  beforeAll(async () => {
    good = join(dir, 'good.zarr');
    await writeZarrFromNetcdf([fx({ layout: 'legacy' })], good, { version: 2, chunkHours: 10 });
  });
  const copy = (name: string) => {
    const p = join(dir, name);
    cpSync(good, p, { recursive: true });
    return p;
  };

  it('a store missing a needed variable: MissingNetcdfVariable naming the variable and the store', async () => {
    const p = join(dir, 'no-t2m.zarr');
    await writeZarrFromNetcdf([fx({ layout: 'legacy' })], p, { version: 2, chunkHours: 10, omit: ['2m_temperature'] });
    await expectCatalogued(openDataset([p], { product: 'era5' }), 'MissingNetcdfVariable', /t2m[\s\S]*no-t2m\.zarr/);
  });

  it('a URL on a closed port: ZarrStoreUnreachable (connection refused), without waiting for the time limit', async () => {
    const closed = createServer();
    await new Promise<void>((r) => closed.listen(0, '127.0.0.1', r));
    const port = (closed.address() as AddressInfo).port;
    await new Promise((r) => closed.close(r));
    const t0 = Date.now();
    await expectCatalogued(openDataset([`http://127.0.0.1:${port}/era5.zarr`], { product: 'era5' }), 'ZarrStoreUnreachable', /ECONNREFUSED/);
    expect(Date.now() - t0).toBeLessThan(10_000);
  });

  it('a server that never answers: ZarrStoreUnreachable after the time limit of one request', async () => {
    const silent = createServer(() => {}); // accepts and never answers
    await new Promise<void>((r) => silent.listen(0, '127.0.0.1', r));
    const url = `http://127.0.0.1:${(silent.address() as AddressInfo).port}/era5.zarr`;
    const t0 = Date.now();
    try {
      await expectCatalogued(openZarrStore(url, { timeoutMs: 400 }), 'ZarrStoreUnreachable', /time limit[\s\S]*0\.4 s/);
      expect(Date.now() - t0).toBeGreaterThanOrEqual(350);
      expect(Date.now() - t0).toBeLessThan(10_000);
    } finally {
      silent.closeAllConnections();
      await new Promise((r) => silent.close(r));
    }
  });

  it('a store over HTTP without consolidated metadata: ZarrStoreUnlisted', async () => {
    const p = join(dir, 'v3.zarr');
    await writeZarrFromNetcdf([fx({ layout: 'legacy' })], p, { version: 3, chunkHours: 10 });
    await expectCatalogued(openDataset([`${baseUrl}/v3.zarr`], { product: 'era5' }), 'ZarrStoreUnlisted', /consolidated/);
  });

  it('arrays disagreeing on a dimension: ZarrGridMismatch naming both arrays and lengths', async () => {
    const p = copy('mismatch.zarr');
    const meta = JSON.parse(readFileSync(join(p, '.zmetadata'), 'utf8'));
    meta.metadata['surface_pressure/.zarray'].shape[2] = 5;
    writeFileSync(join(p, '.zmetadata'), JSON.stringify(meta));
    await expectCatalogued(
      openDataset([p], { product: 'era5' }),
      'ZarrGridMismatch',
      /dimension longitude has length 4 in array .* but 5 in array surface_pressure/,
    );
  });

  it('damaged metadata: ZarrMetadataInvalid (consolidated metadata that is not JSON; an array without dimension names)', async () => {
    const p = copy('badmeta.zarr');
    writeFileSync(join(p, '.zmetadata'), '{"metadata": {"2m_temperature/.zarray": ');
    await expectCatalogued(openDataset([p], { product: 'era5' }), 'ZarrMetadataInvalid', /badmeta\.zarr/);
    const q = copy('nodims.zarr');
    const meta = JSON.parse(readFileSync(join(q, '.zmetadata'), 'utf8'));
    delete meta.metadata['2m_temperature/.zattrs']._ARRAY_DIMENSIONS;
    writeFileSync(join(q, '.zmetadata'), JSON.stringify(meta));
    await expectCatalogued(openDataset([q], { product: 'era5' }), 'ZarrMetadataInvalid', /2m_temperature names no dimensions/);
  });

  it('a damaged chunk: ZarrChunkUnreadable naming the array and the indices, when a block reaches it', async () => {
    const p = copy('badchunk.zarr');
    writeFileSync(join(p, '2m_temperature/1.0.0'), Buffer.from('not zlib at all, a damaged chunk'));
    const ds = await openDataset([p], { product: 'era5' }); // the first chunk (hours 0-9) is fine, and kept from the units check
    try {
      await ds.readBlock(0, 10, tile);
      await expectCatalogued(ds.readBlock(0, 20, tile), 'ZarrChunkUnreadable', /2m_temperature at indices \[10:20, 0:3, 0:4\]/);
    } finally {
      await ds.close();
    }
  });

  it('a folder that is not a Zarr store: ZarrMetadataInvalid; a store folder that does not exist: NetcdfFileNotFound', async () => {
    await expectCatalogued(openDataset([tempDir('heathours-notzarr-')], { product: 'era5' }), 'ZarrMetadataInvalid', /not a Zarr store/);
    await expectCatalogued(openDataset([join(dir, 'absent.zarr')], { product: 'era5' }), 'NetcdfFileNotFound', /absent\.zarr/);
  });
});

describe('expver as a dimension (time × expver × lat × lon, ncgen): read and reported as an ERA5T tail', () => {
  it('the final hours come from expver 1, the last 6 from expver 5: values equal the plain file, and coverage reports the 6 ERA5T hours', async () => {
    const slots = Array.from({ length: 30 }, (_, i) => (i >= 24 ? 1 : 0));
    const dimFile = fx({ layout: 'expver-dim', vars: ['t2m', 'd2m', 'sp', 'u10', 'v10', 'ssrd'], expverSlot: slots });
    const plain = fx({ layout: 'legacy', vars: ['t2m', 'd2m', 'sp', 'u10', 'v10', 'ssrd'] });
    const read = async (p: string) => {
      const ds = await openDataset([p], { product: 'era5' });
      try {
        const b = await ds.readBlock(0, ds.time.count, tile);
        return Array.from(b.fields.airTemperature!);
      } finally {
        await ds.close();
      }
    };
    const a = await read(dimFile);
    const b = await read(plain);
    expect(a.length).toBe(b.length);
    for (let i = 0; i < a.length; i++) expect(a[i]).toBeCloseTo(b[i], 1); // both packed int16, each with its own scale
    const cov = await checkCoverage([dimFile]);
    for (const v of cov.variables) {
      expect(v.present).toBe(30);
      expect(v.era5t).toEqual([{ from: '2020-01-02T00:00:00Z', to: '2020-01-02T05:00:00Z', hours: 6, files: [dimFile] }]);
    }
  });
});
