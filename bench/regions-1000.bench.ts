/**
 * site-1000-regions: seconds to build an atlas of 1,000 regions, data and site: `heathours build
 * --data-only` on the invented small demo grid (8 × 10 cells at 1°, 41 land cells, 2021–2023,
 * baseline 2021–2022) with 1,000 small rectangles as regions (each land cell cut into 5 × 5
 * rectangles, the first 1,000 kept), then the Astro site from that data folder (1,000 region
 * reports, the home page with the map and the ranking). Each step runs in a child process
 * (bench/regions-1000-child.mjs); the details split the pipeline's time by stage (setup,
 * compute, normals, publish) and give the site's time, each also as CPU seconds (all threads),
 * with the machine's load average, since wall time on a shared machine depends on the load. The
 * inputs are written once to .cache/bench/regions-1000 and are not timed.
 */
import { mkdirSync } from 'node:fs';
import { availableParallelism, loadavg } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { BENCH_YEARS as YEARS, rectangleRegions, writeRegionBenchInputs, buildDataAndSite } from './rectangle-regions.ts';
import type { Bench, BenchFigure } from './types.ts';

const ROOT = fileURLToPath(new URL('../', import.meta.url));
const DIR = join(ROOT, '.cache', 'bench', 'regions-1000');
const N_REGIONS = 1000;
/** Rectangles per land-cell side. */
const SPLIT = 5;

async function inputs(): Promise<string> {
  return writeRegionBenchInputs(DIR, {
    id: 'bench-1000',
    title: 'Benchmark atlas of 1,000 regions (invented data)',
    regions: rectangleRegions(N_REGIONS, SPLIT),
    classesFile: join(ROOT, 'content/workload-classes.yaml'),
  });
}

const round1 = (x: unknown) => Math.round(Number(x) * 10) / 10;

export const bench: Bench = {
  names: ['site-1000-regions'],
  async run() {
    mkdirSync(DIR, { recursive: true });
    const config = await inputs();
    const jobs = availableParallelism();
    const { pipeline: p, site: s } = buildDataAndSite(DIR, config, jobs, 'site-1000-regions');
    const figure: BenchFigure = {
      bench: 'site-1000-regions',
      value: round1(Number(p.seconds) + Number(s.seconds)),
      unit: 's',
      input: `invented small demo grid (41 land cells at 1°), ${YEARS.length} years hourly, ${p.regions} rectangular regions, ${jobs} workers`,
      pipelineSeconds: round1(p.seconds),
      pipelineCpuSeconds: round1(p.cpuSeconds),
      pipelineSetupSeconds: round1(p.setupSeconds),
      pipelineComputeSeconds: round1(p.computeSeconds),
      pipelineNormalsSeconds: round1(p.normalsSeconds),
      pipelinePublishSeconds: round1(p.publishSeconds),
      siteSeconds: round1(s.seconds),
      siteCpuSeconds: round1(s.cpuSeconds),
      loadAverage: loadavg()[0].toFixed(1),
      regionPages: Number(s.regionPages),
      largestRegionHtmlKB: Math.round(Number(s.largestRegionHtmlBytes) / 1000),
      homeKB: Math.round(Number(s.homeBytes) / 1000),
      checksum: `${p.checksum}-${s.homeChecksum}`,
    };
    return [figure];
  },
};
