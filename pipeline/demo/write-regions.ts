/**
 * Writes the demo's district files content/regions/*.geojson from ./territory.ts:
 * `npx tsx pipeline/demo/write-regions.ts [DIR]` (default content/regions). test/demo checks that
 * the committed files equal what this writes.
 */
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { writeFileAtomic } from '../model/effects.ts';
import { regionFiles } from './regions-geojson.ts';

const dir = process.argv[2] ?? fileURLToPath(new URL('../../content/regions', import.meta.url));
for (const [name, text] of regionFiles()) {
  await writeFileAtomic(join(dir, name), text);
  process.stdout.write(`wrote ${join(dir, name)}\n`);
}
