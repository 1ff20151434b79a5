/**
 * Where the project's outside check material lives: the reference WBGT table
 * (`reference/liljegren-wbgt-public.csv`) and the real NetCDF files (`realdata/`), kept outside
 * the repository beside it (`../shared`). Looked up, in order, in `HEATHOURS_SHARED_DIR`,
 * `<repository>/../shared` and `/work/shared`, so a clone anywhere on the machine finds it. When
 * none holds it the tests that need it fail with this message (they are never skipped).
 */
import { existsSync } from 'node:fs';
import { join, resolve } from 'node:path';

const ROOT = resolve(import.meta.dirname, '../..');
const CANDIDATES = [process.env.HEATHOURS_SHARED_DIR, resolve(ROOT, '../shared'), '/work/shared'].filter((d): d is string => !!d);

/** The shared folder (holds `reference/` and `realdata/`). */
export function sharedDir(): string {
  const found = CANDIDATES.find((d) => existsSync(join(d, 'reference', 'liljegren-wbgt-public.csv')) && existsSync(join(d, 'realdata')));
  if (!found) throw new Error(`the shared check material (reference/, realdata/) is in none of: ${CANDIDATES.join(', ')}; set HEATHOURS_SHARED_DIR`);
  return found;
}

/** A path inside the shared folder, e.g. `sharedPath('realdata', 'bcsd_obs_1999.nc')`. */
export function sharedPath(...parts: string[]): string {
  return join(sharedDir(), ...parts);
}
