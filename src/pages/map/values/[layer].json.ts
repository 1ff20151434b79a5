/**
 * Build-time endpoints `/map/values/<n>.json`: the value of the catalogue's n-th layer for each
 * region (a JSON array in the order of the catalogue's regions, null where a region has none),
 * fetched by the map page when it shows that layer (components/map/explorer/map-explorer.ts).
 */
import type { APIRoute, GetStaticPaths } from 'astro';
import { loadExplorerCatalogue, loadExplorerValues } from '../../../data/explorer.ts';
import { rendersShared } from '../../../lib/site-part.ts';

// Endpoints of many regions: only part 0 of a site built in parts renders them (lib/site-part.ts).
export const getStaticPaths: GetStaticPaths = () =>
  !rendersShared() ? [] : loadExplorerCatalogue().layers.map((l, i) => ({ params: { layer: String(i) }, props: { id: l.id } }));

export const GET: APIRoute = ({ props }) =>
  new Response(JSON.stringify(loadExplorerValues()[(props as { id: string }).id] ?? []), { headers: { 'Content-Type': 'application/json' } });
