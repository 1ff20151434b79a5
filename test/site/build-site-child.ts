/**
 * Builds one site in a child process for the browser-test harness (browser.ts), so Astro's own
 * Vite runs apart from vitest's. Usage: node --import tsx test/site/build-site-child.ts DATA_DIR OUT_DIR [BASE]
 */
import { buildSite } from '../../pipeline/run/site-stage.ts';
import { HeathoursError } from '../../pipeline/model/errors.ts';

const [dataDir, outDir, base] = process.argv.slice(2);
try {
  await buildSite({ dataDir, outDir, quiet: true, base });
} catch (e) {
  process.stderr.write(e instanceof HeathoursError ? `${e.format()}\n` : `${(e as Error).stack ?? String(e)}\n`);
  process.exit(2);
}
