import { describe, expect, it } from 'vitest';
import { renderLayerPng } from '../../../pipeline/publish/layers/render-layer-png.ts';
import { writeGeoTiff } from '../../../pipeline/publish/layers/geotiff-write.ts';
import { figureStyle } from '../../../pipeline/publish/layers/figure-style.ts';
import { regularGrid } from './helpers.ts';

// The brief's figure: a 40 × 60 grid layer in a few ms. Timings on a shared 2-core machine are
// noisy; the bound is only a guard against an order-of-magnitude regression (median under 250 ms) and the measured medians are printed.
function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}

describe('layer speed', () => {
  it('a 40 × 60 grid (0.25°, 30–40 °N) renders to PNG and GeoTIFF in a few ms (median of 30 runs)', () => {
    const g = regularGrid(30.125, 0.25, 40, 10.125, 0.25, 60, (y, x) => ((y * 7 + x * 13) % 50) * (x % 9 === 0 ? NaN : 1));
    const style = figureStyle('hoursAboveLimit', [0, 50], 'h');
    renderLayerPng(g, style); // warm-up (JIT, ramp sampling)
    const tPng: number[] = [];
    const tTif: number[] = [];
    let bytes = 0;
    for (let i = 0; i < 30; i++) {
      let t0 = performance.now();
      const layer = renderLayerPng(g, style);
      tPng.push(performance.now() - t0);
      t0 = performance.now();
      const tif = writeGeoTiff(g, { units: 'h', description: 'x' });
      tTif.push(performance.now() - t0);
      bytes += layer.png.length + tif.length;
    }
    const layer = renderLayerPng(g, style);
    process.stdout.write(
      `layer speed: 40×60 grid → PNG ${layer.width}×${layer.height} px (${layer.png.length} B) median ${median(tPng).toFixed(2)} ms; ` +
        `GeoTIFF (${writeGeoTiff(g, { units: 'h', description: 'x' }).length} B) median ${median(tTif).toFixed(3)} ms; checksum ${bytes} B\n`,
    );
    expect(median(tPng)).toBeLessThan(250);
    expect(median(tTif)).toBeLessThan(50);
  });
});
