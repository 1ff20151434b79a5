/**
 * A folder's files as bytes, for byte-identity checks between two builds (one machine against a
 * cluster, one input layout against another).
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join, relative } from 'node:path';

/** Every file under `root` (any depth), path relative to `root` → bytes. */
export function readTree(root: string): Map<string, Buffer> {
  const out = new Map<string, Buffer>();
  const walk = (d: string) => {
    for (const e of readdirSync(d, { withFileTypes: true })) {
      const p = join(d, e.name);
      if (e.isDirectory()) walk(p);
      else out.set(relative(root, p), readFileSync(p));
    }
  };
  walk(root);
  return out;
}

/** Paths (sorted) present in only one of the two trees or whose bytes differ; empty when identical. */
export function treeDifferences(a: Map<string, Buffer>, b: Map<string, Buffer>): string[] {
  const out = new Set<string>();
  for (const [k, v] of a) if (!b.get(k)?.equals(v)) out.add(k);
  for (const k of b.keys()) if (!a.has(k)) out.add(k);
  return [...out].sort();
}
