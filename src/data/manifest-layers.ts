/**
 * The map explorer's view of `data/manifest.json`: the atlas, the baseline, the work settings'
 * classes and choices, the figures, and every published layer with its images and legend. A thin
 * view over the site's one reader (manifest.ts), which parses and validates the file once per
 * build. A data folder without a manifest (an inventory-only folder) gives `null`: the map page
 * then says that no layers are published.
 */
import { hasManifest, loadManifest, type SiteManifest } from './manifest.ts';
import { siteDataDir } from './data-dir.ts';

export type ManifestLayers = SiteManifest;
export type { ManifestLayer } from './manifest.ts';

/** The manifest of `dataDir` (default: the build's data folder), or null without a manifest. */
export function loadManifestLayers(dataDir: string = siteDataDir()): ManifestLayers | null {
  return hasManifest(dataDir) ? loadManifest(dataDir) : null;
}
