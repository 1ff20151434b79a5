/**
 * The two ways tests run `heathours` as a process: from the TypeScript sources
 * (bin/heathours-ts.mjs, what most tests use, so they test the code as it is now) and the shipped
 * command (bin/heathours.mjs, running the compiled JavaScript; test/cli/compiled-cli.test.ts
 * compiles first).
 */
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

export const ROOT = fileURLToPath(new URL('../../', import.meta.url));
/** The command from the TypeScript sources. */
export const CLI_TS = join(ROOT, 'bin/heathours-ts.mjs');
/** The shipped command (compiled JavaScript). */
export const CLI_COMPILED = join(ROOT, 'bin/heathours.mjs');
