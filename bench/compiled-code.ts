/**
 * The benches that time whole builds run the shipped code: the compiled JavaScript `npm run
 * compile` writes (compiled/, what `heathours build` runs). This compiles it once per bench run,
 * so those children time today's sources. HEATHOURS_BENCH_CODE=sources in a child's environment
 * runs the TypeScript sources under tsx instead (as the tests do).
 */
import { spawnSync } from 'node:child_process';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

const ROOT = fileURLToPath(new URL('../', import.meta.url));
let compiled = false;

/** Runs `npm run compile` (scripts/compile.ts) unless this bench run already did. */
export function ensureCompiled(): void {
  if (compiled) return;
  const r = spawnSync(process.execPath, ['--import', 'tsx', join(ROOT, 'scripts/compile.ts')], { cwd: ROOT, encoding: 'utf8' });
  if (r.status !== 0) throw new Error(`npm run compile failed: ${r.stderr}`);
  compiled = true;
}
