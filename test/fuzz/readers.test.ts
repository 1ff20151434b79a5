/**
 * Damaged input files never crash the tool (issue 18): a seeded fuzz run over one year of the
 * invented small demo grid in each NetCDF layout (classic, 64-bit offset made by the netCDF-C
 * tool `nccopy`, NetCDF-4), an invented `point` station table and the demo atlas configuration.
 * Each format's mutants are the base cut at every structure boundary, then random damage
 * weighted to headers and metadata (test/fuzz/mutate.ts); each runs in a worker thread under a
 * time limit (test/fuzz/pool.ts) through what a user runs: `inspect` and a build's reads for
 * NetCDF, `point` for the CSV, the configuration checks of `build` for the YAML.
 *
 * Every mutant must be read or end in a catalogued error naming the file; an internal error, a
 * hang, a crashed worker or text printed to the terminal fails the test, which prints the seed,
 * the damage, the kept mutant file and the command that makes it again. HEATHOURS_FUZZ_SEED
 * runs another seed. The longer run is the `fuzz-readers` benchmark.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describeDefect, runCampaign, type FormatSummary } from './campaign.ts';
import { FORMATS, type FormatId } from './mutate.ts';

const SEED = Number(process.env.HEATHOURS_FUZZ_SEED ?? 18);
/** Mutants per format: the truncation sweep (about 40 to 120 cuts) and random damage after it. */
const COUNTS: Record<FormatId, number> = { 'netcdf3-classic': 150, 'netcdf3-64bit-offset': 150, netcdf4: 150, 'point-csv': 300, 'atlas-yaml': 300 };
const dir = mkdtempSync(join(tmpdir(), 'heathours-fuzz-'));
let keep = false;
afterAll(() => {
  if (!keep) rmSync(dir, { recursive: true, force: true });
});

let run: Promise<{ summaries: FormatSummary[]; seconds: number }> | undefined;
const campaign = () => (run ??= runCampaign({ count: 0, counts: COUNTS, seed: SEED, workers: 2, timeoutMs: 30_000, dir, depth: 'quick' }));

describe(`damaged files (fuzz seed ${SEED})`, () => {
  for (const format of FORMATS) {
    it(
      `${format}: every one of ${COUNTS[format]} damaged files is read or ends in a catalogued error naming it, within the time limit and without printing`,
      { timeout: 600_000 },
      async () => {
        const { summaries } = await campaign();
        const s = summaries.find((x) => x.format === format)!;
        if (s.defects.length > 0) keep = true;
        const report = s.defects.slice(0, 5).map(describeDefect).join('\n\n');
        expect(s.defects.length, `${s.defects.length} defect(s) of ${s.mutants} (seed ${SEED}); mutant files kept under ${dir}\n\n${report}`).toBe(0);
        expect(s.mutants).toBe(COUNTS[format]);
        // A NetCDF file cut short is never read as if whole.
        if (format.startsWith('netcdf')) expect(s.sweepRead, 'truncated NetCDF files read without an error').toBe(0);
        expect(s.sweep).toBeGreaterThan(30);
        // Both outcomes occur: the damage is neither always harmless nor always fatal.
        expect(s.counts.catalogued).toBeGreaterThan(0);
        expect(s.counts.read).toBeGreaterThan(0);
      },
    );
  }
});
