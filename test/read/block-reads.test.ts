/**
 * The block reading paths behind readBlock: shared record windows (classic), chunk-aligned
 * hyperslabs with the last chunk carried to the next block (NetCDF-4), reused block buffers
 * and opening without digests. Fixtures are written by Debian's ncgen (netcdf-bin) from CDL;
 * every path must give exactly what one whole read gives, and the invented CDL pattern.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { rmSync } from 'node:fs';
import { openDataset } from '../../pipeline/read/index.ts';
import { pattern, tempDir, writeFixture, type FixtureSpec, type Short } from '../fixtures/read/era5-cdl.ts';

const dir = tempDir();
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const ALL: Short[] = ['t2m', 'd2m', 'sp', 'u10', 'v10', 'ssrd'];
const FIELDS = ['airTemperature', 'dewPointTemperature', 'surfacePressure', 'windSpeed10m', 'solarGlobal'] as const;
let n = 0;
const fx = (spec: Partial<FixtureSpec> & Pick<FixtureSpec, 'layout'>) =>
  writeFixture(dir, `b${n++}`, { start: '2020-01-01T00:00:00Z', hours: 60, lat: [10.5, 10.25, 10], lon: [359.5, 359.75, 0, 0.25], vars: ALL, ...spec });

/** Reads all hours in blocks of `step` hours of `tile` and concatenates each field. */
async function readInBlocks(files: string[], step: number, reuse: boolean, tile = { y0: 0, y1: 3, x0: 0, x1: 4 }) {
  const ds = await openDataset(files, { product: 'era5', digests: false, reuseBlockBuffers: reuse });
  const cells = (tile.y1 - tile.y0) * (tile.x1 - tile.x0);
  const out = Object.fromEntries(FIELDS.map((f) => [f, new Float32Array(ds.time.count * cells)]));
  for (let t0 = 0; t0 < ds.time.count; t0 += step) {
    const b = await ds.readBlock(t0, Math.min(step, ds.time.count - t0), tile);
    for (const f of FIELDS) out[f].set(b.fields[f]!, t0 * cells);
  }
  const sha = ds.files.map((f) => f.sha256);
  await ds.close();
  return { out, sha };
}

describe('block reads', () => {
  it('NetCDF-4 blocks that end inside a chunk (chunks of 24 h, blocks of 7 h) equal one whole read and the CDL pattern', async () => {
    const file = fx({ layout: 'cds2024', chunkHours: 24, lon: [-0.5, -0.25, 0, 0.25], expver: Array(60).fill('0001') });
    const whole = await readInBlocks([file], 60, false);
    const blocks = await readInBlocks([file], 7, true);
    for (const f of FIELDS) expect(Array.from(blocks.out[f])).toEqual(Array.from(whole.out[f]));
    const x = whole.out.airTemperature;
    const lat = [10, 10.25, 10.5];
    const lon = [-0.5, -0.25, 0, 0.25];
    let worst = 0;
    for (let t = 0; t < 60; t++)
      for (let y = 0; y < 3; y++)
        for (let i = 0; i < 4; i++) worst = Math.max(worst, Math.abs(x[t * 12 + y * 4 + i] - pattern('t2m', Date.UTC(2020, 0, 1, t), lat[y], lon[i])));
    expect(worst).toBeLessThan(1e-4);
  });

  it('classic blocks from shared record windows equal one whole read, also for a tile and with reused buffers', async () => {
    const file = fx({ layout: 'legacy' });
    const whole = await readInBlocks([file], 60, false);
    const blocks = await readInBlocks([file], 11, true);
    for (const f of FIELDS) expect(Array.from(blocks.out[f])).toEqual(Array.from(whole.out[f]));
    const tile = { y0: 1, y1: 3, x0: 1, x1: 3 };
    const part = await readInBlocks([file], 13, true, tile);
    for (const f of FIELDS) {
      for (let t = 0; t < 60; t++)
        for (let y = 0; y < 2; y++) for (let i = 0; i < 2; i++) expect(part.out[f][t * 4 + y * 2 + i]).toBe(whole.out[f][t * 12 + (y + 1) * 4 + (i + 1)]);
    }
  });

  it('reused block buffers are overwritten by the next readBlock; fresh ones are not', async () => {
    const file = fx({ layout: 'legacy' });
    const tile = { y0: 0, y1: 3, x0: 0, x1: 4 };
    for (const reuse of [true, false]) {
      const ds = await openDataset([file], { product: 'era5', reuseBlockBuffers: reuse });
      const a = await ds.readBlock(0, 10, tile);
      const first = Array.from(a.fields.airTemperature!);
      const b = await ds.readBlock(10, 10, tile);
      expect(Array.from(a.fields.airTemperature!)).toEqual(reuse ? Array.from(b.fields.airTemperature!) : first);
      await ds.close();
    }
  });

  it('digests: false leaves sha256 empty; the default hashes every file', async () => {
    const file = fx({ layout: 'legacy' });
    expect((await readInBlocks([file], 60, false)).sha).toEqual(['']);
    const ds = await openDataset([file], { product: 'era5' });
    expect(ds.files[0].sha256).toMatch(/^[0-9a-f]{64}$/);
    await ds.close();
  });
});
