/**
 * The MapLibre map of the explorer, offline: a sea background, Natural Earth land and borders
 * (/basemap/*), the shown layer's PNG image(s) in Web Mercator rows drawn with nearest-pixel
 * sampling at full opacity (so a drawn pixel has the very colour the legend gives its value),
 * the outlines of the regions in view with each region's name (from the regions' area pieces,
 * region-loader.ts; none when the view holds more than the map draws; can be switched off), the
 * focused region, the keyboard cursor, the selected cell, and a scale bar. No glyphs or sprites
 * (STACK.md MapLibre gotchas): region names are HTML markers in the page's own font, placed at a
 * point inside each outline (src/lib/label-point.ts), so nothing is fetched for them.
 */
import * as maplibregl from 'maplibre-gl';
import workerUrl from 'maplibre-gl/dist/maplibre-gl-worker.mjs?url';
import 'maplibre-gl/dist/maplibre-gl.css';
import type { FeatureCollection, Geometry } from 'geojson';
import { MAP_COLOURS, cssRgb } from '../map-colours.ts';
import { sitePath } from '../../../lib/nav.ts';
import type { ExplorerLayer } from './catalogue.ts';
import type { RegionAreaPiece } from './region-index.ts';

maplibregl.setWorkerUrl(workerUrl);

declare global {
  // eslint-disable-next-line no-var
  var heathoursMaps: Record<string, maplibregl.Map> | undefined;
}

/** Colours of the map's own lines (our choice): selected cell black on white, cursor dashed dark blue. */
export const EXPLORER_LINES = { selected: '#111111', selectedHalo: '#ffffff', cursor: '#173f5f', focus: '#b4501a' };

const EMPTY: FeatureCollection = { type: 'FeatureCollection', features: [] };

export interface ExplorerMapOptions {
  container: HTMLElement;
  base: string;
  bounds?: [number, number, number, number];
  centre?: [number, number];
  zoom?: number;
  land: unknown;
  borders: unknown;
  attribution: string;
}

export class ExplorerMap {
  readonly map: maplibregl.Map;
  private readonly base: string;
  private imageCount = 0;
  private generation = 0;

  constructor(o: ExplorerMapOptions) {
    this.base = o.base;
    this.map = new maplibregl.Map({
      container: o.container,
      style: { version: 8, sources: {}, layers: [{ id: 'sea', type: 'background', paint: { 'background-color': cssRgb(MAP_COLOURS.sea) } }] },
      ...(o.centre && o.zoom !== undefined ? { center: o.centre, zoom: o.zoom } : { bounds: o.bounds, fitBoundsOptions: { padding: 30, maxZoom: 7 } }),
      maxZoom: 10,
      keyboard: false,
      attributionControl: { compact: true, customAttribution: o.attribution },
      canvasContextAttributes: { preserveDrawingBuffer: true },
      cooperativeGestures: false,
      dragRotate: false,
      pitchWithRotate: false,
    });
    this.map.touchZoomRotate.disableRotation();
    this.map.addControl(new maplibregl.NavigationControl({ showCompass: false }), 'top-right');
    this.map.addControl(new maplibregl.ScaleControl({ unit: 'metric', maxWidth: 120 }), 'bottom-left');
    (globalThis.heathoursMaps ??= {})[o.container.id] = this.map;
    this.pending = this.whenLoaded().then(() => this.addBase(o));
  }

  /** Resolves once the style and the base layers are in. */
  readonly pending: Promise<void>;

  private whenLoaded(): Promise<void> {
    return this.map.loaded() ? Promise.resolve() : new Promise((r) => this.map.once('load', () => r()));
  }

  private addBase(o: ExplorerMapOptions): void {
    const m = this.map;
    m.addSource('land', { type: 'geojson', data: o.land as GeoJSON.GeoJSON, attribution: 'Natural Earth (public domain)' });
    m.addSource('borders', { type: 'geojson', data: o.borders as GeoJSON.GeoJSON });
    m.addSource('regions', { type: 'geojson', data: EMPTY });
    m.addSource('cursor', { type: 'geojson', data: EMPTY });
    m.addSource('selected', { type: 'geojson', data: EMPTY });
    m.addLayer({ id: 'land', type: 'fill', source: 'land', paint: { 'fill-color': cssRgb(MAP_COLOURS.land), 'fill-antialias': false } });
    m.addLayer({ id: 'borders', type: 'line', source: 'borders', paint: { 'line-color': cssRgb(MAP_COLOURS.border), 'line-width': 0.6 } });
    m.addLayer({ id: 'regions', type: 'line', source: 'regions', paint: { 'line-color': cssRgb(MAP_COLOURS.region), 'line-width': 1.4 } });
    m.addLayer({
      id: 'region-focus',
      type: 'line',
      source: 'regions',
      filter: ['==', ['get', 'id'], ''],
      paint: { 'line-color': EXPLORER_LINES.focus, 'line-width': 3 },
    });
    m.addLayer({ id: 'cursor', type: 'line', source: 'cursor', paint: { 'line-color': EXPLORER_LINES.cursor, 'line-width': 2, 'line-dasharray': [2, 1] } });
    m.addLayer({ id: 'selected-halo', type: 'line', source: 'selected', paint: { 'line-color': EXPLORER_LINES.selectedHalo, 'line-width': 4 } });
    m.addLayer({ id: 'selected', type: 'line', source: 'selected', paint: { 'line-color': EXPLORER_LINES.selected, 'line-width': 2 } });
  }

  /** Draws `layer` (its image parts) in place of the previous one; resolves when drawn, false if overtaken. */
  async showLayer(layer: ExplorerLayer): Promise<boolean> {
    await this.pending;
    const gen = ++this.generation;
    const m = this.map;
    const ids = layer.images.map((_, i) => `heat-${i}`);
    layer.images.forEach((img, i) => {
      const url = sitePath(this.base, img.path);
      const src = m.getSource(ids[i]) as maplibregl.ImageSource | undefined;
      if (src) src.updateImage({ url, coordinates: img.coordinates });
      else {
        m.addSource(ids[i], { type: 'image', url, coordinates: img.coordinates });
        m.addLayer(
          { id: ids[i], type: 'raster', source: ids[i], paint: { 'raster-resampling': 'nearest', 'raster-fade-duration': 0, 'raster-opacity': 1 } },
          'borders',
        );
      }
    });
    for (let i = layer.images.length; i < this.imageCount; i++) {
      m.removeLayer(`heat-${i}`);
      m.removeSource(`heat-${i}`);
    }
    this.imageCount = layer.images.length;
    await this.drawn(ids);
    return gen === this.generation;
  }

  /** Resolves when the map is idle with every named image source loaded. */
  drawn(ids: string[] = []): Promise<void> {
    const m = this.map;
    return new Promise((resolve) => {
      const check = () => {
        const ready = ids.every((id) => (m.getSource(id) as maplibregl.ImageSource | undefined)?.loaded() ?? true);
        if (ready && m.loaded()) resolve();
        else m.once('idle', check);
      };
      m.once('idle', check);
      m.triggerRepaint();
    });
  }

  /** Name markers of the regions drawn, by id. */
  private readonly labels = new Map<string, maplibregl.Marker>();

  /** Draws the outlines and names of the regions of these area pieces in place of those drawn before (none: `[]`). */
  showRegions(pieces: readonly RegionAreaPiece[]): void {
    const keep = new Set<string>();
    for (const piece of pieces) {
      for (const r of piece.regions) {
        keep.add(r.id);
        if (this.labels.has(r.id)) continue;
        const el = document.createElement('div');
        el.className = 'region-label';
        el.dataset.regionLabel = r.id;
        el.setAttribute('aria-hidden', 'true');
        el.textContent = r.name;
        this.labels.set(r.id, new maplibregl.Marker({ element: el, anchor: 'center' }).setLngLat(r.label).addTo(this.map));
      }
    }
    for (const [id, marker] of this.labels) {
      if (keep.has(id)) continue;
      marker.remove();
      this.labels.delete(id);
    }
    const data: FeatureCollection = { type: 'FeatureCollection', features: pieces.flatMap((p) => p.outlines.features) };
    void this.pending.then(() => (this.map.getSource('regions') as maplibregl.GeoJSONSource).setData(data));
  }

  /** Shows or hides the region outlines and their names. */
  setOutlines(visible: boolean): void {
    this.map.getContainer().classList.toggle('no-region-labels', !visible);
    void this.pending.then(() => this.map.setLayoutProperty('regions', 'visibility', visible ? 'visible' : 'none'));
  }

  setFocusRegion(id: string | undefined): void {
    void this.pending.then(() => this.map.setFilter('region-focus', ['==', ['get', 'id'], id ?? '']));
  }

  setCursor(feature: GeoJSON.Feature<Geometry> | null): void {
    void this.pending.then(() =>
      (this.map.getSource('cursor') as maplibregl.GeoJSONSource).setData(feature ? { type: 'FeatureCollection', features: [feature] } : EMPTY),
    );
  }

  setSelected(feature: GeoJSON.Feature<Geometry> | null): void {
    void this.pending.then(() =>
      (this.map.getSource('selected') as maplibregl.GeoJSONSource).setData(feature ? { type: 'FeatureCollection', features: [feature] } : EMPTY),
    );
  }
}
