/**
 * Build-time endpoint `/map/explorer.json`: the map explorer's catalogue (layers with their
 * images, legends and values file, our labels for every choice, the default view, and the index
 * of the regions' pieces); each layer's value per region is its own file
 * (map/values/[layer].json.ts) and the regions' names, boxes and outlines are in pieces
 * (map/regions/[piece].json.ts), so this file grows neither with layers × regions nor with the
 * regions. Made from the data folder by src/data/explorer.ts. The manifest itself is too big to
 * fetch (about 3 MB for the small demo); this holds only what the map's first view needs.
 */
import type { APIRoute } from 'astro';
import { loadPublishedCatalogue } from '../../data/explorer.ts';

export const GET: APIRoute = () => new Response(JSON.stringify(loadPublishedCatalogue()), { headers: { 'Content-Type': 'application/json' } });
