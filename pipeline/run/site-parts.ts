/**
 * The site of a large atlas built by several Astro processes side by side (src/lib/site-part.ts
 * says which pages each renders): part 0 renders every page and endpoint but the other parts'
 * region pages, part K > 0 the report and summary of every N-th region. Astro renders pages one
 * after the other in one thread; a region report costs it tens of milliseconds, so 10,000
 * regions (20,000 pages) take minutes in one process and about 1/N of that in N.
 *
 * The parts are then joined into part 0's folder: each other part's `regions/<id>/` folders are
 * moved in (a region already there is a catalogued failure), and every other file a part wrote
 * but its HTML pages (assets, scripts, styles, the JSON endpoints every part renders) must be
 * byte-identical to part 0's, so a part that bundled its scripts differently cannot slip through
 * (the other pages of a part > 0 are dropped: part 0's are kept) (test/site/site-parts.test.ts checks
 * the joined site against a one-process build, file by file).
 */
import { spawn } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdtemp, readdir, readFile, rename, rm, stat } from 'node:fs/promises';
import { dirname, join, relative } from 'node:path';
import { tmpdir } from 'node:os';
import { PACKAGE_ROOT } from '../model/package-root.ts';
import { DATA_DIR_ENV } from '../../src/data/data-dir.ts';
import { SITE_PART_ENV } from '../../src/lib/site-part.ts';
import { SITE_DIGEST_ENV } from '../../src/data/site-digest.ts';
import { SiteBuildFailed } from '../../src/data/errors.ts';

/** Regions from which the site is built in parts (below, one Astro process: a part's own bundling costs ~10 CPU s). */
export const SITE_PARTS_MIN_REGIONS = 200;
/** Environment variable that sets the number of parts whatever the regions (tests, benchmarks): a whole number ≥ 1. */
export const SITE_PARTS_ENV = 'HEATHOURS_SITE_PARTS';
/** Young-generation size of each part's V8 [MB]: fewer scavenges of the page strings (about 15 % less CPU measured at 1,000 regions). */
const SEMI_SPACE_MB = 64;
/** Bytes of a failed part's stderr kept for the error [bytes]. */
const STDERR_KEPT = 16_384;

/** How many Astro processes build a site of `regions` regions with `jobs` cores: 1 below {@link SITE_PARTS_MIN_REGIONS}. */
export function siteParts(regions: number, jobs: number, env: Record<string, string | undefined> = process.env): number {
  const forced = env[SITE_PARTS_ENV];
  if (forced !== undefined && forced !== '') {
    const n = Number(forced);
    if (!Number.isInteger(n) || n < 1) throw new RangeError(`${SITE_PARTS_ENV} must be a whole number of at least 1, not "${forced}"`);
    return n;
  }
  return regions >= SITE_PARTS_MIN_REGIONS ? Math.max(1, Math.min(jobs, 8)) : 1;
}

export interface SitePartsOptions {
  /** Folder holding the pipeline's `data/` subfolder (absolute). */
  dataDir: string;
  /** What the site stage gathered from the region tables (src/data/site-digest.ts). */
  digestDir: string;
  /** Part 0's output folder: the joined site ends here. */
  outDir: string;
  parts: number;
  base: string;
  quiet?: boolean;
}

interface PartRun {
  index: number;
  outDir: string;
  cacheDir: string;
  /**
   * The part's working folder, inside the project: Astro writes the pages' server bundle into
   * `<cwd>/.astro/` when the output folder is outside the working folder (astro/dist/core/build/
   * common.js `getOutDirWithinCwd`), so parts side by side each need their own, and the bundle
   * finds the project's npm packages from there.
   */
  cwd: string;
}

/** What one part's Astro process took. */
export interface PartOutcome {
  /** Peak resident memory [MB]; NaN when the part did not say. */
  peakRssMB: number;
  /** Wall time from start to exit [s]. */
  seconds: number;
}

/** Builds the site in `parts` Astro processes side by side and joins them into `outDir` (see the file comment). */
export async function buildSiteInParts(o: SitePartsOptions): Promise<PartOutcome[]> {
  const runs: PartRun[] = [];
  try {
    for (let k = 0; k < o.parts; k++) {
      // The other parts' folders beside part 0's (same disk: their region folders are moved, not copied).
      const outDir = k === 0 ? o.outDir : await mkdtemp(join(dirname(o.outDir), '.site-part-'));
      runs.push({
        index: k,
        outDir,
        cacheDir: await mkdtemp(join(tmpdir(), 'heathours-astro-cache-')),
        cwd: await mkdtemp(join(PACKAGE_ROOT, '.site-part-')),
      });
    }
    const children = runs.map((r) => runPart(r, o));
    const outcomes = await Promise.allSettled(children.map((c) => c.done));
    const failed = outcomes.findIndex((x) => x.status === 'rejected');
    if (failed >= 0) {
      for (const c of children) c.stop();
      throw (outcomes[failed] as PromiseRejectedResult).reason;
    }
    for (const r of runs.slice(1)) await joinPart(o.outDir, r, o.parts);
    return outcomes.map((x) => (x as PromiseFulfilledResult<PartOutcome>).value);
  } finally {
    for (const r of runs) {
      await rm(r.cacheDir, { recursive: true, force: true });
      await rm(r.cwd, { recursive: true, force: true });
      if (r.index > 0) await rm(r.outDir, { recursive: true, force: true });
    }
  }
}

/**
 * Starts one part's Astro process; `done` settles when it ends, with the part's peak resident
 * memory and wall time, or a catalogued SiteBuildFailed naming the part.
 */
function runPart(r: PartRun, o: SitePartsOptions): { done: Promise<PartOutcome>; stop: () => void } {
  const started = performance.now();
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    [DATA_DIR_ENV]: o.dataDir,
    [SITE_DIGEST_ENV]: o.digestDir,
    HEATHOURS_SITE_BASE: o.base,
    [SITE_PART_ENV]: `${r.index}/${o.parts}`,
  };
  env.ASTRO_TELEMETRY_DISABLED ??= '1';
  // Vite lets BASE_URL of the environment win over Astro's base (site-stage.ts says more).
  delete env.BASE_URL;
  const script = join(PACKAGE_ROOT, 'pipeline', 'run', 'site-part-child.mjs');
  const child = spawn(process.execPath, [`--max-semi-space-size=${SEMI_SPACE_MB}`, script, PACKAGE_ROOT, r.outDir, r.cacheDir, o.base, o.quiet ? '1' : '0'], {
    cwd: r.cwd,
    env,
    // Part 0 speaks for the build; the others only when they fail.
    stdio: ['ignore', o.quiet || r.index > 0 ? 'ignore' : 'inherit', 'pipe'],
  });
  let stderr = '';
  child.stderr!.setEncoding('utf8');
  child.stderr!.on('data', (s: string) => {
    if (!o.quiet && r.index === 0) process.stderr.write(s);
    stderr = (stderr + s).slice(-STDERR_KEPT);
  });
  const done = new Promise<PartOutcome>((resolve, reject) => {
    child.on('error', (e) => reject(SiteBuildFailed({ detail: `site part ${r.index + 1} of ${o.parts} did not start: ${e.message}` })));
    child.on('close', (code, signal) => {
      const last = stderr.trim().split('\n').pop() ?? '';
      if (code === 0) return resolve({ peakRssMB: Number(/"sitePartPeakRssMB":(\d+)/.exec(last)?.[1] ?? NaN), seconds: (performance.now() - started) / 1000 });
      let detail: string;
      try {
        detail = (JSON.parse(last) as { siteBuildFailed: string }).siteBuildFailed;
      } catch {
        detail = signal ? `stopped by ${signal}` : `exit code ${code}: ${stderr.trim().slice(-2_000) || 'no message'}`;
      }
      reject(SiteBuildFailed({ detail: `site part ${r.index + 1} of ${o.parts}: ${detail}` }));
    });
  });
  return { done, stop: () => child.kill('SIGTERM') };
}

/** Moves part `r`'s region pages into `outDir` and checks that every other file it wrote is part 0's. */
async function joinPart(outDir: string, r: PartRun, parts: number): Promise<void> {
  const fail = (what: string) => SiteBuildFailed({ detail: `site part ${r.index + 1} of ${parts}: ${what}` });
  const regionsDir = join(r.outDir, 'regions');
  const ids = await readdir(regionsDir).catch(() => [] as string[]);
  for (const id of ids) {
    const to = join(outDir, 'regions', id);
    if (await stat(to).catch(() => undefined)) throw fail(`regions/${id}/ was built by another part as well`);
    await rename(join(regionsDir, id), to);
  }
  for await (const file of walk(r.outDir)) {
    const rel = relative(r.outDir, file);
    // The pages every part renders are part 0's (the others may skip their data: the home page's ranking).
    if (rel.endsWith('.html')) continue;
    const [mine, theirs] = await Promise.all([readFile(file), readFile(join(outDir, rel)).catch(() => undefined)]);
    if (theirs === undefined) throw fail(`${rel} is not in part 1's site`);
    if (!mine.equals(theirs)) throw fail(`${rel} differs from part 1's (sha256 ${digest(mine)} against ${digest(theirs)})`);
  }
}

const digest = (b: Buffer) => createHash('sha256').update(b).digest('hex').slice(0, 16);

/** Every file below `dir`. */
async function* walk(dir: string): AsyncGenerator<string> {
  for (const e of await readdir(dir, { withFileTypes: true })) {
    const p = join(dir, e.name);
    if (e.isDirectory()) yield* walk(p);
    else yield p;
  }
}
