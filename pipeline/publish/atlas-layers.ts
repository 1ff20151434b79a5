/**
 * Which gridded figures become map layers (PNG for the map, GeoTIFF for GIS) and where they go:
 * `data/layers/<figure>/<combo>/<statistic>-<period>.{png,tif}`. Months of one figure ×
 * combination × statistic share one colour domain, so the map compares months honestly. Each
 * layer's grid is put together from the merge tiles' pieces (`field`), one layer in memory at a
 * time; the domains come from the tiles' per-field minima and maxima.
 */
import { join } from 'node:path';
import { figureStyle, nicheClassStyle, niceDomain, writeLayerFiles, type FigureKind, type LayerFiles, type LegendSpec } from './layers/index.ts';
import { PERIODS, type FigureDef } from '../reduce/figures.ts';
import { periodLabel, trendUnit } from './region-table.ts';
import type { Grid } from '../model/grid.ts';
import { MAPPED, NICHE_FIGURE, TRENDED, type GridField } from './grid-fields.ts';
import { MIN_TREND_YEARS } from '../climate/trend.ts';

/** A published layer, as the manifest lists it. */
export interface LayerEntry {
  id: string;
  figure: string;
  combo: string;
  statistic: 'mean' | 'p90' | 'baseline' | 'class' | 'trend' | 'trend-p';
  period: string;
  units: string;
  png: string;
  tif: string;
  pngSha256: string;
  tifSha256: string;
  coordinates: LayerFiles['coordinates'];
  mapImages: LayerFiles['mapImages'];
  legend: LegendSpec;
}

const KIND: Record<string, FigureKind> = {
  'hours-above-limit-shift': 'hoursAboveLimit',
  'hours-lost-shift': 'hoursLost',
  'capacity-loss-shift': 'capacityLoss',
  'wbgt-mean': 'meanWbgt',
  'person-hours-lost-density': 'personHoursDensity',
};

/** Smallest and largest finite value of each field over the grid (NaN, NaN when none) [unit of the field]. */
export interface FieldRange {
  min: Float64Array;
  max: Float64Array;
}

/** An empty range for `n` fields. */
export function emptyFieldRange(n: number): FieldRange {
  return { min: new Float64Array(n).fill(NaN), max: new Float64Array(n).fill(NaN) };
}

/** Folds range `b` (one tile's) into `a`. */
export function addFieldRange(a: FieldRange, b: FieldRange): void {
  for (let f = 0; f < a.min.length; f++) {
    if (!(b.min[f] >= a.min[f])) a.min[f] = Number.isNaN(b.min[f]) ? a.min[f] : b.min[f];
    if (!(b.max[f] <= a.max[f])) a.max[f] = Number.isNaN(b.max[f]) ? a.max[f] : b.max[f];
  }
}

/** Layers to draw, for the progress bar [–]. */
export function countLayers(fields: readonly GridField[]): number {
  return fields.filter((f) => f.layer).length;
}

/**
 * Draws every layer in the order the manifest lists them (figures in definition order, then
 * combination, statistic, period; the niche last).
 * @param field the whole grid of field `index` as a labelled grid (dims lat, lon; its coordinates and units), NaN = no data
 */
export async function writeAtlasLayers(
  dataDir: string,
  defs: readonly FigureDef[],
  fields: readonly GridField[],
  range: FieldRange,
  field: (index: number) => Grid<Float32Array>,
  onLayer: () => void = () => {},
): Promise<LayerEntry[]> {
  const entries: LayerEntry[] = [];
  const g = (f: Grid<Float32Array>) => ({ lat: f.coords.lat, lon: f.coords.lon, values: f.data });
  const find = (figure: string, comboIndex: number, statistic: string, period: number) =>
    fields.find((f) => f.figure === figure && f.comboIndex === comboIndex && f.statistic === statistic && f.period === period && f.layer)!;
  for (const def of defs) {
    const stats = MAPPED[def.id];
    if (!stats) continue;
    for (let k = 0; k < def.combos.length; k++) {
      for (const stat of stats) {
        const months = Array.from({ length: PERIODS - 1 }, (_, p) => find(def.id, k, stat, p));
        const year = find(def.id, k, stat, PERIODS - 1);
        const fromZero = def.units === 'h' || def.units.startsWith('person-h');
        const monthDomain = safeDomain(
          months.map((f) => f.index),
          range,
          fromZero,
        );
        const yearDomain = safeDomain([year.index], range, fromZero);
        for (let p = 0; p < PERIODS; p++) {
          const f = p < PERIODS - 1 ? months[p] : year;
          const domain = p < PERIODS - 1 ? monthDomain : yearDomain;
          const period = periodLabel(p);
          const dir = join(dataDir, 'layers', def.id, def.combos[k]);
          const name = `${stat}-${period}`;
          const style = figureStyle(KIND[def.id], domain, def.units, { title: `${def.label} (${stat === 'p90' ? '90th-percentile year' : 'baseline mean'})` });
          const files = await writeLayerFiles(dir, name, g(field(f.index)), style, {
            description: `${def.label}, ${def.combos[k]}, ${stat}, period ${period}`,
            noData: -9999,
          });
          entries.push(
            entry(`${def.id}/${def.combos[k]}/${name}`, def.id, def.combos[k], stat, period, def.units, `layers/${def.id}/${def.combos[k]}/`, files),
          );
          onLayer();
        }
      }
    }
  }
  // The trend of the annual value per decade (diverging colours around no change); empty below the minimum years.
  for (const def of defs) {
    if (!(TRENDED as readonly string[]).includes(def.id)) continue;
    for (let k = 0; k < def.combos.length; k++) {
      const f = find(def.id, k, 'trend', PERIODS - 1);
      const m = Math.max(Math.abs(range.min[f.index]), Math.abs(range.max[f.index]));
      const domain = Number.isFinite(m) && m > 0 ? symmetricDomain(m) : ([-1, 1] as [number, number]);
      const dir = join(dataDir, 'layers', def.id, def.combos[k]);
      const style = figureStyle('change', domain, trendUnit(def.units), {
        title: `${def.label}: trend per decade over the years built (Theil–Sen; needs ${MIN_TREND_YEARS} years)`,
      });
      const files = await writeLayerFiles(dir, 'trend-year', g(field(f.index)), style, {
        description: `${def.label}, ${def.combos[k]}, Theil–Sen trend of the annual value per decade over the years built (no value with fewer than ${MIN_TREND_YEARS} years)`,
        noData: -9999,
      });
      entries.push(
        entry(
          `${def.id}/${def.combos[k]}/trend-year`,
          def.id,
          def.combos[k],
          'trend',
          'year',
          trendUnit(def.units),
          `layers/${def.id}/${def.combos[k]}/`,
          files,
        ),
      );
      onLayer();
    }
  }
  // The Mann–Kendall p-value of each trend (a probability, 0–1 on one fixed domain so layers compare); empty below the minimum years.
  for (const def of defs) {
    if (!(TRENDED as readonly string[]).includes(def.id)) continue;
    for (let k = 0; k < def.combos.length; k++) {
      const f = find(def.id, k, 'trend-p', PERIODS - 1);
      const dir = join(dataDir, 'layers', def.id, def.combos[k]);
      const style = figureStyle('probability', [0, 1], '1', {
        title: `${def.label}: p-value of the trend over the years built (Mann–Kendall; needs ${MIN_TREND_YEARS} years)`,
      });
      const files = await writeLayerFiles(dir, 'trend-p-year', g(field(f.index)), style, {
        description: `${def.label}, ${def.combos[k]}, two-sided Mann–Kendall p-value of the trend of the annual value over the years built (no value with fewer than ${MIN_TREND_YEARS} years)`,
        noData: -9999,
      });
      entries.push(
        entry(`${def.id}/${def.combos[k]}/trend-p-year`, def.id, def.combos[k], 'trend-p', 'year', '1', `layers/${def.id}/${def.combos[k]}/`, files),
      );
      onLayer();
    }
  }
  // Mean annual temperature over the baseline, and its niche class.
  const mat = find(NICHE_FIGURE, 0, 'baseline', PERIODS - 1);
  const cls = find(NICHE_FIGURE, 0, 'class', PERIODS - 1);
  const dir = join(dataDir, 'layers', 'mean-annual-temperature', 'air');
  const matFiles = await writeLayerFiles(
    dir,
    'baseline-year',
    g(field(mat.index)),
    figureStyle('meanAnnualTemperature', safeDomain([mat.index], range, false), 'degC', { title: 'Mean annual temperature, baseline' }),
    { description: 'Mean annual air temperature over the baseline years', noData: -9999 },
  );
  entries.push(
    entry(
      'mean-annual-temperature/air/baseline-year',
      'mean-annual-temperature',
      'air',
      'baseline',
      'year',
      'degC',
      'layers/mean-annual-temperature/air/',
      matFiles,
    ),
  );
  onLayer();
  const clsFiles = await writeLayerFiles(dir, 'class-year', g(field(cls.index)), nicheClassStyle(), {
    description: 'Class of the baseline mean annual temperature against the human climate niche',
    noData: -9999,
  });
  entries.push(entry('mean-annual-temperature/air/class-year', 'niche-class', 'air', 'class', 'year', '1', 'layers/mean-annual-temperature/air/', clsFiles));
  onLayer();
  return entries;
}

/**
 * The nice domain over some fields: niceDomain of their smallest and largest finite values (the
 * domain spans min to max), [0, 1] when none has a value.
 */
function safeDomain(indices: readonly number[], range: FieldRange, fromZero: boolean): [number, number] {
  const ends: number[] = [];
  for (const i of indices) if (Number.isFinite(range.min[i])) ends.push(range.min[i], range.max[i]);
  try {
    return niceDomain([Float32Array.from(ends)], { fromZero });
  } catch {
    return [0, 1];
  }
}

/** A domain symmetric about 0 reaching at least ±m, on nice numbers [unit of the values]. */
function symmetricDomain(m: number): [number, number] {
  const [, hi] = niceDomain([Float32Array.from([0, m])], { fromZero: true });
  return [-hi, hi];
}

function entry(
  id: string,
  figure: string,
  combo: string,
  statistic: LayerEntry['statistic'],
  period: string,
  units: string,
  prefix: string,
  f: LayerFiles,
): LayerEntry {
  return {
    id,
    figure,
    combo,
    statistic,
    period,
    units,
    png: `data/${prefix}${f.png}`,
    tif: `data/${prefix}${f.tif}`,
    pngSha256: f.pngSha256,
    tifSha256: f.tifSha256,
    coordinates: f.coordinates,
    mapImages: f.mapImages.map((m) => ({ ...m, path: `data/${prefix}${m.path}` })),
    legend: f.legend,
  };
}
