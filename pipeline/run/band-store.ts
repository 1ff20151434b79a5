/**
 * Merge bands on disk, for a distributed merge: `heathours build --merge DIR --tile K/N` writes
 * each of its bands into `DIR/bands/<rows-id>/` — `data/` (the band's published files: per-cell
 * tables, map chunks, calculator tiles), `scratch/` (its grid piece, region parts and niche
 * entries) and, last and atomically, `band.json` (what the band holds and the key of the build it
 * belongs to). `heathours build --assemble DIR` then checks that every publication block of the
 * plan is in exactly one band of this build and joins them (regions, layers, NetCDF, manifest,
 * site). Paths in band.json are relative to DIR, so the assemble step may mount DIR elsewhere.
 * A scenario's bands go to `DIR/scenario-bands/<scenario id>/<rows-id>/`, the same way.
 */
import { createHash } from 'node:crypto';
import { copyFileSync, existsSync, linkSync, mkdirSync, readdirSync, readFileSync } from 'node:fs';
import { writeFileAtomicSync } from '../model/effects.ts';
import { dirname, join, relative, resolve } from 'node:path';
import { CODE_VERSION } from '../model/version.ts';
import type { MergeTileSummary } from './merge-tile.ts';
import type { BuildPlan, BuildVariant } from './plan-stage.ts';
import { rowsId } from './rows-id.ts';
import { BandsDuplicated, BandsForeign, BandsIncomplete } from './errors.ts';

export const BAND_FORMAT = 2;

/** Key of the merged bands of a build: the configuration, the code, every shard's cache key and the blocks [hex]. */
export function bandsKey(plan: BuildPlan): string {
  const h = createHash('sha256');
  h.update(`band-format ${BAND_FORMAT}\0code ${CODE_VERSION}\0config ${plan.configDigest}\0`);
  for (const k of [...plan.keyed].sort((a, b) => (a.shard.id < b.shard.id ? -1 : 1))) h.update(`${k.shard.id} ${k.key}\0`);
  h.update(JSON.stringify(plan.blocks));
  return h.digest('hex');
}

/** The folder of the bands of a weather under the merge folder: `bands`, or `scenario-bands/<id>` for a scenario. */
export function bandsRootOf(dir: string, variant?: BuildVariant): string {
  return variant?.scenario === undefined ? join(resolve(dir), 'bands') : join(resolve(dir), 'scenario-bands', variant.scenario.id);
}

/** The folder of a band (of a weather; default the record) under the merge folder. */
export function bandDir(dir: string, rows: readonly [number, number], variant?: BuildVariant): string {
  return join(bandsRootOf(dir, variant), rowsId(rows));
}

interface BandFile {
  format: number;
  key: string;
  /** The publication blocks the band holds (rows). */
  blocks: Array<[number, number]>;
  summary: Omit<MergeTileSummary, 'fieldMin' | 'fieldMax'> & { fieldMin: Array<number | null>; fieldMax: Array<number | null> };
}

const toJson = (a: Float64Array) => Array.from(a, (v) => (Number.isFinite(v) ? v : null));
const fromJson = (a: Array<number | null>) => Float64Array.from(a, (v) => (v === null ? NaN : v));

/** Writes a merged band's band.json (paths made relative to `dir`), atomically. */
export function writeBand(dir: string, key: string, blocks: Array<[number, number]>, s: MergeTileSummary, variant?: BuildVariant): void {
  const root = resolve(dir);
  const rel = (p: string) => relative(root, p);
  const file: BandFile = {
    format: BAND_FORMAT,
    key,
    blocks,
    summary: {
      ...s,
      fieldMin: toJson(s.fieldMin),
      fieldMax: toJson(s.fieldMax),
      piece: { ...s.piece, path: rel(s.piece.path) },
      regionParts: s.regionParts.map((r) => ({ ...r, path: rel(r.path) })),
      nicheFragment: rel(s.nicheFragment),
    },
  };
  writeFileAtomicSync(join(bandDir(dir, s.rows, variant), 'band.json'), JSON.stringify(file));
}

/** The band.json of a band folder, or undefined when absent or unreadable. */
function readBandFile(path: string): BandFile | undefined {
  try {
    const f = JSON.parse(readFileSync(path, 'utf8')) as BandFile;
    return f.format === BAND_FORMAT ? f : undefined;
  } catch {
    return undefined;
  }
}

/** Whether a band of these rows is already merged for this build (a retried task skips it). */
export function bandDone(dir: string, key: string, rows: readonly [number, number], variant?: BuildVariant): boolean {
  const f = readBandFile(join(bandDir(dir, rows, variant), 'band.json'));
  return f !== undefined && f.key === key;
}

/** A band found for the assemble step: its summary with absolute paths, and its data folder. */
export interface FoundBand {
  name: string;
  summary: MergeTileSummary;
  dataDir: string;
}

/**
 * Every band under `dir/bands`, checked against the plan: each publication block in exactly one
 * band (BandsIncomplete names the missing blocks, BandsDuplicated two bands that hold one block),
 * every band of this build (BandsForeign: another configuration, code or inputs). Sorted by rows.
 */
export function readBands(dir: string, plan: BuildPlan, variant?: BuildVariant): FoundBand[] {
  const root = resolve(dir);
  const bandsRoot = bandsRootOf(dir, variant);
  const key = bandsKey(plan);
  const names = existsSync(bandsRoot) ? readdirSync(bandsRoot).sort() : [];
  const found: FoundBand[] = [];
  const owner = new Map<string, string>();
  for (const name of names) {
    const path = join(bandsRoot, name, 'band.json');
    if (!existsSync(path)) continue; // a band still being merged, or abandoned: its blocks count as missing
    const f = readBandFile(path);
    if (!f) throw BandsForeign({ band: name, why: 'its band.json cannot be read or is of another format' }, { file: path });
    if (f.key !== key) throw BandsForeign({ band: name, why: 'it was merged from other inputs, configuration or code' }, { file: path });
    for (const b of f.blocks) {
      const id = rowsId(b);
      const other = owner.get(id);
      if (other !== undefined) throw BandsDuplicated({ block: id, bands: [other, name] }, { file: bandsRoot });
      owner.set(id, name);
    }
    const abs = (p: string) => join(root, p);
    found.push({
      name,
      dataDir: join(bandsRoot, name, 'data'),
      summary: {
        ...f.summary,
        fieldMin: fromJson(f.summary.fieldMin),
        fieldMax: fromJson(f.summary.fieldMax),
        piece: { ...f.summary.piece, path: abs(f.summary.piece.path) },
        regionParts: f.summary.regionParts.map((r) => ({ ...r, path: abs(r.path) })),
        nicheFragment: abs(f.summary.nicheFragment),
      },
    });
  }
  const missing = plan.blocks.map((b) => rowsId(b)).filter((id) => !owner.has(id));
  if (missing.length > 0) {
    throw BandsIncomplete({ missing: missing.length, blocks: plan.blocks.length, first: missing.slice(0, 8), dir: bandsRoot }, { file: bandsRoot });
  }
  return found.sort((a, b) => a.summary.rows[0] - b.summary.rows[0]);
}

/**
 * Puts a band's published files into the staging data folder: hard links where the disk allows
 * (the band folder stays whole, so an assemble can be run again), copies otherwise.
 */
export function linkBandData(band: FoundBand, dataDir: string): void {
  const walk = (from: string, to: string) => {
    if (!existsSync(from)) return;
    for (const e of readdirSync(from, { withFileTypes: true })) {
      const src = join(from, e.name);
      const dst = join(to, e.name);
      if (e.isDirectory()) walk(src, dst);
      else {
        mkdirSync(dirname(dst), { recursive: true });
        try {
          linkSync(src, dst);
        } catch {
          copyFileSync(src, dst);
        }
      }
    }
  };
  walk(band.dataDir, dataDir);
}
