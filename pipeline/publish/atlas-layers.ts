/**
 * Which gridded figures become map layers (PNG for the map, GeoTIFF for GIS) and where they go:
 * `data/layers/<figure>/<combo>/<statistic>-<period>.{png,tif}`. Months of one figure ×
 * combination × statistic share one colour domain, so the map compares months honestly.
 */
import { join } from 'node:path';
import { figureStyle, nicheClassStyle, niceDomain, writeLayerFiles, type FigureKind, type LayerFiles, type LegendSpec } from './layers/index.ts';
import type { FigureNormals, NicheResult } from '../run/climate-step.ts';
import { PERIODS } from '../run/figures.ts';
import { periodLabel } from './region-table.ts';
import { nicheClassCode } from '../climate/index.ts';
import type { HorizontalGrid } from '../model/grid.ts';

/** A published layer, as the manifest lists it. */
export interface LayerEntry {
  id: string;
  figure: string;
  combo: string;
  statistic: 'mean' | 'p90' | 'baseline' | 'class';
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
};

/** Statistics mapped per figure. */
const MAPPED: Record<string, Array<'mean' | 'p90'>> = {
  'hours-above-limit-shift': ['mean', 'p90'],
  'hours-lost-shift': ['mean', 'p90'],
  'capacity-loss-shift': ['mean'],
  'wbgt-mean': ['mean'],
};

function gridValues(values: Float64Array, nFields: number, field: number, cells: Int32Array, nGrid: number): Float32Array {
  const out = new Float32Array(nGrid).fill(NaN);
  for (let c = 0; c < cells.length; c++) out[cells[c]] = values[c * nFields + field];
  return out;
}

export async function writeAtlasLayers(
  dataDir: string,
  grid: HorizontalGrid,
  cells: Int32Array,
  figures: readonly FigureNormals[],
  niche: NicheResult,
  onLayer: () => void = () => {},
): Promise<LayerEntry[]> {
  const nGrid = grid.lat.length * grid.lon.length;
  const entries: LayerEntry[] = [];
  const g = (values: Float32Array) => ({ lat: grid.lat, lon: grid.lon, values });
  for (const fn of figures) {
    const def = fn.series.def;
    const stats = MAPPED[def.id];
    if (!stats) continue;
    const nC = def.combos.length;
    const nFields = PERIODS * nC;
    for (let k = 0; k < nC; k++) {
      for (const stat of stats) {
        const source = stat === 'mean' ? fn.cell.mean : fn.cell.p90;
        const monthly = Array.from({ length: PERIODS - 1 }, (_, p) => gridValues(source, nFields, p * nC + k, cells, nGrid));
        const annual = gridValues(source, nFields, (PERIODS - 1) * nC + k, cells, nGrid);
        const fromZero = def.units === 'h';
        const monthDomain = safeDomain(monthly, fromZero);
        const yearDomain = safeDomain([annual], fromZero);
        for (let p = 0; p < PERIODS; p++) {
          const values = p < PERIODS - 1 ? monthly[p] : annual;
          const domain = p < PERIODS - 1 ? monthDomain : yearDomain;
          const period = periodLabel(p);
          const dir = join(dataDir, 'layers', def.id, def.combos[k]);
          const name = `${stat}-${period}`;
          const style = figureStyle(KIND[def.id], domain, def.units, { title: `${def.label} (${stat === 'p90' ? '90th-percentile year' : 'baseline mean'})` });
          const files = await writeLayerFiles(dir, name, g(values), style, { description: `${def.label}, ${def.combos[k]}, ${stat}, period ${period}`, noData: -9999 });
          entries.push(entry(`${def.id}/${def.combos[k]}/${name}`, def.id, def.combos[k], stat, period, def.units, `layers/${def.id}/${def.combos[k]}/`, files));
          onLayer();
        }
      }
    }
  }
  // Mean annual temperature over the baseline, and its niche class.
  const mat = new Float32Array(nGrid).fill(NaN);
  const cls = new Float32Array(nGrid).fill(NaN);
  for (let c = 0; c < cells.length; c++) {
    mat[cells[c]] = niche.assessment.baselineMat[c];
    const v = niche.assessment.baselineMat[c];
    cls[cells[c]] = Number.isFinite(v) ? nicheClassCode(v) : NaN;
  }
  const dir = join(dataDir, 'layers', 'mean-annual-temperature', 'air');
  const matFiles = await writeLayerFiles(dir, 'baseline-year', g(mat), figureStyle('meanAnnualTemperature', safeDomain([mat], false), 'degC', { title: 'Mean annual temperature, baseline' }), { description: 'Mean annual air temperature over the baseline years', noData: -9999 });
  entries.push(entry('mean-annual-temperature/air/baseline-year', 'mean-annual-temperature', 'air', 'baseline', 'year', 'degC', 'layers/mean-annual-temperature/air/', matFiles));
  const clsFiles = await writeLayerFiles(dir, 'class-year', g(cls), nicheClassStyle(), { description: 'Class of the baseline mean annual temperature against the human climate niche', noData: -9999 });
  entries.push(entry('mean-annual-temperature/air/class-year', 'niche-class', 'air', 'class', 'year', '1', 'layers/mean-annual-temperature/air/', clsFiles));
  return entries;
}

function safeDomain(layers: Float32Array[], fromZero: boolean): [number, number] {
  try {
    return niceDomain(layers, { fromZero });
  } catch {
    return [0, 1];
  }
}

function entry(id: string, figure: string, combo: string, statistic: LayerEntry['statistic'], period: string, units: string, prefix: string, f: LayerFiles): LayerEntry {
  return {
    id, figure, combo, statistic, period, units,
    png: `data/${prefix}${f.png}`, tif: `data/${prefix}${f.tif}`, pngSha256: f.pngSha256, tifSha256: f.tifSha256,
    coordinates: f.coordinates,
    mapImages: f.mapImages.map((m) => ({ ...m, path: `data/${prefix}${m.path}` })),
    legend: f.legend,
  };
}
