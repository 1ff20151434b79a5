/**
 * The report pages' and the home page's view of `data/manifest.json`: the years, the work settings
 * with the workload classes, the figures, the statistics' meanings, the layers and the list of
 * published files. A thin view over the site's one reader (manifest.ts), which parses and
 * validates the file once per build; these names are kept for the callers.
 */
import { hasManifest, loadManifest, type SiteManifest } from './manifest.ts';
import { siteDataDir } from './data-dir.ts';

export type AtlasManifest = SiteManifest;
export type WorkloadClassInfo = SiteManifest['work']['classes'][number];

/** Whether the data folder carries the atlas figures (a manifest); see {@link hasManifest}. */
export function hasAtlasManifest(dataDir: string = siteDataDir()): boolean {
  return hasManifest(dataDir);
}

/** The validated manifest (once per build; see {@link loadManifest}). */
export function loadAtlasManifest(dataDir: string = siteDataDir()): AtlasManifest {
  return loadManifest(dataDir);
}
