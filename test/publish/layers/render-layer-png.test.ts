import { describe, expect, it } from 'vitest';
import { interpolateViridis, interpolateYlOrRd } from 'd3-scale-chromatic';
import { renderLayerPng } from '../../../pipeline/publish/layers/render-layer-png.ts';
import type { ContinuousStyle } from '../../../pipeline/publish/layers/style.ts';
import { cssToRgb, decodePng, regularGrid } from './helpers.ts';

// Outside references here: sharp 0.34.5 (libvips) decodes the PNG; the Mercator forward formula
// y = ln(tan(π/4 + φ/2)) (Snyder 1987, USGS PP 1395, eq. 7-2) is written out again below, apart
// from the code under test; colours come from d3-scale-chromatic's interpolators.
const mercY = (latDeg: number) => Math.log(Math.tan(Math.PI / 4 + (latDeg * Math.PI) / 360));

/** Image row holding latitude `lat` on an image spanning [south, north] in Mercator over `height` rows. */
function rowOfLat(lat: number, south: number, north: number, height: number): number {
  return Math.floor(((mercY(north) - mercY(lat)) / (mercY(north) - mercY(south))) * height);
}

/** Image column holding longitude `lon` on an image spanning [west, east] over `width` columns. */
function colOfLon(lon: number, west: number, east: number, width: number): number {
  return Math.floor(((lon - west) / (east - west)) * width);
}

// A tall 1° grid, 20–60 °N, 0–60 °E (40 rows × 60 columns); each row has its own value (its
// index), so each row has its own viridis colour and a pixel tells which row it shows.
const ny = 40;
const nx = 60;
const tall = regularGrid(20.5, 1, ny, 0.5, 1, nx, (y) => y);
const rowStyle: ContinuousStyle = { kind: 'continuous', ramp: 'viridis', domain: [0, ny - 1], units: '1' };
const rowColours = Array.from({ length: ny }, (_, j) => cssToRgb(interpolateViridis(j / (ny - 1))));

function nearestRow(px: [number, number, number, number]): number {
  let best = -1;
  let bestD = Infinity;
  rowColours.forEach((c, j) => {
    const d = Math.abs(c[0] - px[0]) + Math.abs(c[1] - px[1]) + Math.abs(c[2] - px[2]);
    if (d < bestD) {
      bestD = d;
      best = j;
    }
  });
  return best;
}

describe('renderLayerPng', () => {
  it('corner coordinates are the grid cell edges: top-left, top-right, bottom-right, bottom-left', () => {
    const layer = renderLayerPng(tall, rowStyle);
    expect(layer.coordinates).toEqual([
      [0, 60],
      [60, 60],
      [60, 20],
      [0, 20],
    ]);
  });

  it('sharp decodes the PNG as RGBA of the stated size; 8 px per 1° cell across, Mercator-square pixels down', async () => {
    const layer = renderLayerPng(tall, rowStyle);
    const img = await decodePng(layer.png);
    expect([img.width, img.height, img.channels]).toEqual([layer.width, layer.height, 4]);
    expect(layer.width).toBe(nx * 8);
    // Height: Mercator span of 20–60 °N in units of one pixel's width (1°/8 in radians).
    const expected = (mercY(60) - mercY(20)) / (Math.PI / 180 / 8);
    expect(Math.abs(layer.height - expected)).toBeLessThanOrEqual(1);
  });

  it('a cell near the north edge, one near the south edge and one in the middle land in the rows the Mercator formula gives', async () => {
    const layer = renderLayerPng(tall, rowStyle);
    const img = await decodePng(layer.png);
    for (const j of [ny - 1, ny - 2, 0, 1, 20]) {
      const r = rowOfLat(20.5 + j, 20, 60, layer.height);
      const c = colOfLon(30.5, 0, 60, layer.width);
      expect(nearestRow(img.at(c, r))).toBe(j);
    }
  });

  it('every image row shows the grid row its centre latitude falls in (inverse of the test formula, whole column)', async () => {
    const layer = renderLayerPng(tall, rowStyle);
    const img = await decodePng(layer.png);
    const yN = mercY(60);
    const yS = mercY(20);
    let wrong = 0;
    for (let r = 0; r < layer.height; r++) {
      const y = yN - ((r + 0.5) / layer.height) * (yN - yS);
      const lat = (2 * Math.atan(Math.exp(y)) - Math.PI / 2) * (180 / Math.PI);
      const j = Math.min(ny - 1, Math.floor(lat - 20));
      if (nearestRow(img.at(5, r)) !== j) wrong++;
    }
    expect(wrong).toBe(0);
  });

  it('the Mercator stretch matters: a linear-in-latitude resample would put the 40.5 °N cell rows away from where the PNG has it', async () => {
    const layer = renderLayerPng(tall, rowStyle);
    const img = await decodePng(layer.png);
    const j = 20; // centre 40.5 °N
    const linearRow = Math.floor(((60 - 40.5) / 40) * layer.height);
    const mercatorRow = rowOfLat(40.5, 20, 60, layer.height);
    expect(Math.abs(linearRow - mercatorRow)).toBeGreaterThan(16); // more than two cells' worth of pixels at 8 px/cell
    expect(nearestRow(img.at(10, mercatorRow))).toBe(j);
    expect(nearestRow(img.at(10, linearRow))).not.toBe(j);
  });

  it('the pixel at a cell centre has the d3 YlOrRd colour of the cell value (within 1 of 255), fully opaque', async () => {
    // Value = 10·row + col on a 12 × 16 grid at 0.25°, 50–53 °N, over domain [0, 200].
    const g = regularGrid(50.125, 0.25, 12, -2.875, 0.25, 16, (y, x) => 10 * y + x);
    const style: ContinuousStyle = { kind: 'continuous', ramp: 'YlOrRd', domain: [0, 200], units: 'h' };
    const layer = renderLayerPng(g, style);
    const img = await decodePng(layer.png);
    for (const [y, x] of [
      [0, 0],
      [11, 15],
      [6, 7],
      [3, 12],
      [11, 0],
    ]) {
      const v = 10 * y + x;
      const want = cssToRgb(interpolateYlOrRd(v / 200));
      const px = img.at(colOfLon(g.lon[x], -3, 1, layer.width), rowOfLat(g.lat[y], 50, 53, layer.height));
      for (let k = 0; k < 3; k++) expect(Math.abs(px[k] - want[k])).toBeLessThanOrEqual(1);
      expect(px[3]).toBe(255);
    }
  });

  it('values beyond the domain take the end colours; a reversed ramp swaps the ends', async () => {
    const g = regularGrid(0.5, 1, 2, 0.5, 1, 2, (y, x) => (y === 0 ? (x === 0 ? -50 : 10) : x === 0 ? 0 : 500));
    const style: ContinuousStyle = { kind: 'continuous', ramp: 'viridis', domain: [0, 100], units: 'h' };
    const img = await decodePng(renderLayerPng(g, style).png);
    const low = cssToRgb(interpolateViridis(0));
    const high = cssToRgb(interpolateViridis(1));
    // south-west (−50) is the bottom-left pixel; north-east (500) the top-right
    expect(img.at(0, img.height - 1).slice(0, 3)).toEqual(low);
    expect(img.at(img.width - 1, 0).slice(0, 3)).toEqual(high);
    const rev = await decodePng(renderLayerPng(g, { ...style, reverse: true }).png);
    expect(rev.at(0, rev.height - 1).slice(0, 3)).toEqual(high);
  });

  it('NaN cells are fully transparent (alpha 0) and their neighbours opaque', async () => {
    const g = regularGrid(-9.5, 1, 10, 100.5, 1, 10, (y, x) => (x === 3 && y === 4 ? NaN : y * x));
    const layer = renderLayerPng(g, { kind: 'continuous', ramp: 'magma', domain: [0, 81], units: 'h' });
    const img = await decodePng(layer.png);
    const r = rowOfLat(-5.5, -10, 0, layer.height);
    expect(img.at(colOfLon(103.5, 100, 110, layer.width), r)).toEqual([0, 0, 0, 0]);
    expect(img.at(colOfLon(102.5, 100, 110, layer.width), r)[3]).toBe(255);
    expect(img.at(colOfLon(103.5, 100, 110, layer.width), rowOfLat(-4.5, -10, 0, layer.height))[3]).toBe(255);
  });

  it('a grid reaching the pole is clamped to the Web Mercator limit 85.0511 °N in its corners', () => {
    const g = regularGrid(80.25, 0.5, 20, 0.25, 0.5, 20, () => 1);
    const layer = renderLayerPng(g, { kind: 'continuous', ramp: 'viridis', domain: [0, 2], units: '1' });
    expect(layer.coordinates[0][1]).toBeCloseTo(85.0511287798, 8); // 2·atan(e^π) − 90°, common practice for Web Mercator
    expect(layer.coordinates[3][1]).toBe(80);
    expect(layer.height).toBeGreaterThan(0);
  });

  it('a grid crossing the antimeridian keeps its longitudes past 180 in the corners', () => {
    const g = regularGrid(-20.5, 1, 5, 175.5, 1, 10, () => 1);
    const layer = renderLayerPng(g, { kind: 'continuous', ramp: 'viridis', domain: [0, 2], units: '1' });
    expect(layer.coordinates[1][0]).toBe(185);
  });

  it('the image stays within maxSize: fewer pixels per cell on a wide grid', () => {
    const g = regularGrid(-0.05, 0.1, 2, 0.05, 0.1, 1000, () => 1);
    const layer = renderLayerPng(g, { kind: 'continuous', ramp: 'viridis', domain: [0, 2], units: '1' });
    expect(layer.width).toBe(4000); // floor(4096 / 1000) = 4 px per cell
    const small = renderLayerPng(g, { kind: 'continuous', ramp: 'viridis', domain: [0, 2], units: '1' }, { maxSize: 1000 });
    expect(small.width).toBe(1000);
  });

  it('the same input gives the same bytes (stable digests in the manifest)', () => {
    const a = renderLayerPng(tall, rowStyle).png;
    const b = renderLayerPng(tall, rowStyle).png;
    expect(Buffer.from(a).equals(Buffer.from(b))).toBe(true);
  });
});
