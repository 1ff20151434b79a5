/** Pure helpers of the site: number formatting, grid geometry, the CSP string, colour blending. */
import { describe, expect, it } from 'vitest';
import { formatBytes, formatCount, formatFixed, formatLat, formatLon, formatUtc, formatValue } from '../../src/lib/format.ts';
import { gridCellLines, gridEdges, gridExtentPolygon, gridMapEdges, MAP_LAT_LIMIT, MAX_DRAWN_CELLS } from '../../src/components/map/grid-geometry.ts';
import { CONTENT_SECURITY_POLICY, CONTENT_SECURITY_POLICY_HEADER } from '../../src/lib/content-security-policy.ts';
import { blendOver } from '../../src/components/map/map-colours.ts';
import { parseShownNumber } from './browser.ts';

const grid = { latMin: 10, latMax: 14, lonMin: 60, lonMax: 64, nLat: 9, nLon: 9, dLat: 0.5, dLon: 0.5, landCells: 57 };

describe('formatting', () => {
  it('formatFixed prints a true minus sign and never a negative zero', () => {
    expect(formatFixed(-3.75, 2)).toBe('\u22123.75');
    expect(formatFixed(-0.001, 2)).toBe('0.00');
    expect(formatFixed(Number.NaN, 2)).toBe('–');
  });

  it('formatValue keeps 2 decimals below 100, 1 below 10 000, and parses back within half a last digit', () => {
    expect(formatValue(28.0462)).toBe('28.05');
    expect(formatValue(1019.87)).toBe('1019.9');
    expect(formatValue(101325)).toBe('101325');
    for (const x of [-3.75, 0, 14.3125, 987.305, 1071.5]) {
      const s = formatValue(x);
      const decimals = (s.split('.')[1] ?? '').length;
      expect(Math.abs(parseShownNumber(s) - x)).toBeLessThanOrEqual(0.5 * 10 ** -decimals + 1e-9);
    }
  });

  it('formatCount groups thousands with thin spaces; formatBytes uses powers of 1000 (SI)', () => {
    expect(formatCount(26280)).toBe('26\u2009280');
    expect(formatCount(81)).toBe('81');
    expect(formatBytes(999)).toBe('999 B');
    expect(formatBytes(48213504)).toBe('48.2 MB');
    expect(formatBytes(1_500_000_000)).toBe('1.50 GB');
  });

  it('formatLat/formatLon name the hemisphere; formatUtc shows minutes in UTC', () => {
    expect(formatLat(-12.5)).toBe('12.50° S');
    expect(formatLon(-0.25, 3)).toBe('0.250° W');
    expect(formatUtc('2021-01-01T01:00:00Z')).toBe('2021-01-01 01:00 UTC');
  });
});

describe('grid geometry', () => {
  it('puts the outer edges half a step beyond the outermost cell centres', () => {
    expect(gridEdges(grid)).toEqual([59.75, 9.75, 64.25, 14.25]);
    expect(gridExtentPolygon(grid).geometry.coordinates[0]).toHaveLength(5);
  });

  it('caps a global grid at ±90° for its edges and at the Web Mercator limit for drawing (MapLibre refuses |lat| > 90)', () => {
    // ERA5's global 0.25° grid: 721 rows of centres from −90° to 90°, 1440 columns from 0° E.
    const global = { latMin: -90, latMax: 90, lonMin: 0, lonMax: 359.75, nLat: 721, nLon: 1440, dLat: 0.25, dLon: 0.25, landCells: 0 };
    expect(gridEdges(global)).toEqual([-0.125, -90, 359.875, 90]);
    expect(gridMapEdges(global)).toEqual([-0.125, -MAP_LAT_LIMIT, 359.875, MAP_LAT_LIMIT]);
    for (const [, lat] of gridExtentPolygon(global).geometry.coordinates[0]) expect(Math.abs(lat)).toBeLessThanOrEqual(MAP_LAT_LIMIT);
    const tall = { ...global, nLon: 10, lonMax: 2.25 };
    for (const f of gridCellLines(tall).features) for (const [, lat] of f.geometry.coordinates) expect(Math.abs(lat)).toBeLessThanOrEqual(MAP_LAT_LIMIT);
  });

  it('draws nLon + 1 meridians and nLat + 1 parallels, and none for a grid above MAX_DRAWN_CELLS', () => {
    expect(gridCellLines(grid).features).toHaveLength(10 + 10);
    const big = { ...grid, nLat: 1000, nLon: MAX_DRAWN_CELLS / 1000 + 1 };
    expect(gridCellLines(big).features).toHaveLength(0);
  });
});

describe('the Content-Security-Policy', () => {
  it('allows only the site itself (and blob:/data: where MapLibre needs them), with no unsafe-inline or eval', () => {
    for (const policy of [CONTENT_SECURITY_POLICY, CONTENT_SECURITY_POLICY_HEADER]) {
      expect(policy).not.toMatch(/unsafe-/);
      expect(policy).not.toMatch(/https?:|\*/);
      expect(policy).toMatch(/script-src 'self'(;|$)/);
      expect(policy).toMatch(/default-src 'self'/);
    }
    expect(CONTENT_SECURITY_POLICY).not.toMatch(/frame-ancestors/);
    expect(CONTENT_SECURITY_POLICY_HEADER).toMatch(/frame-ancestors 'none'/);
  });
});

describe('blendOver', () => {
  it('mixes sRGB bytes linearly by opacity, as WebGL blending with SRC_ALPHA/ONE_MINUS_SRC_ALPHA does', () => {
    expect(blendOver([255, 0, 0], [0, 0, 255], 0.5)).toEqual([128, 0, 128]);
    expect(blendOver([10, 20, 30], [200, 200, 200], 0)).toEqual([200, 200, 200]);
  });
});
