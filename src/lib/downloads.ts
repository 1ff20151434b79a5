/**
 * The downloads page's grouping of the manifest: tables, map layers by figure and combination
 * (each with its GeoTIFF and PNG), every other file, and each scenario's files (its layers grouped
 * the same way, its other files in one list), so that every artefact of the manifest is listed
 * exactly once. Pure: manifest in, groups out.
 */
import type { SiteManifest, ManifestArtefact, ManifestLayer } from '../data/manifest.ts';
import { comboLabel, periodOrder } from './layer-labels.ts';

/** One layer's two files. */
export interface LayerDownload {
  layer: ManifestLayer;
  tif: ManifestArtefact;
  png: ManifestArtefact;
}

/** The layers of one figure × combination, by period (rows) and statistic (columns). */
export interface ComboGroup {
  combo: string;
  label: string;
  statistics: string[];
  periods: string[];
  /** `${period}|${statistic}` → the layer. */
  cells: Map<string, LayerDownload>;
  bytes: number;
}

export interface FigureGroup {
  id: string;
  label: string;
  units: string;
  combos: ComboGroup[];
  layerCount: number;
  bytes: number;
}

/** One scenario's files (everything under its `data/scenarios/<id>/`), folded on the page as one group. */
export interface ScenarioDownloads {
  id: string;
  name: string;
  /** The scenario in words (manifest `scenarios[].words`): its kind, what it changes, its source. */
  kind: string;
  what: string;
  source: string;
  /** Its layers, grouped by figure and combination like the baseline's. */
  figures: FigureGroup[];
  /** Its other files (tables, indexes, tiles), in manifest order. */
  files: ManifestArtefact[];
  layerCount: number;
  /** Size of all its files [bytes]. */
  bytes: number;
}

export interface DownloadGroups {
  tables: ManifestArtefact[];
  figures: FigureGroup[];
  /** Every artefact that is neither a table nor a layer's GeoTIFF or PNG, nor a scenario's file. */
  others: ManifestArtefact[];
  /** One group per scenario of the manifest, in its order (empty without scenarios). */
  scenarios: ScenarioDownloads[];
  totalBytes: number;
}

const STAT_ORDER = ['mean', 'median', 'p90', 'trend', 'trend-p', 'baseline', 'class'];
const byStat = (a: string, b: string) =>
  STAT_ORDER.indexOf(a) + 99 * Number(!STAT_ORDER.includes(a)) - (STAT_ORDER.indexOf(b) + 99 * Number(!STAT_ORDER.includes(b))) || a.localeCompare(b);

/** The layers `layers` grouped by figure and combination; their files are marked in `used`. */
function figureGroups(m: SiteManifest, layers: readonly ManifestLayer[], byPath: ReadonlyMap<string, ManifestArtefact>, used: Set<string>): FigureGroup[] {
  const figureLabels = new Map(m.figures.map((f) => [f.id, f]));
  const comboOrder = new Map(m.figures.map((f) => [f.id, f.combos]));
  const figures = new Map<string, FigureGroup>();
  for (const layer of layers) {
    const tif = byPath.get(layer.tif);
    const png = byPath.get(layer.png);
    if (!tif || !png) continue; // the manifest schema refuses this for the baseline; kept for the types
    used.add(tif.path);
    used.add(png.path);
    let fig = figures.get(layer.figure);
    if (!fig) {
      const def = figureLabels.get(layer.figure);
      fig = {
        id: layer.figure,
        label: def?.label ?? layer.legend.title ?? layer.figure,
        units: def?.units ?? layer.units,
        combos: [],
        layerCount: 0,
        bytes: 0,
      };
      figures.set(layer.figure, fig);
    }
    let combo = fig.combos.find((c) => c.combo === layer.combo);
    if (!combo) {
      combo = { combo: layer.combo, label: comboLabel(layer.combo, m.work.classes), statistics: [], periods: [], cells: new Map(), bytes: 0 };
      fig.combos.push(combo);
    }
    if (!combo.statistics.includes(layer.statistic)) combo.statistics.push(layer.statistic);
    if (!combo.periods.includes(layer.period)) combo.periods.push(layer.period);
    combo.cells.set(`${layer.period}|${layer.statistic}`, { layer, tif, png });
    combo.bytes += tif.bytes + png.bytes;
    fig.layerCount += 1;
    fig.bytes += tif.bytes + png.bytes;
  }
  for (const fig of figures.values()) {
    const order = comboOrder.get(fig.id) ?? [];
    fig.combos.sort((a, b) => (order.indexOf(a.combo) + 1 || 1e9) - (order.indexOf(b.combo) + 1 || 1e9) || a.combo.localeCompare(b.combo));
    for (const c of fig.combos) {
      c.statistics.sort(byStat);
      c.periods.sort((a, b) => periodOrder(a) - periodOrder(b));
    }
  }
  const figOrder = m.figures.map((f) => f.id);
  return [...figures.values()].sort((a, b) => (figOrder.indexOf(a.id) + 1 || 1e9) - (figOrder.indexOf(b.id) + 1 || 1e9) || a.id.localeCompare(b.id));
}

/** Groups the manifest for the downloads page (see the file comment). */
export function downloadGroups(m: SiteManifest): DownloadGroups {
  const byPath = new Map(m.artefacts.map((a) => [a.path, a]));
  const used = new Set<string>();
  // Each scenario's files first: its layers like the baseline's, the rest of its folder as one list.
  const scenarios: ScenarioDownloads[] = (m.scenarios ?? []).map((sc) => {
    const figures = figureGroups(m, sc.layers, byPath, used);
    const prefix = sc.dataPath.endsWith('/') ? sc.dataPath : `${sc.dataPath}/`;
    const files = m.artefacts.filter((a) => a.path.startsWith(prefix) && !used.has(a.path));
    for (const f of files) used.add(f.path);
    const layerBytes = figures.reduce((n, f) => n + f.bytes, 0);
    return {
      id: sc.id,
      name: sc.name,
      kind: sc.words.kind,
      what: sc.words.what,
      source: sc.words.source,
      figures,
      files,
      layerCount: figures.reduce((n, f) => n + f.layerCount, 0),
      bytes: layerBytes + files.reduce((n, a) => n + a.bytes, 0),
    };
  });
  const figureList = figureGroups(m, m.layers, byPath, used);
  const tables = m.artefacts.filter((a) => a.kind === 'table' && !used.has(a.path));
  for (const t of tables) used.add(t.path);
  const others = m.artefacts.filter((a) => !used.has(a.path));
  return { tables, figures: figureList, others, scenarios, totalBytes: m.artefacts.reduce((s, a) => s + a.bytes, 0) };
}

/** The region id of a per-region file (`data/regions/<id>.csv`, `data/calculator/<id>.bin`), or undefined. */
export function regionOfPath(path: string): string | undefined {
  const m = path.match(/^data\/(?:regions|calculator)\/([a-z0-9-]+)\.(csv|json|bin)$/);
  return m ? m[1] : undefined;
}

/** A fold of the "other data files": files of one purpose, with their count and total size. */
export interface FileGroup {
  id: 'site' | 'region-summaries' | 'region-tiles' | 'cell-tiles' | 'cell-figures';
  title: string;
  /** What the files are for, one sentence. */
  about: string;
  files: ManifestArtefact[];
  bytes: number;
  /** Few files a reader looks for: shown open. */
  open: boolean;
}

const FILE_GROUPS: ReadonlyArray<Omit<FileGroup, 'files' | 'bytes'> & { test: (path: string) => boolean }> = [
  {
    id: 'site',
    title: 'Atlas files',
    about: 'The dataset inventory, the region outlines, what changed since the previous build, and the niche class of each cell.',
    open: true,
    test: (p) => /^data\/[^/]+$/.test(p),
  },
  {
    id: 'region-summaries',
    title: 'Region summaries',
    about: 'Per region: grid cells covered, area, mean annual temperature against the human climate niche (JSON).',
    open: false,
    test: (p) => /^data\/regions\/[^/]+\.json$/.test(p),
  },
  {
    id: 'region-tiles',
    title: 'Calculator tiles per region',
    about: 'Hours of WBGT per bin, year, month, local hour and exposure for each region; the calculator reads them (format in calculator/index.json).',
    open: false,
    test: (p) => /^data\/calculator\/[^/]+$/.test(p),
  },
  {
    id: 'cell-tiles',
    title: 'Calculator tiles per grid cell',
    about: 'The same histograms for every land cell, in chunks of consecutive cells; the calculator reads them for a point.',
    open: false,
    test: (p) => p.startsWith('data/calculator/cells/'),
  },
  {
    id: 'cell-figures',
    title: 'Per-cell figures for the map',
    about: 'The numbers of the cell tables and more, in small tiles that the map page reads for a clicked cell.',
    open: false,
    test: (p) => p.startsWith('data/cells/'),
  },
];

/**
 * The "other data files" of {@link downloadGroups} in folds by purpose (the map's and the
 * calculator's tiles are most of the files, and few readers want them one by one). Every file is
 * in exactly one group: a path no rule knows goes to the first group, the atlas files.
 */
export function otherFileGroups(others: readonly ManifestArtefact[]): FileGroup[] {
  const groups: FileGroup[] = FILE_GROUPS.map(({ test: _test, ...g }) => ({ ...g, files: [], bytes: 0 }));
  for (const a of others) {
    const i = FILE_GROUPS.findIndex((g) => g.test(a.path));
    const g = groups[i < 0 ? 0 : i];
    g.files.push(a);
    g.bytes += a.bytes;
  }
  return groups.filter((g) => g.files.length > 0);
}
