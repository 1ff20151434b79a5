/**
 * buildSite's checks of the data folder, made before the Astro build: each bad input is a
 * catalogued error naming the file and key, and the previous output folder is left untouched.
 * The data folder is the one the real pipeline makes for the site tests (pipeline-data.ts),
 * copied without its layers and tiles (the checks read only the files at the top of data/).
 * (The successful build is exercised by the page tests through browser.ts.)
 */
import { copyFile, mkdir, mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import { existsSync, readFileSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { buildSite } from '../../pipeline/run/site-stage.ts';
import { HeathoursError } from '../../pipeline/model/errors.ts';
import { loadInventory } from '../../src/data/inventory.ts';
import { loadRegions, regionSummaries } from '../../src/data/regions.ts';
import { loadManifest } from '../../src/data/manifest.ts';
import { siteDataDir } from '../../src/data/data-dir.ts';
import { buildPipelineData, PIPELINE_DATA_BASELINE, PIPELINE_DATA_YEARS } from './pipeline-data.ts';

let source: string;
const readFileSyncUtf8 = (p: string): string => readFileSync(p, 'utf8');
let work: string;
let dataDir: string;
let outDir: string;

beforeAll(async () => {
  source = (await buildPipelineData()).dataDir;
});

beforeEach(async () => {
  work = await mkdtemp(join(tmpdir(), 'heathours-site-'));
  dataDir = join(work, 'in');
  outDir = join(work, 'dist');
  await mkdir(join(dataDir, 'data'), { recursive: true });
  for (const name of await readdir(join(source, 'data'))) {
    const from = join(source, 'data', name);
    if (statSync(from).isFile()) await copyFile(from, join(dataDir, 'data', name));
  }
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
  expect((await readdir(work)).sort()).toEqual(['dist', 'in']);
  return err as HeathoursError;
}

// biome-ignore lint/suspicious/noExplicitAny: the edits reach into any part of a published JSON file
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
    await editJson('data/inventory.json', (v) => (v.grid.landCells = v.grid.nLat * v.grid.nLon + 1));
    const err = await expectFailure('SiteDataInvalid');
    expect(err.where.key).toBe('grid.landCells');
  });

  it('fails with SiteDataMissing naming data/manifest.json when the manifest is absent', async () => {
    const path = join(dataDir, 'data/manifest.json');
    await rm(path);
    const err = await expectFailure('SiteDataMissing');
    expect(err.where.file).toBe(path);
    expect(err.message).toContain('manifest.json');
  });

  it('fails with SiteDataUnreadable naming data/manifest.json when the manifest is truncated', async () => {
    const path = join(dataDir, 'data/manifest.json');
    const text = await readFile(path, 'utf8');
    await writeFile(path, text.slice(0, Math.floor(text.length / 2)));
    const err = await expectFailure('SiteDataUnreadable');
    expect(err.where.file).toBe(path);
    expect(err.message).toContain('manifest.json');
  });

  it('fails with SiteDataUnreadable when the manifest is not JSON at all', async () => {
    await writeFile(join(dataDir, 'data/manifest.json'), '<html>not a manifest</html>');
    const err = await expectFailure('SiteDataUnreadable');
    expect(err.where.file).toBe(join(dataDir, 'data/manifest.json'));
  });

  it('fails with SiteDataInvalid naming the key when an artefact path leaves data/', async () => {
    await editJson('data/manifest.json', (v) => (v.artefacts[2].path = 'data/../../etc/passwd'));
    const err = await expectFailure('SiteDataInvalid');
    expect(err.where.file).toBe(join(dataDir, 'data/manifest.json'));
    expect(err.where.key).toBe('artefacts.2.path');
  });

  it('fails with SiteDataInvalid when a layer names a GeoTIFF the artefacts do not list', async () => {
    await editJson('data/manifest.json', (v) => (v.layers[5].tif = 'data/layers/nowhere.tif'));
    const err = await expectFailure('SiteDataInvalid');
    expect(err.where.key).toBe('layers.5.tif');
  });

  it('fails with SiteDataInvalid when the manifest has the wrong version or lacks the work settings', async () => {
    await editJson('data/manifest.json', (v) => (v.manifestVersion = 2));
    expect((await expectFailure('SiteDataInvalid')).where.key).toBe('manifestVersion');
    await editJson('data/manifest.json', (v) => {
      v.manifestVersion = 1;
      delete v.work;
    });
    expect((await expectFailure('SiteDataInvalid')).where.key).toBe('work');
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
  it('read the pipeline-made data: the inventory as written, and the regions sorted by name with their HTML-looking name intact', () => {
    const inv = loadInventory(source);
    expect(inv.atlas.years).toEqual([...PIPELINE_DATA_YEARS]);
    expect(inv.atlas.invented).toBe(true);
    const raw = JSON.parse(readFileSyncUtf8(join(source, 'data/regions.geojson'))) as { features: Array<{ properties: { id: string; name: string } }> };
    const byName = [...raw.features].map((f) => f.properties).sort((a, b) => a.name.localeCompare(b.name));
    const summaries = regionSummaries(loadRegions(source));
    expect(summaries).toEqual(byName.map((p) => ({ id: p.id, name: p.name })));
    expect(summaries.find((r) => r.id === 'odd-name')?.name).toMatch(/^<img src=x onerror=alert\(1\)><script>/);
  });

  it('read the manifest as the pipeline wrote it: every layer with its legend, every artefact with its digest', () => {
    const m = loadManifest(source);
    const raw = JSON.parse(readFileSyncUtf8(join(source, 'data/manifest.json')));
    expect(m).toEqual(raw);
    expect(m.baseline).toEqual([...PIPELINE_DATA_BASELINE]);
    expect(m.layers.length).toBeGreaterThan(100);
    const paths = new Set(m.artefacts.map((a) => a.path));
    for (const l of m.layers) {
      expect(paths.has(l.png) && paths.has(l.tif), l.id).toBe(true);
      expect(l.legend.stops.length).toBeGreaterThan(0);
    }
    // The artefact list matches the files on disk (sizes), the manifest itself excepted.
    for (const a of m.artefacts.slice(0, 50)) expect(statSync(join(source, a.path)).size, a.path).toBe(a.bytes);
    expect(paths.has('data/manifest.json')).toBe(false);
  });

  it('fail with SiteDataDirUnset when the build did not say where the data are', () => {
    const saved = process.env.HEATHOURS_DATA_DIR;
    delete process.env.HEATHOURS_DATA_DIR;
    try {
      expect(() => siteDataDir()).toThrow(expect.objectContaining({ code: 'SiteDataDirUnset' }));
    } finally {
      if (saved !== undefined) process.env.HEATHOURS_DATA_DIR = saved;
    }
    expect(existsSync(source)).toBe(true);
  });
});
