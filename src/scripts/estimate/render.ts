/**
 * Draws an estimate into the page: the settings (temperatures as data-temp-c / data-temp-delta-c
 * spans, so the °C/°F switch rewrites them), the table rows, and the CSV download as a Blob link.
 * Text only through textContent (no markup from data).
 */
import { estimateCsv, estimateFileName } from '../../lib/estimate/csv.ts';
import type { EstimateContext } from '../../lib/estimate/context.ts';
import type { EstimateResult } from '../../lib/estimate/estimate.ts';
import { summaryLines, type SummaryPart } from '../../lib/estimate/summary.ts';
import { ESTIMATE_COLUMNS, estimateRows } from '../../lib/estimate/table.ts';
import { formatFixed } from '../../lib/format.ts';
import { formatTemperature, formatTemperatureDelta, type TemperatureUnit } from '../../lib/units.ts';

function part(p: SummaryPart, unit: TemperatureUnit): Node {
  if (typeof p === 'string') return document.createTextNode(p);
  const span = document.createElement('span');
  span.dataset.digits = '1';
  if ('tempC' in p) {
    span.dataset.tempC = String(p.tempC);
    span.textContent = formatTemperature(p.tempC, unit, 1);
  } else {
    span.dataset.tempDeltaC = String(p.deltaC);
    span.textContent = formatTemperatureDelta(p.deltaC, unit, 1);
  }
  return span;
}

/** The settings list. */
export function renderSummary(dl: HTMLElement, r: EstimateResult, ctx: EstimateContext, unit: TemperatureUnit): void {
  dl.replaceChildren();
  for (const line of summaryLines(r, ctx)) {
    const dt = document.createElement('dt');
    dt.textContent = line.label;
    const dd = document.createElement('dd');
    dd.dataset.key = line.key;
    for (const p of line.parts) dd.append(part(p, unit));
    dl.append(dt, dd);
  }
}

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

let csvUrl: string | null = null;

/** Points the download link at a Blob of the CSV (the previous Blob URL is released). */
export function renderCsvLink(a: HTMLAnchorElement, r: EstimateResult, ctx: EstimateContext, atlasTitle: string): void {
  if (csvUrl) URL.revokeObjectURL(csvUrl);
  csvUrl = URL.createObjectURL(new Blob([estimateCsv(r, ctx, atlasTitle)], { type: 'text/csv;charset=utf-8' }));
  a.href = csvUrl;
  a.download = estimateFileName(r);
}
