/**
 * Draws the settings into the page (temperatures as data-temp-c / data-temp-delta-c spans, so the
 * °C/°F switch rewrites them) and points download links at Blobs. Text only through textContent
 * (no markup from data).
 */
import type { SummaryLine, SummaryPart } from '../../lib/estimate/summary.ts';
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
