/**
 * A view in words, for the legend title, the region table's caption and the map's label:
 * "Hours lost to rest breaks · Moderate work rate (300 W), acclimatized, in the sun · Whole
 * year · Mean of the baseline years 2021–2022". Pure.
 */
import type { ExplorerCatalogue, ExplorerLayer } from './catalogue.ts';
import { baselineYears, NICHE_BASELINE_YEARS } from '../../../lib/niche-baseline.ts';

function label(catalogue: ExplorerCatalogue, key: keyof ExplorerCatalogue['choices'], id: string | undefined): string | undefined {
  if (id === undefined) return undefined;
  return catalogue.choices[key].find((c) => c.id === id)?.label ?? id;
}

/** The figure's menu name. */
export function figureLabel(catalogue: ExplorerCatalogue, figure: string): string {
  return catalogue.figures.find((f) => f.id === figure)?.label ?? figure;
}

/** Parts of a layer's description: figure, the choices that picked it, period, statistic. */
export function describeLayer(catalogue: ExplorerCatalogue, layer: ExplorerLayer): { figure: string; view: string; period: string; statistic: string } {
  const v = layer.view;
  const acc = label(catalogue, 'acclimatization', v.acclimatization);
  const exp = label(catalogue, 'exposure', v.exposure);
  const parts = [label(catalogue, 'workloadClass', v.workloadClass), label(catalogue, 'loss', v.loss), acc?.toLowerCase(), exp?.toLowerCase()].filter(
    (s): s is string => s !== undefined,
  );
  const [b0, b1] = catalogue.baseline;
  const stat = label(catalogue, 'statistic', layer.statistic) ?? layer.statistic;
  // A trend is taken over every year built, not over the baseline.
  const trend = isTrendStatistic(layer.statistic);
  const [y0, y1] = catalogue.years;
  // Niche figures carry the baseline's length, and a caution when it is shorter than the niche's 20 years.
  const niche = layer.figure === 'niche-class' || layer.figure === 'mean-annual-temperature';
  const n = baselineYears(catalogue.baseline);
  const length = niche
    ? ` (${n} year${n === 1 ? '' : 's'}${n < NICHE_BASELINE_YEARS ? `; the niche was described with ${NICHE_BASELINE_YEARS}+ years` : ''})`
    : '';
  return {
    figure: figureLabel(catalogue, layer.figure),
    view: parts.join(', '),
    period: label(catalogue, 'period', layer.period) ?? layer.period,
    statistic: trend ? `${stat}, years built ${y0}–${y1}` : `${stat}, baseline ${b0}–${b1}${length}`,
  };
}

/** Whether a statistic is the record's trend (`trend`: Theil–Sen slope per decade; `trend-p`: its Mann–Kendall p-value). */
export function isTrendStatistic(statistic: string): boolean {
  return statistic === 'trend' || statistic === 'trend-p';
}

/**
 * For a trend layer of a record shorter than the trend needs: "A trend needs at least 15 years;
 * this record has 3 (2021–2023), so the layer has no values." Otherwise null.
 */
export function trendNote(catalogue: Pick<ExplorerCatalogue, 'years' | 'minTrendYears'>, layer: Pick<ExplorerLayer, 'statistic'>): string | null {
  if (!isTrendStatistic(layer.statistic)) return null;
  const [y0, y1] = catalogue.years;
  const n = y1 - y0 + 1;
  if (n >= catalogue.minTrendYears) return null;
  return `A trend needs at least ${catalogue.minTrendYears} years; this record has ${n} (${y0}–${y1}), so the layer has no values.`;
}

/** One line: the parts joined with " · ". */
export function describeLayerLine(catalogue: ExplorerCatalogue, layer: ExplorerLayer): string {
  const d = describeLayer(catalogue, layer);
  return [d.figure, d.view, d.period, d.statistic].filter((s) => s !== '').join(' · ');
}
