/**
 * site-10000-regions: seconds to build an atlas of 10,000 regions, data and site, on this machine
 * (aim: under 300 s on 2 cores), and what the first view of its pages transfers (aim: under 2 MB
 * for the map page). Inputs: the invented small demo grid (8 × 10 cells at 1°, 41 land cells,
 * 2021–2023, baseline 2021–2022) with 10,000 rectangles as regions (each land cell cut into
 * 16 × 16, bench/rectangle-regions.ts), `regionWorkbooks: false` (the .xlsx per region is the
 * largest cost of the region stage; content/README.md). `heathours build --data-only` and then the
 * Astro site run in child processes (bench/regions-1000-child.mjs); the figure splits the time by
 * stage (compute, merge, regions, layers, inventory and manifest, site), each also as CPU seconds,
 * with the peak resident memory of each child (and of each Astro process of a site built in
 * parts, pipeline/run/site-parts.ts; the site's CPU seconds count those processes too) and the
 * machine's load average (wall time on a shared machine depends on the load). First views are counted from the built files
 * (bench/first-view.mjs), stored and gzip-compressed.
 *
 * `HEATHOURS_BENCH_REGIONS=N` builds N regions instead (e.g. 2,000 for a shorter run); the figure
 * then says so in its name's `regions` detail and projects 10,000 linearly from the per-region
 * CPU time of the region stage and the site (stated as a projection, not a measurement).
 */
import { mkdirSync } from 'node:fs';
import { availableParallelism, loadavg } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { BENCH_YEARS, rectangleRegions, writeRegionBenchInputs, buildDataAndSite } from './rectangle-regions.ts';
import type { Bench, BenchFigure } from './types.ts';

const ROOT = fileURLToPath(new URL('../', import.meta.url));
const N_REGIONS = Number(process.env.HEATHOURS_BENCH_REGIONS ?? 10_000);
const DIR = join(ROOT, '.cache', 'bench', `site-regions-${N_REGIONS}`);
/** Rectangles per land-cell side: 41 land cells × 16² = 10,496 ≥ 10,000. */
const SPLIT = 16;

const round1 = (x: unknown) => Math.round(Number(x) * 10) / 10;
const kB = (x: unknown) => Math.round(Number(x) / 1000);

export const bench: Bench = {
  names: ['site-10000-regions'],
  async run() {
    if (!Number.isInteger(N_REGIONS) || N_REGIONS < 1 || N_REGIONS > 10_496)
      throw new Error(`HEATHOURS_BENCH_REGIONS must be a whole number from 1 to 10496, not ${process.env.HEATHOURS_BENCH_REGIONS}`);
    mkdirSync(DIR, { recursive: true });
    const config = await writeRegionBenchInputs(DIR, {
      id: `bench-${N_REGIONS}`,
      title: `Benchmark atlas of ${N_REGIONS} regions (invented data)`,
      regions: rectangleRegions(N_REGIONS, SPLIT, 5),
      classesFile: join(ROOT, 'content/workload-classes.yaml'),
      extra: 'regionWorkbooks: false\n',
    });
    const jobs = availableParallelism();
    const { pipeline: p, site: s } = buildDataAndSite(DIR, config, jobs, 'site-10000-regions');
    const view = s.view as Record<string, { bytes: number; gzipBytes: number; largest: string[] }>;
    const total = Number(p.seconds) + Number(s.seconds);
    const figure: BenchFigure = {
      bench: 'site-10000-regions',
      value: round1(total),
      unit: 's',
      input: `invented small demo grid (41 land cells at 1°), ${BENCH_YEARS.length} years hourly, ${p.regions} rectangular regions, no region workbooks, ${jobs} workers`,
      regions: Number(p.regions),
      pipelineSeconds: round1(p.seconds),
      pipelineCpuSeconds: round1(p.cpuSeconds),
      computeSeconds: round1(p.computeSeconds),
      mergeSeconds: round1(p.mergeSeconds),
      regionStageSeconds: round1(p.regionSeconds),
      layersSeconds: round1(p.layersSeconds),
      inventoryAndManifestSeconds: round1(p.inventorySeconds),
      pipelinePeakRssMB: Math.round(Number(p.peakRssMB)),
      siteSeconds: round1(s.seconds),
      siteCpuSeconds: round1(s.cpuSeconds),
      sitePeakRssMB: Math.round(Number(s.peakRssMB)),
      siteParts: Number(s.parts),
      sitePartPeakRssMB: (s.partPeakRssMB as number[]).join('/'),
      sitePartSeconds: (s.partSeconds as number[]).map(round1).join('/'),
      siteGatherSeconds: round1(s.gatherSeconds),
      regionPages: Number(s.regionPages),
      mapFirstViewKB: kB(view.map.bytes),
      mapFirstViewGzipKB: kB(view.map.gzipBytes),
      mapLargest: view.map.largest.join('; '),
      homeFirstViewKB: kB(view.home.bytes),
      downloadsFirstViewKB: kB(view.downloads.bytes),
      regionFirstViewKB: kB(view.region.bytes),
      loadAverage: loadavg()[0].toFixed(1),
      checksum: `${p.checksum}-${s.homeChecksum}`,
    };
    if (N_REGIONS !== 10_000) {
      // Linear in the regions: the region stage and the site's CPU per region, the rest as measured.
      const perRegion = (Number(p.regionSeconds) + Number(s.cpuSeconds)) / N_REGIONS;
      figure.projected10000Seconds = round1(Number(p.seconds) - Number(p.regionSeconds) + 10_000 * perRegion);
      figure.projection =
        'pipeline minus its region stage, plus 10,000 × (region-stage wall seconds + site CPU seconds) per region measured here; not a measurement';
    }
    return [figure];
  },
};
