/**
 * Browser script of {@link GridExtentMap.astro}: draws the dataset grid's extent and cells and the
 * region outlines over the offline Natural Earth base map. Everything comes from the site itself
 * (no remote tiles, glyphs, sprites or fonts); no labels are drawn, so no glyphs are needed.
 *
 * Each map container carries its inputs in data attributes (`data-grid`, `data-regions-url`,
 * `data-land-url`, `data-borders-url`) and reports its state in `data-map-state`
 * (`loading` → `idle` | `error`). Maps are registered in `globalThis.heathoursMaps[containerId]`
 * for the browser tests and later page scripts.
 */
import * as maplibregl from 'maplibre-gl';
import workerUrl from 'maplibre-gl/dist/maplibre-gl-worker.mjs?url';
import 'maplibre-gl/dist/maplibre-gl.css';
import { GRID_FILL_OPACITY, MAP_COLOURS, cssRgb } from './map-colours.ts';
import { gridCellLines, gridExtentPolygon, gridMapEdges, type GridSpec } from './grid-geometry.ts';

maplibregl.setWorkerUrl(workerUrl);

declare global {
  // eslint-disable-next-line no-var
  var heathoursMaps: Record<string, maplibregl.Map> | undefined;
}

async function fetchJson(url: string): Promise<unknown> {
  const res = await fetch(url);
  if (!res.ok) throw new Error(`${url}: HTTP ${res.status}`);
  return res.json();
}

function baseStyle(): maplibregl.StyleSpecification {
  return {
    version: 8,
    sources: {},
    layers: [{ id: 'sea', type: 'background', paint: { 'background-color': cssRgb(MAP_COLOURS.sea) } }],
  };
}

async function startMap(container: HTMLElement): Promise<void> {
  container.dataset.mapState = 'loading';
  const grid = JSON.parse(container.dataset.grid ?? 'null') as GridSpec;
  const [w, s, e, n] = gridMapEdges(grid);
  const map = new maplibregl.Map({
    container,
    style: baseStyle(),
    bounds: [w, s, e, n],
    fitBoundsOptions: { padding: 40, maxZoom: 4 },
    maxZoom: 10,
    attributionControl: { compact: true },
    canvasContextAttributes: { preserveDrawingBuffer: true },
    cooperativeGestures: false,
  });
  map.addControl(new maplibregl.NavigationControl({ showCompass: false }), 'top-right');
  (globalThis.heathoursMaps ??= {})[container.id] = map;

  const [land, borders, regions] = await Promise.all([
    fetchJson(container.dataset.landUrl ?? ''),
    fetchJson(container.dataset.bordersUrl ?? ''),
    fetchJson(container.dataset.regionsUrl ?? ''),
  ]);
  if (!map.loaded()) await new Promise<void>((resolve) => map.once('load', () => resolve()));

  map.addSource('land', { type: 'geojson', data: land as GeoJSON.GeoJSON, attribution: 'Natural Earth (public domain)' });
  map.addSource('borders', { type: 'geojson', data: borders as GeoJSON.GeoJSON });
  map.addSource('grid-extent', { type: 'geojson', data: gridExtentPolygon(grid) });
  map.addSource('grid-cells', { type: 'geojson', data: gridCellLines(grid) });
  map.addSource('regions', { type: 'geojson', data: regions as GeoJSON.GeoJSON });

  map.addLayer({ id: 'land', type: 'fill', source: 'land', paint: { 'fill-color': cssRgb(MAP_COLOURS.land), 'fill-antialias': false } });
  map.addLayer({ id: 'borders', type: 'line', source: 'borders', paint: { 'line-color': cssRgb(MAP_COLOURS.border), 'line-width': 0.6 } });
  map.addLayer({
    id: 'grid-extent-fill',
    type: 'fill',
    source: 'grid-extent',
    paint: { 'fill-color': cssRgb(MAP_COLOURS.gridFill), 'fill-opacity': GRID_FILL_OPACITY, 'fill-antialias': false },
  });
  map.addLayer({
    id: 'grid-cells',
    type: 'line',
    source: 'grid-cells',
    paint: { 'line-color': cssRgb(MAP_COLOURS.gridLine), 'line-width': 0.5, 'line-opacity': 0.6 },
  });
  map.addLayer({ id: 'grid-extent-edge', type: 'line', source: 'grid-extent', paint: { 'line-color': cssRgb(MAP_COLOURS.gridLine), 'line-width': 1.5 } });
  map.addLayer({ id: 'regions', type: 'line', source: 'regions', paint: { 'line-color': cssRgb(MAP_COLOURS.region), 'line-width': 1.8 } });

  map.once('idle', () => {
    container.dataset.mapState = 'idle';
  });
}

for (const container of document.querySelectorAll<HTMLElement>('[data-grid-extent-map]')) {
  startMap(container).catch((err: unknown) => {
    container.dataset.mapState = 'error';
    console.error('map could not be drawn:', err);
  });
}
