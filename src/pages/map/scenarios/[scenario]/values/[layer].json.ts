/**
 * Build-time endpoints `/map/scenarios/<scenario-id>/values/<n>.json`: scenario `<scenario-id>`'s
 * value per region of the layer standing in for the catalogue's n-th layer (a JSON array in the
 * order of the catalogue's regions, null where a region has none, the shape of
 * `/map/values/<n>.json`), from the scenario's own region tables. Fetched by the map page only
 * when that scenario and layer are shown.
 */
import type { APIRoute, GetStaticPaths } from 'astro';
import { loadExplorerScenarios, loadScenarioValues } from '../../../../../data/explorer.ts';
import { rendersShared } from '../../../../../lib/site-part.ts';

// Endpoints of many regions: only part 0 of a site built in parts renders them (lib/site-part.ts).
export const getStaticPaths: GetStaticPaths = () =>
  !rendersShared()
    ? []
    : loadExplorerScenarios().flatMap((sc) =>
        sc.layers.map((l, i) => ({
          params: { scenario: sc.id, layer: l.values.slice(l.values.lastIndexOf('/') + 1, -'.json'.length) },
          props: { scenario: sc.id, index: i },
        })),
      );

export const GET: APIRoute = ({ props }) => {
  const { scenario, index } = props as { scenario: string; index: number };
  return new Response(JSON.stringify(loadScenarioValues(scenario)[index] ?? []), { headers: { 'Content-Type': 'application/json' } });
};
