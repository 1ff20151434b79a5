/**
 * The map explorer's catalogue for this build's data folder (lib/explorer-catalogue.ts), read
 * once per build: the manifest's layers (without the trend layers, which are downloads only), the
 * regions and each layer's value per region. A data
 * folder without a manifest gives an empty catalogue (`available: false`).
 */
import { loadInventory } from './inventory.ts';
import { loadManifestLayers } from './manifest-layers.ts';
import { loadRegions } from './regions.ts';
import { regionLayerValues } from './region-values.ts';
import { siteDataDir } from './data-dir.ts';
import { emptyCatalogue, explorerCatalogue } from '../lib/explorer-catalogue.ts';
import type { ExplorerCatalogue } from '../components/map/explorer/catalogue.ts';

const cache = new Map<string, ExplorerCatalogue>();

export function loadExplorerCatalogue(dataDir: string = siteDataDir()): ExplorerCatalogue {
  const hit = cache.get(dataDir);
  if (hit) return hit;
  const all = loadManifestLayers(dataDir);
  // The trend layers (one per combination, whole year only) are GIS downloads, not a view of the explorer yet.
  const manifest = all && { ...all, layers: all.layers.filter((l) => l.statistic !== 'trend') };
  let catalogue: ExplorerCatalogue;
  if (!manifest) catalogue = emptyCatalogue(loadInventory(dataDir).atlas.invented);
  else {
    const regions = loadRegions(dataDir);
    const values = regionLayerValues(dataDir, regions.features.map((f) => f.properties.id), manifest.layers);
    catalogue = explorerCatalogue(manifest, regions, values);
  }
  cache.set(dataDir, catalogue);
  return catalogue;
}
