// Child process of the pipeline benches (bench/pipeline.bench.ts, bench/rebuild.bench.ts): one
// `heathours build --data-only` in this process, then one JSON line with the build report, this
// process's peak RSS (all threads) and a checksum of the published region tables. Runs the TypeScript
// sources through pipeline/infra/ts-boot.mjs (h5wasm first, then tsx).
// Usage: node bench/pipeline-child.mjs CONFIG OUT JOBS [OPTIONS_JSON]; OPTIONS_JSON is merged
// into the buildAtlas options (default {"cache": false}: compute every shard).
import '../pipeline/infra/ts-boot.mjs';
import { createHash } from 'node:crypto';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';

const [config, out, jobs, options] = process.argv.slice(2);
const { buildAtlas } = await import('../pipeline/run/build-atlas.ts');
const extra = options ? JSON.parse(options) : { cache: false };
const report = await buildAtlas({ configPath: config, outDir: out, jobs: Number(jobs), quiet: true, dataOnly: true, ...extra });
const h = createHash('sha256');
const dir = join(out, 'data', 'regions');
for (const f of readdirSync(dir)
  .filter((f) => f.endsWith('.csv'))
  .sort())
  h.update(readFileSync(join(dir, f)));
process.stdout.write(`${JSON.stringify({ ...report, maxRssKb: process.resourceUsage().maxRSS, checksum: h.digest('hex').slice(0, 16) })}\n`);
