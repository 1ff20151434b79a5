/**
 * Build-time endpoint `/map/explorer.json`: the map explorer's catalogue (layers with their
 * images, legends and values file, our labels for every choice, the regions, the default view;
 * each layer's value per region is its own file, map/values/[layer].json.ts), made from the data folder by src/data/explorer.ts. The manifest itself is too big to
 * fetch (about 3 MB for the small demo); this holds only what the map needs.
 */
import type { APIRoute } from 'astro';
import { loadExplorerCatalogue } from '../../data/explorer.ts';

export const GET: APIRoute = () =>
  new Response(JSON.stringify(loadExplorerCatalogue()), { headers: { 'Content-Type': 'application/json' } });
