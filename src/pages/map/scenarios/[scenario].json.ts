/**
 * Build-time endpoints `/map/scenarios/<scenario-id>.json`: one what-if climate's words and its
 * layers under the baseline layer ids (with its own images, GeoTIFFs, legends and values paths),
 * an `ExplorerScenario` (src/lib/explorer-scenarios.ts). About as large as the catalogue's layers,
 * so the map page fetches it only when the scenario is chosen.
 */
import type { APIRoute, GetStaticPaths } from 'astro';
import { loadExplorerScenarios } from '../../../data/explorer.ts';
import { rendersShared } from '../../../lib/site-part.ts';

// Endpoints of many regions: only part 0 of a site built in parts renders them (lib/site-part.ts).
export const getStaticPaths: GetStaticPaths = () =>
  !rendersShared() ? [] : loadExplorerScenarios().map((sc) => ({ params: { scenario: sc.id }, props: { id: sc.id } }));

export const GET: APIRoute = ({ props }) => {
  const sc = loadExplorerScenarios().find((s) => s.id === (props as { id: string }).id);
  return new Response(JSON.stringify(sc ?? null), { headers: { 'Content-Type': 'application/json' } });
};
