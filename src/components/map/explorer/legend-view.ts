/**
 * Draws a layer's legend from its manifest legend: a continuous ramp as an SVG gradient through
 * the legend's stops (the exact PNG colours at those values) with a tick per stop, or one
 * swatch per class. Temperatures follow the °C/°F switch. Only DOM and SVG attributes are set,
 * never inline styles (the Content-Security-Policy forbids them).
 */
import type { TemperatureUnit } from '../../../lib/units.ts';
import type { ExplorerLegend } from './catalogue.ts';
import { legendTickLabel, unitLabel } from './value-format.ts';

const SVG = 'http://www.w3.org/2000/svg';

function svg<K extends keyof SVGElementTagNameMap>(name: K, attrs: Record<string, string | number>): SVGElementTagNameMap[K] {
  const el = document.createElementNS(SVG, name);
  for (const [k, v] of Object.entries(attrs)) el.setAttribute(k, String(v));
  return el;
}

function el<K extends keyof HTMLElementTagNameMap>(name: K, cls?: string, text?: string): HTMLElementTagNameMap[K] {
  const e = document.createElement(name);
  if (cls) e.className = cls;
  if (text !== undefined) e.textContent = text;
  return e;
}

/** Width and height of the ramp's drawing [SVG user units]; the SVG scales to its box. */
const W = 240;
const PAD = 12;

function continuous(legend: ExplorerLegend, unit: TemperatureUnit, caption: string): SVGSVGElement {
  const root = svg('svg', { viewBox: `0 0 ${W} 34`, class: 'legend-ramp', role: 'img', 'aria-label': caption });
  const defs = svg('defs', {});
  const grad = svg('linearGradient', { id: 'map-legend-gradient', x1: 0, x2: 1, y1: 0, y2: 0 });
  const [lo, hi] = legend.domain ?? [legend.stops[0].value, legend.stops[legend.stops.length - 1].value];
  const span = hi - lo || 1;
  for (const s of legend.stops) grad.append(svg('stop', { offset: ((s.value - lo) / span).toFixed(4), 'stop-color': s.color }));
  defs.append(grad);
  root.append(defs, svg('rect', { x: PAD, y: 2, width: W - 2 * PAD, height: 14, fill: 'url(#map-legend-gradient)', stroke: '#56626b', 'stroke-width': 0.5 }));
  legend.stops.forEach((s, i) => {
    const x = PAD + ((s.value - lo) / span) * (W - 2 * PAD);
    root.append(svg('line', { x1: x, x2: x, y1: 16, y2: 20, stroke: '#1d252c', 'stroke-width': 0.8 }));
    // Every other tick is labelled when there are many, so labels do not collide.
    if (legend.stops.length <= 6 || i % 2 === 0 || i === legend.stops.length - 1) {
      const t = svg('text', { x, y: 31, 'text-anchor': 'middle', 'font-size': 11, fill: '#1d252c', 'data-legend-value': s.value });
      t.textContent = legendTickLabel(legend, i, unit);
      root.append(t);
    }
  });
  return root;
}

function classes(legend: ExplorerLegend, unit: TemperatureUnit): HTMLUListElement {
  const ul = el('ul', 'legend-classes');
  legend.stops.forEach((s, i) => {
    const li = el('li');
    li.dataset.legendValue = String(s.value);
    const sw = svg('svg', { width: 16, height: 16, viewBox: '0 0 16 16', 'aria-hidden': 'true', class: 'legend-swatch' });
    sw.append(svg('rect', { x: 0.5, y: 0.5, width: 15, height: 15, fill: s.color, stroke: '#56626b', 'stroke-width': 0.5 }));
    li.append(sw, el('span', undefined, ` ${legendTickLabel(legend, i, unit)}`));
    ul.append(li);
  });
  return ul;
}

/** Fills `box` with the legend; `title` names the layer and period. */
export function renderLegend(box: HTMLElement, legend: ExplorerLegend, title: string, unit: TemperatureUnit, invented: boolean): void {
  box.replaceChildren();
  const u = unitLabel(legend.units, unit);
  const head = el('p', 'legend-title');
  head.append(el('strong', undefined, title));
  if (u) {
    const span = el('span', 'legend-unit', ` [${u}]`);
    span.dataset.legendUnit = u;
    head.append(span);
  }
  box.append(head);
  const caption = legend.domain
    ? `Colour ramp from ${legendTickLabel(legend, 0, unit)} to ${legendTickLabel(legend, legend.stops.length - 1, unit)} ${u}`
    : 'Classes';
  box.append(legend.kind === 'continuous' ? continuous(legend, unit, caption) : classes(legend, unit));
  const notes = el('p', 'legend-notes');
  notes.textContent =
    (legend.kind === 'continuous' && legend.outOfDomain === 'clamped' ? 'Values beyond the ends take the end colours. ' : '') +
    `No colour: ${legend.noData.meaning}.` +
    (invented ? ' Invented data.' : '');
  box.append(notes);
  box.dataset.legendUnits = legend.units;
}
