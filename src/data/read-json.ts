/** Reads one JSON file of the data folder and validates it with a zod schema, with catalogued errors. */
import { readFileSync, existsSync } from 'node:fs';
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
