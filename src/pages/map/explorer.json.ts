/**
 * Build-time endpoint `/map/explorer.json`: the map explorer's catalogue (layers with their
 * images and legends, our labels for every choice, each layer's value per region, the default
 * view), made from the data folder by src/data/explorer.ts. The manifest itself is too big to
 * fetch (about 3 MB for the small demo); this holds only what the map needs.
 */
import type { APIRoute } from 'astro';
import { loadExplorerCatalogue } from '../../data/explorer.ts';

export const GET: APIRoute = () =>
  new Response(JSON.stringify(loadExplorerCatalogue()), { headers: { 'Content-Type': 'application/json' } });
