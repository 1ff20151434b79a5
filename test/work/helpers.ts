/** Test helpers of the work stage: catalogued-error assertion and fixture reading. */
import { readFileSync } from 'node:fs';

export { expectCatalogued as expectWorkError } from '../helpers/catalogued.ts';

/** Rows of a fixture CSV in test/work/fixtures (lines starting with # are provenance). */
export function readFixture(name: string): Record<string, string>[] {
  const text = readFileSync(new URL(`./fixtures/${name}`, import.meta.url), 'utf8');
  const lines = text.split('\n').filter((l) => l.length > 0 && !l.startsWith('#'));
  const head = lines[0].split(',');
  return lines.slice(1).map((l) => {
    const cells = l.split(',');
    return Object.fromEntries(head.map((h, i) => [h, cells[i]]));
  });
}
