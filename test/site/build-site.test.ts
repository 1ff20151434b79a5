/**
 * buildSite's checks of the data folder, made before the Astro build: each bad input is a
 * catalogued error naming the file and key, and the previous output folder is left untouched.
 * (The successful build is exercised by pages.test.ts through browser.ts.)
 */
import { cp, mkdir, mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { buildSite } from '../../pipeline/publish/site.ts';
import { HeathoursError } from '../../pipeline/model/errors.ts';
import { loadInventory } from '../../src/data/inventory.ts';
import { loadRegions, regionSummaries } from '../../src/data/regions.ts';
import { siteDataDir } from '../../src/data/data-dir.ts';
import { FIXTURE_DATA_DIR } from './browser.ts';

let work: string;
let dataDir: string;
let outDir: string;

beforeEach(async () => {
  work = await mkdtemp(join(tmpdir(), 'heathours-site-'));
  dataDir = join(work, 'in');
  outDir = join(work, 'dist');
  await cp(FIXTURE_DATA_DIR, dataDir, { recursive: true });
  await mkdir(outDir);
  await writeFile(join(outDir, 'index.html'), 'previous site');
});

afterEach(async () => {
  await rm(work, { recursive: true, force: true });
});

async function expectFailure(code: string): Promise<HeathoursError> {
  const err = await buildSite({ dataDir, outDir, quiet: true }).catch((e: unknown) => e);
  expect(err).toBeInstanceOf(HeathoursError);
  expect((err as HeathoursError).code).toBe(code);
  // The previous output is untouched and nothing half-built sits beside it.
  expect(await readFile(join(outDir, 'index.html'), 'utf8')).toBe('previous site');
  const { readdir } = await import('node:fs/promises');
  expect((await readdir(work)).sort()).toEqual(['dist', 'in']);
  return err as HeathoursError;
}

async function editJson(rel: string, edit: (v: any) => void): Promise<void> {
  const path = join(dataDir, rel);
  const v = JSON.parse(await readFile(path, 'utf8'));
  edit(v);
  await writeFile(path, JSON.stringify(v));
}

describe('buildSite rejects a bad data folder before building', () => {
  it('fails with SiteDataMissing when the data folder has no data/ subfolder', async () => {
    await rm(join(dataDir, 'data'), { recursive: true });
    const err = await expectFailure('SiteDataMissing');
    expect(err.where.file).toBe(join(dataDir, 'data'));
  });

  it('fails with SiteDataMissing naming data/regions.geojson when it is absent', async () => {
    await rm(join(dataDir, 'data/regions.geojson'));
    const err = await expectFailure('SiteDataMissing');
    expect(err.message).toContain('regions.geojson');
  });

  it('fails with SiteDataUnreadable when inventory.json is truncated', async () => {
    const path = join(dataDir, 'data/inventory.json');
    await writeFile(path, (await readFile(path, 'utf8')).slice(0, 200));
    const err = await expectFailure('SiteDataUnreadable');
    expect(err.where.file).toBe(path);
  });

  it('fails with SiteDataInvalid naming the key of a malformed SHA-256', async () => {
    await editJson('data/inventory.json', (v) => (v.files[1].sha256 = 'not-a-digest'));
    const err = await expectFailure('SiteDataInvalid');
    expect(err.where.key).toBe('files.1.sha256');
  });

  it('fails with SiteDataInvalid when the grid has more land cells than cells', async () => {
    await editJson('data/inventory.json', (v) => (v.grid.landCells = 82));
    const err = await expectFailure('SiteDataInvalid');
    expect(err.where.key).toBe('grid.landCells');
  });

  it('fails with SiteDataInvalid when a region id is not a slug', async () => {
    await editJson('data/regions.geojson', (v) => (v.features[0].properties.id = 'Lowland Coast'));
    const err = await expectFailure('SiteDataInvalid');
    expect(err.where.key).toBe('features.0.properties.id');
  });

  it('fails with SiteDataInvalid when two regions share an id', async () => {
    await editJson('data/regions.geojson', (v) => (v.features[1].properties.id = v.features[0].properties.id));
    await expectFailure('SiteDataInvalid');
  });
});

describe('buildSite refuses an output path it cannot write', () => {
  it('fails with SiteOutputUnwritable when a file stands where the output folder should be', async () => {
    const blocker = join(work, 'blocker');
    await writeFile(blocker, 'a file');
    for (const out of [blocker, join(blocker, 'dist')]) {
      const err = await buildSite({ dataDir, outDir: out, quiet: true }).catch((e: unknown) => e);
      expect(err).toBeInstanceOf(HeathoursError);
      expect((err as HeathoursError).code).toBe('SiteOutputUnwritable');
    }
    expect(await readFile(blocker, 'utf8')).toBe('a file');
  });
});

describe('the typed accessors of src/data', () => {
  it('read the fixture: the inventory as written, and the regions sorted by name with their HTML-looking name intact', () => {
    const inv = loadInventory(FIXTURE_DATA_DIR);
    expect(inv.grid.nLat * inv.grid.nLon).toBe(81);
    expect(inv.atlas.invented).toBe(true);
    const names = regionSummaries(loadRegions(FIXTURE_DATA_DIR)).map((r) => r.id);
    expect(names).toEqual(['odd-name', 'lowland-coast', 'upper-basin']);
  });

  it('fail with SiteDataDirUnset when the build did not say where the data are', () => {
    const saved = process.env.HEATHOURS_DATA_DIR;
    delete process.env.HEATHOURS_DATA_DIR;
    try {
      expect(() => siteDataDir()).toThrow(expect.objectContaining({ code: 'SiteDataDirUnset' }));
    } finally {
      if (saved !== undefined) process.env.HEATHOURS_DATA_DIR = saved;
    }
    expect(existsSync(FIXTURE_DATA_DIR)).toBe(true);
  });
});
