/**
 * Geometry of the monthly bar chart: per month, one bar per series (its mean [h]) with a tick at
 * its 90th-percentile year. Scales from d3-scale (band for months and series, linear for hours,
 * zero-based and "nice"), the P90 ticks as SVG path strings from d3-shape's `line`. Pure: the
 * component only draws what this returns.
 */
import { scaleBand, scaleLinear } from 'd3-scale';
import { line } from 'd3-shape';

export interface BarValue {
  /** [h] NaN = no value */
  mean: number;
  /** [h] NaN = no value */
  p90: number;
}

export interface BarSeries {
  key: string;
  label: string;
  colour: string;
  /** One value per category. */
  values: BarValue[];
}

export interface MonthlyBarsSpec {
  categories: string[];
  series: BarSeries[];
  width?: number;
  height?: number;
  margin?: { top: number; right: number; bottom: number; left: number };
}

export interface Bar {
  series: string;
  category: string;
  x: number;
  y: number;
  width: number;
  height: number;
  /** [h] */
  value: number;
}

export interface P90Mark {
  series: string;
  category: string;
  x1: number;
  x2: number;
  y: number;
  /** [h] */
  value: number;
}

export interface MonthlyBarsGeometry {
  width: number;
  height: number;
  plot: { left: number; right: number; top: number; bottom: number };
  bars: Bar[];
  marks: P90Mark[];
  /** One path per series with all its P90 ticks. */
  markPaths: Array<{ series: string; colour: string; d: string }>;
  yTicks: Array<{ value: number; y: number }>;
  xLabels: Array<{ label: string; x: number }>;
  /** Top of the hours axis [h]. */
  yMax: number;
  /** hours → y */
  y(v: number): number;
}

const lineOf = line<[number, number]>();

export function buildMonthlyBars(spec: MonthlyBarsSpec): MonthlyBarsGeometry {
  const width = spec.width ?? 720;
  const height = spec.height ?? 260;
  const m = spec.margin ?? { top: 12, right: 12, bottom: 28, left: 48 };
  const plot = { left: m.left, right: width - m.right, top: m.top, bottom: height - m.bottom };
  const x = scaleBand<string>().domain(spec.categories).range([plot.left, plot.right]).paddingInner(0.2).paddingOuter(0.1);
  const inner = scaleBand<string>()
    .domain(spec.series.map((s) => s.key))
    .range([0, x.bandwidth()])
    .paddingInner(0.08);
  let top = 0;
  for (const s of spec.series) for (const v of s.values) for (const n of [v.mean, v.p90]) if (Number.isFinite(n) && n > top) top = n;
  const y = scaleLinear()
    .domain([0, top > 0 ? top : 1])
    .nice()
    .range([plot.bottom, plot.top]);
  const bars: Bar[] = [];
  const marks: P90Mark[] = [];
  for (const s of spec.series) {
    spec.categories.forEach((c, i) => {
      const v = s.values[i];
      const x0 = (x(c) ?? 0) + (inner(s.key) ?? 0);
      const w = inner.bandwidth();
      if (v && Number.isFinite(v.mean)) bars.push({ series: s.key, category: c, x: x0, y: y(v.mean), width: w, height: y(0) - y(v.mean), value: v.mean });
      if (v && Number.isFinite(v.p90)) marks.push({ series: s.key, category: c, x1: x0, x2: x0 + w, y: y(v.p90), value: v.p90 });
    });
  }
  const markPaths = spec.series.map((s) => ({
    series: s.key,
    colour: s.colour,
    d: marks
      .filter((mk) => mk.series === s.key)
      .map(
        (mk) =>
          lineOf([
            [mk.x1, mk.y],
            [mk.x2, mk.y],
          ]) ?? '',
      )
      .join(''),
  }));
  return {
    width,
    height,
    plot,
    bars,
    marks,
    markPaths,
    yTicks: y.ticks(5).map((value) => ({ value, y: y(value) })),
    xLabels: spec.categories.map((label) => ({ label, x: (x(label) ?? 0) + x.bandwidth() / 2 })),
    yMax: y.domain()[1],
    y: (v) => y(v),
  };
}
