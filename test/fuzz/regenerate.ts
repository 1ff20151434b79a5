/**
 * Makes one fuzz mutant again, from its format, seed and index alone (the bases are rewritten
 * byte for byte from the demo writers when missing):
 *
 *   npx tsx test/fuzz/regenerate.ts --format netcdf4 --seed 7 --index 123 --out damaged.nc
 *
 * then, e.g., `npx heathours inspect damaged.nc`. The damage done is printed.
 */
import { writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parseArgs } from 'node:util';
import { loadBase, prepareBases } from './bases.ts';
import { FORMATS, makeMutant, type FormatId } from './mutate.ts';

/** Where regenerate.ts keeps the bases unless told (--bases). */
export const DEFAULT_BASES_DIR = join(tmpdir(), 'heathours-fuzz-bases');

async function main(): Promise<void> {
  const { values } = parseArgs({ options: { format: { type: 'string' }, seed: { type: 'string' }, index: { type: 'string' }, out: { type: 'string' }, bases: { type: 'string' } } });
  const format = values.format as FormatId;
  if (!FORMATS.includes(format) || values.seed === undefined || values.index === undefined || !values.out) {
    process.stderr.write(`usage: npx tsx test/fuzz/regenerate.ts --format ${FORMATS.join('|')} --seed N --index N --out FILE [--bases DIR]\n`);
    process.exitCode = 2;
    return;
  }
  const bases = await prepareBases(values.bases ?? DEFAULT_BASES_DIR);
  const m = makeMutant(loadBase(format, bases.base[format]), Number(values.seed), Number(values.index));
  writeFileSync(values.out, m.bytes);
  process.stdout.write(`wrote ${values.out} (${m.bytes.length} bytes): ${m.recipe.join('; ')}\n`);
  if (format === 'netcdf3-classic' || format === 'netcdf3-64bit-offset' || format === 'netcdf4') {
    process.stdout.write(`its land-sea mask: ${format === 'netcdf4' ? bases.lsm.netcdf4 : bases.lsm.netcdf3}\n`);
  }
}

if (import.meta.url === `file://${process.argv[1]}`) await main();
