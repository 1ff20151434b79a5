/**
 * Build-time endpoint `/map/regions/index.json`: the index of the regions' pieces alone
 * (components/map/explorer/region-index.ts), for the region search of the home page and the
 * region index pages (src/scripts/region-search.ts), which need no layer.
 */
import type { APIRoute } from 'astro';
import { loadExplorerRegionPieces } from '../../../data/explorer.ts';

export const GET: APIRoute = () => new Response(JSON.stringify(loadExplorerRegionPieces().index), { headers: { 'Content-Type': 'application/json' } });
