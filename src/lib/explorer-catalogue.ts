/**
 * Builds the map explorer's catalogue (components/map/explorer/catalogue.ts) from the manifest's
 * layers and the regions: our plain labels for each figure and choice, the layers
 * with the choices that pick them, the legends (each once), and the default view. Pure.
 */
import type { RegionCollection } from '../data/regions.ts';
import type { ManifestLayers } from '../data/manifest-layers.ts';
import { comboColumns } from '../../pipeline/publish/combo.ts';
import { LOSS_VIEWS } from '../../pipeline/reduce/layout.ts';
import { baselineYearCount, p90Label, shortBaselineWarning } from '../../pipeline/publish/baseline-length.ts';
import { valueUnitWords } from '../../pipeline/publish/data-dictionary.ts';
import { labelPoint } from './label-point.ts';
import { workforceSourceLine } from './report/workforce.ts';
import { PERSON_HOURS_DENSITY } from '../../pipeline/regions/person-hours.ts';
import { MIN_TREND_YEARS } from '../../pipeline/climate/trend.ts';
import type {
  ExplorerCatalogue,
  ExplorerChoice,
  ExplorerFigure,
  ExplorerLayer,
  ExplorerLegend,
  ExplorerRegion,
  LayerView,
} from '../components/map/explorer/catalogue.ts';

/** Our names for the figures the map shows, in menu order. */
export const MAP_FIGURE_LABELS: Readonly<Record<string, string>> = {
  'hours-above-limit-shift': 'Hours above the limit',
  'hours-lost-shift': 'Hours lost to rest breaks',
  'wbgt-mean': 'Mean WBGT',
  'capacity-loss-shift': 'Capacity loss',
  'mean-annual-temperature': 'Mean annual temperature',
  'niche-class': 'Human climate niche class',
  [PERSON_HOURS_DENSITY]: 'Person-hours lost per km²',
};

export const ACCLIMATIZATION_LABELS: Readonly<Record<string, string>> = { acclimatized: 'Acclimatized', unacclimatized: 'Not acclimatized' };
export const EXPOSURE_LABELS: Readonly<Record<string, string>> = {
  sun: 'In the sun',
  shade: 'In the shade (open sky, sun removed)',
  shelter: 'Under a shelter (a roof or canopy, a shelter at air temperature — Lemke & Kjellstrom 2012)',
};
export const STATISTIC_LABELS: Readonly<Record<string, string>> = {
  mean: 'Mean year',
  trend: 'Trend per decade (Theil–Sen)',
  'trend-p': 'Trend p-value (Mann–Kendall)',
  baseline: 'Baseline mean',
  class: 'Class of the baseline mean',
};

/** A statistic's menu label; the P90 says how many baseline years it rests on (`n`). */
export function statisticChoiceLabel(id: string, n: number): string {
  return id === 'p90' ? p90Label(n) : (STATISTIC_LABELS[id] ?? id);
}

/** The unit of a map figure's value in words, per month and per year. */
function unitWordsOf(figure: string, units: string): { month: string; year: string } {
  if (figure === 'mean-annual-temperature') return { month: 'degrees Celsius (mean of the year)', year: 'degrees Celsius (mean of the year)' };
  if (figure === 'niche-class') return { month: 'class of the mean annual temperature', year: 'class of the mean annual temperature' };
  return { month: valueUnitWords(figure, units, 'month'), year: valueUnitWords(figure, units, 'year') };
}
export const MONTH_NAMES = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December'];

/** "January" … "December" for `01`–`12`, "Whole year" for `year`. */
export function periodName(period: string): string {
  return period === 'year' ? 'Whole year' : (MONTH_NAMES[Number(period) - 1] ?? period);
}

function bboxOf(feature: RegionCollection['features'][number]): [number, number, number, number] {
  let w = Infinity;
  let s = Infinity;
  let e = -Infinity;
  let n = -Infinity;
  const polygons = feature.geometry.type === 'Polygon' ? [feature.geometry.coordinates] : feature.geometry.coordinates;
  for (const poly of polygons) {
    for (const ring of poly) {
      for (const [x, y] of ring) {
        w = Math.min(w, x);
        e = Math.max(e, x);
        s = Math.min(s, y);
        n = Math.max(n, y);
      }
    }
  }
  return [w, s, e, n];
}

function viewOf(figure: string, combo: string): LayerView {
  // The person-hours layer mixes every class, acclimatization and exposure by the workforce shares: no choice.
  if (figure === 'mean-annual-temperature' || figure === 'niche-class' || figure === PERSON_HOURS_DENSITY) return {};
  const cc = comboColumns(figure, combo);
  const view: LayerView = {};
  if (cc.workload_class) view.workloadClass = cc.workload_class;
  if (cc.acclimatization) view.acclimatization = cc.acclimatization;
  if (cc.exposure) view.exposure = cc.exposure;
  if (cc.method && cc.method !== 'limit') view.loss = cc.method;
  return view;
}

/** The ids present, in the order of `order` first, then any others in order of appearance. */
function ordered(present: Iterable<string>, order: readonly string[]): string[] {
  const set = new Set(present);
  return [...order.filter((id) => set.has(id)), ...[...set].filter((id) => !order.includes(id))];
}

/** An empty catalogue: the data folder publishes no layers. */
export function emptyCatalogue(invented: boolean): ExplorerCatalogue {
  return {
    version: 1,
    available: false,
    invented,
    baseline: [0, 0],
    baselineYears: 0,
    years: [0, 0],
    minTrendYears: MIN_TREND_YEARS,
    baselineWarning: null,
    latestYear: 0,
    figures: [],
    choices: { workloadClass: [], acclimatization: [], exposure: [], loss: [], statistic: [], period: [] },
    legends: [],
    layers: [],
    regions: [],
    defaults: { figure: '', view: {}, statistic: '', period: '' },
  };
}

/** Path below the site's base of the values file of the catalogue's `index`-th layer. */
export const layerValuesPath = (index: number) => `map/values/${index}.json`;

export function explorerCatalogue(manifest: ManifestLayers, regions: RegionCollection): ExplorerCatalogue {
  const legendIndex = new Map<string, number>();
  const legends: ExplorerLegend[] = [];
  const layers: ExplorerLayer[] = manifest.layers.map((l, index) => {
    const k = JSON.stringify(l.legend);
    let li = legendIndex.get(k);
    if (li === undefined) {
      li = legends.length;
      legends.push(l.legend);
      legendIndex.set(k, li);
    }
    return {
      id: l.id,
      figure: l.figure,
      view: viewOf(l.figure, l.combo),
      statistic: l.statistic,
      period: l.period,
      units: l.units,
      images: l.mapImages.map((m) => ({ path: m.path, coordinates: m.coordinates })),
      legend: li,
      tif: l.tif,
      values: layerValuesPath(index),
    };
  });

  const figureIds = ordered(
    layers.map((l) => l.figure),
    Object.keys(MAP_FIGURE_LABELS),
  );
  const figures: ExplorerFigure[] = figureIds.map((id) => {
    const def = manifest.figures.find((f) => f.id === id);
    const first = layers.find((l) => l.figure === id)!;
    const title = legends[first.legend].title ?? id;
    const source =
      id === PERSON_HOURS_DENSITY && manifest.workforce ? { source: workforceSourceLine(manifest.workforce), sourceInvented: manifest.workforce.invented } : {};
    return {
      id,
      label: MAP_FIGURE_LABELS[id] ?? def?.label ?? title,
      description: def?.label ?? title.replace(/\s*\(.*\)$/, ''),
      units: first.units,
      unitWords: unitWordsOf(id, first.units),
      ...source,
    };
  });

  const classes = manifest.work.classes;
  const pick = (get: (v: LayerView) => string | undefined) => layers.map((l) => get(l.view)).filter((v): v is string => v !== undefined);
  const choice = (ids: string[], label: (id: string) => string): ExplorerChoice[] => ids.map((id) => ({ id, label: label(id) }));
  const lossLabel = (id: string) => (LOSS_VIEWS.find((v) => v.id === id)?.label ?? id).replace(/^Capacity loss, /, '');
  const classIds = ordered(
    pick((v) => v.workloadClass),
    classes.map((c) => c.id),
  );
  const choices: ExplorerCatalogue['choices'] = {
    workloadClass: choice(classIds, (id) => {
      const c = classes.find((x) => x.id === id);
      return c ? `${c.name} (${c.metabolicRate} W)` : id;
    }),
    acclimatization: choice(
      ordered(
        pick((v) => v.acclimatization),
        manifest.work.acclimatization,
      ),
      (id) => ACCLIMATIZATION_LABELS[id] ?? id,
    ),
    exposure: choice(
      ordered(
        pick((v) => v.exposure),
        manifest.work.exposures,
      ),
      (id) => EXPOSURE_LABELS[id] ?? id,
    ),
    loss: choice(
      ordered(
        pick((v) => v.loss),
        LOSS_VIEWS.map((v) => v.id),
      ),
      lossLabel,
    ),
    statistic: choice(
      ordered(
        layers.map((l) => l.statistic),
        ['mean', 'p90', 'trend', 'trend-p', 'baseline', 'class'],
      ),
      (id) => statisticChoiceLabel(id, baselineYearCount(manifest.baseline)),
    ),
    period: choice(
      ordered(
        layers.map((l) => l.period),
        [...MONTH_NAMES.map((_, i) => String(i + 1).padStart(2, '0')), 'year'],
      ),
      periodName,
    ),
  };

  const regionList: ExplorerRegion[] = regions.features.map((f) => ({
    id: f.properties.id,
    name: f.properties.name,
    bbox: bboxOf(f),
    label: labelPoint(f.geometry),
  }));
  const defaultFigure = figureIds.includes('hours-lost-shift') ? 'hours-lost-shift' : (figureIds[0] ?? '');
  const defaults = {
    figure: defaultFigure,
    view: {
      // The middle workload class (e.g. "moderate" of four): a map that is neither all zero nor all saturated.
      workloadClass: classIds[Math.floor((classIds.length - 1) / 2)],
      acclimatization: choices.acclimatization[0]?.id,
      exposure: choices.exposure[0]?.id,
      loss: choices.loss[0]?.id,
    },
    statistic: choices.statistic.some((c) => c.id === 'mean') ? 'mean' : (choices.statistic[0]?.id ?? ''),
    period: choices.period.some((c) => c.id === 'year') ? 'year' : (choices.period[0]?.id ?? ''),
  };
  return {
    version: 1,
    available: layers.length > 0,
    invented: manifest.atlas.invented,
    baseline: manifest.baseline,
    baselineYears: baselineYearCount(manifest.baseline),
    baselineWarning: shortBaselineWarning(manifest.baseline),
    years: manifest.years,
    minTrendYears: MIN_TREND_YEARS,
    latestYear: manifest.latestYear,
    figures,
    choices,
    legends,
    layers,
    regions: regionList,
    defaults,
  };
}
