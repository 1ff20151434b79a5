/**
 * Computes one shard: reads its tile month by month, runs the physics (WBGT in sun and shade)
 * and adds every hour into the shard's partial. Memory is bounded by one block (a month of one
 * tile), never by the length of the record.
 */
import type { Dataset } from '../read/index.ts';
import { computeHours, emptyCounts, addCounts, type KernelCounts, type PhysicsArrays } from '../physics/index.ts';
import { allocLocalHours, localHoursInto, type LocalHours, type WorkEvaluation, type WorkShift } from '../work/index.ts';
import { accumulateBlock, createPartial, createScratch, finishPartial, type ShardPartial } from '../reduce/accumulator.ts';
import type { ShardSpec } from './plan.ts';

const HOUR_MS = 3_600_000;
/** Hours per block: one month and a little, so a block never spans more than two local months. */
export const BLOCK_HOURS = 744;

export interface ShardContext {
  evaluations: readonly WorkEvaluation[];
  timeZone: string;
  shift: WorkShift;
  /** Grid columns (to turn global cell indices into tile positions). */
  nLon: number;
}

export interface ShardResult {
  partial: ShardPartial;
  /** Wall-clock milliseconds spent reading, in physics and in the reduction [ms]. */
  timing: { read: number; physics: number; reduce: number };
  physics: KernelCounts;
  /** Cell-hours computed (land cells × hours of the year read) [–]. */
  cellHours: number;
}

/** Hour indices [h0, h1) of the dataset that may belong to local year `year` (±1 day margin). */
export function hourRangeForYear(ds: Pick<Dataset, 'time'>, year: number): [number, number] {
  const from = Date.UTC(year, 0, 1) - 26 * HOUR_MS;
  const to = Date.UTC(year + 1, 0, 1) + 26 * HOUR_MS;
  const h0 = Math.max(0, Math.ceil((from - ds.time.start) / HOUR_MS));
  const h1 = Math.min(ds.time.count, Math.floor((to - ds.time.start) / HOUR_MS) + 1);
  return [h0, Math.max(h0, h1)];
}

export async function computeShard(ds: Dataset, shard: ShardSpec, ctx: ShardContext): Promise<ShardResult> {
  const { tile, cells } = shard;
  const nRows = tile.y1 - tile.y0;
  const nCols = tile.x1 - tile.x0;
  const nTile = nRows * nCols;
  const nLand = cells.length;
  // Position of each land cell inside the tile.
  const pos = Int32Array.from(cells, (c) => (Math.floor(c / ctx.nLon) - tile.y0) * nCols + ((c % ctx.nLon) - tile.x0));
  const isLand = new Uint8Array(nTile);
  for (const p of pos) isLand[p] = 1;

  const partial = createPartial(shard.year, cells, ctx.evaluations);
  const scratch = createScratch(BLOCK_HOURS * nLand, ctx.evaluations, nLand);
  const physics = emptyCounts();
  const local: LocalHours = allocLocalHours(BLOCK_HOURS);
  const n = BLOCK_HOURS * nTile;
  const out = {
    cosZenith: new Float32Array(n), directFraction: new Float32Array(n), solar: new Float32Array(n), wind2m: new Float32Array(n),
    wbgtSun: new Float32Array(n), wbgtShade: new Float32Array(n), status: new Uint8Array(n),
  };
  const gSun = new Float32Array(BLOCK_HOURS * nLand);
  const gShade = new Float32Array(BLOCK_HOURS * nLand);
  const gAir = new Float32Array(BLOCK_HOURS * nLand);
  let cellHours = 0;
  const timing = { read: 0, physics: 0, reduce: 0 };
  let tick = performance.now();
  const lap = (k: keyof typeof timing) => {
    const now = performance.now();
    timing[k] += now - tick;
    tick = now;
  };

  const [h0, h1] = hourRangeForYear(ds, shard.year);
  for (let t0 = h0; t0 < h1; t0 += BLOCK_HOURS) {
    const nt = Math.min(BLOCK_HOURS, h1 - t0);
    tick = performance.now();
    const block = await ds.readBlock(t0, nt, tile);
    lap('read');
    const f = block.fields;
    const air = f.airTemperature!;
    // Ocean cells are not computed: a missing input makes the kernel skip them.
    for (let t = 0; t < nt; t++) for (let i = 0; i < nTile; i++) if (isLand[i] === 0) air[t * nTile + i] = NaN;
    const m = nt * nTile;
    out.status.fill(0, 0, m);
    const arrays: PhysicsArrays = {
      time: block.time, lat: block.lat, lon: block.lon,
      airTemperature: air, dewPointTemperature: f.dewPointTemperature!, surfacePressure: f.surfacePressure!,
      windSpeed: f.windSpeed10m!, solarGlobal: f.solarGlobal!, solarDirect: f.solarDirect,
      cosZenith: out.cosZenith.subarray(0, m), directFraction: out.directFraction.subarray(0, m), solar: out.solar.subarray(0, m),
      wind2m: out.wind2m.subarray(0, m), wbgtSun: out.wbgtSun.subarray(0, m), wbgtShade: out.wbgtShade.subarray(0, m),
      status: out.status.subarray(0, m),
    };
    const counts = computeHours(arrays, 0, nt, { windHeight: 10 });
    counts.rejected -= (nTile - nLand) * nt; // ocean cells are skipped on purpose, not rejected
    addCounts(physics, counts);
    lap('physics');
    // Gather the land cells into compact arrays for the reduction.
    for (let t = 0; t < nt; t++) {
      const src = t * nTile;
      const dst = t * nLand;
      for (let j = 0; j < nLand; j++) {
        const i = src + pos[j];
        gSun[dst + j] = out.wbgtSun[i];
        gShade[dst + j] = out.wbgtShade[i];
        gAir[dst + j] = air[i];
      }
    }
    localHoursInto(local, block.time, ctx.timeZone, ctx.shift);
    accumulateBlock(
      partial,
      { nHours: nt, wbgtSun: gSun.subarray(0, nt * nLand), wbgtShade: gShade.subarray(0, nt * nLand), airTemperature: gAir.subarray(0, nt * nLand), local },
      ctx.evaluations,
      scratch,
    );
    for (let t = 0; t < nt; t++) if (local.year[t] === shard.year) cellHours += nLand;
    lap('reduce');
  }
  finishPartial(partial, scratch);
  return { partial, physics, cellHours, timing };
}
