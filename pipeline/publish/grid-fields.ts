/**
 * The gridded fields the atlas publishes: the per-cell NetCDF's slices (figure × statistic ×
 * period × evaluation) and the map layers (figure × combination × statistic × period, mean annual
 * temperature and its niche class). Merge tiles write their rows of every field into a piece file
 * (`grid-pieces.ts`); the publish stage puts each field together from the pieces, one field in
 * memory at a time, and writes NetCDF slabs and layer images from it.
 */
import { CELL_TABLE_FIGURES } from './cell-table.ts';
import { PERIODS, type FigureDef } from '../reduce/figures.ts';
import { trendUnit } from './region-table.ts';

/** Statistics of the per-cell fields: normals across the baseline, years used, the niche. */
export type GridStatistic = 'mean' | 'median' | 'p90' | 'years' | 'baseline' | 'class' | 'trend' | 'trend-p';

export interface GridField {
  /** Index in the field list (and in every piece file). */
  index: number;
  figure: string;
  /** Combination of the figure (evaluation key, exposure, loss view), or `air` for the niche. */
  combo: string;
  comboIndex: number;
  statistic: GridStatistic;
  /** Period 0–11 (month), 12 (year); the niche fields are annual. */
  period: number;
  /** Drawn as a map layer (PNG + GeoTIFF). */
  layer: boolean;
  /** Held in the per-cell NetCDF. */
  netcdf: boolean;
}

/** Statistics mapped per figure (the layers of the map page and the GIS downloads). */
export const MAPPED: Record<string, Array<'mean' | 'p90'>> = {
  'hours-above-limit-shift': ['mean', 'p90'],
  'hours-lost-shift': ['mean', 'p90'],
  'capacity-loss-shift': ['mean'],
  'wbgt-mean': ['mean'],
  'person-hours-lost-density': ['mean', 'p90'],
};

/**
 * Figures whose annual value gets two trend layers per combination (`trend-year`: the Theil–Sen
 * slope per decade over the years built; `trend-p-year`: the Mann–Kendall p-value of that trend;
 * docs/methods.md §10.5; no value below 15 years).
 */
export const TRENDED = ['hours-above-limit-shift', 'hours-lost-shift'] as const;

/** Statistics of the per-cell NetCDF's figures (those of the per-cell tables). */
export const NETCDF_STATISTICS = ['mean', 'median', 'p90', 'years'] as const;

/** Figure id of the niche fields. */
export const NICHE_FIGURE = 'mean-annual-temperature';

/**
 * Every gridded field, in piece-file order: the NetCDF figures variable by variable (statistic,
 * then period, then combination — the C order of a `(period, evaluation, lat, lon)` variable),
 * then the layers that are not in the NetCDF, then the trend layers ({@link TRENDED}: every slope,
 * then every p-value, so the fields before them keep their places), then the niche (baseline mean annual temperature,
 * its class).
 */
export function gridFields(defs: readonly FigureDef[]): GridField[] {
  const out: GridField[] = [];
  const push = (f: Omit<GridField, 'index'>) => out.push({ ...f, index: out.length });
  for (const id of CELL_TABLE_FIGURES) {
    const def = defs.find((d) => d.id === id)!;
    const mapped = MAPPED[id] ?? [];
    for (const statistic of NETCDF_STATISTICS) {
      for (let period = 0; period < PERIODS; period++) {
        def.combos.forEach((combo, comboIndex) =>
          push({ figure: id, combo, comboIndex, statistic, period, layer: (mapped as string[]).includes(statistic), netcdf: true }),
        );
      }
    }
  }
  for (const def of defs) {
    if (CELL_TABLE_FIGURES.includes(def.id)) continue;
    for (const statistic of MAPPED[def.id] ?? []) {
      def.combos.forEach((combo, comboIndex) => {
        for (let period = 0; period < PERIODS; period++) push({ figure: def.id, combo, comboIndex, statistic, period, layer: true, netcdf: false });
      });
    }
  }
  for (const id of TRENDED) {
    const def = defs.find((d) => d.id === id);
    if (def)
      def.combos.forEach((combo, comboIndex) => push({ figure: id, combo, comboIndex, statistic: 'trend', period: PERIODS - 1, layer: true, netcdf: false }));
  }
  for (const id of TRENDED) {
    const def = defs.find((d) => d.id === id);
    if (def)
      def.combos.forEach((combo, comboIndex) => push({ figure: id, combo, comboIndex, statistic: 'trend-p', period: PERIODS - 1, layer: true, netcdf: false }));
  }
  push({ figure: NICHE_FIGURE, combo: 'air', comboIndex: 0, statistic: 'baseline', period: PERIODS - 1, layer: true, netcdf: true });
  push({ figure: NICHE_FIGURE, combo: 'air', comboIndex: 0, statistic: 'class', period: PERIODS - 1, layer: true, netcdf: true });
  return out;
}

/**
 * Units of a gridded field, as the per-cell NetCDF and the layers label it: the figure's units
 * for its statistics, per decade for a trend, 1 for years used, p-values and the niche class,
 * degC for the mean annual temperature.
 */
export function gridFieldUnits(defs: readonly FigureDef[], f: GridField): string {
  if (f.statistic === 'years' || f.statistic === 'class' || f.statistic === 'trend-p') return '1';
  if (f.figure === NICHE_FIGURE) return 'degC';
  const units = defs.find((d) => d.id === f.figure)!.units;
  return f.statistic === 'trend' ? trendUnit(units) : units;
}
