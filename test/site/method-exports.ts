/** Reads a method constant's code reference (`pipeline/…/file.ts#NAME.key.0`) back from the module itself. */
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { PROJECT_ROOT } from './browser.ts';

export async function resolveExport(code: string): Promise<unknown> {
  const [file, path] = code.split('#');
  const mod = (await import(pathToFileURL(join(PROJECT_ROOT, file)).href)) as Record<string, unknown>;
  return path.split('.').reduce<unknown>((v, key) => (v as Record<string, unknown>)[key], mod);
}
