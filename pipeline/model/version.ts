/** The code version recorded in manifests and cache keys: package version. */
import { readFileSync } from 'node:fs';
import { packagePath } from './package-root.ts';

const pkg = JSON.parse(readFileSync(packagePath('package.json'), 'utf8')) as { version: string };

export const CODE_VERSION: string = pkg.version;
