#!/usr/bin/env node
// Entry point of the `heathours` command. It runs the compiled JavaScript in compiled/, which
// `npm ci` / `npm install` write through the `prepare` script (`npm run compile`,
// scripts/compile.ts): nothing is transpiled when the command starts. bin/heathours-ts.mjs runs
// the same command from the TypeScript sources (slow start; for development).
import { existsSync, readFileSync, statSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('..', import.meta.url));
const compiled = new URL('../compiled/', import.meta.url);
if (!existsSync(new URL('cli.js', compiled))) {
  process.stderr.write(
    'error [NotCompiled] The compiled command is missing\n' +
      `  ${fileURLToPath(new URL('cli.js', compiled))} does not exist: the install step that compiles heathours did not run or failed\n` +
      `  hint: run \`npm run compile\` (or \`npm ci\`, which runs it) in ${root}, then try again\n`,
  );
  process.exit(2);
}
warnIfStale();
const { main } = await import(new URL('cli.js', compiled).href);
await main(process.argv);

/**
 * A source file changed after the last compile: the command would run old code, so say so (a
 * stat of each source, about a millisecond; skipped where the sources are not shipped).
 */
function warnIfStale() {
  let manifest;
  try {
    manifest = JSON.parse(readFileSync(new URL('sources.json', compiled), 'utf8'));
  } catch {
    return;
  }
  for (const f of manifest.files) {
    const info = statSync(`${root}${f}`, { throwIfNoEntry: false });
    if (info && info.mtimeMs > manifest.compiledAtMs) {
      process.stderr.write(
        `warning: ${f} changed after heathours was compiled; this run uses the older compiled code (run \`npm run compile\` to update it)\n`,
      );
      return;
    }
  }
}
