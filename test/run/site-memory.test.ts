/**
 * The build plans the site's memory and time before it starts (pipeline/run/memory-plan.ts
 * `planSite`, pipeline/run/estimate.ts): the site's Astro processes count against the memory
 * budget, fewer processes are used when their peaks together do not fit, and a budget too small
 * for one process is the catalogued MemoryBudgetTooSmall naming the site. The model's constants
 * are this implementation's measured peaks (site-10000-regions, 2026-12-05, named in
 * memory-plan.ts): part 0 1,093 MB at 1,000 regions and 1,434 MB at 10,000, part 1 718 MB and
 * 1,210 MB; the model must give back those measurements within 5 %.
 */
import { describe, expect, it } from 'vitest';
import { DEFAULT_MEMORY_BUDGET, planSite, siteProcessesBytes } from '../../pipeline/run/memory-plan.ts';
import { expectCatalogued } from '../helpers/catalogued.ts';

const MB = 1024 * 1024;
const GB = 1024 * MB;

describe('the site in the memory plan', () => {
  it('gives back the measured peaks of the Astro processes within 5 % (1,000 and 10,000 regions, two parts)', () => {
    const measured: Array<[number, number]> = [
      [1_000, 1_093 + 718],
      [10_000, 1_434 + 1_210],
    ];
    for (const [regions, mb] of measured) expect(Math.abs(siteProcessesBytes(regions, 2) / MB - mb) / mb).toBeLessThan(0.05);
    expect(Math.abs(siteProcessesBytes(10_000, 1) / MB - 1_434) / 1_434).toBeLessThan(0.05);
  });

  it('builds 10,000 regions in two Astro processes within the default budget of 3 GB, counting them in the peak', () => {
    const p = planSite(DEFAULT_MEMORY_BUDGET, { regions: 10_000, parts: 2 });
    expect(p.siteParts).toBe(2);
    expect(p.sitePeak).toBeGreaterThan(siteProcessesBytes(10_000, 2));
    expect(p.sitePeak).toBeLessThanOrEqual(DEFAULT_MEMORY_BUDGET);
  });

  it('uses fewer Astro processes when their peaks together do not fit the budget', () => {
    expect(planSite(2.5 * GB, { regions: 10_000, parts: 2 }).siteParts).toBe(1);
    expect(planSite(16 * GB, { regions: 10_000, parts: 8 }).siteParts).toBe(8);
    expect(planSite(4 * GB, { regions: 10_000, parts: 8 }).siteParts).toBe(2);
  });

  it('is MemoryBudgetTooSmall naming the site and the memory needed when one Astro process does not fit', () => {
    const e = expectCatalogued(() => planSite(1 * GB, { regions: 10_000, parts: 2 }), 'MemoryBudgetTooSmall', /building the site of 10000 regions/);
    expect(e.message).toMatch(/about \d[\d,]* MB are needed/);
  });

  it('plans nothing for a build without a site (data only, a shard or merge task)', () => {
    expect(planSite(100 * MB, undefined)).toEqual({ siteParts: 1, sitePeak: 0 });
  });
});
