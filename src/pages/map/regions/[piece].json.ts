/**
 * Build-time endpoints `/map/regions/<kind>-<k>.json`: the regions in pieces of at most 256 (by
 * name, by id, by area with their outlines; components/map/explorer/region-index.ts), fetched by
 * the map page when it needs them (components/map/explorer/region-loader.ts).
 */
import type { APIRoute, GetStaticPaths } from 'astro';
import { loadExplorerRegionPieces } from '../../../data/explorer.ts';
import { rendersShared } from '../../../lib/site-part.ts';

// Endpoints of many regions: only part 0 of a site built in parts renders them (lib/site-part.ts).
export const getStaticPaths: GetStaticPaths = () =>
  !rendersShared()
    ? []
    : [...loadExplorerRegionPieces().pieces.keys()].map((path) => ({
        params: { piece: path.replace(/^map\/regions\//, '').replace(/\.json$/, '') },
        props: { path },
      }));

export const GET: APIRoute = ({ props }) =>
  new Response(JSON.stringify(loadExplorerRegionPieces().pieces.get((props as { path: string }).path)), { headers: { 'Content-Type': 'application/json' } });
