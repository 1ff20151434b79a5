/**
 * Paths of the check material kept in the repository under test/fixtures/: the reference WBGT
 * table (`reference/`, README there) and the real NetCDF files of Debian packages (`realdata/`,
 * PROVENANCE.md and licences there). Tests read only from the clone
 * (test/repository/stands-alone.test.ts checks that no file looks outside it).
 */
import { join, resolve } from 'node:path';

/** The repository's test/fixtures folder. */
export const FIXTURES_DIR = resolve(import.meta.dirname, '..', 'fixtures');

/** A path inside test/fixtures, e.g. `fixturePath('realdata', 'bcsd_obs_1999.nc')`. */
export function fixturePath(...parts: string[]): string {
  return join(FIXTURES_DIR, ...parts);
}
