/**
 * `data/atlas-cells.nc`: the per-cell figures of the whole grid as one CF-1.8 NetCDF file
 * (64-bit-offset NetCDF-3, readable by ncdump, netCDF-C and xarray): for each figure of the cell
 * tables (shift hours above the limit, shift hours lost per worker) its baseline mean, median and
 * 90th-percentile year and the years used, with dimensions (period, evaluation, lat, lon); the
 * baseline mean annual temperature and its niche class on (lat, lon). Periods 1–12 are the local
 * months, period 13 the whole year. Written one grid field at a time (the publish stage puts each
 * together from the merge bands' pieces), so the file is never in memory.
 *
 * CF conventions: CF Metadata Conventions 1.8 (units, long_name, standard_name of the coordinates,
 * _FillValue, flag_values / flag_meanings for the class, cell_methods `time: mean`), from the CF
 * document's sections 3, 4 and 7.3 (from memory; the file is read back with ncdump and netCDF-C in
 * test/publish/cell-netcdf.test.ts). How a statistic was made across years is said in `comment`.
 */
import { Netcdf3Writer, type Nc3Attr, type Nc3Var } from '../formats/netcdf3-writer.ts';
import { NICHE_CLASSES } from '../climate/index.ts';
import { PERIODS, type FigureDef } from '../reduce/figures.ts';
import type { GridField } from './grid-fields.ts';
import type { Grid, HorizontalGrid } from '../model/grid.ts';
import { NICHE_FIGURE } from './grid-fields.ts';

/** Fill value of the float variables (as in the GeoTIFF layers) [unit of the variable]. */
export const CELL_NETCDF_FILL = -9999;
/** Fill value of the class variable. */
const CLASS_FILL = -1;

const text = (s: string): Nc3Attr['value'] => s;
const attr = (name: string, value: Nc3Attr['value']): Nc3Attr => ({ name, value });

/** NetCDF name of a figure × statistic variable, e.g. `hours_lost_shift_p90`. */
export function cellVariableName(figure: string, statistic: string): string {
  return `${figure.replace(/-/g, '_')}_${statistic === 'years' ? 'years_used' : statistic}`;
}

const STAT_WORDS: Record<string, string> = {
  mean: 'baseline mean',
  median: 'baseline median',
  p90: '90th-percentile year of the baseline (Hyndman-Fan type 7)',
  years: 'baseline years used',
};

export interface CellNetcdfMeta {
  title: string;
  invented: boolean;
  source: string;
  history: string;
  baseline: [number, number];
  /** For a scenario's file: what it is and that it is a what-if, not a forecast (a global attribute). */
  scenario?: string;
}

/**
 * Writes the file from `field(index)` (the whole grid of a field as a labelled grid: dims lat,
 * lon on `grid`'s coordinates, NaN = no data; a field on another grid or in other units than the
 * variable's is refused).
 * @param grid the horizontal grid of every field (the file's lat and lon)
 */
export function writeCellNetcdf(
  path: string,
  grid: HorizontalGrid,
  defs: readonly FigureDef[],
  fields: readonly GridField[],
  meta: CellNetcdfMeta,
  field: (index: number) => Grid<Float32Array>,
): void {
  const nc = fields.filter((f) => f.netcdf);
  const figures = [...new Set(nc.filter((f) => f.figure !== NICHE_FIGURE).map((f) => f.figure))];
  const evalKeys = defs.find((d) => d.id === figures[0])?.combos ?? [];
  const keyLen = Math.max(1, ...evalKeys.map((k) => k.length));
  const vars: Nc3Var[] = [
    {
      name: 'lat',
      type: 'double',
      dims: ['lat'],
      attrs: [attr('standard_name', text('latitude')), attr('long_name', text('latitude of the cell centre')), attr('units', text('degrees_north'))],
    },
    {
      name: 'lon',
      type: 'double',
      dims: ['lon'],
      attrs: [attr('standard_name', text('longitude')), attr('long_name', text('longitude of the cell centre')), attr('units', text('degrees_east'))],
    },
    {
      name: 'month',
      type: 'int',
      dims: ['period'],
      attrs: [attr('long_name', text('local month of the period (1-12); 0 for the whole year')), attr('units', text('1'))],
    },
    {
      name: 'evaluation',
      type: 'char',
      dims: ['evaluation', 'evaluation_strlen'],
      attrs: [attr('long_name', text('work evaluation: workload class.acclimatization.exposure'))],
    },
  ];
  const order: Array<{ name: string; fields: GridField[]; type: 'float' | 'short' | 'byte'; units: string }> = [];
  for (const figure of figures) {
    const def = defs.find((d) => d.id === figure)!;
    for (const statistic of ['mean', 'median', 'p90', 'years'] as const) {
      const fs = nc.filter((f) => f.figure === figure && f.statistic === statistic);
      if (fs.length === 0) continue;
      const name = cellVariableName(figure, statistic);
      const years = statistic === 'years';
      vars.push({
        name,
        type: years ? 'short' : 'float',
        dims: ['period', 'evaluation', 'lat', 'lon'],
        attrs: [
          attr('long_name', text(`${def.label}: ${STAT_WORDS[statistic]}`)),
          attr('units', text(years ? '1' : def.units)),
          attr('_FillValue', years ? { type: 'short', values: [-1] } : { type: 'float', values: [CELL_NETCDF_FILL] }),
          attr(
            'comment',
            text(
              years
                ? `number of baseline years ${meta.baseline[0]}-${meta.baseline[1]} whose value counted (completeness rule in the atlas manifest)`
                : `each year's value over the period (a local month, or the year), then the ${STAT_WORDS[statistic]} of the baseline years ${meta.baseline[0]}-${meta.baseline[1]} that count`,
            ),
          ),
        ],
      });
      order.push({ name, fields: fs, type: years ? 'short' : 'float', units: years ? '1' : def.units });
    }
  }
  const niche = nc.filter((f) => f.figure === NICHE_FIGURE);
  const mat = niche.find((f) => f.statistic === 'baseline');
  const cls = niche.find((f) => f.statistic === 'class');
  if (mat) {
    vars.push({
      name: 'mean_annual_temperature',
      type: 'float',
      dims: ['lat', 'lon'],
      attrs: [
        attr('standard_name', text('air_temperature')),
        attr('long_name', text(`mean annual 2 m air temperature over the baseline ${meta.baseline[0]}-${meta.baseline[1]}`)),
        attr('units', text('degC')),
        attr('_FillValue', { type: 'float', values: [CELL_NETCDF_FILL] }),
        attr('cell_methods', text('time: mean')),
        attr('comment', text('mean of the annual means of the baseline years that count')),
      ],
    });
    order.push({ name: 'mean_annual_temperature', fields: [mat], type: 'float', units: 'degC' });
  }
  if (cls) {
    vars.push({
      name: 'niche_class',
      type: 'byte',
      dims: ['lat', 'lon'],
      attrs: [
        attr('long_name', text('class of the baseline mean annual temperature against the human climate niche')),
        attr('_FillValue', { type: 'byte', values: [CLASS_FILL] }),
        attr('flag_values', { type: 'byte', values: NICHE_CLASSES.map((_, i) => i) }),
        attr('flag_meanings', text(NICHE_CLASSES.join(' '))),
      ],
    });
    order.push({ name: 'niche_class', fields: [cls], type: 'byte', units: '1' });
  }
  const w = new Netcdf3Writer(path, {
    format: '64bit-offset',
    numRecords: 0,
    dims: [
      { name: 'period', length: PERIODS },
      { name: 'evaluation', length: evalKeys.length },
      { name: 'evaluation_strlen', length: keyLen },
      { name: 'lat', length: grid.lat.length },
      { name: 'lon', length: grid.lon.length },
    ],
    attrs: [
      attr('Conventions', text('CF-1.8')),
      attr('title', text(meta.title)),
      attr('source', text(meta.source)),
      attr('history', text(meta.history)),
      attr(
        'comment',
        text(
          `Per-cell figures of the atlas: statistics over the baseline years ${meta.baseline[0]}-${meta.baseline[1]} of each year's value. Screening values; local regulations and a competent person decide work/rest.` +
            (meta.invented ? ' INVENTED DATA: made by heathours demo-data for an invented territory; describes no real place.' : ''),
        ),
      ),
      ...(meta.scenario !== undefined ? [attr('scenario', text(meta.scenario))] : []),
    ],
    vars,
  });
  try {
    w.writeFixed('lat', grid.lat);
    w.writeFixed('lon', grid.lon);
    w.writeFixed(
      'month',
      Array.from({ length: PERIODS }, (_, p) => (p < PERIODS - 1 ? p + 1 : 0)),
    );
    const chars = new Uint8Array(evalKeys.length * keyLen);
    evalKeys.forEach((k, i) => chars.set(new TextEncoder().encode(k), i * keyLen));
    w.writeFixed('evaluation', chars);
    for (const v of order) {
      for (const f of v.fields) {
        const g = onGrid(field(f.index), grid, v.units, v.name);
        const out = v.type === 'float' ? new Float32Array(g.length) : new Int16Array(g.length);
        const fill = v.type === 'float' ? CELL_NETCDF_FILL : v.type === 'short' ? -1 : CLASS_FILL;
        for (let i = 0; i < g.length; i++) out[i] = Number.isFinite(g[i]) ? g[i] : fill;
        w.appendFixed(v.name, out);
      }
    }
    w.close();
  } catch (e) {
    w.abort();
    throw e;
  }
}

/** The data of a field after checking it lies on `grid` (dims lat, lon; the same coordinates) in `units`; a RangeError names the variable otherwise. */
function onGrid(f: Grid<Float32Array>, grid: HorizontalGrid, units: string, name: string): Float32Array {
  const same = (a: Float64Array, b: Float64Array) => a === b || (a.length === b.length && a.every((v, i) => v === b[i]));
  const ok =
    f.dims.join(',') === 'lat,lon' && same(f.coords.lat, grid.lat) && same(f.coords.lon, grid.lon) && f.data.length === grid.lat.length * grid.lon.length;
  if (!ok) throw new RangeError(`per-cell NetCDF: a field of ${name} is not on the file's (lat, lon) grid`);
  if (f.attrs.units !== units) throw new RangeError(`per-cell NetCDF: a field of ${name} is in ${f.attrs.units}, the variable in ${units}`);
  return f.data;
}
