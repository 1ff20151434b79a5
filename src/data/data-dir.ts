/**
 * Where the pages find their inputs: the data folder the pipeline wrote, passed to the Astro
 * build in the environment variable `HEATHOURS_DATA_DIR` (set by pipeline/run/site-stage.ts).
 * Read at build time only (pages are prerendered in Node).
 */
import { resolve } from 'node:path';
import { SiteDataDirUnset } from './errors.ts';

/** The variable that carries the data folder into the Astro build. */
export const DATA_DIR_ENV = 'HEATHOURS_DATA_DIR';

/** The data folder (it holds `data/`), absolute; a catalogued error when unset. */
export function siteDataDir(): string {
  const dir = process.env[DATA_DIR_ENV];
  if (!dir) throw SiteDataDirUnset({});
  return resolve(dir);
}
