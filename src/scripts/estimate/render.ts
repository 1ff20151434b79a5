/**
 * Draws an estimate into the page: the settings (temperatures as data-temp-c / data-temp-delta-c
 * spans, so the °C/°F switch rewrites them), the table rows, and the CSV download as a Blob link.
 * Text only through textContent (no markup from data).
 */
import { estimateCsv, estimateFileName } from '../../lib/estimate/csv.ts';
import type { EstimateContext } from '../../../pipeline/schedule/context.ts';
import type { ResolvedPlace } from '../../../pipeline/schedule/place.ts';
import type { EstimateResult } from '../../lib/estimate/estimate.ts';
import type { SummaryLine, SummaryPart } from '../../lib/estimate/summary.ts';
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
export function renderSummary(dl: HTMLElement, lines: readonly SummaryLine[], unit: TemperatureUnit): void {
  dl.replaceChildren();
  for (const line of lines) {
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


/** Points the monthly table's download link at a Blob of its CSV. */
export function renderCsvLink(a: HTMLAnchorElement, r: EstimateResult, ctx: EstimateContext, atlasTitle: string, place: ResolvedPlace): void {
  setDownload(a, estimateCsv(r, ctx, atlasTitle, place), 'text/csv;charset=utf-8', estimateFileName(r, place, 'csv', 'monthly'));
}

const urls = new Map<HTMLAnchorElement, string>();

/** Points a download link at a Blob of `text` (the link's previous Blob URL is released). */
export function setDownload(a: HTMLAnchorElement, text: string, type: string, name: string): void {
  const old = urls.get(a);
  if (old) URL.revokeObjectURL(old);
  const url = URL.createObjectURL(new Blob([text], { type }));
  urls.set(a, url);
  a.href = url;
  a.download = name;
}
