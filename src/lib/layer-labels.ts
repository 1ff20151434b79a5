/**
 * Plain words for the keys of the manifest's layers and figures: a combination key
 * (`high.acclimatized.sun`, `kjellstrom-300w.shade`, `sun`, `air`), a statistic and a period.
 * Pure; the workload classes come from the manifest's work settings.
 */
import { LOSS_VIEWS } from '../../pipeline/reduce/layout.ts';
import { p90Label } from '../../pipeline/publish/baseline-length.ts';

/** A workload class as the manifest lists it. */
export interface ClassLabel {
  id: string;
  name: string;
  /** [W] */
  metabolicRate: number;
}

const ACCLIMATIZATION: Record<string, string> = { acclimatized: 'acclimatized', unacclimatized: 'not acclimatized' };
const EXPOSURE: Record<string, string> = { sun: 'in the sun', shade: 'in the shade (open sky, sun removed)' };

/** Label of a combination key of a figure, e.g. "High work rate (415 W), acclimatized, in the sun". */
export function comboLabel(key: string, classes: readonly ClassLabel[]): string {
  if (key === 'air') return 'Air temperature';
  if (EXPOSURE[key]) return `WBGT ${EXPOSURE[key]}`;
  const parts = key.split('.');
  if (parts.length === 3) {
    const c = classes.find((x) => x.id === parts[0]);
    const cls = c ? `${c.name} (${c.metabolicRate} W)` : parts[0];
    return `${cls}, ${ACCLIMATIZATION[parts[1]] ?? parts[1]}, ${EXPOSURE[parts[2]] ?? parts[2]}`;
  }
  if (parts.length === 2) {
    const view = LOSS_VIEWS.find((v) => v.id === parts[0]);
    return `${view ? view.label : parts[0]}, ${EXPOSURE[parts[1]] ?? parts[1]}`;
  }
  return key;
}

const STATISTICS: Record<string, string> = {
  mean: 'Baseline mean',
  p90: '90th-percentile year',
  median: 'Baseline median',
  baseline: 'Baseline',
  class: 'Class',
  min: 'Lowest year',
  max: 'Highest year',
  latest: 'Latest year',
  trend: 'Trend per decade (Theil–Sen)',
  'trend-p': 'Trend p-value (Mann–Kendall)',
};

/**
 * Label of a statistic key; the P90 names the number of baseline years `baselineYears` it rests
 * on when given (pipeline/publish/baseline-length.ts p90Label: "P90 of 4 years (near the highest)").
 */
export function statisticLabel(statistic: string, baselineYears?: number): string {
  if (statistic === 'p90' && baselineYears !== undefined) return p90Label(baselineYears);
  return STATISTICS[statistic] ?? statistic;
}

const MONTHS = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December'];

/** Label of a period: `01`–`12` → month name, `year` → "Whole year". */
export function periodName(period: string): string {
  if (period === 'year') return 'Whole year';
  const m = Number(period);
  return Number.isInteger(m) && m >= 1 && m <= 12 ? MONTHS[m - 1] : period;
}

/** Sort key of a period: months in order, then the whole year. */
export function periodOrder(period: string): number {
  return period === 'year' ? 13 : Number(period);
}
