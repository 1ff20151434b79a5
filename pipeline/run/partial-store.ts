/**
 * A folder of partial files (pipeline/reduce/partial-codec.ts), one per shard: the build's cache
 * (`<cache>/<atlas-id>/<shard-id>.hhp`), or one slice's share of a distributed run
 * (`<partials>/slice-K-of-N/<shard-id>.hhp`). Files are written to a temporary name and renamed,
 * so a killed build leaves only whole files; a damaged one fails its checksum when read.
 */
import { existsSync, readdirSync, readFileSync, rmSync, statSync } from 'node:fs';
import { writeFileAtomicSync } from '../model/effects.ts';
import { join, relative } from 'node:path';
import { decodePartial, decodePartialSparse, encodePartial, readPartialHeader, type PartialMeta } from '../formats/partial-file.ts';
import type { SparsePartial } from '../reduce/merge.ts';
import type { ShardPartial } from '../reduce/accumulator.ts';
import { HeathoursError } from '../model/errors.ts';
import { processAlive } from '../model/lock.ts';
import { explainChange, type ShardProvenance } from './shard-key.ts';

export const PARTIAL_EXTENSION = '.hhp';

/** Path of a shard's partial in `dir`. */
export function partialPath(dir: string, shardId: string): string {
  return join(dir, `${shardId}${PARTIAL_EXTENSION}`);
}

/** Writes a partial file atomically (temporary sibling, then rename); returns its size [B]. */
export function writePartialFile(path: string, partial: ShardPartial, meta: PartialMeta): number {
  const bytes = encodePartial(partial, meta);
  writeFileAtomicSync(path, bytes);
  return bytes.length;
}

/**
 * Removes temporary files left in `dir` by writers that were killed (their process is gone);
 * returns how many. Files of live writers are left alone.
 */
export function removeAbandonedTemporaries(dir: string): number {
  if (!existsSync(dir)) return 0;
  let n = 0;
  for (const name of readdirSync(dir)) {
    const m = /\.hhp\.(\d+)\.[a-z0-9]+\.tmp$/.exec(name);
    if (!m || processAlive(Number(m[1]))) continue;
    rmSync(join(dir, name), { force: true });
    n++;
  }
  return n;
}

/** Reads and decodes a partial file (checksum verified). */
export function readPartialFile(path: string): { meta: PartialMeta; partial: ShardPartial } {
  return decodePartial(readFileSync(path), path);
}

/** Reads and decodes a partial file for a merge: the histograms left in their sparse form (checked). */
export function readPartialFileSparse(path: string): { meta: PartialMeta; partial: SparsePartial } {
  return decodePartialSparse(readFileSync(path), path);
}

/** What the cache holds for one shard. */
export type CacheVerdict = { status: 'fresh'; path: string; meta: PartialMeta } | { status: 'missing' | 'stale' | 'corrupt'; path: string; reason: string };

/**
 * Looks a shard up in the cache folder `dir`: fresh when a whole file with the same key is there;
 * otherwise why not (no entry, what changed, or the damage found by the checksum).
 */
export function lookupPartial(dir: string, shardId: string, key: string, provenance: ShardProvenance): CacheVerdict {
  const path = partialPath(dir, shardId);
  if (!existsSync(path)) return { status: 'missing', path, reason: 'not computed before' };
  try {
    const { meta } = readPartialHeader(readFileSync(path), path);
    if (meta.key === key) return { status: 'fresh', path, meta };
    const why = explainChange(meta.provenance as unknown as ShardProvenance, provenance);
    return { status: 'stale', path, reason: why.length ? why.join('; ') : 'its key differs' };
  } catch (e) {
    if (e instanceof HeathoursError) return { status: 'corrupt', path, reason: `cache entry damaged: ${e.message}` };
    throw e;
  }
}

/** One partial file found under a partials folder. */
export interface FoundPartial {
  path: string;
  /** Path below the scanned folder, for messages. */
  name: string;
  meta: PartialMeta;
  bytes: number;
}

/** Every `*.hhp` file under `dir` (any depth), with its checked header; damage is an error. */
export function scanPartials(dir: string): FoundPartial[] {
  const out: FoundPartial[] = [];
  const walk = (d: string) => {
    for (const e of readdirSync(d, { withFileTypes: true }).sort((a, b) => (a.name < b.name ? -1 : 1))) {
      const p = join(d, e.name);
      if (e.isDirectory()) walk(p);
      else if (e.name.endsWith(PARTIAL_EXTENSION)) {
        const { meta } = readPartialHeader(readFileSync(p), p);
        out.push({ path: p, name: relative(dir, p), meta, bytes: statSync(p).size });
      }
    }
  };
  walk(dir);
  return out;
}
