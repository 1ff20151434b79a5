/**
 * Before Astro renders the site: each region table read once, and what the pages need from it
 * gathered into a folder the pages are pointed to (src/data/site-digest.ts): the rows the report,
 * the summary and the home page show, and each map layer's value per region. Pages would
 * otherwise read every region table three or four times (a report, its summary, the map's values
 * in every part of a site built in parts), about 0.5 MB of text each. Large atlases gather on the
 * build's worker threads, slices of {@link SLICE} regions at a time. The layers' values are
 * written as each slice comes back, at the slice's place in one binary file per layer, so memory
 * holds at most {@link FLUSH_REGIONS} regions' values, whatever the number of regions.
 */
import { closeSync, mkdirSync, openSync, writeFileSync, writeSync } from 'node:fs';
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

/** Regions whose layer values are held before they are written to the layers' files [count]. */
const FLUSH_REGIONS = 1024;

/** Sizes of the gathering (tests make them small, to cross slices and writes on a small atlas). */
export interface GatherSizes {
  /** Regions per task [count]; default {@link SLICE}. */
  slice?: number;
  /** Regions whose values are held before they are written [count]; default {@link FLUSH_REGIONS}. */
  flushRegions?: number;
}

/** Gathers `dataDir`'s region tables into `digestDir` (see the file comment); `jobs` worker threads for large atlases. */
export async function gatherSiteDigest(dataDir: string, digestDir: string, jobs: number, quiet?: boolean, sizes: GatherSizes = {}): Promise<void> {
  const slice = sizes.slice ?? SLICE;
  const flushRegions = sizes.flushRegions ?? FLUSH_REGIONS;
  const manifest = loadManifestLayers(dataDir);
  // Without the atlas figures there are no region tables to read (an inventory-only folder).
  if (!manifest) return;
  const ids = loadRegions(dataDir).features.map((f) => f.properties.id);
  const tables: DigestTable[] = [
    { regionsDir: 'data/regions', layers: manifest.layers },
    ...(manifest.scenarios ?? []).map((sc) => ({ scenarioId: sc.id, regionsDir: `${sc.dataPath.replace(/\/$/, '')}/regions`, layers: sc.layers })),
  ];
  // One file per layer: each region's value [units of the layer] as a float64 at 8 × its index, NaN where none.
  const dir = join(digestDir, 'values');
  mkdirSync(dir, { recursive: true });
  const index: Record<string, string> = {};
  const files = tables.map((t) => t.layers.map(() => ''));
  let n = 0;
  tables.forEach((t, ti) =>
    t.layers.forEach((l, li) => {
      const file = `${n++}.f64`;
      writeFileSync(join(dir, file), new Uint8Array(0));
      files[ti][li] = join(dir, file);
      index[layerValuesKey(t.regionsDir, l.tif)] = file;
    }),
  );
  const slices: Array<{ from: number; ids: string[] }> = [];
  for (let i = 0; i < ids.length; i += slice) slices.push({ from: i, ids: ids.slice(i, i + slice) });
  // Slices back from the workers, not yet written: [first region, regions, values per table].
  let held: Array<{ from: number; n: number; got: Float64Array[] }> = [];
  let heldRegions = 0;
  const flush = () => {
    files.forEach((perLayer, ti) =>
      perLayer.forEach((path, li) => {
        const fd = openSync(path, 'r+');
        try {
          for (const h of held) {
            const v = h.got[ti].subarray(li * h.n, (li + 1) * h.n);
            writeSync(fd, new Uint8Array(v.buffer, v.byteOffset, v.byteLength), 0, v.byteLength, h.from * 8);
          }
        } finally {
          closeSync(fd);
        }
      }),
    );
    held = [];
    heldRegions = 0;
  };
  const keep = (from: number, count: number, got: Float64Array[]) => {
    held.push({ from, n: count, got });
    heldRegions += count;
    if (heldRegions >= flushRegions) flush();
  };
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
  flush();
  progress.done();
  writeFileSync(join(dir, 'index.json'), JSON.stringify(index));
}
