/**
 * `data/manifest.json`: what this build is (atlas, inputs with digests, years, code version,
 * configuration digest, build time) and every artefact it published with its path, kind, units
 * and digest. The site and users read it to find and trust the files.
 */
import { readdir, stat } from 'node:fs/promises';
import { join, relative } from 'node:path';
import { sha256OfFile } from '../model/file-sha256.ts';
import type { InventoryFile } from '../read/inventory-types.ts';
import type { LayerEntry } from './atlas-layers.ts';

export interface ArtefactEntry {
  /** Path relative to the site root, e.g. `data/regions/north-coast.csv`. */
  path: string;
  kind: 'table' | 'layer-png' | 'layer-geotiff' | 'json' | 'geojson' | 'histogram' | 'netcdf';
  units?: string;
  description: string;
  bytes: number;
  sha256: string;
}

export interface Manifest {
  manifestVersion: 1;
  atlas: { id: string; title: string; invented: boolean; attribution?: string };
  buildTime: string;
  codeVersion: string;
  configDigest: string;
  inputs: InventoryFile[];
  years: [number, number];
  baseline: [number, number];
  latestYear: number;
  timeZone: string;
  /** Modelling choices of the physics (pipeline/physics/settings.ts): globe diameter [m]. */
  physics: { globeDiameter: number };
  work: unknown;
  figures: Array<{ id: string; label: string; units: string; combos: string[] }>;
  statistics: Record<string, string>;
  counts: Record<string, number>;
  layers: LayerEntry[];
  artefacts: ArtefactEntry[];
  /** The workforce weighting, when the atlas has one (config `workforce`). */
  workforce?: ManifestWorkforce;
  /** What every scenario is and is not (a what-if, not a forecast), to show with any of them. */
  scenarioCaveat?: string;
  /** The scenarios published under `data/scenarios/<id>/` (same files as the record's), in configuration order. */
  scenarios?: ManifestScenario[];
}

/** What a build's person-hours were made from, and what became of the raster's people. */
export interface ManifestWorkforce {
  /** The raster's name, year and licence as the config gives them; invented rasters say so. */
  name: string;
  year: number;
  licence: string;
  invented: boolean;
  raster: { file: string; sha256: string; width: number; height: number; pixelDegrees: [number, number]; sampleType: string; noData: number | string | null };
  shares: { file: string; sha256: string; defaults: { acclimatizedShare: number; sunShare: number } };
  /** People on the land cells, over cells outside the land mask (not counted), outside the grid (parts of the pixels read) [people]. */
  peopleOnLand: number;
  peopleOffLand: number;
  peopleOutsideGrid: number;
  /** Hours of a year of the shift pattern: one full-time equivalent [h]. */
  annualHours: number;
  /** The region figures (tables) made from it; the per-cell figure is in `figures`. */
  figures: Array<{ id: string; label: string; units: string; combos: string[] }>;
}

/** One scenario as the manifest describes it. */
export interface ManifestScenario {
  id: string;
  name: string;
  description?: string;
  /** Its parameters: a uniform warming [K], or the change file (name, SHA-256, humidity kind, variables read). */
  definition:
    | { kind: 'warming'; warming: number }
    | { kind: 'change-file'; changeFile: string; sha256: string; humidity: 'relative' | 'specific'; variables: string[] };
  /** In words: the kind, what it changes, its source, and the caveat (pipeline/scenario/describe.ts). */
  words: { kind: string; what: string; source: string; caveat: string };
  /** Range of each change over the land cells and months: temperature [K], humidity [percentage points, or fraction], solar [fraction]. */
  changes: {
    temperature: { min: number; max: number; mean: number };
    humidity: { min: number; max: number; mean: number } | null;
    solar: { min: number; max: number; mean: number } | null;
  };
  /** Its folder below the site root, `data/scenarios/<id>/`. */
  dataPath: string;
  /** Shards, land cell-hours and physics counts of its record, and the relative-humidity clamps its changes made [cell-hours]. */
  counts: Record<string, number>;
  /** Its map layers (paths in its folder; ids as the record's). */
  layers: LayerEntry[];
}

export const STATISTIC_RULES: Record<string, string> = {
  mean: 'mean over the baseline years that count (completeness: at most 240 missing hours per month or year, at least 80 % of the baseline years)',
  median: 'median of the baseline years, Hyndman-Fan type 7 (linear interpolation)',
  p90: '90th-percentile year of the baseline, Hyndman-Fan type 7: exceeded in about 1 year in 10',
  min: 'lowest baseline year',
  max: 'highest baseline year',
  latest: 'the latest year built, for comparison with the baseline',
  'worst-cell-mean': 'highest baseline mean of any grid cell of the region',
  trend: 'Theil-Sen slope of the annual value over every built year with a value, per decade (Sen 1968); empty with fewer than 15 years',
  'trend-p':
    'two-sided Mann-Kendall p-value of that trend (Mann 1945, Kendall 1975; normal approximation with the tie correction); empty with fewer than 15 years',
};

/** SHA-256 of a file [hex] (pipeline/model/file-sha256.ts). */
export { sha256OfFile };

/** Files hashed at once [count]: the reads and the hashing of several files overlap on libuv's threads. */
const HASHED_AT_ONCE = 4;

/**
 * Lists every file under `root/data` as artefacts, with kinds guessed from the path, in the
 * order of a sorted walk; {@link HASHED_AT_ONCE} files are read and hashed at a time.
 */
export async function listArtefacts(
  root: string,
  describe: (path: string) => { kind: ArtefactEntry['kind']; description: string; units?: string },
): Promise<ArtefactEntry[]> {
  const files: Array<{ p: string; path: string }> = [];
  async function walk(dir: string): Promise<void> {
    const entries = (await readdir(dir, { withFileTypes: true })).sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0));
    for (const e of entries) {
      const p = join(dir, e.name);
      // A link or other entry is looked at as the old walk did: by what it points to.
      const isDir = e.isDirectory() || (!e.isFile() && (await stat(p)).isDirectory());
      if (isDir) await walk(p);
      else {
        const path = relative(root, p).split('\\').join('/');
        if (path === 'data/manifest.json') continue;
        files.push({ p, path });
      }
    }
  }
  await walk(join(root, 'data'));
  const facts = new Array<{ bytes: number; sha256: string }>(files.length);
  let next = 0;
  const worker = async () => {
    for (let i = next++; i < files.length; i = next++) {
      const p = files[i].p;
      facts[i] = { bytes: (await stat(p)).size, sha256: await sha256OfFile(p) };
    }
  };
  await Promise.all(Array.from({ length: Math.min(HASHED_AT_ONCE, files.length) }, worker));
  return files.map((f, i) => ({ path: f.path, ...describe(f.path), bytes: facts[i].bytes, sha256: facts[i].sha256 }));
}
