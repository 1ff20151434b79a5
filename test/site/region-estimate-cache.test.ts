/**
 * The region pages' estimate comparison (src/data/region-estimate.ts) keeps a bounded cache: the
 * number of comparisons held never passes ESTIMATE_CACHE_LIMIT however many regions are asked,
 * and a region dropped from the cache gives the same comparison when asked again. The reference
 * comparison is computed directly from the calculator context and the pipeline's own histogram
 * tile decoder (pipeline/schedule/tiles.ts `regionTileHistograms`), on data the real pipeline
 * published (test/site/pipeline-data.ts, the invented demo).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { regionTileHistograms } from '../../pipeline/schedule/tiles.ts';
import { loadEstimateContext } from '../../src/data/estimate.ts';
import { ESTIMATE_CACHE_LIMIT, estimateCacheSize, loadEstimateDifference } from '../../src/data/region-estimate.ts';
import { loadRegionReport } from '../../src/data/region-report.ts';
import { estimateDifference } from '../../src/lib/report/estimate-difference.ts';
import { buildPipelineData } from './pipeline-data.ts';

const REGION = 'varn-shore';
let dataDir: string;

beforeAll(async () => {
  dataDir = (await buildPipelineData()).dataDir;
}, 600_000);

describe('region estimate comparison cache', () => {
  it('gives what the pages show of the comparison computed directly from the calculator context and the region tile', () => {
    const { figures } = loadRegionReport(REGION, dataDir);
    const loaded = loadEstimateContext(dataDir)!;
    const entry = loaded.ctx.regions.find((r) => r.id === REGION)!;
    const bytes = new Uint8Array(readFileSync(join(dataDir, entry.path)));
    const direct = estimateDifference(REGION, regionTileHistograms(bytes, entry.path, loaded.ctx), loaded.ctx, figures);
    const { workloadClass, acclimatization, exposure, largest, largestShare } = direct;
    expect(loadEstimateDifference(REGION, figures, dataDir)).toEqual({ workloadClass, acclimatization, exposure, largest, largestShare });
  });

  it('never holds more than ESTIMATE_CACHE_LIMIT comparisons, and a dropped region gives the same comparison again', () => {
    const { figures } = loadRegionReport(REGION, dataDir);
    const first = loadEstimateDifference(REGION, figures, dataDir);
    expect(first).not.toBeNull();
    // Regions the calculator does not know have no comparison (null) but still take a cache place.
    for (let i = 0; i < ESTIMATE_CACHE_LIMIT + 100; i++) {
      expect(loadEstimateDifference(`not-a-region-${i}`, figures, dataDir)).toBeNull();
      expect(estimateCacheSize()).toBeLessThanOrEqual(ESTIMATE_CACHE_LIMIT);
    }
    expect(estimateCacheSize()).toBe(ESTIMATE_CACHE_LIMIT);
    const again = loadEstimateDifference(REGION, figures, dataDir);
    expect(again).not.toBe(first); // recomputed, not the dropped object
    expect(again).toEqual(first);
  });
});
