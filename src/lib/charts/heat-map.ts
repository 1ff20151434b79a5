/**
 * Geometry of the month × hour-of-day heat map of typical WBGT: months across (band scale), local
 * hours down (band scale), each cell filled from the site's temperature ramp (ramp.ts, from
 * d3-scale-chromatic, clamped to the domain), and a legend of swatches with value ticks and a tick per
 * class limit. Cells of one colour share one SVG path. Pure.
 */
import { scaleBand } from 'd3-scale';
import { buildLegend, colourOf, wbgtColourScale, type LegendGeometry } from './ramp.ts';

export interface HeatMapSpec {
  /** Column labels (months). */
  columns: string[];
  /** Row labels (hours). */
  rows: string[];
  /** Value of a cell [°C]; NaN = no data. ±Infinity are drawn at the ends of the ramp. */
  value(col: number, row: number): number;
  /** Colour domain [°C]. */
  domain: [number, number];
  /** Marks on the legend (e.g. class limits) [°C]. */
  limits?: Array<{ key: string; label: string; value: number }>;
  width?: number;
  cellHeight?: number;
}

export interface HeatCell {
  col: number;
  row: number;
  x: number;
  y: number;
  width: number;
  height: number;
  /** [°C] */
  value: number;
  fill: string;
}

export interface HeatMapGeometry {
  width: number;
  height: number;
  plot: { left: number; right: number; top: number; bottom: number };
  cells: HeatCell[];
  /**
   * The cells as one SVG path per colour (a rectangle `M x,y h w v h h −w Z` per cell, coordinates
   * to 0.1 px), in order of first appearance: a few dozen elements instead of 288.
   */
  paths: Array<{ fill: string; d: string; cells: number }>;
  colLabels: Array<{ label: string; x: number }>;
  rowLabels: Array<{ label: string; y: number }>;
  legend: LegendGeometry & { y: number; height: number };
  limitTicks: Array<{ key: string; label: string; value: number; x: number }>;
}

export function buildHeatMap(spec: HeatMapSpec): HeatMapGeometry {
  const width = spec.width ?? 720;
  const cellH = spec.cellHeight ?? 14;
  const left = 52;
  const right = width - 12;
  const top = 22;
  const bottom = top + cellH * spec.rows.length;
  const x = scaleBand<number>()
    .domain(spec.columns.map((_, i) => i))
    .range([left, right])
    .paddingInner(0.04);
  const y = scaleBand<number>()
    .domain(spec.rows.map((_, i) => i))
    .range([top, bottom])
    .paddingInner(0.08);
  const colour = wbgtColourScale(spec.domain);
  const cells: HeatCell[] = [];
  spec.columns.forEach((_, c) => {
    spec.rows.forEach((__, r) => {
      const v = spec.value(c, r);
      const shown = v === Infinity ? spec.domain[1] : v === -Infinity ? spec.domain[0] : v;
      cells.push({ col: c, row: r, x: x(c) ?? 0, y: y(r) ?? 0, width: x.bandwidth(), height: y.bandwidth(), value: v, fill: colourOf(colour, shown) });
    });
  });
  const legendY = bottom + 22;
  const legend = { ...buildLegend(colour, left, Math.min(420, right - left)), y: legendY, height: 12 };
  const limitTicks = (spec.limits ?? []).map((l) => ({ ...l, x: legend.position(l.value) }));
  const byFill = new Map<string, { fill: string; d: string; cells: number }>();
  const r1 = (v: number) => Math.round(v * 10) / 10;
  for (const c of cells) {
    let p = byFill.get(c.fill);
    if (!p) byFill.set(c.fill, (p = { fill: c.fill, d: '', cells: 0 }));
    const x0 = r1(c.x);
    const y0 = r1(c.y);
    // Edges rounded first, so neighbouring cells keep the same gap.
    p.d += `M${x0},${y0}h${r1(r1(c.x + c.width) - x0)}v${r1(r1(c.y + c.height) - y0)}h${-r1(r1(c.x + c.width) - x0)}Z`;
    p.cells++;
  }
  return {
    width,
    height: legendY + 12 + 40,
    plot: { left, right, top, bottom },
    cells,
    paths: [...byFill.values()],
    colLabels: spec.columns.map((label, i) => ({ label, x: (x(i) ?? 0) + x.bandwidth() / 2 })),
    rowLabels: spec.rows.map((label, i) => ({ label, y: (y(i) ?? 0) + y.bandwidth() / 2 })),
    legend,
    limitTicks,
  };
}
