/**
 * The files a region report offers for download: the region's own table, summary and histogram
 * tile, and the annual GeoTIFF layers of the atlas (each covers the whole grid, the region
 * included), with sizes and units from the manifest's list of published files. Pure.
 */
import type { AtlasManifest } from '../../data/atlas-manifest.ts';
import { formatUnits } from '../format.ts';

export interface DownloadItem {
  /** Path below the site's base, e.g. `data/regions/x.csv`. */
  path: string;
  /** What the file holds, in words. */
  what: string;
  /** Format name. */
  format: string;
  /** Units of the values, in words. */
  units: string;
  /** [bytes]; NaN when the manifest does not list the file. */
  bytes: number;
}

export interface LayerDownload extends DownloadItem {
  figure: string;
  combo: string;
  statistic: string;
  /** Whether the layer belongs to the report's default workload class (or to no class). */
  primary: boolean;
}

const sizes = new WeakMap<AtlasManifest, Map<string, number>>();

/** Bytes of each published file, indexed once per manifest (every report page asks). */
function sizeOf(manifest: AtlasManifest): (path: string) => number {
  let bytes = sizes.get(manifest);
  if (!bytes) {
    bytes = new Map(manifest.artefacts.map((a) => [a.path, a.bytes]));
    sizes.set(manifest, bytes);
  }
  const b = bytes;
  return (path) => b.get(path) ?? NaN;
}

/** The region's own files. */
export function regionFiles(manifest: AtlasManifest, regionId: string): DownloadItem[] {
  const size = sizeOf(manifest);
  return [
    {
      path: `data/regions/${regionId}.csv`,
      what: 'Monthly and annual table of this region: every figure, workload class, acclimatization, exposure and statistic (one row each)',
      format: 'CSV',
      units: 'in the unit column: h (hours per worker) or degC (°C)',
      bytes: size(`data/regions/${regionId}.csv`),
    },
    {
      path: `data/regions/${regionId}.json`,
      what: 'Summary of this region: grid cells covered, area, mean annual temperature against the human climate niche',
      format: 'JSON',
      units: 'km², °C',
      bytes: size(`data/regions/${regionId}.json`),
    },
    {
      path: `data/calculator/${regionId}.bin`,
      what: 'Hours of WBGT per 0.25 °C bin, per year, month, local hour and exposure (the calculator reads it; format in data/calculator/index.json)',
      format: 'binary',
      units: 'h (× 100, unsigned 16-bit)',
      bytes: size(`data/calculator/${regionId}.bin`),
    },
  ];
}

const FIGURE_ORDER = ['hours-lost-shift', 'hours-above-limit-shift', 'capacity-loss-shift', 'wbgt-mean', 'mean-annual-temperature', 'niche-class'];

/**
 * The annual GeoTIFF layers (period `year`), ordered by figure (hours lost first), then as the
 * manifest lists them. `primary` marks those of `defaultClass` and the climate layers (not the
 * capacity-loss view, which is a second, population-level view).
 */
export function annualLayerDownloads(manifest: AtlasManifest, defaultClass: string): LayerDownload[] {
  const size = sizeOf(manifest);
  const label = new Map(manifest.figures.map((f) => [f.id, f.label]));
  const classIds = new Set(manifest.work.classes.map((c) => c.id));
  const rank = (f: string) => {
    const i = FIGURE_ORDER.indexOf(f);
    return i < 0 ? FIGURE_ORDER.length : i;
  };
  return manifest.layers
    .filter((l) => l.period === 'year')
    .map((l, order) => ({ l, order }))
    .sort((a, b) => rank(a.l.figure) - rank(b.l.figure) || a.order - b.order)
    .map(({ l }) => {
      const cls = l.combo.split('.')[0];
      const byClass = classIds.has(cls);
      return {
        path: l.tif,
        what:
          label.get(l.figure) ??
          (l.figure === 'mean-annual-temperature'
            ? 'Mean annual temperature'
            : l.figure === 'niche-class'
              ? 'Mean annual temperature against the human climate niche (class codes)'
              : l.figure),
        format: 'GeoTIFF',
        units: l.units === '1' ? 'class code' : l.units === 'h' ? 'h per worker per year' : formatUnits(l.units),
        bytes: size(l.tif),
        figure: l.figure,
        combo: l.combo,
        statistic: l.statistic,
        primary: byClass ? cls === defaultClass : l.figure !== 'capacity-loss-shift',
      };
    });
}
