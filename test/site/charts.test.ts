/**
 * The report's pure chart builders (src/lib/charts/) and the figures they draw from
 * (src/lib/report/). Geometry is checked against scales built here from first principles (a
 * linear map written out by hand) or against general libraries: d3-scale-chromatic for the
 * colours, d3-geo's geoArea / geoContains for the map (a general-purpose geographic library), and
 * the textbook grouped-data median for the binned quantile.
 */
import { describe, expect, it } from 'vitest';
import { geoArea, geoContains } from 'd3-geo';
import { interpolateCividis, interpolateReds } from 'd3-scale-chromatic';
import type { Polygon } from 'geojson';
import { buildMonthlyBars } from '../../src/lib/charts/monthly-bars.ts';
import { buildHeatMap } from '../../src/lib/charts/heat-map.ts';
import { buildNicheStrip, NICHE_AXIS } from '../../src/lib/charts/niche-strip.ts';
import { buildRegionMap, graticuleStep, rewindForD3 } from '../../src/lib/charts/region-map.ts';
import { NO_DATA_COLOUR } from '../../src/lib/charts/ramp.ts';
import { dataNumber, px } from '../../src/lib/charts/svg-number.ts';
import { binnedQuantile } from '../../src/lib/report/hour-matrix.ts';
import { formatRuns, hoursAbove, runHours } from '../../src/lib/report/hour-ranges.ts';
import { classLimits, isAbove, type ClassLimit } from '../../src/lib/report/limits.ts';
import { classesDefaultFirst, defaultWorkloadClass } from '../../src/lib/report/selection.ts';
import type { AtlasManifest } from '../../src/data/atlas-manifest.ts';
import { compareForRanking, rankBy } from '../../src/lib/report/ranking.ts';
import { NICHE_BOUNDS } from '../../pipeline/climate/niche.ts';
import { NICHE_COLOURS } from '../../pipeline/publish/layers/niche-style.ts';
import { WBGT_BIN_EDGES, WBGT_HISTOGRAM_LENGTH } from '../../pipeline/work/wbgt-bins.ts';

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];
/** d3-scale-chromatic's ramps return `#rrggbb`; compare in lower case. */
/** A colour as `#rrggbb` in lower case (d3-scale-chromatic returns `#rrggbb` or `rgb(r, g, b)`). */
const hex = (c: string) => {
  const m = /^rgb\((\d+), ?(\d+), ?(\d+)\)$/.exec(c);
  return m
    ? `#${m
        .slice(1)
        .map((v) => Number(v).toString(16).padStart(2, '0'))
        .join('')}`
    : c.toLowerCase();
};

describe('monthly bar chart', () => {
  const means = [0, 1, 3, 10, 40, 70, 90, 95, 60, 20, 5, 0.5];
  const p90s = means.map((m) => m * 1.2 + 1);
  const geometry = buildMonthlyBars({
    categories: MONTHS,
    series: [
      { key: 'a', label: 'A', colour: '#000', values: means.map((mean, i) => ({ mean, p90: p90s[i] })) },
      { key: 'b', label: 'B', colour: '#fff', values: means.map((mean, i) => ({ mean: i === 3 ? NaN : mean * 2, p90: NaN })) },
    ],
  });
  const { plot, yMax } = geometry;
  const yOf = (v: number) => plot.bottom - (v / yMax) * (plot.bottom - plot.top);

  it('puts each bar top and each 90th-percentile tick where a zero-based linear hours axis puts its value', () => {
    expect(yMax).toBeGreaterThanOrEqual(Math.max(...means.map((m) => m * 2), ...p90s));
    for (const b of geometry.bars) {
      expect(b.y).toBeCloseTo(yOf(b.value), 9);
      expect(b.y + b.height).toBeCloseTo(plot.bottom, 9);
    }
    expect(geometry.marks).toHaveLength(12);
    geometry.marks.forEach((m, i) => expect(m.y).toBeCloseTo(yOf(p90s[i]), 9));
  });

  it('places the bars of a month side by side inside its twelfth of the plot, in month order, and leaves out missing values', () => {
    const slot = (plot.right - plot.left) / 12;
    for (const b of geometry.bars) {
      const i = MONTHS.indexOf(b.category);
      expect(b.x).toBeGreaterThanOrEqual(plot.left + i * slot - 1e-9);
      expect(b.x + b.width).toBeLessThanOrEqual(plot.left + (i + 1) * slot + 1e-9);
    }
    const a = geometry.bars.filter((b) => b.series === 'a');
    const bs = geometry.bars.filter((b) => b.series === 'b');
    expect(a).toHaveLength(12);
    expect(bs).toHaveLength(11); // April of series b has no value
    for (const b of bs) expect(b.x).toBeGreaterThan(a.find((x) => x.category === b.category)!.x);
  });

  it('draws the ticks of a series as one SVG path of horizontal strokes at the tick positions', () => {
    const d = geometry.markPaths.find((p) => p.series === 'a')!.d;
    const moves = [...d.matchAll(/M([\d.-]+),([\d.-]+)L([\d.-]+),([\d.-]+)/g)];
    expect(moves).toHaveLength(12);
    moves.forEach((m, i) => {
      expect(Number(m[2])).toBeCloseTo(geometry.marks[i].y, 6);
      expect(Number(m[4])).toBeCloseTo(geometry.marks[i].y, 6);
      expect(Number(m[1])).toBeCloseTo(geometry.marks[i].x1, 6);
    });
    expect(geometry.markPaths.find((p) => p.series === 'b')!.d).toBe('');
  });

  it('keeps an axis of 0–1 h when every month is zero, so no bar divides by zero', () => {
    const g = buildMonthlyBars({ categories: MONTHS, series: [{ key: 'z', label: 'Z', colour: '#000', values: MONTHS.map(() => ({ mean: 0, p90: 0 })) }] });
    expect(g.yMax).toBe(1);
    for (const b of g.bars) expect(b.height).toBe(0);
  });
});

describe('heat map of typical WBGT', () => {
  const domain: [number, number] = [10, 35];
  const value = (c: number, r: number) => (c === 0 && r === 0 ? NaN : c === 1 && r === 0 ? Infinity : 12 + c * 1.5 + r * 0.5);
  const hours = Array.from({ length: 24 }, (_, h) => String(h));
  const g = buildHeatMap({ columns: MONTHS, rows: hours, value, domain, limits: [{ key: 'x', label: 'X', value: 28.21 }] });

  it('colours each cell with the temperature ramp (cividis, as the map layers) at its place in the 10–35 °C domain (clamped), and marks missing cells grey', () => {
    expect(g.cells).toHaveLength(12 * 24);
    for (const c of g.cells) {
      const v = value(c.col, c.row);
      if (Number.isNaN(v)) expect(c.fill).toBe(NO_DATA_COLOUR);
      else {
        const t = Math.min(1, Math.max(0, ((v === Infinity ? 35 : v) - 10) / 25));
        expect(hex(c.fill)).toBe(hex(interpolateCividis(t)));
      }
    }
  });

  it('lays months across and hours down, in order, without overlap, inside the plot', () => {
    const at = (c: number, r: number) => g.cells.find((x) => x.col === c && x.row === r)!;
    for (let c = 1; c < 12; c++) expect(at(c, 0).x).toBeGreaterThanOrEqual(at(c - 1, 0).x + at(c - 1, 0).width);
    for (let r = 1; r < 24; r++) expect(at(0, r).y).toBeGreaterThanOrEqual(at(0, r - 1).y + at(0, r - 1).height);
    expect(at(0, 0).x).toBeGreaterThanOrEqual(g.plot.left);
    expect(at(11, 23).x + at(11, 23).width).toBeLessThanOrEqual(g.plot.right + 1e-9);
    expect(at(11, 23).y + at(11, 23).height).toBeLessThanOrEqual(g.plot.bottom + 1e-9);
  });

  it('draws the cells as one path per colour whose rectangles are the cells, to 0.1 px', () => {
    expect(g.paths.reduce((n, p) => n + p.cells, 0)).toBe(288);
    expect(new Set(g.paths.map((p) => p.fill)).size).toBe(g.paths.length);
    for (const p of g.paths) {
      const rects = [...p.d.matchAll(/M([\d.]+),([\d.]+)h([\d.]+)v([\d.]+)h-([\d.]+)Z/g)];
      expect(rects).toHaveLength(p.cells);
      expect(rects.map((m) => m[0]).join('')).toBe(p.d);
      for (const m of rects) {
        const [x, y, w, h] = [1, 2, 3, 4].map((i) => Number(m[i]));
        const cell = g.cells.find((c) => c.fill === p.fill && Math.abs(c.x - x) <= 0.05 && Math.abs(c.y - y) <= 0.05)!;
        expect(cell).toBeDefined();
        expect(Math.abs(x + w - (cell.x + cell.width))).toBeLessThanOrEqual(0.1 + 1e-9);
        expect(Math.abs(y + h - (cell.y + cell.height))).toBeLessThanOrEqual(0.1 + 1e-9);
        expect(Number(m[5])).toBe(w);
      }
    }
  });

  it('puts legend ticks and the limit mark where a linear map of the domain onto the legend puts them', () => {
    const { x, width } = g.legend;
    const pos = (v: number) => x + ((v - 10) / 25) * width;
    expect(g.legend.ticks.map((t) => t.value)).toContain(20);
    for (const t of g.legend.ticks) expect(t.x).toBeCloseTo(pos(t.value), 9);
    expect(g.limitTicks[0].x).toBeCloseTo(pos(28.21), 9);
    // The swatches run the whole legend with the temperature ramp's colours in order.
    expect(g.legend.swatches[0].x).toBeCloseTo(x, 9);
    const last = g.legend.swatches[g.legend.swatches.length - 1];
    expect(last.x + last.width).toBeCloseTo(x + width, 9);
    for (const s of g.legend.swatches) expect(hex(s.fill)).toBe(hex(interpolateCividis((s.value - 10) / 25)));
  });
});

describe('niche strip', () => {
  it('draws the bands at the published bounds (11, 15, 20, 25, 29 °C) in the niche map colours, edge to edge', () => {
    const g = buildNicheStrip({ baselineMat: 27.6, latestMat: 27.9 });
    expect(g.domain).toEqual(NICHE_AXIS);
    const [lo, hi] = g.domain;
    const xOf = (v: number) => 16 + ((v - lo) / (hi - lo)) * (g.width - 32);
    expect(g.bands.map((b) => [b.cls, b.from, b.to])).toEqual([
      ['margin', 0, NICHE_BOUNDS.coreLow],
      ['core', 11, 15],
      ['margin', 15, 20],
      ['second', 20, 25],
      ['margin', 25, 29],
      ['outside', 29, 35],
    ]);
    for (const b of g.bands) {
      expect(b.x).toBeCloseTo(xOf(b.from), 9);
      expect(b.x + b.width).toBeCloseTo(xOf(b.to), 9);
      expect(b.fill).toBe(NICHE_COLOURS[b.cls]);
    }
    expect(g.markers.map((m) => m.key)).toEqual(['baseline', 'latest']);
    expect(g.markers[0].x).toBeCloseTo(xOf(27.6), 9);
    expect(g.markers[1].x).toBeCloseTo(xOf(27.9), 9);
  });

  it('widens the axis for a mean annual temperature beyond it and leaves out a marker that is not known', () => {
    const g = buildNicheStrip({ baselineMat: 36.4, latestMat: NaN });
    expect(g.domain[1]).toBeGreaterThanOrEqual(38.4);
    expect(g.markers).toHaveLength(1);
    expect(g.markers[0].x).toBeLessThan(g.width - 16 + 1e-9);
    const outside = g.bands.find((b) => b.cls === 'outside')!;
    expect(outside.to).toBe(g.domain[1]);
  });
});

describe('home region map', () => {
  // An RFC 7946 polygon (exterior counter-clockwise), 1° × 1°, and a second one beside it.
  const ccw = (w: number, s: number): Polygon => ({
    type: 'Polygon',
    coordinates: [
      [
        [w, s],
        [w + 1, s],
        [w + 1, s + 1],
        [w, s + 1],
        [w, s],
      ],
    ],
  });

  it('rewinds RFC 7946 rings so d3-geo reads the small polygon, not the rest of the sphere', () => {
    const p = ccw(-146, 20);
    expect(geoArea(p)).toBeGreaterThan(2 * Math.PI); // d3 reads it inside out
    const fixed = rewindForD3(p) as Polygon;
    // Area of a 1° × 1° cell on the unit sphere: Δλ (sin φ2 − sin φ1) (spherical geometry).
    const expected = (Math.PI / 180) * (Math.sin((21 * Math.PI) / 180) - Math.sin((20 * Math.PI) / 180));
    expect(geoArea(fixed)).toBeCloseTo(expected, 6);
    expect(geoContains(fixed, [-145.5, 20.5])).toBe(true);
    // Already clockwise: unchanged.
    expect(rewindForD3(fixed)).toBe(fixed);
  });

  it('fits the regions inside the frame, fills each from the hours ramp (Reds, as the map layers: white for none, dark red for many) by its value, and keeps each centroid inside its outline', () => {
    const g = buildRegionMap({
      regions: [
        { id: 'a', name: 'A', geometry: ccw(-146, 20), value: 0 },
        { id: 'b', name: 'B', geometry: ccw(-145, 20), value: 300 },
        { id: 'c', name: 'C', geometry: ccw(-146, 21), value: NaN },
      ],
    });
    expect(hex(g.regions[0].fill)).toBe(hex(interpolateReds(0)));
    expect(hex(g.regions[1].fill)).toBe(hex(interpolateReds(1)));
    expect(g.regions[2].fill).toBe(NO_DATA_COLOUR);
    for (const r of g.regions) {
      const nums = [...r.d.matchAll(/[\d.]+/g)].map((m) => Number(m[0]));
      for (let i = 0; i + 1 < nums.length; i += 2) {
        expect(nums[i]).toBeGreaterThanOrEqual(10 - 0.05);
        expect(nums[i]).toBeLessThanOrEqual(g.width - 10 + 0.05);
      }
    }
    // Mercator keeps east to the right and north up: B (east of A) has the larger x, C (north of A) the smaller y.
    expect(g.regions[1].centroid[0]).toBeGreaterThan(g.regions[0].centroid[0]);
    expect(g.regions[2].centroid[1]).toBeLessThan(g.regions[0].centroid[1]);
    const [cx, cy] = g.project([-145.5, 20.5]);
    expect(Math.abs(cx - g.regions[0].centroid[0])).toBeLessThan(1);
    expect(Math.abs(cy - g.regions[0].centroid[1])).toBeLessThan(1);
    expect(g.graticule.length).toBeGreaterThan(0);
  });

  it('picks a graticule step of 1, 2 or 5 times a power of ten giving about four lines', () => {
    expect(graticuleStep(3)).toBe(1);
    expect(graticuleStep(10)).toBe(5);
    expect(graticuleStep(40)).toBe(10);
    expect(graticuleStep(0.6)).toBe(0.2);
  });
});

describe('figures behind the charts', () => {
  it('the binned median is the grouped-data median lo + (N/2 − F)/f·w, with open end bins as ±Infinity', () => {
    const counts = new Float64Array(WBGT_HISTOGRAM_LENGTH);
    // Hours 2 in [20, 20.25), 6 in [20.25, 20.5), 2 in [20.5, 20.75): N = 10, median bin [20.25, 20.5), F = 2, f = 6.
    const bin = (lo: number) => 1 + Math.round((lo - 5) / 0.25);
    counts[bin(20)] = 2;
    counts[bin(20.25)] = 6;
    counts[bin(20.5)] = 2;
    expect(WBGT_BIN_EDGES[bin(20.25) - 1]).toBe(20.25);
    expect(binnedQuantile(counts, 0.5)).toBeCloseTo(20.25 + ((5 - 2) / 6) * 0.25, 12);
    expect(binnedQuantile(counts, 0.2)).toBeCloseTo(20.25, 12);
    const low = new Float64Array(WBGT_HISTOGRAM_LENGTH);
    low[0] = 3;
    low[bin(30)] = 1;
    expect(binnedQuantile(low, 0.5)).toBe(-Infinity);
    const high = new Float64Array(WBGT_HISTOGRAM_LENGTH);
    high[WBGT_HISTOGRAM_LENGTH - 1] = 3;
    expect(binnedQuantile(high, 0.5)).toBe(Infinity);
    expect(binnedQuantile(new Float64Array(WBGT_HISTOGRAM_LENGTH), 0.5)).toBeNaN();
  });

  it('an hour is above a limit only when WBGT plus the clothing adjustment is strictly above it; runs of such hours read as clock ranges', () => {
    const limit: ClassLimit = {
      workloadClass: 'm',
      className: 'M',
      metabolicRate: 300,
      acclimatization: 'acclimatized',
      limit: 28.21,
      clothingAdjustment: 1,
      threshold: 27.21,
    };
    expect(isAbove(27.21, limit)).toBe(false);
    expect(isAbove(27.22, limit)).toBe(true);
    expect(isAbove(NaN, limit)).toBe(false);
    const values = new Float64Array(12 * 24).fill(20);
    for (const h of [10, 11, 12, 13, 16, 23]) values[6 * 24 + h] = 30;
    const runs = hoursAbove({ statistic: 'median', exposure: 'sun', years: [2021], values, hours: new Float64Array(12 * 24) }, 6, limit);
    expect(runs).toEqual([
      { start: 10, end: 14 },
      { start: 16, end: 17 },
      { start: 23, end: 24 },
    ]);
    expect(formatRuns(runs)).toBe('10:00–14:00, 16:00–17:00, 23:00–24:00');
    expect(runHours(runs)).toBe(6);
    expect(formatRuns([])).toBe('none');
  });

  it("takes the class limits from the atlas's limit model and clothing adjustment (ISO 7243:1989 table, docs/methods.md §8.3)", () => {
    const work = {
      classes: [
        { id: 'light', name: 'Light', metabolicRate: 180 },
        { id: 'heavy', name: 'Heavy', metabolicRate: 415 },
      ],
      limitModel: 'table-1989',
      airMovement: false,
      acclimatization: ['acclimatized', 'unacclimatized'],
      clothingAdjustment: 2,
    };
    const limits = classLimits({ work } as unknown as AtlasManifest);
    // ISO 7243:1989 reference values: class 1 30 / 29 °C, class 3 (no air movement) 25 / 22 °C.
    expect(limits.map((l) => [l.workloadClass, l.acclimatization, l.limit, l.threshold])).toEqual([
      ['light', 'acclimatized', 30, 28],
      ['light', 'unacclimatized', 29, 27],
      ['heavy', 'acclimatized', 25, 23],
      ['heavy', 'unacclimatized', 22, 20],
    ]);
    expect(isAbove(23.01, limits[2])).toBe(true);
    expect(isAbove(23, limits[2])).toBe(false);
    // No class called moderate: the first class is the default, and it comes first.
    expect(defaultWorkloadClass({ work } as unknown as AtlasManifest).id).toBe('light');
    expect(
      classesDefaultFirst({ work: { ...work, classes: [...work.classes, { id: 'moderate', name: 'M', metabolicRate: 300 }] } } as unknown as AtlasManifest).map(
        (c) => c.id,
      ),
    ).toEqual(['moderate', 'light', 'heavy']);
  });

  it('ranks most hours first, regions without a value last, equal values by name', () => {
    const items = [
      { id: 'c', name: 'Cee', v: 5 },
      { id: 'a', name: 'Ay', v: NaN },
      { id: 'b', name: 'Bee', v: 9 },
      { id: 'd', name: 'Dee', v: 5 },
    ];
    expect(rankBy(items, (x) => x.v).map((x) => x.id)).toEqual(['b', 'c', 'd', 'a']);
    expect(compareForRanking(NaN, NaN)).toBe(0);
  });

  it('rounds SVG coordinates to 0.1 px and data values to 3 decimals, keeping ±Infinity and dropping NaN', () => {
    expect(px(12.3456)).toBe('12.3');
    expect(dataNumber(28.123456)).toBe('28.123');
    expect(dataNumber(Infinity)).toBe('Infinity');
    expect(dataNumber(NaN)).toBe('');
  });
});
