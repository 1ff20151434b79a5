/**
 * A damaged data chunk that only a shard meets: `heathours build` on one invented NetCDF-4 demo
 * year whose compressed chunk of mid-year values is zeroed. The build reads the file's header
 * and first hour without trouble; the shard that reaches the chunk fails with the catalogued
 * NetcdfDataUnreadable naming the file, the variable and the hours, and the previous output is
 * left exactly as it was. Which variable the damage hit is told by Debian's `ncdump` (the
 * netCDF-C library, with its own HDF5), which must fail on that variable only.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createHash } from 'node:crypto';
import { writeDemoDataset, yearFileName } from '../../pipeline/demo/index.ts';
import { buildAtlas } from '../../pipeline/run/build-atlas.ts';
import { HeathoursError } from '../../pipeline/model/errors.ts';
import { mapHdf5 } from './structure-hdf5.ts';
import { testAtlasYaml } from '../helpers/atlas-yaml.ts';

const ROOT = new URL('../../', import.meta.url).pathname;
const YEAR = 2023;
/** Hours per chunk of the demo's NetCDF-4 layout (pipeline/demo BLOCK_HOURS). */
const CHUNK_HOURS = 168;
const VARIABLES = ['t2m', 'd2m', 'u10', 'v10', 'sp', 'ssrd', 'fdir', 'strd'];
let dir = '';

function digestTree(d: string): string {
  const h = createHash('sha256');
  const walk = (p: string) => {
    for (const e of readdirSync(p, { withFileTypes: true }).sort((a, b) => a.name.localeCompare(b.name))) {
      const q = join(p, e.name);
      h.update(q.slice(d.length));
      if (e.isDirectory()) walk(q);
      else h.update(readFileSync(q));
    }
  };
  walk(d);
  return h.digest('hex');
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'hh-damaged-build-'));
  await writeDemoDataset({ outDir: join(dir, 'inputs'), years: [YEAR], layout: 'netcdf4', grid: 'small', quiet: true, jobs: 1 });
  writeFileSync(join(dir, 'atlas.yaml'), `${testAtlasYaml({ id: 'damaged', title: 'Damaged input test (invented data)', years: [YEAR, YEAR] })}`);
}, 180_000);
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('a damaged data chunk found while a shard reads it', () => {
  it(
    'fails the build with NetcdfDataUnreadable naming the file, the variable (as ncdump finds it) and hours that hold the chunk; the previous output is untouched',
    { timeout: 400_000 },
    async () => {
      const cfg = join(dir, 'atlas.yaml');
      const out = join(dir, 'out');
      await buildAtlas({ configPath: cfg, outDir: out, jobs: 1, quiet: true, dataOnly: true, cache: false });
      const before = digestTree(out);

      // Zero 512 bytes inside the 27th chunk in file order (a mid-year chunk of some variable).
      const file = join(dir, 'inputs', yearFileName(YEAR));
      const bytes = readFileSync(file);
      const map = mapHdf5(bytes);
      const [a, b] = map.chunks[26];
      bytes.fill(0, a + Math.floor((b - a) / 2) - 256, a + Math.floor((b - a) / 2) + 256);
      writeFileSync(file, bytes);

      // netCDF-C (Debian's ncdump) fails on exactly one variable, the damaged one.
      const failing = VARIABLES.filter((v) => spawnSync('ncdump', ['-v', v, file], { stdio: 'ignore' }).status !== 0);
      expect(failing).toHaveLength(1);
      const variable = failing[0];
      expect(execFileSync('ncdump', ['-h', file], { encoding: 'utf8' })).toContain(`float ${variable}(valid_time, latitude, longitude)`);

      let err: unknown;
      try {
        await buildAtlas({ configPath: cfg, outDir: out, jobs: 1, quiet: true, dataOnly: true, cache: false });
      } catch (e) {
        err = e;
      }
      expect(err).toBeInstanceOf(HeathoursError);
      const e = err as HeathoursError;
      expect(e.code).toBe('NetcdfDataUnreadable');
      expect(e.where).toMatchObject({ file, variable });
      const m = /for the hours (\S+) to (\S+) \(end of hour, UTC\)/.exec(e.message);
      expect(m, e.message).not.toBeNull();
      expect(e.hint.length).toBeGreaterThan(10);

      // The reported hours hold the damaged chunk, located by netCDF-C through Debian's
      // python3-netcdf4 (reading the variable block by block of 168 hours).
      const py = `import netCDF4, sys
v = netCDF4.Dataset(sys.argv[1])[sys.argv[2]]
for k in range(0, v.shape[0], ${CHUNK_HOURS}):
    try:
        v[k:k + ${CHUNK_HOURS}]
    except Exception:
        print(k); break`;
      const bad = Number(execFileSync('/usr/bin/python3', ['-c', py, file, variable], { encoding: 'utf8' }).trim());
      expect(Number.isInteger(bad)).toBe(true);
      const chunkFrom = Date.UTC(YEAR, 0, 1, 1) + bad * 3_600_000;
      const first = Date.parse(m![1]);
      const last = Date.parse(m![2]);
      expect(first <= chunkFrom && last >= chunkFrom, `hours ${m![1]} to ${m![2]} miss the damaged chunk from ${new Date(chunkFrom).toISOString()}`).toBe(true);
      // Nothing half-published: the output is byte for byte the first build's, no staging left.
      expect(digestTree(out)).toBe(before);
      expect(readdirSync(dir).filter((f) => f.includes('.stage-') || f.endsWith('.tmp'))).toEqual([]);
      // The CLI prints it as a catalogued error and exits with 3 (an input-data error), without HDF5's diagnostics.
      const cli = spawnSync(
        process.execPath,
        [join(ROOT, 'bin/heathours.mjs'), 'build', '--config', cfg, '--data-only', '--no-cache', '--jobs', '1', '--quiet'],
        { encoding: 'utf8' },
      );
      expect(cli.status).toBe(3);
      expect(cli.stderr).toContain('error [NetcdfDataUnreadable]');
      expect(cli.stderr).not.toMatch(/HDF5-DIAG|major:|minor:/);
      expect(digestTree(out)).toBe(before);
    },
  );
});
