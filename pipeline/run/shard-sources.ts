/**
 * Where each shard's partial comes from in a build: a fresh cache entry (reused), a computation
 * (with the reason), or, for `build --merge DIR`, a partial file of a distributed run, checked
 * against the plan (missing, duplicated, foreign and unknown shards are errors naming them).
 */
import type { ShardSpec } from './plan.ts';
import { lookupPartial, partialPath, removeAbandonedTemporaries, scanPartials, type FoundPartial } from './partial-store.ts';
import { explainChange, type ShardProvenance } from './shard-key.ts';
import type { PartialMeta } from '../formats/partial-file.ts';
import { PartialsIncomplete, PartialsInconsistent } from '../reduce/errors.ts';
import { PartialsDuplicated, PartialsForeign } from './errors.ts';

/** A shard with its provenance and cache key (pipeline/run/shard-key.ts). */
export interface KeyedShard {
  shard: ShardSpec;
  provenance: ShardProvenance;
  key: string;
}

/** The decision for one shard. */
export type ShardSource = { kind: 'file'; path: string; meta: PartialMeta; why: string } | { kind: 'compute'; why: string; storePath?: string };

/**
 * Looks every shard up in the cache folder `dir` (undefined: no cache, compute all). A damaged
 * or stale entry is recomputed and overwritten.
 */
export function sourcesFromCache(keyed: readonly KeyedShard[], dir: string | undefined): ShardSource[] {
  if (dir !== undefined) removeAbandonedTemporaries(dir);
  return keyed.map(({ shard, provenance, key }) => {
    if (dir === undefined) return { kind: 'compute', why: 'cache off' };
    const v = lookupPartial(dir, shard.id, key, provenance);
    if (v.status === 'fresh') return { kind: 'file', path: v.path, meta: v.meta, why: 'reused: same inputs, settings and code' };
    return { kind: 'compute', why: v.reason, storePath: partialPath(dir, shard.id) };
  });
}

/**
 * The partial files under `dir` for every shard of the plan (`build --merge DIR`). Errors:
 * PartialsDuplicated (two files for one shard), PartialsForeign (made from other inputs,
 * settings or code), PartialsInconsistent (a shard the plan does not have), PartialsIncomplete
 * (shards with no file, by name).
 */
export function sourcesFromPartials(keyed: readonly KeyedShard[], dir: string): { sources: ShardSource[]; found: FoundPartial[] } {
  const found = scanPartials(dir);
  const byId = new Map<string, FoundPartial[]>();
  for (const f of found) byId.set(f.meta.shardId, [...(byId.get(f.meta.shardId) ?? []), f]);
  const planned = new Map(keyed.map((k) => [k.shard.id, k]));
  for (const [id, files] of byId) {
    if (files.length > 1) throw PartialsDuplicated({ shardId: id, files: files.map((f) => f.name) }, { file: dir });
    if (!planned.has(id)) {
      throw PartialsInconsistent(
        { detail: `${files[0].name} holds shard ${id}, which this build's plan does not have (another grid, mask, years or shards.cellsPerTile?)` },
        { file: dir },
      );
    }
  }
  const missing = keyed.filter((k) => !byId.has(k.shard.id)).map((k) => k.shard.id);
  if (missing.length > 0) {
    throw PartialsIncomplete(
      {
        detail: `${missing.length} of ${keyed.length} shard(s) have no partial under ${dir}: ${missing.slice(0, 12).join(', ')}${missing.length > 12 ? ', …' : ''}`,
      },
      { file: dir },
    );
  }
  const sources = keyed.map(({ shard, provenance, key }): ShardSource => {
    const f = byId.get(shard.id)![0];
    if (f.meta.key !== key) {
      const why = explainChange(f.meta.provenance as unknown as ShardProvenance, provenance);
      throw PartialsForeign({ file: f.name, shardId: shard.id, why: why.length ? why.join('; ') : 'its key differs' }, { file: f.path });
    }
    return { kind: 'file', path: f.path, meta: f.meta, why: `merged from ${f.name}` };
  });
  return { sources, found };
}

/** Log lines for the decisions: one line per distinct reason, with the count and first shards. */
export function describeSources(keyed: readonly KeyedShard[], sources: readonly ShardSource[]): string[] {
  const groups = new Map<string, string[]>();
  sources.forEach((s, i) => {
    const label = s.kind === 'file' ? (s.why.startsWith('merged') ? 'merged' : 'reused') : `recomputed (${s.why})`;
    groups.set(label, [...(groups.get(label) ?? []), keyed[i].shard.id]);
  });
  return [...groups].map(([label, ids]) => `shards ${label}: ${ids.length} — ${ids.slice(0, 8).join(', ')}${ids.length > 8 ? ', …' : ''}`);
}
