/**
 * The map explorer's what-if climates (components/map/explorer/catalogue.ts `ExplorerScenario`),
 * made from the manifest's `scenarios` and the explorer's own catalogue: each scenario layer that
 * has a baseline twin of the same figure, combination, statistic and period, under the twin's id
 * and view (so a switch of climate keeps the view), with the scenario's own images, GeoTIFF,
 * legend, and a values file of its own (`map/scenarios/<scenario-id>/values/<n>.json`, n the
 * twin's index in the catalogue, the same shape as the baseline's `map/values/<n>.json`). The
 * scenario's words (kind, what it changes, source) come from the manifest (pipeline/scenario/
 * describe.ts wrote them); the caveat is the manifest's `scenarioCaveat`, else the pipeline's
 * `SCENARIO_CAVEAT` (one source of that text). Kept apart from the catalogue, fetched only when a
 * scenario is chosen, so the map's first view does not grow with the scenarios. Pure.
 */
import type { ManifestLayers } from '../data/manifest-layers.ts';
import type { ExplorerCatalogue, ExplorerLegend, ExplorerScenario, ExplorerScenarioWords } from '../components/map/explorer/catalogue.ts';
import { SCENARIO_CAVEAT } from '../../pipeline/scenario/describe.ts';

/** Path below the site's base of scenario `scenarioId`'s values file for the catalogue's `index`-th layer. */
export const scenarioValuesPath = (scenarioId: string, index: number) => `map/scenarios/${scenarioId}/values/${index}.json`;

/** Path below the site's base of scenario `scenarioId`'s layers file (an {@link ExplorerScenario}). */
export const scenarioLayersPath = (scenarioId: string) => `map/scenarios/${scenarioId}.json`;

/** Key of a layer's view, shared by a baseline layer and its scenario twin. */
const twinKey = (l: { figure: string; combo: string; statistic: string; period: string }) => `${l.figure}|${l.combo}|${l.statistic}|${l.period}`;

/** The caveat shown with every scenario: the manifest's, else the pipeline's own words. */
export function scenarioCaveat(manifest: Pick<ManifestLayers, 'scenarioCaveat'> | null): string {
  return manifest?.scenarioCaveat ?? SCENARIO_CAVEAT;
}

/** Each scenario's words, without its layers (what the map page writes at build time for its switch). */
export function scenarioWords(manifest: ManifestLayers | null): ExplorerScenarioWords[] {
  return (manifest?.scenarios ?? []).map((sc) => ({
    id: sc.id,
    name: sc.name,
    kind: sc.words.kind,
    what: sc.words.what,
    source: sc.words.source,
    layersFile: scenarioLayersPath(sc.id),
    cellsIndex: `${sc.dataPath.replace(/\/$/, '')}/cells/index.json`,
  }));
}

/** Every scenario with its layers under the baseline twins' ids (see the file comment). */
export function explorerScenarios(manifest: ManifestLayers, catalogue: ExplorerCatalogue): ExplorerScenario[] {
  // The baseline twin of each manifest layer, by view; the catalogue's layers are the manifest's the explorer shows, by id.
  const catalogueIndex = new Map(catalogue.layers.map((l, i) => [l.id, i]));
  const twinOf = new Map<string, number>();
  for (const l of manifest.layers) {
    const i = catalogueIndex.get(l.id);
    if (i !== undefined) twinOf.set(twinKey(l), i);
  }
  const words = scenarioWords(manifest);
  return (manifest.scenarios ?? []).map((sc, s) => {
    const legends: ExplorerLegend[] = [];
    const legendIndex = new Map<string, number>();
    const layers = sc.layers.flatMap((l) => {
      const i = twinOf.get(twinKey(l));
      if (i === undefined) return [];
      const twin = catalogue.layers[i];
      const k = JSON.stringify(l.legend);
      let li = legendIndex.get(k);
      if (li === undefined) {
        li = legends.length;
        legends.push(l.legend);
        legendIndex.set(k, li);
      }
      return [
        {
          ...twin,
          units: l.units,
          images: l.mapImages.map((m) => ({ path: m.path, coordinates: m.coordinates })),
          legend: li,
          tif: l.tif,
          values: scenarioValuesPath(sc.id, i),
        },
      ];
    });
    return { ...words[s], layers, legends };
  });
}
