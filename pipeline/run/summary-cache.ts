/**
 * The inventory summary's chunk cache on disk (`<cache>/<atlas-id>/summary/<key>.json`): the
 * min, max, sum and counts of each variable over one UTC year of hours, keyed by the digests of
 * the files holding them (pipeline/read/dataset.ts `summary`). A yearly rebuild then streams only
 * the new year's files for the inventory. An unreadable entry is treated as absent (recomputed).
 */
import { existsSync, readFileSync } from 'node:fs';
import { writeFileAtomicSync } from '../model/effects.ts';
import { join } from 'node:path';
import type { SummaryAccumulator, SummaryChunkCache } from '../read/index.ts';

export function fileSummaryCache(dir: string): SummaryChunkCache {
  return {
    get(key) {
      const p = join(dir, `${key}.json`);
      if (!existsSync(p)) return undefined;
      try {
        const raw = JSON.parse(readFileSync(p, 'utf8')) as Record<string, { min: number | null; max: number | null; sum: number; n: number; fill: number }>;
        const out: Record<string, SummaryAccumulator> = {};
        for (const [k, a] of Object.entries(raw)) {
          if (typeof a.sum !== 'number' || typeof a.n !== 'number' || typeof a.fill !== 'number') return undefined;
          // JSON has no infinities: an empty chunk's min/max are stored as null.
          out[k] = { min: a.min ?? Infinity, max: a.max ?? -Infinity, sum: a.sum, n: a.n, fill: a.fill };
        }
        return out;
      } catch {
        return undefined;
      }
    },
    set(key, value) {
      writeFileAtomicSync(
        join(dir, `${key}.json`),
        JSON.stringify(value, (_k, v) => (v === Infinity || v === -Infinity ? null : v)),
      );
    },
  };
}
