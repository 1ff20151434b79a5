/**
 * The map explorer's view as a URL query, so a view can be shared and a loaded URL restores it:
 * `layer` (figure id), `month` (`01`–`12` or `year`), `class`, `accl`, `exposure`, `loss`,
 * `stat`, `lon`/`lat` [° E, ° N] and `zoom` of the map's centre, `cell` (global grid index),
 * `region` (fit that region when no centre is given) and `scenario` (a what-if climate's id;
 * absent: the record). Other parameters (e.g. `units`) are kept.
 * Pure: strings in, strings out.
 */
import type { ExplorerCatalogue, LayerView } from './catalogue.ts';

export interface ViewState extends LayerView {
  figure: string;
  statistic: string;
  period: string;
  /** Map centre [° E, ° N] and zoom; absent: fit the region or the grid. */
  centre?: [number, number];
  zoom?: number;
  /** Selected cell (global grid index y · nLon + x). */
  cell?: number;
  /** Region to fit when no centre is given. */
  region?: string;
  /** The what-if climate shown (a scenario id); absent: the record. */
  scenario?: string;
}

/** Query parameter of each part of the view. */
export const VIEW_PARAMS = {
  figure: 'layer',
  period: 'month',
  workloadClass: 'class',
  acclimatization: 'accl',
  exposure: 'exposure',
  loss: 'loss',
  statistic: 'stat',
  lon: 'lon',
  lat: 'lat',
  zoom: 'zoom',
  cell: 'cell',
  region: 'region',
  scenario: 'scenario',
} as const;

const finite = (s: string | null): number | undefined => {
  if (s === null || s.trim() === '') return undefined;
  const v = Number(s);
  return Number.isFinite(v) ? v : undefined;
};

/** The view a query asks for, on top of the catalogue's defaults (not yet checked against the layers). */
export function parseViewState(search: string, catalogue: ExplorerCatalogue): ViewState {
  const q = new URLSearchParams(search);
  const d = catalogue.defaults;
  const text = (k: string) => q.get(k) ?? undefined;
  const state: ViewState = {
    figure: text(VIEW_PARAMS.figure) ?? d.figure,
    period: text(VIEW_PARAMS.period) ?? d.period,
    statistic: text(VIEW_PARAMS.statistic) ?? d.statistic,
    workloadClass: text(VIEW_PARAMS.workloadClass) ?? d.view.workloadClass,
    acclimatization: text(VIEW_PARAMS.acclimatization) ?? d.view.acclimatization,
    exposure: text(VIEW_PARAMS.exposure) ?? d.view.exposure,
    loss: text(VIEW_PARAMS.loss) ?? d.view.loss,
  };
  const lon = finite(q.get(VIEW_PARAMS.lon));
  const lat = finite(q.get(VIEW_PARAMS.lat));
  const zoom = finite(q.get(VIEW_PARAMS.zoom));
  if (lon !== undefined && lat !== undefined && Math.abs(lat) <= 85.06 && zoom !== undefined && zoom >= 0 && zoom <= 24) {
    state.centre = [lon, lat];
    state.zoom = zoom;
  }
  const cell = finite(q.get(VIEW_PARAMS.cell));
  if (cell !== undefined && Number.isInteger(cell) && cell >= 0) state.cell = cell;
  const region = q.get(VIEW_PARAMS.region);
  if (region && catalogue.regions.some((r) => r.id === region)) state.region = region;
  const scenario = q.get(VIEW_PARAMS.scenario);
  if (scenario && /^[a-z0-9][a-z0-9-]*$/.test(scenario)) state.scenario = scenario;
  return state;
}

/** `search` with the view's parameters set (and those it lacks removed); others kept. Starts with `?` unless empty. */
export function viewQuery(state: ViewState, search = ''): string {
  const q = new URLSearchParams(search);
  const set = (k: string, v: string | undefined) => (v === undefined ? q.delete(k) : q.set(k, v));
  set(VIEW_PARAMS.figure, state.figure);
  set(VIEW_PARAMS.period, state.period);
  set(VIEW_PARAMS.workloadClass, state.workloadClass);
  set(VIEW_PARAMS.acclimatization, state.acclimatization);
  set(VIEW_PARAMS.exposure, state.exposure);
  set(VIEW_PARAMS.loss, state.loss);
  set(VIEW_PARAMS.statistic, state.statistic);
  set(VIEW_PARAMS.lon, state.centre ? state.centre[0].toFixed(4) : undefined);
  set(VIEW_PARAMS.lat, state.centre ? state.centre[1].toFixed(4) : undefined);
  set(VIEW_PARAMS.zoom, state.zoom !== undefined ? state.zoom.toFixed(2) : undefined);
  set(VIEW_PARAMS.cell, state.cell !== undefined ? String(state.cell) : undefined);
  set(VIEW_PARAMS.region, state.region);
  set(VIEW_PARAMS.scenario, state.scenario);
  const s = q.toString();
  return s === '' ? '' : `?${s}`;
}
