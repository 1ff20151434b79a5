/**
 * What a build will cost, estimated from its plan before it starts: wall time, disk (published
 * output, partials, scratch) and memory (memory-plan.ts). Pure. The rates are this
 * implementation's, measured on a 2-core machine (bench: `pipeline`, `country-build`,
 * `merge-split`); a faster or busier machine changes the time, not the disk.
 */
import type { ShardSpec } from './plan.ts';
import type { MemoryPlan } from './memory-plan.ts';
import { formatBytes } from './memory-plan.ts';
import { gridCellCount, type LandCells } from '../model/grid.ts';

/** Worker time per land cell-hour computed: read, physics and reduction [s] (about 0.87 M cell-hours/s per worker). */
const COMPUTE_S_PER_CELL_HOUR = 1.15e-6;
/** Worker time to merge, take the normals of and write one land cell-year [s]. */
const MERGE_S_PER_CELL_YEAR = 0.6e-3;
/** Time to assemble and write one gridded field per grid cell (NetCDF slab and layer image) [s]. */
const PUBLISH_S_PER_FIELD_CELL = 0.15e-6;
/** Time per region (its table, summary, calculator tile) [s]. */
const REGION_S = 0.05;
/**
 * The site (site-stage.ts): CPU per region of reading its tables into the digest, spread over the
 * workers [s]; CPU per region of its pages, spread over the Astro processes [s]; the fixed time
 * (each process's start and bundling, joining the parts) [s]. Measured by `site-10000-regions`
 * (2026-12-05, 2 cores): digest 25.7 s, parts 152 s and 148 s for 10,000 regions in two parts,
 * site 184 s in all.
 */
const DIGEST_S_PER_REGION = 0.005;
const SITE_S_PER_REGION = 0.028;
const SITE_S = 18;

/** Bytes of a partial file per land cell-year [B] (sparse histograms, DEFLATE). */
const PARTIAL_B_PER_CELL_YEAR = 5_900;
/** Published bytes per land cell (cell table rows, map chunk) and per land cell-year (calculator tiles) [B]. */
const OUTPUT_B_PER_CELL = 44_000;
const OUTPUT_B_PER_CELL_YEAR = 4_400;
/** Published bytes per region-year (calculator tile) and per region (table, summary) [B]. */
const OUTPUT_B_PER_REGION_YEAR = 36_000;
const OUTPUT_B_PER_REGION = 480_000;
/** Scratch bytes per region-year of its histogram parts [B]. */
const SCRATCH_B_PER_REGION_YEAR = 300_000;

export interface EstimateInput {
  shards: readonly ShardSpec[];
  /** The grid's land cells (how many, of how many cells). */
  land: LandCells;
  years: number;
  regions: number;
  jobs: number;
  fields: number;
  evaluations: number;
  memory: MemoryPlan;
  /** Weathers published: the record and each scenario (default 1); `shards` holds all of theirs. */
  variants?: number;
}

export interface BuildEstimate {
  /** Land cell-hours to compute if nothing is cached [–]. */
  cellHours: number;
  seconds: { compute: number; merge: number; publish: number; site: number; total: number };
  bytes: { partials: number; output: number; scratch: number };
  peakMemory: number;
  text: string;
}

export function estimateBuild(input: EstimateInput): BuildEstimate {
  const e = { ...input, cells: input.land.ids.length, nGrid: gridCellCount(input.land) };
  let cellHours = 0;
  for (const s of e.shards) cellHours += s.cells.length * (s.hours[1] - s.hours[0]);
  const v = Math.max(1, e.variants ?? 1);
  const compute = (cellHours * COMPUTE_S_PER_CELL_HOUR) / e.jobs;
  const merge = (v * e.cells * e.years * MERGE_S_PER_CELL_YEAR) / e.jobs;
  const publish = v * (e.fields * e.nGrid * PUBLISH_S_PER_FIELD_CELL + e.regions * REGION_S);
  const parts = Math.max(1, e.memory.siteParts);
  const site = SITE_S + (e.regions * DIGEST_S_PER_REGION) / e.jobs + (e.regions * SITE_S_PER_REGION) / parts;
  const total = compute + merge + publish + site;
  const partials = v * e.cells * e.years * PARTIAL_B_PER_CELL_YEAR;
  const output =
    v *
    (e.cells * OUTPUT_B_PER_CELL +
      e.cells * e.years * OUTPUT_B_PER_CELL_YEAR +
      e.regions * (OUTPUT_B_PER_REGION + e.years * OUTPUT_B_PER_REGION_YEAR) +
      e.nGrid * e.fields * 5);
  const scratch = e.nGrid * e.fields * 4 + v * e.regions * e.years * SCRATCH_B_PER_REGION_YEAR;
  const peakMemory = Math.max(e.memory.computePeak, e.memory.mergePeak, e.memory.sitePeak);
  const min = (s: number) => (s >= 90 ? `${(s / 60).toFixed(1)} min` : `${s.toFixed(0)} s`);
  const text =
    `${(cellHours / 1e6).toFixed(1)} M land cell-hours; about ${min(total)} on ${e.jobs} worker(s) if nothing is cached ` +
    `(computing ${min(compute)}, merging ${min(merge)}, publishing ${min(publish)}, site ${min(site)}${parts > 1 ? ` in ${parts} Astro processes` : ''}); ` +
    `disk: ${formatBytes(output)} published, ${formatBytes(partials)} of partials, ${formatBytes(scratch)} of scratch; peak memory ${formatBytes(peakMemory)}`;
  return { cellHours, seconds: { compute, merge, publish, site, total }, bytes: { partials, output, scratch }, peakMemory, text };
}
