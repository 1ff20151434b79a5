/**
 * The month-by-month detail of the estimate page (hours above the limit and hours lost per worker,
 * baseline mean and P90 year; src/lib/estimate), loaded by main.ts only when the reader opens it,
 * so the page's first script carries the schedule only. Draws the settings of the table, its rows
 * and its CSV download (a Blob link). Text only through textContent.
 */
import type { EstimateContext } from '../../../pipeline/schedule/context.ts';
import type { EstimateInputs } from '../../../pipeline/schedule/inputs.ts';
import type { ResolvedPlace } from '../../../pipeline/schedule/place.ts';
import { estimateCsv } from '../../lib/estimate/csv.ts';
import { estimateFileName } from '../../lib/estimate/file-name.ts';
import { runEstimate, type EstimateResult } from '../../lib/estimate/estimate.ts';
import { summaryLines } from '../../lib/estimate/summary.ts';
import { ESTIMATE_COLUMNS, estimateRows } from '../../lib/estimate/table.ts';
import { formatFixed } from '../../lib/format.ts';
import type { TemperatureUnit } from '../../lib/units.ts';
import { renderSummary, setDownload } from './render.ts';

/** The table body. */
export function renderTable(tbody: HTMLTableSectionElement, r: EstimateResult): void {
  tbody.replaceChildren();
  for (const row of estimateRows(r)) {
    const tr = document.createElement('tr');
    tr.dataset.row = row.key;
    const label = document.createElement('td');
    label.textContent = row.label;
    tr.append(label);
    for (const c of ESTIMATE_COLUMNS) {
      const td = document.createElement('td');
      td.className = 'num';
      td.textContent = formatFixed(row.values[c.key], c.digits);
      tr.append(td);
    }
    tbody.append(tr);
  }
}

/**
 * Runs the monthly estimate for the place's histograms and draws it: settings, table, CSV link.
 * Catalogued errors of runEstimate (EstimatePeriodInvalid, those of pipeline/work).
 */
export function showMonthly(
  histograms: readonly Float64Array[],
  inputs: EstimateInputs,
  ctx: EstimateContext,
  place: ResolvedPlace,
  atlasTitle: string,
  unit: TemperatureUnit,
): void {
  const r = runEstimate(histograms, inputs, ctx);
  renderSummary(document.getElementById('estimate-summary')!, summaryLines(r, ctx, place), unit);
  renderTable((document.getElementById('estimate-table') as HTMLTableElement).tBodies[0], r);
  setDownload(
    document.getElementById('estimate-csv') as HTMLAnchorElement,
    estimateCsv(r, ctx, atlasTitle, place),
    'text/csv;charset=utf-8',
    estimateFileName(r, place, 'csv', 'monthly'),
  );
}
