/**
 * Which workload class, acclimatization and exposure the report and home pages show first (the
 * others follow in <details> or behind a switch). Our rule, stated on the pages:
 * - the class `moderate` when the atlas has it (steady work such as operating plant or
 *   plastering, docs/methods.md §8.1), else the first class of the atlas;
 * - the first acclimatization state and the first exposure the atlas configures (by default
 *   acclimatized workers in the sun).
 */
import type { AtlasManifest, WorkloadClassInfo } from '../../data/atlas-manifest.ts';

export const PREFERRED_DEFAULT_CLASS = 'moderate';

/** The workload class shown first. */
export function defaultWorkloadClass(manifest: AtlasManifest): WorkloadClassInfo {
  const classes = manifest.work.classes;
  return classes.find((c) => c.id === PREFERRED_DEFAULT_CLASS) ?? classes[0];
}

/** The classes with the default first, the others in the atlas's order. */
export function classesDefaultFirst(manifest: AtlasManifest): WorkloadClassInfo[] {
  const d = defaultWorkloadClass(manifest);
  return [d, ...manifest.work.classes.filter((c) => c.id !== d.id)];
}

/** The acclimatization state shown first. */
export function defaultAcclimatization(manifest: AtlasManifest): string {
  return manifest.work.acclimatization[0];
}

/** The exposure shown first. */
export function defaultExposure(manifest: AtlasManifest): string {
  return manifest.work.exposures[0];
}

/** Plain words for an acclimatization state or an exposure. */
export const ACCLIMATIZATION_WORDS: Readonly<Record<string, string>> = { acclimatized: 'acclimatized', unacclimatized: 'unacclimatized' };
export const EXPOSURE_WORDS: Readonly<Record<string, string>> = {
  sun: 'in the sun',
  shade: 'in the shade (open sky, sun removed)',
  shelter: 'under a shelter (a roof or canopy, a shelter at air temperature — Lemke & Kjellstrom 2012)',
};
