/**
 * A build from Zarr stores in the analysis-ready ERA5 layout publishes the atlas built from the
 * same values in NetCDF: region tables, maps, workbooks and the per-cell NetCDF byte for byte;
 * only the two files that describe the inputs (their names, format, layout, digest) differ. The
 * stores are written from the invented small demo year (NetCDF-3, packed int16) by
 * test/helpers/write-zarr.ts, per the Zarr v2 storage specification, in chunks of 168 hours (the
 * NetCDF-4 demo's chunking), once read from the folder and once over HTTP (node:http on 127.0.0.1).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createServer, type Server } from 'node:http';
import { execFileSync } from 'node:child_process';
import { cpSync, createReadStream, mkdirSync, mkdtempSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join, normalize } from 'node:path';
import { writeDemoDataset } from '../../pipeline/demo/index.ts';
import { buildAtlas } from '../../pipeline/run/build-atlas.ts';
import { testAtlasYaml } from '../helpers/atlas-yaml.ts';
import { writeZarrFromNetcdf } from '../helpers/write-zarr.ts';
import { readTree, treeDifferences } from '../helpers/file-tree.ts';

let dir = '';
let server: Server;
let baseUrl = '';

/** The configuration; `inputs` is the only line that differs between builds (written into a fixed-text file by name). */
const atlasYaml = (inputs: string) => testAtlasYaml({ id: 'small', title: 'Small test atlas (invented data)', years: [2022, 2022], datasetInputs: inputs });

async function build(name: string, inputs: string): Promise<Map<string, Buffer>> {
  const cfg = join(dir, name, 'atlas.yaml');
  mkdirSync(join(dir, name), { recursive: true });
  writeFileSync(cfg, atlasYaml(inputs));
  await buildAtlas({ configPath: cfg, outDir: join(dir, name, 'out'), jobs: 1, quiet: true, dataOnly: true, cache: false });
  return readTree(join(dir, name, 'out'));
}

const savedTime = process.env.HEATHOURS_BUILD_TIME;
beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'hh-zarr-build-'));
  process.env.HEATHOURS_BUILD_TIME = '2026-01-01T00:00:00.000Z';
  await writeDemoDataset({ outDir: join(dir, 'demo'), years: [2022], layout: 'legacy', grid: 'small', quiet: true });
  mkdirSync(join(dir, 'nc/inputs'), { recursive: true });
  for (const f of ['era5-demo-2022.nc', 'era5-demo-lsm.nc']) writeFileSync(join(dir, 'nc/inputs', f), readFileSync(join(dir, 'demo', f)));
  // Two stores, as there are two files: each workbook states the number of inputs.
  await writeZarrFromNetcdf([join(dir, 'demo/era5-demo-2022.nc')], join(dir, 'stores/era5-demo-2022.zarr'), { version: 2, chunkHours: 168 });
  await writeZarrFromNetcdf([join(dir, 'demo/era5-demo-lsm.nc')], join(dir, 'stores/era5-demo-lsm.zarr'), { version: 2, chunkHours: 168 });
  // The same stores where `files: [inputs/*]` finds them (a glob matches `*.zarr` folders), so the configuration text is the NetCDF build's.
  mkdirSync(join(dir, 'local'), { recursive: true });
  cpSync(join(dir, 'stores'), join(dir, 'local/inputs'), { recursive: true });
  server = createServer((req, res) => {
    const p = join(dir, 'stores', normalize(new URL(req.url ?? '/', 'http://x').pathname).replace(/^\/+/, ''));
    if (!p.startsWith(join(dir, 'stores')) || !statSync(p, { throwIfNoEntry: false })?.isFile()) return void res.writeHead(404).end();
    res.writeHead(200);
    createReadStream(p).pipe(res);
  });
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
  baseUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
}, 300_000);

afterAll(async () => {
  if (savedTime === undefined) delete process.env.HEATHOURS_BUILD_TIME;
  else process.env.HEATHOURS_BUILD_TIME = savedTime;
  await new Promise((r) => server?.close(r));
  rmSync(dir, { recursive: true, force: true });
});

describe('build from Zarr stores', () => {
  it('stores in a folder and over HTTP publish the NetCDF build byte for byte, except the two files that describe the inputs', async () => {
    const nc = await build('nc', '  files: [inputs/*]');
    const local = await build('local', '  files: [inputs/*]');
    const remote = await build('remote', `  zarr: [${baseUrl}/era5-demo-2022.zarr, ${baseUrl}/era5-demo-lsm.zarr]`);
    expect(nc.size).toBeGreaterThan(50);
    const regionTables = [...nc.keys()].filter((p) => /region/i.test(p) && /\.(csv|json|xlsx)$/.test(p));
    expect(regionTables.length).toBeGreaterThan(5);
    const differingFrom = (other: Map<string, Buffer>) => treeDifferences(nc, other);
    // Same configuration text: only the inputs' description differs.
    expect(differingFrom(local)).toEqual(['data/inventory.json', 'data/manifest.json']);
    // Over HTTP the configuration names URLs: the workbooks also state its other digest, and differ in nothing else (Info-ZIP's unzip -p).
    const xlsx = [...nc.keys()].filter((p) => p.endsWith('.xlsx'));
    expect(differingFrom(remote)).toEqual(['data/inventory.json', 'data/manifest.json', ...xlsx].sort());
    const digest = (m: Map<string, Buffer>) => (JSON.parse(m.get('data/manifest.json')!.toString('utf8')) as { configDigest: string }).configDigest;
    const unzipped = (m: Map<string, Buffer>, p: string, name: string) => {
      const f = join(dir, `${name}-${p.replace(/\//g, '_')}`);
      writeFileSync(f, m.get(p)!);
      return execFileSync('unzip', ['-p', f], { maxBuffer: 1 << 28 })
        .toString('latin1')
        .split(digest(m))
        .join('DIGEST');
    };
    expect(digest(remote)).not.toBe(digest(nc));
    for (const p of xlsx) expect(unzipped(remote, p, 'remote')).toBe(unzipped(nc, p, 'nc'));
    const inv = (m: Map<string, Buffer>) =>
      JSON.parse(m.get('data/inventory.json')!.toString('utf8')) as { files: Array<{ name: string; format: string; layout: string }>; variables: unknown };
    expect(inv(local).files.map((f) => [f.name, f.format, f.layout])).toEqual([
      ['era5-demo-2022.zarr', 'zarr', 'era5-zarr'],
      ['era5-demo-lsm.zarr', 'zarr', 'era5-zarr'],
    ]);
    expect(inv(local).variables).toEqual(inv(nc).variables);
    expect(inv(remote).files).toEqual(inv(local).files);
  }, 900_000);
});
