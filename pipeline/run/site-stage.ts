/**
 * The last step of `heathours build`: the Astro site. Takes the data folder the pipeline wrote
 * (`dataDir/data/manifest.json`, `inventory.json`, `regions.geojson`, …), builds the static site with
 * Astro's programmatic `build()` into a temporary folder, copies `dataDir/data/` to `data/` in it,
 * and only then replaces `outDir` (pipeline/model/effects.ts `replaceDirAtomic`): a failed build
 * leaves the previous site as it was.
 *
 * Pages read their inputs at build time through src/data/*.ts, which find the data folder in the
 * environment variable HEATHOURS_DATA_DIR; this function sets it for the duration of the build, so
 * two builds must not run at once in one process.
 */
import { cp, mkdir, mkdtemp, rename, rm, stat } from 'node:fs/promises';
import { existsSync } from 'node:fs';
import { availableParallelism, tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { replaceDirAtomic } from '../model/effects.ts';
import { withProcessLock } from '../model/lock.ts';
import { PACKAGE_ROOT } from '../model/package-root.ts';
import { DATA_DIR_ENV } from '../../src/data/data-dir.ts';
import { loadInventory } from '../../src/data/inventory.ts';
import { loadRegions } from '../../src/data/regions.ts';
import { loadManifest } from '../../src/data/manifest.ts';
import { SiteBuildFailed, SiteDataMissing, SiteOutputUnwritable } from '../../src/data/errors.ts';
import { buildSiteInParts, siteParts } from './site-parts.ts';
import { gatherSiteDigest } from './site-digest.ts';
import { SITE_DIGEST_ENV } from '../../src/data/site-digest.ts';

/** The project root: where astro.config.mjs and src/ live. */
const PROJECT_ROOT = `${PACKAGE_ROOT}/`;

/** Files Astro's static build writes into the output folder that the site does not use. */
const ASTRO_LEFTOVERS = ['content-assets.mjs', 'content-modules.mjs'];

export interface BuildSiteOptions {
  /** Folder holding the pipeline's `data/` subfolder. */
  dataDir: string;
  /** Where the site goes (replaced only after a successful build), e.g. `dist`. */
  outDir: string;
  /** No log lines but errors. */
  quiet?: boolean;
  /** URL path the site is served under (config `site.base`), e.g. `/atlas/`; default `/`. */
  base?: string;
  /**
   * Move `dataDir/data` into the site instead of copying it (a build's staging folder, on the same
   * disk as `outDir`): no second copy of a large atlas's data.
   */
  moveData?: boolean;
  /** Astro processes to build in, as the build's memory plan chose (memory-plan.ts); default: site-parts.ts `siteParts`. */
  parts?: number;
  /** Cores the build may use [count]; default all. Large atlases are built by that many Astro processes (site-parts.ts). */
  jobs?: number;
}

/** Environment variable that carries the site's base path into astro.config.mjs. */
export const SITE_BASE_ENV = 'HEATHOURS_SITE_BASE';

/** Checks the data folder before the (slow) Astro build, with catalogued errors; the number of regions. */
export function checkSiteData(dataDir: string): number {
  const dataFolder = join(dataDir, 'data');
  if (!existsSync(dataFolder)) throw SiteDataMissing({ path: dataFolder, what: 'data folder' }, { file: dataFolder });
  loadManifest(dataDir);
  loadInventory(dataDir);
  return loadRegions(dataDir).features.length;
}

/** Checks that `outDir` is a folder (or absent) whose parent exists or can be made. */
async function checkOutput(outDir: string): Promise<void> {
  const info = await stat(outDir).catch(() => undefined);
  if (info && !info.isDirectory()) throw SiteOutputUnwritable({ path: outDir, detail: 'a file, not a folder, is in the way' }, { file: outDir });
  try {
    await mkdir(dirname(outDir), { recursive: true });
  } catch (e) {
    throw SiteOutputUnwritable({ path: outDir, detail: (e as Error).message }, { file: outDir });
  }
}

/** What a site build did. */
export interface SiteBuildReport {
  /** Astro processes that rendered the pages (1: this process). */
  parts: number;
  /** Peak resident memory of each Astro process of a build in parts [MB]; empty for one. */
  partPeakRssMB: number[];
  /** Wall time of each Astro process of a build in parts [s]; empty for one. */
  partSeconds: number[];
  /** Reading the region tables into the digest before Astro starts [s]. */
  gatherSeconds: number;
}

/** Builds the static site from `dataDir` into `outDir` (see the file comment). */
export async function buildSite(opts: BuildSiteOptions): Promise<SiteBuildReport> {
  const dataDir = resolve(opts.dataDir);
  const outDir = resolve(opts.outDir);
  const regions = checkSiteData(dataDir);
  await checkOutput(outDir);
  const started = Date.now();
  const jobs = opts.jobs ?? availableParallelism();
  const parts = opts.parts ?? siteParts(regions, jobs);
  let partPeakRssMB: number[] = [];
  let partSeconds: number[] = [];
  let gatherSeconds = 0;
  await replaceDirAtomic(outDir, async (tmp) => {
    // What the pages need from the region tables, read once (pipeline/run/site-digest.ts).
    const digestDir = await mkdtemp(join(tmpdir(), 'heathours-site-digest-'));
    try {
      const gatherStart = performance.now();
      await gatherSiteDigest(dataDir, digestDir, jobs, opts.quiet);
      gatherSeconds = (performance.now() - gatherStart) / 1000;
      if (parts > 1) {
        const outcomes = await withProcessLock(
          join(PROJECT_ROOT, '.astro-build.lock'),
          () => buildSiteInParts({ dataDir, digestDir, outDir: tmp, parts, base: opts.base ?? '/', quiet: opts.quiet }),
          { onWait: (pid) => waiting(pid, opts) },
        );
        partPeakRssMB = outcomes.map((x) => x.peakRssMB);
        partSeconds = outcomes.map((x) => x.seconds);
      } else await buildInProcess(tmp, dataDir, digestDir, opts);
    } finally {
      await rm(digestDir, { recursive: true, force: true });
    }
    // Astro 5 leaves its (empty) content-layer modules next to the pages; they are not part of the site.
    for (const leftover of ASTRO_LEFTOVERS) await rm(join(tmp, leftover), { force: true });
    if (opts.moveData) await rename(join(dataDir, 'data'), join(tmp, 'data'));
    else await cp(join(dataDir, 'data'), join(tmp, 'data'), { recursive: true });
  });
  if (!opts.quiet)
    process.stderr.write(`site: built ${outDir} in ${((Date.now() - started) / 1000).toFixed(1)} s${parts > 1 ? ` by ${parts} Astro processes` : ''}\n`);
  return { parts, partPeakRssMB, partSeconds, gatherSeconds };
}

function waiting(pid: number, opts: BuildSiteOptions): void {
  if (!opts.quiet) process.stderr.write(`site: waiting for another site build (pid ${pid}) to finish\n`);
}

/** Astro's build of every page in this process, into `tmp`. */
async function buildInProcess(tmp: string, dataDir: string, digestDir: string, opts: BuildSiteOptions): Promise<void> {
  const cacheDir = await mkdtemp(join(tmpdir(), 'heathours-astro-cache-'));
  const previous = process.env[DATA_DIR_ENV];
  const previousDigest = process.env[SITE_DIGEST_ENV];
  const previousBase = process.env[SITE_BASE_ENV];
  // Vite lets a BASE_URL variable of the environment (vitest sets one, so may a CI) win over
  // Astro's base in import.meta.env.BASE_URL: it is taken away for the build.
  const previousBaseUrl = process.env.BASE_URL;
  delete process.env.BASE_URL;
  process.env[DATA_DIR_ENV] = dataDir;
  process.env[SITE_DIGEST_ENV] = digestDir;
  process.env[SITE_BASE_ENV] = opts.base ?? '/';
  process.env.ASTRO_TELEMETRY_DISABLED ??= '1';
  try {
    const { build } = await import('astro');
    // Astro writes .astro/ in the project root: one Astro build at a time on this machine.
    // Astro runs the pages' server code from the output folder, and that code finds its npm
    // packages from the working folder: the build runs in the project root wherever the command
    // was started (an output folder outside the project, e.g. /srv/site, failed with "Cannot
    // find package" when started elsewhere).
    const cwd = process.cwd();
    process.chdir(PROJECT_ROOT);
    try {
      await withProcessLock(
        join(PROJECT_ROOT, '.astro-build.lock'),
        () =>
          build({
            root: PROJECT_ROOT,
            outDir: tmp,
            cacheDir,
            mode: 'production',
            base: opts.base ?? '/',
            logLevel: opts.quiet ? 'error' : 'info',
          }),
        { onWait: (pid) => waiting(pid, opts) },
      );
    } finally {
      process.chdir(cwd);
    }
  } catch (e) {
    const err = e as Error & { code?: string; hint?: string };
    const detail = err.hint ? `${err.message} (${err.hint})` : (err.message ?? String(e));
    throw SiteBuildFailed({ detail });
  } finally {
    restore(DATA_DIR_ENV, previous);
    restore(SITE_DIGEST_ENV, previousDigest);
    restore(SITE_BASE_ENV, previousBase);
    if (previousBaseUrl !== undefined) process.env.BASE_URL = previousBaseUrl;
    await rm(cacheDir, { recursive: true, force: true });
  }
}

function restore(name: string, value: string | undefined): void {
  if (value === undefined) delete process.env[name];
  else process.env[name] = value;
}
