/**
 * Before Astro renders the site: each region table read once, and what the pages need from it
 * gathered into a folder the pages are pointed to (src/data/site-digest.ts): the rows the report,
 * the summary and the home page show, and each map layer's value per region. Pages would
 * otherwise read every region table three or four times (a report, its summary, the map's values
 * in every part of a site built in parts), about 0.5 MB of text each. Large atlases gather on the
 * build's worker threads, slices of {@link SLICE} regions at a time; memory holds one slice's
 * values per worker plus the values of every layer and region (the map's values files are that
 * large anyway).
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { runInWorkers } from '../infra/worker-pool.ts';
import { loadManifestLayers } from '../../src/data/manifest-layers.ts';
import { loadRegions } from '../../src/data/regions.ts';
import { gatherRegionSlice, type DigestTable } from '../../src/data/site-digest-make.ts';
import { layerValuesKey } from '../../src/data/site-digest.ts';
import { startProgress } from '../model/progress.ts';
import { SITE_PARTS_MIN_REGIONS } from './site-parts.ts';

/** Regions per task [count]. */
const SLICE = 64;

/** Gathers `dataDir`'s region tables into `digestDir` (see the file comment); `jobs` worker threads for large atlases. */
export async function gatherSiteDigest(dataDir: string, digestDir: string, jobs: number, quiet?: boolean): Promise<void> {
  const manifest = loadManifestLayers(dataDir);
  // Without the atlas figures there are no region tables to read (an inventory-only folder).
  if (!manifest) return;
  const ids = loadRegions(dataDir).features.map((f) => f.properties.id);
  const tables: DigestTable[] = [
    { regionsDir: 'data/regions', layers: manifest.layers },
    ...(manifest.scenarios ?? []).map((sc) => ({ scenarioId: sc.id, regionsDir: `${sc.dataPath.replace(/\/$/, '')}/regions`, layers: sc.layers })),
  ];
  // Each layer's value per region [units of the layer], NaN where none (null in the files).
  const values = tables.map((t) => t.layers.map(() => new Float64Array(ids.length)));
  const slices: Array<{ from: number; ids: string[] }> = [];
  for (let i = 0; i < ids.length; i += SLICE) slices.push({ from: i, ids: ids.slice(i, i + SLICE) });
  const keep = (from: number, n: number, got: Float64Array[]) =>
    got.forEach((v, ti) => values[ti].forEach((perRegion, li) => perRegion.set(v.subarray(li * n, (li + 1) * n), from)));
  const progress = startProgress('site: region tables', ids.length, { quiet, unit: 'regions' });
  if (jobs > 1 && ids.length >= SITE_PARTS_MIN_REGIONS) {
    await runInWorkers<string[], Float64Array[]>(
      'site-digest',
      slices.map((s) => s.ids),
      {
        size: jobs,
        init: { dataDir, digestDir, tables },
        describe: (t) => `gathering the tables of regions ${t[0]} to ${t[t.length - 1]}`,
        onResult: (t, got, index) => {
          keep(slices[index].from, t.length, got);
          progress.tick(t.length);
        },
      },
    );
  } else {
    for (const s of slices) {
      keep(s.from, s.ids.length, gatherRegionSlice(dataDir, digestDir, tables, s.ids));
      progress.tick(s.ids.length);
    }
  }
  progress.done();
  // One small file per layer (no file built as one string of every layer), and their index.
  const dir = join(digestDir, 'values');
  mkdirSync(dir, { recursive: true });
  const index: Record<string, string> = {};
  let n = 0;
  tables.forEach((t, ti) =>
    t.layers.forEach((l, li) => {
      const file = `${n++}.json`;
      writeFileSync(join(dir, file), JSON.stringify(Array.from(values[ti][li], (v) => (Number.isNaN(v) ? null : v))));
      index[layerValuesKey(t.regionsDir, l.tif)] = file;
    }),
  );
  writeFileSync(join(dir, 'index.json'), JSON.stringify(index));
}
