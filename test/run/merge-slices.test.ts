/**
 * How the merge shares a band's regions out among workers (pipeline/run/merge-stage.ts
 * regionSlices): only with fewer bands than workers, only for bands whose regions outweigh their
 * cells, in slices of whole regions in region order that together hold every region once.
 * Outside check: none; the byte-identity of the published output with and without slices is
 * test/run/region-pool.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { regionSlices, DEFAULT_REGION_SLICING } from '../../pipeline/run/merge-stage.ts';
import type { MergeTileInput } from '../../pipeline/run/merge-tile.ts';
import type { RegionTileCells } from '../../pipeline/regions/region-sums.ts';

/** A band of `cells` land cells overlapped by `regions` regions of `perRegion` cells each. */
function band(id: string, cells: number, regions: number, perRegion = 1): MergeTileInput {
  const rs: RegionTileCells[] = Array.from({ length: regions }, (_, r) => ({
    region: r,
    local: Int32Array.from({ length: perRegion }, (_, k) => (r + k) % cells),
    cells: Int32Array.from({ length: perRegion }, (_, k) => (r + k) % cells),
    weight: new Float64Array(perRegion).fill(1 / perRegion),
    histWeight: new Float64Array(perRegion).fill(1 / perRegion),
  }));
  return {
    id,
    rows: [0, 1],
    blocks: [[0, 1]],
    cells: new Int32Array(cells),
    subset: false,
    years: [2021],
    baseline: [2021, 2021],
    latestYear: 2021,
    partials: [[]],
    grid: { lat: new Float64Array(1), lon: new Float64Array(1) },
    regions: rs,
    dataDir: '',
    scratchDir: '',
  };
}

describe('sharing a band’s regions out among merge workers', () => {
  it('slices 10,000 one-cell regions on a 41-cell band into 2 tasks on 2 workers, every region once, in order', () => {
    const s = regionSlices([band('rows-0000-0010', 41, 10_000)], 2);
    expect(s.inputs).toHaveLength(1);
    expect(s.tasks).toHaveLength(1);
    expect(s.tasks[0].of).toBe('rows-0000-0010');
    expect(s.tasks[0].tile.regionsOnly).toBe(true);
    const all = [...s.inputs[0].regions, ...s.tasks[0].tile.regions].map((r) => r.region);
    expect(all).toEqual(Array.from({ length: 10_000 }, (_, i) => i));
    expect(s.inputs[0].regions).toHaveLength(5_000);
  });
  it('leaves the bands whole when there are as many bands as workers', () => {
    const s = regionSlices([band('a', 41, 10_000), band('b', 41, 10_000)], 2);
    expect(s.tasks).toHaveLength(0);
    expect(s.inputs.map((b) => b.regions.length)).toEqual([10_000, 10_000]);
  });
  it('leaves a band whole when its regions do not outweigh its cells (300 districts on 20,000 cells) or are too few to slice', () => {
    expect(regionSlices([band('country', 20_000, 300, 70)], 8).tasks).toHaveLength(0);
    expect(regionSlices([band('few', 41, 2 * DEFAULT_REGION_SLICING.minRegions - 1)], 8).tasks).toHaveLength(0);
  });
  it('makes at most ⌈workers / bands⌉ slices per band, each of at least the smallest slice', () => {
    const s = regionSlices([band('big', 41, 4_000)], 8, { minRegions: 1_000, overlap: 4 });
    expect(s.tasks).toHaveLength(3);
    for (const t of s.tasks) expect(t.tile.regions.length).toBeGreaterThanOrEqual(1_000);
  });
});
