/**
 * The mutator itself (test/fuzz/mutate.ts) never fails: the long run (bench fuzz-readers, seed 1)
 * found two mutants whose second step lost bytes past the end of a file an earlier step had cut
 * short (RangeError in the harness, counted as a crash of the fuzz worker, not of a reader). Each
 * is made again here, with the other kinds of damage around it, and must come out as bytes with
 * a recipe. Inputs: one year of the invented small demo grid (test/fuzz/bases.ts).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { loadBase, prepareBases, type BasePaths } from './bases.ts';
import { makeMutant } from './mutate.ts';

let bases: BasePaths;
beforeAll(async () => {
  bases = await prepareBases(mkdtempSync(join(tmpdir(), 'hh-mutate-')));
}, 300_000);

describe('the fuzz mutator', () => {
  it('makes the mutants that broke it (seed 1: NetCDF-3 classic 4409, NetCDF-4 6037) and their neighbours, each no longer than the file plus what a step may add', () => {
    for (const [format, index] of [
      ['netcdf3-classic', 4409],
      ['netcdf4', 6037],
    ] as const) {
      const base = loadBase(format, bases.base[format]);
      for (let i = index - 20; i <= index + 20; i++) {
        const m = makeMutant(base, 1, i);
        expect(m.recipe.length, `${format} ${i}`).toBeGreaterThan(0);
        // At most three steps, each adding at most 4,096 random bytes or doubling 8.
        expect(m.bytes.length, `${format} ${i}`).toBeLessThanOrEqual(base.bytes.length + 3 * 4096);
      }
    }
  });
});
