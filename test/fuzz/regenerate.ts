/**
 * Makes one fuzz mutant again, from its format, seed and index alone (the bases are rewritten
 * byte for byte from the demo writers when missing):
 *
 *   npx tsx test/fuzz/regenerate.ts --format netcdf4 --seed 7 --index 123 --out damaged.nc
 *
 * then, e.g., `npx heathours inspect damaged.nc`. The damage done is printed. An atlas YAML
 * mutant meets what the fuzzer saw only when written beside the bases' copy of content/
 * (BASES/atlas/content/), where its regions, classes and data globs resolve. With `--run` the
 * mutant is also put through the fuzzer's steps (targets.ts) in this process, alone, with the
 * fuzzer's time limit for NetCDF-4 metadata, after one untimed run on the undamaged base (start-up
 * aside): each step's outcome, wall time [ms] and the process's CPU time [ms] (every thread, the
 * metadata worker's loop included) are printed.
 */
import { writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parseArgs } from 'node:util';
import { loadBase, prepareBases } from './bases.ts';
import { FORMATS, makeMutant, type FormatId } from './mutate.ts';
import { classify } from './outcome.ts';
import { stepsFor } from './targets.ts';
import { FUZZ_METADATA_TIMEOUT_MS } from './fuzz-limits.ts';
import { setHdf5MetadataTimeout } from '../../pipeline/read/hdf5-meta.ts';

/** Where regenerate.ts keeps the bases unless told (--bases). */
export const DEFAULT_BASES_DIR = join(tmpdir(), 'heathours-fuzz-bases');

async function main(): Promise<void> {
  const { values } = parseArgs({
    options: {
      format: { type: 'string' },
      seed: { type: 'string' },
      index: { type: 'string' },
      out: { type: 'string' },
      bases: { type: 'string' },
      run: { type: 'boolean' },
    },
  });
  const format = values.format as FormatId;
  if (!FORMATS.includes(format) || values.seed === undefined || values.index === undefined || !values.out) {
    process.stderr.write(`usage: npx tsx test/fuzz/regenerate.ts --format ${FORMATS.join('|')} --seed N --index N --out FILE [--bases DIR] [--run]\n`);
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
  if (values.run) {
    setHdf5MetadataTimeout(FUZZ_METADATA_TIMEOUT_MS);
    // One untimed run on the undamaged base first, so that loading and compiling the readers
    // (and HDF5's WebAssembly) is not counted, as it is not for a mutant in a running campaign.
    for (const step of stepsFor(format, bases.base[format], bases)) await step.run().catch(() => undefined);
    let wall = 0;
    let cpu = 0;
    for (const step of stepsFor(format, values.out, bases)) {
      const t0 = performance.now();
      const c0 = process.cpuUsage();
      let thrown: unknown;
      try {
        await step.run();
      } catch (e) {
        thrown = e ?? new Error('undefined was thrown');
      }
      const c = process.cpuUsage(c0);
      const ms = performance.now() - t0;
      const cms = (c.user + c.system) / 1000;
      wall += ms;
      cpu += cms;
      const r = classify(thrown, values.out);
      process.stdout.write(`${step.name}: ${r.outcome}${r.code ? ` [${r.code}]` : ''}, ${ms.toFixed(0)} ms wall, ${cms.toFixed(0)} ms CPU\n`);
    }
    process.stdout.write(`all steps: ${wall.toFixed(0)} ms wall, ${cpu.toFixed(0)} ms CPU\n`);
    process.exit(0);
  }
}

if (import.meta.url === `file://${process.argv[1]}`) await main();
