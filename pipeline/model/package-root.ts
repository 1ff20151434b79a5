/**
 * Where heathours' own files are: the folder holding its package.json. Found by walking up from
 * this module's location, so it is the same whether the code runs from the TypeScript sources
 * (pipeline/model/package-root.ts) or from the compiled bundle (compiled/chunks/…), whose
 * folders lie at different depths.
 */
import { existsSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

function findPackageRoot(start: string): string {
  for (let dir = start; ; ) {
    const file = join(dir, 'package.json');
    if (existsSync(file)) {
      const pkg = JSON.parse(readFileSync(file, 'utf8')) as { name?: string };
      if (pkg.name === 'heathours') return dir;
    }
    const up = dirname(dir);
    if (up === dir) throw new Error(`heathours' package.json was not found in any folder above ${start}`);
    dir = up;
  }
}

/** Absolute path of the package's root folder (no trailing separator). */
export const PACKAGE_ROOT: string = findPackageRoot(dirname(fileURLToPath(import.meta.url)));

/** An absolute path inside the package, e.g. `packagePath('content', 'workload-classes.yaml')`. */
export function packagePath(...parts: string[]): string {
  return join(PACKAGE_ROOT, ...parts);
}
