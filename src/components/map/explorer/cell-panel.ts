/**
 * The panel of the selected cell: where it is, the region that holds it (or the nearest), links
 * to the region report and to the calculator, the shown layer's value there, and the cell's
 * monthly shift hours above the limit and lost to rest breaks (mean, median, P90 of the baseline
 * years and the years used) for the chosen workload class, acclimatization and exposure: the
 * numbers of the cell's rows in data/atlas-cells.csv, to the same two decimals. DOM only; text
 * goes in through textContent (names are never parsed as HTML).
 */
import { formatFixed, formatLat, formatLon } from '../../../lib/format.ts';
import { formatTemperature, type TemperatureUnit } from '../../../lib/units.ts';
import { sitePath } from '../../../lib/nav.ts';
import type { CellFiguresIndex, CellRecord } from '../../../../pipeline/publish/cell-figures.ts';
import { cellTableOfRow } from './cell-grid.ts';
import { NICHE_CLASSES } from '../../../../pipeline/climate/niche.ts';
import { baselineLength, nicheBaselineCaution } from '../../../lib/niche-baseline.ts';
import type { ExplorerCatalogue, ExplorerLayer } from './catalogue.ts';
import type { ViewState } from './view-state.ts';
import { describeLayer } from './describe-view.ts';
import { formatLayerValue } from './value-format.ts';

/** The two figures of atlas-cells.csv, as the panel's column groups. */
export const PANEL_FIGURES = [
  { id: 'hours-above-limit-shift', label: 'Hours above the limit' },
  { id: 'hours-lost-shift', label: 'Hours lost to rest breaks' },
] as const;
const STATS = ['mean', 'median', 'p90'] as const;
/** Niche classes in code order (code = index). */
const NICHE_CODES: readonly string[] = NICHE_CLASSES;
const STAT_HEADS = { mean: 'Mean', median: 'Median', p90: 'P90' };

export interface PanelContext {
  base: string;
  catalogue: ExplorerCatalogue;
  index: CellFiguresIndex;
  state: ViewState;
  layer: ExplorerLayer | undefined;
  unit: TemperatureUnit;
  /** Regions holding the cell centre, or the nearest with its distance [km]. */
  regions: { holding: string[]; nearest?: { id: string; km: number } };
  /** The what-if climate shown (its name), whose per-cell figures `index` and the record are; absent: the record. */
  scenarioName?: string;
}

function el<K extends keyof HTMLElementTagNameMap>(name: K, attrs: Record<string, string> = {}, text?: string): HTMLElementTagNameMap[K] {
  const e = document.createElement(name);
  for (const [k, v] of Object.entries(attrs)) e.setAttribute(k, v);
  if (text !== undefined) e.textContent = text;
  return e;
}

function regionLink(ctx: PanelContext, id: string): HTMLAnchorElement {
  const name = ctx.catalogue.regions.find((r) => r.id === id)?.name ?? id;
  return el('a', { href: sitePath(ctx.base, `regions/${id}/`), 'data-region-link': id }, name);
}

function where(ctx: PanelContext): HTMLParagraphElement {
  const p = el('p', { class: 'cell-where' });
  const { holding, nearest } = ctx.regions;
  if (holding.length > 0) {
    p.append(holding.length === 1 ? 'In the region ' : 'In the regions ');
    holding.forEach((id, i) => {
      if (i > 0) p.append(i === holding.length - 1 ? ' and ' : ', ');
      p.append(regionLink(ctx, id));
    });
    p.append('.');
  } else if (nearest) {
    p.append('In no region; the nearest is ', regionLink(ctx, nearest.id), `, about ${Math.round(nearest.km)} km away.`);
  } else p.append('The atlas has no regions.');
  return p;
}

/** The shown layer's value at the cell, from the chunk (the layer's own figure and choices). */
export function layerValueAtCell(ctx: Pick<PanelContext, 'index' | 'layer'>, record: CellRecord): number | null {
  const layer = ctx.layer;
  if (!layer) return null;
  // The per-cell chunks hold the monthly and yearly statistics, not the trend: its value is read from the layer's GeoTIFF.
  if (layer.statistic === 'trend' || layer.statistic === 'trend-p') return null;
  if (layer.figure === 'mean-annual-temperature') return record.niche.baselineMat;
  if (layer.figure === 'niche-class') {
    return record.niche.baselineClass === null ? null : NICHE_CODES.indexOf(record.niche.baselineClass);
  }
  const fig = ctx.index.figures.find((f) => f.id === layer.figure);
  const values = record.figures[layer.figure];
  if (!fig || !values) return null;
  const v = layer.view;
  const combo =
    layer.figure === 'capacity-loss-shift'
      ? `${v.loss}.${v.exposure}`
      : layer.figure === 'wbgt-mean'
        ? `${v.exposure}`
        : `${v.workloadClass}.${v.acclimatization}.${v.exposure}`;
  const k = fig.combos.indexOf(combo);
  const p = ctx.index.periods.indexOf(layer.period);
  if (k < 0 || p < 0) return null;
  const s = layer.statistic === 'p90' ? 2 : 0;
  return values[k][p][s];
}

function figuresTable(ctx: PanelContext, record: CellRecord): HTMLTableElement | HTMLParagraphElement {
  const s = ctx.state;
  const combo = `${s.workloadClass}.${s.acclimatization}.${s.exposure}`;
  const cols = PANEL_FIGURES.map((f) => {
    const fig = ctx.index.figures.find((x) => x.id === f.id);
    const k = fig ? fig.combos.indexOf(combo) : -1;
    return { ...f, values: k >= 0 ? record.figures[f.id]?.[k] : undefined };
  });
  if (cols.some((c) => !c.values)) return el('p', {}, `No figures for the combination ${combo}.`);
  const table = el('table', { id: 'cell-figures', class: 'data-table cell-figures', 'data-combo': combo });
  const cls = ctx.catalogue.choices.workloadClass.find((c) => c.id === s.workloadClass)?.label ?? s.workloadClass ?? '';
  const acc = ctx.catalogue.choices.acclimatization.find((c) => c.id === s.acclimatization)?.label ?? s.acclimatization ?? '';
  const exp = ctx.catalogue.choices.exposure.find((c) => c.id === s.exposure)?.label ?? s.exposure ?? '';
  const [b0, b1] = ctx.catalogue.baseline;
  table.append(
    el(
      'caption',
      {},
      `${ctx.scenarioName ? `What-if climate “${ctx.scenarioName}” (not a forecast): ` : ''}Shift hours per worker per month [h], ${cls}, ${acc.toLowerCase()}, ${exp.toLowerCase()}: statistics of the baseline years ${b0}–${b1}, the numbers of this cell's rows in its per-cell table (CSV).`,
    ),
  );
  const thead = el('thead');
  const r1 = el('tr');
  r1.append(el('th', { scope: 'col', rowspan: '2' }, 'Month'));
  for (const c of cols) r1.append(el('th', { scope: 'colgroup', colspan: '3' }, c.label));
  r1.append(el('th', { scope: 'col', rowspan: '2', class: 'num' }, 'Years used'));
  const r2 = el('tr');
  // The P90 head names the baseline's years (a P90 of a few years is near the highest of them).
  const heads = { ...STAT_HEADS, p90: `P90 of ${ctx.catalogue.baselineYears} yr` };
  for (const c of cols) for (const st of STATS) r2.append(el('th', { scope: 'col', class: 'num', 'data-key': `${c.id}.${st}` }, heads[st]));
  thead.append(r1, r2);
  const tbody = el('tbody');
  ctx.index.periods.forEach((period, p) => {
    const tr = el('tr', { 'data-period': period });
    tr.append(el('th', { scope: 'row' }, ctx.catalogue.choices.period.find((c) => c.id === period)?.label ?? period));
    for (const c of cols) {
      STATS.forEach((st, si) => {
        const v = c.values![p][si];
        tr.append(el('td', { class: 'num', 'data-key': `${c.id}.${st}` }, v === null ? '–' : formatFixed(v, 2)));
      });
    }
    tr.append(el('td', { class: 'num', 'data-key': 'years_used' }, String(cols[0].values![p][3])));
    tbody.append(tr);
  });
  table.append(thead, tbody);
  return table;
}

/** Links to the per-cell table holding the cell's row and to the NetCDF of every cell. */
function cellDownloads(ctx: PanelContext, cell: number): Array<string | HTMLElement> {
  const table = cellTableOfRow(ctx.index, Math.floor(cell / ctx.index.grid.nLon));
  const out: Array<string | HTMLElement> = [];
  if (table) out.push(' · ', el('a', { href: sitePath(ctx.base, table), download: '', 'data-cell-table': '' }, "this cell's band of rows as CSV"));
  out.push(' · ', el('a', { href: sitePath(ctx.base, ctx.index.netcdf), download: '', 'data-cell-netcdf': '' }, 'every cell as NetCDF'));
  return out;
}

/** Fills the panel for `record` (a land cell) or says the cell has no figures (`record` null). */
export function renderCellPanel(panel: HTMLElement, ctx: PanelContext, cell: number, centre: [number, number], record: CellRecord | null): void {
  panel.replaceChildren();
  panel.dataset.cell = String(cell);
  panel.hidden = false;
  const heading = el('h2', { id: 'cell-panel-title' }, `Grid cell ${cell}: ${formatLat(centre[1])}, ${formatLon(centre[0])}`);
  panel.append(heading);
  if (!record) {
    panel.dataset.state = 'no-data';
    panel.append(el('p', {}, 'This cell is not a land cell of the atlas (sea, or masked out by the land-sea mask): it has no figures.'), where(ctx));
    return;
  }
  panel.dataset.state = 'ready';
  panel.append(where(ctx));
  const links = el('p', { class: 'cell-links' });
  links.append(
    el('a', { href: sitePath(ctx.base, `estimate/?cell=${cell}`), 'data-cell-estimate': '' }, 'Estimate working hours for this cell'),
    ' · ',
    ...cellDownloads(ctx, cell),
  );
  panel.append(links);
  if (ctx.layer) {
    const d = describeLayer(ctx.catalogue, ctx.layer);
    const legend = ctx.catalogue.legends[ctx.layer.legend];
    const value = layerValueAtCell(ctx, record);
    const p = el('p', { class: 'cell-layer-value', 'data-key': 'layer-value' });
    p.append(
      `${[d.figure, d.view, d.period, d.statistic].filter((x) => x).join(', ')}: `,
      el('strong', { 'data-value': value === null ? '' : String(value) }, formatLayerValue(value, ctx.layer.units, ctx.unit, legend, 2)),
    );
    panel.append(p);
  }
  panel.append(figuresTable(ctx, record));
  const n = record.niche;
  const niche = el('p', { class: 'cell-niche', 'data-key': 'niche' });
  const nicheLayer = ctx.catalogue.layers.find((l) => l.figure === 'niche-class');
  const nicheLegend = nicheLayer ? ctx.catalogue.legends[nicheLayer.legend] : undefined;
  const code = n.baselineClass ? NICHE_CODES.indexOf(n.baselineClass) : -1;
  const label = code >= 0 && nicheLegend ? formatLayerValue(code, '1', ctx.unit, nicheLegend) : undefined;
  const caution = nicheBaselineCaution(ctx.catalogue.baseline);
  niche.textContent =
    `Mean annual air temperature over the baseline (${baselineLength(ctx.catalogue.baseline)}): ${formatTemperature(n.baselineMat ?? NaN, ctx.unit, 2)}` +
    (n.latestMat !== null ? `; in ${ctx.catalogue.latestYear} (1 year): ${formatTemperature(n.latestMat, ctx.unit, 2)}` : '') +
    (label ? `. Against the human climate niche: ${label}.` : '.') +
    (caution ? ` ${caution}` : '');
  panel.append(niche);
  panel.append(
    el(
      'p',
      { class: 'cell-caution' },
      'These are modelled grid-box screening figures, not a measurement at a site. Local regulations and a competent person decide work/rest and stop-work; at any sign of heat illness stop work and get medical help.',
    ),
  );
}
