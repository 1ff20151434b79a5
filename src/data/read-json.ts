/** Reads one JSON file of the data folder and validates it with a zod schema, with catalogued errors. */
import { readFileSync, existsSync, statSync } from 'node:fs';
import type { z } from 'zod';
import { SiteDataInvalid, SiteDataMissing, SiteDataUnreadable } from './errors.ts';

/** Parses `path` as JSON and checks it against `schema`; `what` names the file in errors. */
export function readValidatedJson<S extends z.ZodTypeAny>(path: string, schema: S, what: string): z.infer<S> {
  if (!existsSync(path)) throw SiteDataMissing({ path, what }, { file: path });
  let raw: unknown;
  try {
    raw = JSON.parse(readFileSync(path, 'utf8'));
  } catch (e) {
    throw SiteDataUnreadable({ path, detail: (e as Error).message }, { file: path });
  }
  const parsed = schema.safeParse(raw);
  if (!parsed.success) {
    const problems = parsed.error.issues.slice(0, 8).map((i) => `${i.path.join('.') || '(top level)'}: ${i.message}`);
    const first = parsed.error.issues[0];
    throw SiteDataInvalid({ path, problems }, { file: path, key: first ? first.path.join('.') : undefined });
  }
  return parsed.data;
}

const stamped = new Map<string, { stamp: string; value: unknown }>();

/**
 * {@link readValidatedJson}, parsed and checked once per path, size and modification time: for
 * files every page reads (the manifest, the inventory). The result is shared by every caller:
 * read it, never change it.
 */
export function readValidatedJsonOnce<S extends z.ZodTypeAny>(path: string, schema: S, what: string): z.infer<S> {
  const info = statSync(path, { throwIfNoEntry: false });
  const stamp = info ? `${info.size}:${info.mtimeMs}` : '';
  const hit = stamped.get(path);
  if (hit && info && hit.stamp === stamp) return hit.value as z.infer<S>;
  const value = readValidatedJson(path, schema, what);
  stamped.set(path, { stamp, value });
  return value;
}
