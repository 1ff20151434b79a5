// One part of a site built in several processes (pipeline/run/site-stage.ts `buildSite`): Astro's
// static build of the pages of the part named in HEATHOURS_SITE_PART (src/lib/site-part.ts) into
// OUT_DIR, with the data folder in HEATHOURS_DATA_DIR and the base path in HEATHOURS_SITE_BASE.
// Plain JavaScript: nothing here needs TypeScript (Astro compiles the pages itself), so the
// compiled CLI and the sources start the same file.
//   node site-part-child.mjs ROOT OUT_DIR CACHE_DIR BASE QUIET(0|1)
// Exits 0 when built, its peak resident memory on the last line of stderr as JSON
// `{"sitePartPeakRssMB": N}`; otherwise 1, the error's message (and Astro's hint) on the last line of
// stderr as JSON `{"siteBuildFailed": "…"}`.
import { build } from 'astro';

const [root, outDir, cacheDir, base, quiet] = process.argv.slice(2);
try {
  await build({ root, outDir, cacheDir, mode: 'production', base, logLevel: quiet === '1' ? 'error' : 'info' });
} catch (e) {
  const detail = e?.hint ? `${e.message} (${e.hint})` : (e?.message ?? String(e));
  process.stderr.write(`\n${JSON.stringify({ siteBuildFailed: detail })}\n`);
  process.exit(1);
}
// The part's peak memory, for the site stage's report (last line of stderr).
process.stderr.write(`\n${JSON.stringify({ sitePartPeakRssMB: Math.round(process.resourceUsage().maxRSS / 1024) })}\n`);
// Astro's build can leave handles open (file watchers of Vite's cache); the part is done.
process.exit(0);
