/**
 * What the map explorer (`/map/`) knows about the published layers: the catalogue the page's
 * build-time endpoint `/map/explorer.json` writes (src/lib/explorer-catalogue.ts makes it from
 * data/manifest.json, the region tables and the region summaries) and the browser reads. Plain
 * JSON types with type-only imports, so both sides share them.
 */
import type { LegendSpec } from '../../../../pipeline/publish/layers/legend.ts';

/** The legend of a layer, as the manifest carries it: the pipeline's own type (a type-only import, nothing is bundled). */
export type ExplorerLegend = LegendSpec;

/** The choices that pick one layer of a figure; a choice a figure does not have is absent. */
export interface LayerView {
  /** Workload class id (hours figures). */
  workloadClass?: string;
  acclimatization?: string;
  /** `sun` or `shade` (hours figures, capacity loss, mean WBGT). */
  exposure?: string;
  /** Loss function id (capacity loss), e.g. `kjellstrom-300w`. */
  loss?: string;
}

/** One image MapLibre draws: a PNG in Web Mercator rows and its four corners [° E, ° N]. */
export interface ExplorerImage {
  /** Path below the site's base, e.g. `data/layers/…/mean-07.png`. */
  path: string;
  /** Top-left, top-right, bottom-right, bottom-left. */
  coordinates: [[number, number], [number, number], [number, number], [number, number]];
}

export interface ExplorerLayer {
  /** The manifest's layer id, e.g. `hours-lost-shift/moderate.acclimatized.sun/mean-07`. */
  id: string;
  figure: string;
  view: LayerView;
  /** `mean`, `p90`, `trend` (Theil–Sen slope per decade over the years built, whole year only), `trend-p` (its Mann–Kendall p-value), `baseline` (mean annual temperature) or `class` (niche class). */
  statistic: string;
  /** `01`–`12` or `year`. */
  period: string;
  units: string;
  images: ExplorerImage[];
  /** Index into {@link ExplorerCatalogue.legends}. */
  legend: number;
  /** Path of the GeoTIFF below the site's base (for download). */
  tif: string;
  /**
   * Path below the site's base of the layer's value per region (`map/values/<n>.json`: a JSON
   * array in the order of {@link ExplorerCatalogue.regions}, null where a region has none),
   * fetched when the layer is shown, so the catalogue does not grow with layers × regions.
   */
  values: string;
}

export interface ExplorerFigure {
  id: string;
  /** Our short name for the layer menu, e.g. "Hours lost to rest breaks". */
  label: string;
  /** The pipeline's description, e.g. "Shift hours lost to the rest breaks the limit requires, per worker". */
  description: string;
  units: string;
  /** The unit in words for a month's and for the year's value, e.g. "hours per worker per month" (pipeline/publish/data-dictionary.ts). */
  unitWords: { month: string; year: string };
  /** The data behind the figure beyond the weather, shown under its legend: the people raster's name, year, licence (workforce figures). */
  source?: string;
  /** Whether those data are invented. */
  sourceInvented?: boolean;
}

export interface ExplorerChoice {
  id: string;
  label: string;
}

export interface ExplorerRegion {
  id: string;
  name: string;
  /** [west, south, east, north] of the region's outline [° E, ° N]. */
  bbox: [number, number, number, number];
  /** Where its name is written on the map, inside the outline [° E, ° N] (src/lib/label-point.ts). */
  label: [number, number];
}

export interface ExplorerCatalogue {
  version: 1;
  /** False when the data folder has no manifest (no layers published): the page shows a note only. */
  available: boolean;
  invented: boolean;
  baseline: [number, number];
  /** Years in the baseline [years]; a P90 of fewer than 10 is labelled so (pipeline/publish/baseline-length.ts). */
  baselineYears: number;
  /** The short-baseline warning, or null (pipeline/publish/baseline-length.ts). */
  baselineWarning: string | null;
  /** First and last year built [year]: the years a trend is taken over. */
  years: [number, number];
  /** Fewest years built a trend is shown for [years] (pipeline/climate/trend.ts `MIN_TREND_YEARS`). */
  minTrendYears: number;
  latestYear: number;
  figures: ExplorerFigure[];
  /** Options of each choice, in menu order, with our labels. */
  choices: {
    workloadClass: ExplorerChoice[];
    acclimatization: ExplorerChoice[];
    exposure: ExplorerChoice[];
    loss: ExplorerChoice[];
    statistic: ExplorerChoice[];
    period: ExplorerChoice[];
  };
  legends: ExplorerLegend[];
  layers: ExplorerLayer[];
  regions: ExplorerRegion[];
  /** The view shown when the URL asks for nothing. */
  defaults: { figure: string; view: LayerView; statistic: string; period: string };
}

/**
 * The catalogue as `/map/explorer.json` publishes it: the regions are left out and an index of
 * their pieces (region-index.ts) stands in their place, so the file does not grow with them.
 */
export type PublishedCatalogue = Omit<ExplorerCatalogue, 'regions'> & { regionIndex: RegionIndex };

/** The index of the region pieces (region-index.ts makes them). */
export interface RegionIndex {
  /** Regions in the atlas. */
  count: number;
  maxDrawn: number;
  byName: Array<{ path: string; from: string }>;
  byId: Array<{ path: string; from: string }>;
  /** `bbox`: [west, south, east, north] of the piece's regions' boxes [° E, ° N]. */
  areas: Array<{ path: string; bbox: [number, number, number, number]; count: number }>;
}

/** One what-if climate in words, as the map page writes it at build time for its switch (src/lib/explorer-scenarios.ts). */
export interface ExplorerScenarioWords {
  id: string;
  name: string;
  /** `uniform warming` or `change factors` (manifest `scenarios[].words.kind`). */
  kind: string;
  /** What it changes, in one sentence. */
  what: string;
  /** Where its changes come from. */
  source: string;
  /** Path below the site's base of its layers file (`map/scenarios/<id>.json`, an {@link ExplorerScenario}), fetched when chosen. */
  layersFile: string;
  /** Path below the site's base of its per-cell figures' index (`data/scenarios/<id>/cells/index.json`). */
  cellsIndex: string;
}

/**
 * One what-if climate as the map switches to it: its layers, each under the id and view of the
 * baseline layer of the same figure, combination, statistic and period (so a switch keeps the
 * view), with its own images, GeoTIFF, legend (index into `legends`) and values file
 * (`map/scenarios/<id>/values/<n>.json`, n the baseline twin's index in the catalogue).
 */
export interface ExplorerScenario extends ExplorerScenarioWords {
  layers: ExplorerLayer[];
  legends: ExplorerLegend[];
}
