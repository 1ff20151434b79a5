// Child process of bench/regions-1000.bench.ts and bench/regions-10000.bench.ts. Runs the shipped
// compiled JavaScript (compiled/build-atlas.js, compiled/site-stage.js: what `heathours build`
// runs; the parent compiles first, bench/compiled-code.ts), or with HEATHOURS_BENCH_CODE=sources
// the TypeScript sources through pipeline/infra/ts-boot.mjs.
//   node bench/regions-1000-child.mjs pipeline CONFIG OUT JOBS  → `heathours build --data-only`, with the
//       time of each logged stage
//   node bench/regions-1000-child.mjs site DATA_DIR DIST        → the Astro site from that data folder (its
//       data/ moved into DIST, as `heathours build` does), with the first-view bytes of the home, map, downloads and first region page (bench/first-view.mjs)
// Prints one JSON line: wall and CPU seconds (all threads), peak resident memory, and details.
import { createHash } from 'node:crypto';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { firstViewBytes } from './first-view.mjs';

const [mode, a, b, jobs] = process.argv.slice(2);
const sources = process.env.HEATHOURS_BENCH_CODE === 'sources';
if (sources) await import('../pipeline/infra/ts-boot.mjs');
const t0 = performance.now();
/** CPU time of this process, all threads (getrusage) [s]. */
const cpu = () => {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1e6;
};
/**
 * CPU time of the child processes this one waited for [s] (the site's Astro parts): cutime and
 * cstime of /proc/self/stat (fields 16 and 17, in clock ticks of 1/100 s on Linux); 0 elsewhere.
 */
const childrenCpu = () => {
  try {
    const stat = readFileSync('/proc/self/stat', 'utf8');
    const f = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    return (Number(f[13]) + Number(f[14])) / 100;
  } catch {
    return 0;
  }
};
if (mode === 'pipeline') {
  const { buildAtlas } = sources ? await import('../pipeline/run/build-atlas.ts') : await import('../compiled/build-atlas.js');
  const marks = [];
  // Build log lines start with the elapsed time, `[  1.2 s] `: drop it before matching.
  const bare = (m) => m.replace(/^\[[^\]]*\] /, '');
  const logger = { info: (m) => marks.push([performance.now() - t0, bare(m)]), warn: (m) => marks.push([performance.now() - t0, `warning: ${bare(m)}`]) };
  const report = await buildAtlas({ configPath: a, outDir: b, jobs: Number(jobs), quiet: true, dataOnly: true, logger });
  const seconds = (performance.now() - t0) / 1000;
  const at = (re) => (marks.find(([, m]) => re.test(m))?.[0] ?? NaN) / 1000;
  const h = createHash('sha256');
  const dir = join(b, 'data', 'regions');
  const csvs = readdirSync(dir)
    .filter((f) => f.endsWith('.csv') && !f.endsWith('.wide.csv'))
    .sort();
  for (const f of csvs) h.update(readFileSync(join(dir, f)));
  process.stdout.write(
    `${JSON.stringify({
      seconds,
      cpuSeconds: cpu(),
      setupSeconds: at(/^computing /),
      computeSeconds: report.computeSeconds,
      normalsSeconds: at(/^summarising/) - at(/^computed /),
      publishSeconds: seconds - at(/^summarising/),
      mergeSeconds: report.mergeSeconds,
      regionSeconds: Number(
        marks.map(([, m]) => /region\(s\): tables, summaries and calculator tiles in ([\d.]+) s/.exec(m)?.[1]).find((x) => x !== undefined) ?? NaN,
      ),
      layersSeconds: at(/map layers drawn/) - (at(/region\(s\): tables/) || NaN),
      inventorySeconds: seconds - at(/^summarising/),
      peakRssMB: process.resourceUsage().maxRSS / 1024,
      regions: csvs.length,
      cellHours: report.cellHours,
      checksum: h.digest('hex').slice(0, 16),
    })}\n`,
  );
} else if (mode === 'site') {
  const { buildSite } = sources ? await import('../pipeline/run/site-stage.ts') : await import('../compiled/site-stage.js');
  // The data folder is moved into the site, as `heathours build` does (pipeline/run/build-atlas.ts):
  // the bench builds data and site in two processes only to time them apart. (Copying it instead
  // took ~3.3 s at 1,000 regions and ~30 s at 10,000: the site's time, not the build's.)
  const built = await buildSite({ dataDir: a, outDir: b, quiet: true, moveData: true });
  const seconds = (performance.now() - t0) / 1000;
  const pages = readdirSync(join(b, 'regions')).filter((d) => statSync(join(b, 'regions', d, 'index.html'), { throwIfNoEntry: false }));
  const biggest = Math.max(...pages.map((d) => statSync(join(b, 'regions', d, 'index.html')).size));
  const h = createHash('sha256').update(readFileSync(join(b, 'index.html')));
  const view = Object.fromEntries(
    [
      ['home', ''],
      ['map', 'map/'],
      ['downloads', 'downloads/'],
      ['region', `regions/${pages.sort()[0]}/`],
    ].map(([k, p]) => [k, firstViewBytes(b, p)]),
  );
  process.stdout.write(
    `${JSON.stringify({ seconds, cpuSeconds: cpu() + childrenCpu(), peakRssMB: process.resourceUsage().maxRSS / 1024, parts: built.parts, partPeakRssMB: built.partPeakRssMB, partSeconds: built.partSeconds, gatherSeconds: built.gatherSeconds, regionPages: pages.length, largestRegionHtmlBytes: biggest, homeBytes: statSync(join(b, 'index.html')).size, homeChecksum: h.digest('hex').slice(0, 16), view })}\n`,
  );
} else {
  process.stderr.write(`unknown mode ${mode}\n`);
  process.exit(2);
}
