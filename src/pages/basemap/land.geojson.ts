/** Build-time endpoint: Natural Earth 1:110m land (world-atlas 2.0.2), cut at ±180°, as GeoJSON. */
import type { APIRoute } from 'astro';
import type { Topology } from 'topojson-specification';
import landTopology from 'world-atlas/land-110m.json';
import { landFromTopology } from '../../lib/basemap.ts';

export const GET: APIRoute = () =>
  new Response(JSON.stringify(landFromTopology(landTopology as unknown as Topology)), {
    headers: { 'Content-Type': 'application/geo+json' },
  });
