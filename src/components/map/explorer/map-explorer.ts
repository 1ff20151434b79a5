/**
 * Browser script of the map page (src/pages/map/index.astro): wires the catalogue
 * (`/map/explorer.json`), the URL view state, the controls, the MapLibre map, the legend, the
 * month player, the cell cursor and panel, and the region table; the regions' names, boxes and
 * outlines come in pieces when needed (region-loader.ts): a region named in the URL, the search,
 * the outlines of the view (`data-regions-drawn` on the map container: how many), the regions
 * around a selected cell. Inputs come from data
 * attributes of `#map-explorer`; nothing is inline. The map container reports
 * `data-map-state` (`loading` → `idle` | `error`) and `data-layer-id` (the layer drawn) for the
 * tests; `#cell-panel` reports `data-cell` and `data-state` (`loading`, `ready`, `no-data`).
 * The climate switch (`#map-scenario`, written at build time with each what-if climate's words)
 * fetches a scenario's layers file (`map/scenarios/<id>.json`) when it is first chosen, its
 * values files and per-cell figures when shown; the map container reports `data-scenario`
 * (`baseline` or the scenario id) with the layer drawn.
 */
import type { CellChunk, CellFiguresIndex, CellRecord } from '../../../../pipeline/publish/cell-figures.ts';
import type { DatasetInventory } from '../../../../pipeline/read/inventory-types.ts';
import { sitePath } from '../../../lib/nav.ts';
import { UNIT_EVENT, currentUnit } from '../../../lib/units.ts';
import { formatLat, formatLon } from '../../../lib/format.ts';
import type { ExplorerCatalogue, ExplorerLayer, ExplorerScenario, PublishedCatalogue } from './catalogue.ts';
import { parseViewState, viewQuery, type ViewState } from './view-state.ts';
import { CHOICE_KEYS, resolveView } from './layer-choice.ts';
import { findControls, syncControls } from './controls.ts';
import { renderLegend } from './legend-view.ts';
import { layerUnitWords, legendRangeNote, type ShownRange } from './legend-range.ts';
import { describeLayer, describeLayerLine, trendNote } from './describe-view.ts';
import { updateRegionTable } from './region-table.ts';
import { renderCellPanel } from './cell-panel.ts';
import { cellAt, cellCentre, cellPolygon, chunkOfCell, isCell, moveCell, type CellGrid } from './cell-grid.ts';
import type { regionsForPoint } from './nearest-region.ts';
import { ExplorerMap } from './explorer-map.ts';
import { RegionLoader } from './region-loader.ts';

/** Pause between months while playing, after the month is drawn [ms]. */
const PLAY_STEP_MS = 1200;

async function fetchJson<T>(url: string): Promise<T> {
  const res = await fetch(url);
  if (!res.ok) throw new Error(`${url}: HTTP ${res.status}`);
  return (await res.json()) as T;
}

function must<T extends Element>(root: ParentNode, selector: string): T {
  const el = root.querySelector<T>(selector);
  if (!el) throw new Error(`map page: missing ${selector}`);
  return el;
}

async function start(root: HTMLElement): Promise<void> {
  const base = root.dataset.base ?? '/';
  const mapBox = must<HTMLElement>(root, '#explorer-map');
  mapBox.dataset.mapState = 'loading';
  const form = must<HTMLFormElement>(root, '#map-controls');
  const legendBox = must<HTMLElement>(root, '#map-legend');
  const status = must<HTMLElement>(root, '#map-status');
  const panel = must<HTMLElement>(document, '#cell-panel');
  const regionTable = document.querySelector<HTMLTableElement>('#region-values');
  const playButton = must<HTMLButtonElement>(form, '#map-play');
  const outlines = must<HTMLInputElement>(form, '#map-outlines');
  const picker = must<HTMLFormElement>(document, '#cell-picker');
  const inv = JSON.parse(root.dataset.grid ?? 'null') as DatasetInventory['grid'];
  const grid: CellGrid = { nLat: inv.nLat, nLon: inv.nLon, lat0: inv.latMin, lon0: inv.lonMin, dLat: inv.dLat, dLon: inv.dLon };

  const [published, cellsIndex, land, borders] = await Promise.all([
    fetchJson<PublishedCatalogue>(root.dataset.catalogueUrl ?? ''),
    fetchJson<CellFiguresIndex>(root.dataset.cellsUrl ?? ''),
    fetchJson<unknown>(root.dataset.landUrl ?? ''),
    fetchJson<unknown>(root.dataset.bordersUrl ?? ''),
  ]);
  if (!published.available) throw new Error('no map layers are published in this atlas');
  const loader = new RegionLoader(published.regionIndex, (path) => fetchJson<unknown>(sitePath(base, path)));
  // The regions known so far stand in the catalogue's list: first the one the URL names, if any.
  const urlRegion = new URLSearchParams(location.search).get('region');
  const catalogue: ExplorerCatalogue = { ...published, regions: [] };
  const named = urlRegion ? await loader.byId(urlRegion) : undefined;
  if (named) catalogue.regions = [named];

  // The what-if climates: the switch and each one's words are in the page; a scenario's layers are fetched when first chosen.
  const scenarioSelect = root.querySelector<HTMLSelectElement>('#map-scenario');
  const scenarioBox = root.querySelector<HTMLElement>('#map-scenario-about');
  const scenarioFiles = new Map<string, Promise<ExplorerScenario>>();
  const scenarioOption = (id: string | undefined) => (id && scenarioSelect ? [...scenarioSelect.options].find((o) => o.value === id && id !== '') : undefined);
  function scenarioOf(id: string): Promise<ExplorerScenario> {
    let p = scenarioFiles.get(id);
    if (!p) {
      p = fetchJson<ExplorerScenario>(sitePath(base, scenarioOption(id)?.dataset.layersFile ?? ''));
      scenarioFiles.set(id, p);
    }
    return p;
  }
  // The climate shown: null for the record; its catalogue is the record's with the scenario's layers and legends.
  let scenario: ExplorerScenario | null = null;
  const shownCatalogue = (): ExplorerCatalogue => (scenario ? { ...catalogue, layers: scenario.layers, legends: scenario.legends } : catalogue);
  const withKnownRegions = (): ExplorerCatalogue => ({ ...shownCatalogue(), regions: [...loader.known.values()] });

  let state: ViewState = resolveView(catalogue, parseViewState(location.search, catalogue)).state;
  let layer: ExplorerLayer | undefined;
  const regionBox = async (id: string | undefined) => (id === undefined ? undefined : (await loader.byId(id))?.bbox);
  const [w, s, e, n] = [
    grid.lon0 - grid.dLon / 2,
    grid.lat0 - grid.dLat / 2,
    grid.lon0 + (grid.nLon - 0.5) * grid.dLon,
    grid.lat0 + (grid.nLat - 0.5) * grid.dLat,
  ];
  const explorer = new ExplorerMap({
    container: mapBox,
    base,
    bounds: (await regionBox(state.region)) ?? [w, Math.max(-85, s), e, Math.min(85, n)],
    centre: state.centre,
    zoom: state.zoom,
    land,
    borders,
    attribution: catalogue.invented ? 'Heat layers: invented data' : 'Heat layers: this atlas',
  });
  const map = explorer.map;
  explorer.setFocusRegion(state.region);
  const controls = findControls(form);
  form.hidden = false;
  for (const note of document.querySelectorAll<HTMLElement>('[data-no-js-note]')) note.hidden = true;
  picker.hidden = false;

  const writeUrl = () => history.replaceState(null, '', `${location.pathname}${viewQuery(state, location.search)}${location.hash}`);

  // The selected cell and its record (null: not a land cell), and the keyboard cursor.
  let selected:
    | { cell: number; record: CellRecord | null; index: CellFiguresIndex; indexPath: string; regions: ReturnType<typeof regionsForPoint> }
    | undefined;
  let cursor: number | undefined;
  // Per-cell figures of the record (data/cells/) and of each scenario shown (data/scenarios/<id>/cells/), fetched when needed.
  const chunks = new Map<string, Promise<CellChunk>>();
  const cellIndexes = new Map<string, Promise<CellFiguresIndex>>([['data/cells/index.json', Promise.resolve(cellsIndex)]]);
  const cellsIndexPath = () => (scenario ? scenario.cellsIndex : 'data/cells/index.json');
  function cellIndexOf(path: string): Promise<CellFiguresIndex> {
    let p = cellIndexes.get(path);
    if (!p) {
      p = fetchJson<CellFiguresIndex>(sitePath(base, path));
      cellIndexes.set(path, p);
    }
    return p;
  }
  async function recordOf(cell: number, indexPath: string): Promise<{ index: CellFiguresIndex; record: CellRecord | null }> {
    const index = await cellIndexOf(indexPath);
    const id = chunkOfCell(index, cell);
    if (!index.chunks.some((c) => c.id === id)) return { index, record: null };
    const path = `${indexPath.slice(0, indexPath.lastIndexOf('/'))}/${id}.json`;
    let p = chunks.get(path);
    if (!p) {
      p = fetchJson<CellChunk>(sitePath(base, path));
      chunks.set(path, p);
    }
    return { index, record: (await p).cells.find((c) => c.cell === cell) ?? null };
  }

  function renderPanel(): void {
    if (!selected) return;
    const centre = cellCentre(grid, selected.cell);
    renderCellPanel(
      panel,
      {
        base,
        catalogue: withKnownRegions(),
        index: selected.index,
        state,
        layer,
        unit: currentUnit(),
        regions: selected.regions,
        scenarioName: scenario?.name,
      },
      selected.cell,
      centre,
      selected.record,
    );
  }

  let selectToken = 0;
  async function selectCell(cell: number): Promise<void> {
    if (!isCell(grid, cell)) return;
    const token = ++selectToken;
    state.cell = cell;
    writeUrl();
    explorer.setSelected(cellPolygon(grid, cell));
    panel.hidden = false;
    panel.dataset.state = 'loading';
    panel.dataset.cell = String(cell);
    const indexPath = cellsIndexPath();
    const [{ index, record }, regionsHere] = await Promise.all([recordOf(cell, indexPath), loader.forPoint(cellCentre(grid, cell))]);
    if (token !== selectToken) return;
    selected = { cell, record, index, indexPath, regions: regionsHere };
    renderPanel();
    const [lon, lat] = cellCentre(grid, cell);
    status.textContent = `Grid cell ${cell} (${formatLat(lat)}, ${formatLon(lon)}) selected: ${record ? 'its figures are shown below the map' : 'not a land cell, no figures'}.`;
  }

  // Each layer's value per region, fetched when the layer is first shown (map/values/<n>.json).
  // Keyed by the values file: a scenario's layer has its baseline twin's id but values of its own.
  const valueFiles = new Map<string, Promise<Array<number | null>>>();
  let shownValues: { layer: ExplorerLayer; values: Array<number | null> } | undefined;
  function regionValuesOf(l: ExplorerLayer): Promise<Array<number | null>> {
    let p = valueFiles.get(l.values);
    if (!p) {
      p = fetchJson<Array<number | null>>(sitePath(base, l.values));
      valueFiles.set(l.values, p);
    }
    return p;
  }

  // The range shown before the current layer's, for the legend's "the range changed" note.
  let rangeBefore: ShownRange | undefined;
  let rangeNow: ShownRange | undefined;

  function renderAll(): void {
    const unit = currentUnit();
    if (!layer) return;
    const shown = shownCatalogue();
    const legend = shown.legends[layer.legend];
    const d = describeLayer(shown, layer);
    renderLegend(legendBox, legend, `${d.figure}, ${d.period}`, unit, catalogue.invented);
    if (scenario) {
      // The climate shown, under the legend's title: a what-if, never a forecast.
      const climate = document.createElement('p');
      climate.className = 'legend-scenario';
      climate.id = 'map-legend-scenario';
      const tag = document.createElement('strong');
      tag.textContent = 'What-if climate: ';
      climate.append(tag, `${scenario.name} (${scenario.kind}), not a forecast.`);
      legendBox.firstElementChild?.after(climate);
    }
    const note = trendNote(shown, layer);
    if (note) {
      const p = document.createElement('p');
      p.className = 'legend-trend-note';
      p.id = 'map-trend-note';
      p.textContent = note;
      legendBox.append(p);
    }
    const fig = shown.figures.find((f) => f.id === layer!.figure);
    const range = document.createElement('p');
    range.className = 'legend-range';
    range.id = 'map-legend-range';
    range.textContent = legendRangeNote(legend, { figure: layer.figure, period: layer.period, unitWords: layerUnitWords(fig, layer) }, unit, rangeBefore);
    legendBox.append(range);
    if (fig?.source) {
      // The people raster behind a workforce layer: name, year, licence; invented ones say so.
      const src = document.createElement('p');
      src.className = 'legend-source';
      src.id = 'map-legend-source';
      if (fig.sourceInvented) {
        const tag = document.createElement('strong');
        tag.className = 'invented-tag';
        tag.textContent = 'Invented people. ';
        src.append(tag);
      }
      src.append(fig.source);
      legendBox.append(src);
    }
    const sub = document.createElement('p');
    sub.className = 'legend-view';
    sub.textContent = [d.view, d.statistic].filter((x) => x).join(' · ');
    legendBox.append(sub);
    const tif = document.createElement('p');
    tif.className = 'legend-download';
    const a = document.createElement('a');
    a.href = sitePath(base, layer.tif);
    a.textContent = 'This layer as GeoTIFF (for GIS)';
    a.setAttribute('download', '');
    tif.append(a);
    legendBox.append(tif);
    if (regionTable && shownValues?.layer === layer) updateRegionTable(regionTable, shown, layer, unit, shownValues.values);
    map
      .getCanvas()
      .setAttribute(
        'aria-label',
        `Map: ${scenario ? `what-if climate ${scenario.name}, ` : ''}${describeLayerLine(shown, layer)}. Arrow keys move a cell cursor, Enter shows the cell's figures, plus and minus zoom.`,
      );
    renderPanel();
  }

  /** Shows the words of the climate chosen (the record: none) and the switch's value. */
  function showScenarioWords(): void {
    if (scenarioSelect) scenarioSelect.value = scenario?.id ?? '';
    if (!scenarioBox) return;
    scenarioBox.hidden = scenario === null;
    for (const li of scenarioBox.querySelectorAll<HTMLElement>('[data-scenario-about]')) li.hidden = li.dataset.scenarioAbout !== scenario?.id;
  }

  let drawToken = 0;
  async function apply(wish: ViewState): Promise<void> {
    // The climate first: an unknown scenario id (an old link) falls back to the record.
    const wanted = scenarioOption(wish.scenario) ? wish.scenario : undefined;
    const token = ++drawToken;
    const nextScenario = wanted ? await scenarioOf(wanted) : null;
    if (token !== drawToken) return;
    const scenarioChanged = (nextScenario?.id ?? null) !== (scenario?.id ?? null);
    scenario = nextScenario;
    const shown = shownCatalogue();
    const r = resolveView(shown, { ...wish, scenario: wanted });
    state = r.state;
    showScenarioWords();
    syncControls(controls, shown, r.options, state);
    playButton.disabled = r.options.period.filter((p) => p !== 'year').length < 2;
    writeUrl();
    const next = r.layer;
    if (!next) return;
    const changed = next !== layer;
    if (changed) {
      rangeBefore = rangeNow;
      rangeNow = { figure: next.figure, units: next.units, domain: shown.legends[next.legend].domain };
    }
    layer = next;
    renderAll();
    if (!changed && mapBox.dataset.layerId === next.id && !scenarioChanged) return;
    mapBox.dataset.mapState = 'loading';
    // The region table's values come with the layer: the map is idle when both are shown.
    const values = regionTable
      ? regionValuesOf(next).then((v) => {
          if (layer !== next) return;
          shownValues = { layer: next, values: v };
          updateRegionTable(regionTable, shownCatalogue(), next, currentUnit(), v);
        })
      : Promise.resolve();
    // A selected cell shows the figures of the climate shown.
    const panelDone = selected && selected.indexPath !== cellsIndexPath() ? selectCell(selected.cell) : Promise.resolve();
    const [current] = await Promise.all([explorer.showLayer(next), values, panelDone]);
    if (current && token === drawToken) {
      mapBox.dataset.layerId = next.id;
      mapBox.dataset.scenario = scenario?.id ?? 'baseline';
      mapBox.dataset.mapState = 'idle';
    }
  }

  // Controls.
  controls.figure.addEventListener('change', () => void apply({ ...state, figure: controls.figure.value }));
  for (const key of CHOICE_KEYS) {
    controls.selects[key].addEventListener('change', () => void apply({ ...state, [key]: controls.selects[key].value }));
  }
  scenarioSelect?.addEventListener('change', () => void apply({ ...state, scenario: scenarioSelect.value === '' ? undefined : scenarioSelect.value }));
  form.addEventListener('submit', (ev) => ev.preventDefault());
  outlines.addEventListener('change', () => explorer.setOutlines(outlines.checked));

  // The month player: steps through the months of the shown view, one per PLAY_STEP_MS once drawn.
  let playing = false;
  const setPlaying = (on: boolean) => {
    playing = on;
    playButton.setAttribute('aria-pressed', String(on));
    playButton.textContent = on ? 'Pause' : 'Play the months';
  };
  playButton.addEventListener('click', async () => {
    if (playing) return setPlaying(false);
    setPlaying(true);
    while (playing) {
      const months = resolveView(shownCatalogue(), state).options.period.filter((p) => p !== 'year');
      if (months.length < 2) break;
      const i = months.indexOf(state.period);
      await apply({ ...state, period: months[(i + 1) % months.length] });
      await explorer.drawn();
      await new Promise((r) => setTimeout(r, PLAY_STEP_MS));
    }
    setPlaying(false);
  });

  // The outlines and names of the regions in view, unless the view holds more than the map draws.
  const regionsNote = must<HTMLElement>(root, '#map-regions-note');
  let viewToken = 0;
  async function drawRegions(): Promise<void> {
    const token = ++viewToken;
    const b = map.getBounds();
    const r = await loader.inView([b.getWest(), b.getSouth(), b.getEast(), b.getNorth()]);
    if (token !== viewToken) return;
    explorer.showRegions(r.pieces ?? []);
    mapBox.dataset.regionsDrawn = String(r.pieces ? r.pieces.reduce((sum, p) => sum + p.regions.length, 0) : 0);
    regionsNote.textContent = r.pieces
      ? ''
      : `About ${r.count.toLocaleString('en')} regions lie in this view, more than the map outlines at once: zoom in to see their outlines and names, or find one by name above.`;
  }

  // Camera in the URL.
  map.on('moveend', () => {
    const c = map.getCenter();
    state.centre = [c.lng, c.lat];
    state.zoom = map.getZoom();
    writeUrl();
    void drawRegions();
  });

  // Pointer and keyboard selection.
  const announce = (text: string) => (status.textContent = text);
  const showCursor = (cell: number) => {
    cursor = cell;
    explorer.setCursor(cellPolygon(grid, cell));
    const [lon, lat] = cellCentre(grid, cell);
    if (!map.getBounds().contains([lon, lat])) map.panTo([lon, lat]);
    announce(`Cursor on grid cell ${cell} (${formatLat(lat)}, ${formatLon(lon)}). Press Enter for its figures.`);
  };
  map.on('click', (ev) => {
    const hit = cellAt(grid, ev.lngLat.lng, ev.lngLat.lat);
    if (!hit) return announce('That point is outside the atlas grid.');
    cursor = hit.id;
    explorer.setCursor(null);
    void selectCell(hit.id);
  });
  const canvas = map.getCanvas();
  canvas.setAttribute('tabindex', '0');
  canvas.setAttribute('aria-describedby', 'map-keys');
  canvas.addEventListener('keydown', (ev) => {
    const steps: Record<string, [number, number]> = { ArrowLeft: [-1, 0], ArrowRight: [1, 0], ArrowUp: [0, 1], ArrowDown: [0, -1] };
    if (ev.key in steps) {
      ev.preventDefault();
      const start = cursor ?? state.cell ?? cellAt(grid, map.getCenter().lng, map.getCenter().lat)?.id ?? Math.floor((grid.nLat * grid.nLon) / 2);
      const [dx, dy] = steps[ev.key];
      showCursor(cursor === undefined ? start : moveCell(grid, start, dx, dy));
    } else if ((ev.key === 'Enter' || ev.key === ' ') && cursor !== undefined) {
      ev.preventDefault();
      void selectCell(cursor);
    } else if (ev.key === '+' || ev.key === '=') {
      ev.preventDefault();
      map.zoomIn();
    } else if (ev.key === '-') {
      ev.preventDefault();
      map.zoomOut();
    } else if (ev.key === 'Escape') {
      cursor = undefined;
      explorer.setCursor(null);
    }
  });

  // The cell picker form: a latitude and longitude.
  picker.addEventListener('submit', (ev) => {
    ev.preventDefault();
    const lat = Number(must<HTMLInputElement>(picker, '[name="lat"]').value);
    const lon = Number(must<HTMLInputElement>(picker, '[name="lon"]').value);
    const hit = cellAt(grid, lon, lat);
    if (!hit) return announce('That point is outside the atlas grid.');
    cursor = hit.id;
    explorer.setCursor(null);
    map.panTo(cellCentre(grid, hit.id));
    void selectCell(hit.id);
  });

  // The search box: a region by name, or a place by latitude and longitude.
  const search = must<HTMLFormElement>(root, '#map-search');
  const searchResult = must<HTMLElement>(search, '#map-search-result');
  search.hidden = false;
  search.addEventListener('submit', async (ev) => {
    ev.preventDefault();
    search.dataset.result = 'loading';
    const r = await loader.search(must<HTMLInputElement>(search, '[name="q"]').value);
    // data-result says the search is done: set last, after the map, the address and the words.
    if (r.kind === 'none') {
      searchResult.textContent = r.message;
      search.dataset.result = r.kind;
      return;
    }
    if (r.kind === 'region') {
      state.region = r.id;
      explorer.setFocusRegion(r.id);
      map.fitBounds((await regionBox(r.id))!, { padding: 30, maxZoom: 8, duration: 0 });
      writeUrl();
      searchResult.textContent = `${r.name}: shown and outlined on the map.`;
      search.dataset.result = r.kind;
      return;
    }
    search.dataset.result = r.kind;
    const hit = cellAt(grid, r.lon, r.lat);
    if (!hit) {
      searchResult.textContent = `${formatLat(r.lat)}, ${formatLon(r.lon)} is outside the atlas grid.`;
      return;
    }
    cursor = hit.id;
    explorer.setCursor(null);
    map.panTo(cellCentre(grid, hit.id), { duration: 0 });
    void selectCell(hit.id);
    searchResult.textContent = `${formatLat(r.lat)}, ${formatLon(r.lon)}: grid cell ${hit.id}, its figures are below the map.`;
  });

  // "Show on the map" links of the region table fit the region without leaving the page.
  for (const link of document.querySelectorAll<HTMLAnchorElement>('a[data-fit-region]')) {
    link.addEventListener('click', async (ev) => {
      const id = link.dataset.fitRegion;
      ev.preventDefault();
      const box = await regionBox(id);
      if (!box) {
        location.href = link.href;
        return;
      }
      state.region = id;
      explorer.setFocusRegion(id);
      map.fitBounds(box, { padding: 30, maxZoom: 8, duration: 0 });
      mapBox.scrollIntoView({ block: 'nearest' });
      writeUrl();
    });
  }

  document.addEventListener(UNIT_EVENT, () => renderAll());
  await explorer.pending;
  await drawRegions();
  await apply(state);
  if (state.cell !== undefined) void selectCell(state.cell);
}

const root = document.getElementById('map-explorer');
if (root) {
  start(root).catch((err: unknown) => {
    const box = root.querySelector<HTMLElement>('#explorer-map');
    if (box) box.dataset.mapState = 'error';
    const status = root.querySelector<HTMLElement>('#map-status');
    if (status) status.textContent = `The map could not be drawn: ${(err as Error).message}`;
    console.error('map explorer:', err);
  });
}
