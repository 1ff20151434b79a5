/**
 * The map explorer's catalogue for this build's data folder (lib/explorer-catalogue.ts), read
 * once per build: the manifest's layers (the trend layers among them) and the regions; and each layer's value per region (data/region-values.ts), published one file per
 * layer (`map/values/<n>.json`, pages/map/values/) so the catalogue the map fetches first does not
 * grow with layers × regions. A data folder without a manifest gives an empty catalogue
 * (`available: false`) and no values. The regions are published apart, in pieces the map fetches
 * when it needs them (components/map/explorer/region-index.ts, pages/map/regions/): the published
 * catalogue (`map/explorer.json`) carries only their index.
 */
import { loadInventory } from './inventory.ts';
import { loadManifestLayers } from './manifest-layers.ts';
import { loadRegions } from './regions.ts';
import { regionLayerValues } from './region-values.ts';
import { siteDataDir } from './data-dir.ts';
import { emptyCatalogue, explorerCatalogue } from '../lib/explorer-catalogue.ts';
import { explorerScenarios } from '../lib/explorer-scenarios.ts';
import type { ExplorerCatalogue, ExplorerScenario, PublishedCatalogue } from '../components/map/explorer/catalogue.ts';
import { regionPieces, type RegionAreaPiece, type RegionListPiece } from '../components/map/explorer/region-index.ts';

const cache = new Map<string, ExplorerCatalogue>();

/** The manifest's layers the explorer shows: all of them (the trend layers, one per combination and whole year only, among them). */
function explorerLayers(dataDir: string) {
  return loadManifestLayers(dataDir);
}
const valuesCache = new Map<string, Record<string, Array<number | null>>>();

export function loadExplorerCatalogue(dataDir: string = siteDataDir()): ExplorerCatalogue {
  const hit = cache.get(dataDir);
  if (hit) return hit;
  const manifest = explorerLayers(dataDir);
  const catalogue = manifest ? explorerCatalogue(manifest, loadRegions(dataDir)) : emptyCatalogue(loadInventory(dataDir).atlas.invented);
  cache.set(dataDir, catalogue);
  return catalogue;
}

/** Layer id → value per region, in the order of the catalogue's regions; null where a region has none. Read once per build. */
export function loadExplorerValues(dataDir: string = siteDataDir()): Record<string, Array<number | null>> {
  const hit = valuesCache.get(dataDir);
  if (hit) return hit;
  const manifest = explorerLayers(dataDir);
  const values = manifest
    ? regionLayerValues(
        dataDir,
        loadExplorerCatalogue(dataDir).regions.map((r) => r.id),
        manifest.layers,
      )
    : {};
  valuesCache.set(dataDir, values);
  return values;
}

const piecesCache = new Map<string, ReturnType<typeof regionPieces>>();

/** The regions' index and pieces (path below the site's base → JSON value), in the catalogue's order of regions. Made once per build. */
export function loadExplorerRegionPieces(dataDir: string = siteDataDir()): ReturnType<typeof regionPieces> {
  const hit = piecesCache.get(dataDir);
  if (hit) return hit;
  const catalogue = loadExplorerCatalogue(dataDir);
  // The catalogue's regions are those of regions.geojson in its order (lib/explorer-catalogue.ts).
  const geometry = catalogue.available ? loadRegions(dataDir).features.map((f) => f.geometry) : [];
  const made = regionPieces(catalogue.regions, geometry);
  piecesCache.set(dataDir, made);
  return made;
}

/** What `map/explorer.json` publishes: the catalogue without its regions, with their pieces' index. */
export function loadPublishedCatalogue(dataDir: string = siteDataDir()): PublishedCatalogue {
  const { regions: _regions, ...rest } = loadExplorerCatalogue(dataDir);
  return { ...rest, regionIndex: loadExplorerRegionPieces(dataDir).index };
}

export type { RegionAreaPiece, RegionListPiece };

const scenariosCache = new Map<string, ExplorerScenario[]>();

/** The map's what-if climates with their layers (lib/explorer-scenarios.ts); none without a manifest. Made once per build. */
export function loadExplorerScenarios(dataDir: string = siteDataDir()): ExplorerScenario[] {
  const hit = scenariosCache.get(dataDir);
  if (hit) return hit;
  const manifest = explorerLayers(dataDir);
  const made = manifest ? explorerScenarios(manifest, loadExplorerCatalogue(dataDir)) : [];
  scenariosCache.set(dataDir, made);
  return made;
}

const scenarioValuesCache = new Map<string, Array<Array<number | null>>>();

/**
 * Scenario `scenarioId`'s value per region of each of its map layers, in the order of its layers
 * in {@link loadExplorerScenarios} (regions in the catalogue's order), from its own region tables
 * and summaries (`data/scenarios/<id>/regions/`). Read once per build and scenario.
 */
export function loadScenarioValues(scenarioId: string, dataDir: string = siteDataDir()): Array<Array<number | null>> {
  const k = `${dataDir}\0${scenarioId}`;
  const hit = scenarioValuesCache.get(k);
  if (hit) return hit;
  const manifest = explorerLayers(dataDir);
  const sc = manifest?.scenarios?.find((s) => s.id === scenarioId);
  const shown = loadExplorerScenarios(dataDir).find((s) => s.id === scenarioId);
  let out: Array<Array<number | null>> = [];
  if (manifest && sc && shown) {
    // The scenario's manifest layers in the order of the shown list (matched by GeoTIFF path, which is unique).
    const byTif = new Map(sc.layers.map((l) => [l.tif, l]));
    const layers = shown.layers.map((l, i) => ({ ...byTif.get(l.tif)!, id: String(i) }));
    const regionsDir = `${sc.dataPath.replace(/\/$/, '')}/regions`;
    const values = regionLayerValues(
      dataDir,
      loadExplorerCatalogue(dataDir).regions.map((r) => r.id),
      layers,
      regionsDir,
    );
    out = layers.map((l) => values[l.id]);
  }
  scenarioValuesCache.set(k, out);
  return out;
}
