/** Build-time endpoint: Natural Earth 1:110m country borders (world-atlas 2.0.2), split at ±180°, as GeoJSON. */
import type { APIRoute } from 'astro';
import type { Topology } from 'topojson-specification';
import countriesTopology from 'world-atlas/countries-110m.json';
import { bordersFromTopology } from '../../lib/basemap.ts';

export const GET: APIRoute = () =>
  new Response(JSON.stringify(bordersFromTopology(countriesTopology as unknown as Topology)), {
    headers: { 'Content-Type': 'application/geo+json' },
  });
