// Child process of the pipeline benches (bench/pipeline.bench.ts, bench/rebuild.bench.ts): one
// `heathours build --data-only` in this process, then one JSON line with the build report, this
// process's peak RSS (all threads) and a checksum of the published region tables.
// By default it runs the shipped code, the compiled JavaScript of `npm run compile`
// (compiled/build-atlas.js, the code `heathours build` runs; the parent compiles first). With
// HEATHOURS_BENCH_CODE=sources it runs the TypeScript sources through pipeline/infra/ts-boot.mjs
// (h5wasm first, then tsx), as the tests do: every worker then transpiles its modules at start.
// Usage: node bench/pipeline-child.mjs CONFIG OUT JOBS [OPTIONS_JSON]; OPTIONS_JSON is merged
// into the buildAtlas options (default {"cache": false}: compute every shard).
import { createHash } from 'node:crypto';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';

const [config, out, jobs, options] = process.argv.slice(2);
const sources = process.env.HEATHOURS_BENCH_CODE === 'sources';
if (sources) await import('../pipeline/infra/ts-boot.mjs');
const { buildAtlas } = sources ? await import('../pipeline/run/build-atlas.ts') : await import('../compiled/build-atlas.js');
const extra = options ? JSON.parse(options) : { cache: false };
const report = await buildAtlas({ configPath: config, outDir: out, jobs: Number(jobs), quiet: true, dataOnly: true, ...extra });
const h = createHash('sha256');
const dir = join(out, 'data', 'regions');
for (const f of readdirSync(dir)
  .filter((f) => f.endsWith('.csv'))
  .sort())
  h.update(readFileSync(join(dir, f)));
process.stdout.write(`${JSON.stringify({ ...report, maxRssKb: process.resourceUsage().maxRSS, checksum: h.digest('hex').slice(0, 16) })}\n`);
