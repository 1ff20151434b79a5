import { describe, expect, it } from 'vitest';
import { mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { renderLayerPng } from '../../../pipeline/publish/layers/render-layer-png.ts';
import { writeLayerFiles } from '../../../pipeline/publish/layers/write-layer-files.ts';
import type { ContinuousStyle } from '../../../pipeline/publish/layers/style.ts';
import { decodePng, regularGrid } from './helpers.ts';

// Outside references: sharp 0.34.5 decodes the parts; MapLibre 6.20's refusal of image corners
// past 180 ° and its drawing of the two parts are checked in maplibre-display.test.ts.
const style: ContinuousStyle = { kind: 'continuous', ramp: 'viridis', domain: [0, 100], units: 'h' };

describe('layers across the antimeridian', () => {
  it('an ERA5-like 0.25° grid 179.0–181.0 °E is cut exactly at 180 ° into a west part and an east part shifted by −360 °', async () => {
    // centres 179.0, 179.25, … 181.0 → edges 178.875 … 181.125; 180 ° is 4.5 cells = 36 px from the west edge
    const g = regularGrid(-5.125, 0.25, 4, 179, 0.25, 9, (_y, x) => x * 10);
    const layer = renderLayerPng(g, style);
    expect(layer.coordinates[1][0]).toBe(181.125);
    expect(layer.parts).toHaveLength(2);
    const [w, e] = layer.parts;
    expect(w.coordinates).toEqual([
      [178.875, layer.coordinates[0][1]],
      [180, layer.coordinates[0][1]],
      [180, layer.coordinates[2][1]],
      [178.875, layer.coordinates[2][1]],
    ]);
    expect(e.coordinates[0][0]).toBe(-180);
    expect(e.coordinates[1][0]).toBeCloseTo(-178.875, 12);
    expect([w.width, e.width]).toEqual([36, 36]);
    expect(w.height).toBe(layer.height);
    // the pixels of the parts are the whole image's, column for column
    const whole = await decodePng(layer.png);
    const west = await decodePng(w.png);
    const east = await decodePng(e.png);
    for (const x of [0, 17, 35]) expect(west.at(x, 3)).toEqual(whole.at(x, 3));
    for (const x of [0, 20, 35]) expect(east.at(x, 3)).toEqual(whole.at(36 + x, 3));
  });

  it('a grid west of 180 ° is one part, the whole image itself', () => {
    const g = regularGrid(0.5, 1, 3, 170.5, 1, 9, () => 1);
    const layer = renderLayerPng(g, style);
    expect(layer.parts).toHaveLength(1);
    expect(layer.parts[0].png).toBe(layer.png);
    expect(layer.parts[0].coordinates).toEqual(layer.coordinates);
  });

  it('writeLayerFiles writes <name>.west.png and <name>.east.png for the map beside the whole <name>.png', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'layers-am-'));
    const g = regularGrid(-5.125, 0.25, 4, 179, 0.25, 9, (_y, x) => x * 10);
    const out = await writeLayerFiles(dir, 'x', g, style, { description: 'x' });
    expect(readdirSync(dir).sort()).toEqual(['x.east.png', 'x.png', 'x.tif', 'x.west.png']);
    expect(out.mapImages.map((m) => m.path)).toEqual(['x.west.png', 'x.east.png']);
    const east = await decodePng(readFileSync(join(dir, 'x.east.png')));
    expect(east.width).toBe(out.mapImages[1].width);
  });
});
