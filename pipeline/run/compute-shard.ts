/**
 * Computes one shard: reads its tile month by month, runs the physics (WBGT in sun and shade)
 * and adds every hour into the shard's partial. Memory is bounded by one block (a month of one
 * tile), never by the length of the record.
 */
import type { Dataset } from '../read/index.ts';
import { computeHours, emptyCounts, addCounts, type KernelCounts, type PhysicsArrays } from '../physics/index.ts';
import { allocLocalHours, localHoursInto, type LocalHours, type WorkEvaluation, type WorkShift } from '../work/index.ts';
import { accumulateBlock, createPartial, finishPartial, reuseScratch, type ReduceScratch, type ShardPartial } from '../reduce/accumulator.ts';
import type { PhysicsSettings } from '../physics/settings.ts';
import type { ShardSpec } from './plan.ts';

const HOUR_MS = 3_600_000;
/** Hours per block: one month and a little, so a block never spans more than two local months. */
export const BLOCK_HOURS = 744;

export interface ShardContext {
  evaluations: readonly WorkEvaluation[];
  timeZone: string;
  shift: WorkShift;
  /** Modelling choices of the physics (globe diameter). */
  physics: PhysicsSettings;
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

/** A run of land cells in one grid row: land indices [j0, j1) and the row inside the tile. */
export interface LandRun {
  row: number;
  j0: number;
  j1: number;
}

/**
 * Splits ascending global cell indices (row-major, `nLon` columns) into one run per grid row;
 * `y0` is the tile's first row.
 */
export function landRuns(cells: Int32Array, nLon: number, y0: number): LandRun[] {
  const runs: LandRun[] = [];
  for (let j = 0; j < cells.length; j++) {
    const row = Math.floor(cells[j] / nLon) - y0;
    const last = runs[runs.length - 1];
    if (last !== undefined && last.row === row) last.j1 = j + 1;
    else runs.push({ row, j0: j, j1: j + 1 });
  }
  return runs;
}

/** The arrays one shard's blocks are computed in: inputs, physics outputs, reduction scratch. */
interface BlockBuffers {
  scratch: ReduceScratch;
  local: LocalHours;
  inp: Record<'air' | 'dew' | 'sp' | 'wind' | 'sg' | 'sd', Float32Array>;
  out: Record<'cosZenith' | 'directFraction' | 'solar' | 'wind2m' | 'wbgtSun' | 'wbgtShade', Float32Array> & { status: Uint8Array };
  gSun: Float32Array;
  gShade: Float32Array;
  gAir: Float32Array;
}

/**
 * The buffers of the last shard, kept for the next one in this thread (a worker computes many
 * shards): allocating and faulting in ~100 MB per shard cost more than a short piece's work.
 */
let kept: BlockBuffers | undefined;

function blockBuffers(n: number, evaluations: readonly WorkEvaluation[], nLand: number, months: [number, number]): BlockBuffers {
  const scratch = reuseScratch(kept?.scratch, n, evaluations, nLand, months);
  if (kept !== undefined && kept.gAir.length >= n) {
    kept.scratch = scratch;
    return kept;
  }
  const mk = () => new Float32Array(n);
  kept = {
    scratch,
    local: allocLocalHours(BLOCK_HOURS),
    inp: { air: mk(), dew: mk(), sp: mk(), wind: mk(), sg: mk(), sd: mk() },
    out: { cosZenith: mk(), directFraction: mk(), solar: mk(), wind2m: mk(), wbgtSun: mk(), wbgtShade: mk(), status: new Uint8Array(n) },
    gSun: mk(),
    gShade: mk(),
    gAir: mk(),
  };
  return kept;
}

export async function computeShard(ds: Dataset, shard: ShardSpec, ctx: ShardContext): Promise<ShardResult> {
  const { tile, cells } = shard;
  const nRows = tile.y1 - tile.y0;
  const nCols = tile.x1 - tile.x0;
  const nTile = nRows * nCols;
  const nLand = cells.length;
  // Position of each land cell inside the tile.
  const pos = Int32Array.from(cells, (c) => (Math.floor(c / ctx.nLon) - tile.y0) * nCols + ((c % ctx.nLon) - tile.x0));
  const runs = landRuns(cells, ctx.nLon, tile.y0);

  const partial = createPartial(shard.year, cells, ctx.evaluations);
  const n = BLOCK_HOURS * nLand;
  const buf = blockBuffers(n, ctx.evaluations, nLand, shard.months);
  const { scratch, inp, out, gSun, gShade, gAir } = buf;
  const physics = emptyCounts();
  const local: LocalHours = buf.local;
  // Physics runs on the land cells only, one grid row at a time: each row's land cells form a
  // grid of 1 row × its land columns (the columns need not be adjacent: geometry takes the
  // longitude per column). Inputs are gathered row-segment-major, `[jr0 * nt + t * nr + k]`.
  const rowLat = new Float64Array(1);
  const runLon = runs.map((r) => new Float64Array(r.j1 - r.j0));
  let cellHours = 0;
  const timing = { read: 0, physics: 0, reduce: 0 };
  let tick = performance.now();
  const lap = (k: keyof typeof timing) => {
    const now = performance.now();
    timing[k] += now - tick;
    tick = now;
  };

  const [h0, h1] = shard.hours;
  for (let t0 = h0; t0 < h1; t0 += BLOCK_HOURS) {
    const nt = Math.min(BLOCK_HOURS, h1 - t0);
    tick = performance.now();
    const block = await ds.readBlock(t0, nt, tile);
    lap('read');
    const f = block.fields;
    const air = f.airTemperature!;
    const dew = f.dewPointTemperature!;
    const sp = f.surfacePressure!;
    const wind = f.windSpeed10m!;
    const sg = f.solarGlobal!;
    const sd = f.solarDirect;
    // Gather the land cells: row-segment-major for the physics, time-major air for the reduction.
    for (let t = 0; t < nt; t++) {
      const src = t * nTile;
      const dst = t * nLand;
      for (let j = 0; j < nLand; j++) gAir[dst + j] = air[src + pos[j]];
    }
    for (const r of runs) {
      const nr = r.j1 - r.j0;
      const o = r.j0 * nt;
      for (let t = 0; t < nt; t++) {
        const src = t * nTile;
        const dst = o + t * nr;
        for (let k = 0; k < nr; k++) {
          const i = src + pos[r.j0 + k];
          inp.air[dst + k] = air[i];
          inp.dew[dst + k] = dew[i];
          inp.sp[dst + k] = sp[i];
          inp.wind[dst + k] = wind[i];
          inp.sg[dst + k] = sg[i];
        }
        if (sd !== undefined) for (let k = 0; k < nr; k++) inp.sd[dst + k] = sd[src + pos[r.j0 + k]];
      }
    }
    out.status.fill(0, 0, nt * nLand);
    for (let ri = 0; ri < runs.length; ri++) {
      const r = runs[ri];
      const lon = runLon[ri];
      for (let k = 0; k < lon.length; k++) lon[k] = block.lon[(cells[r.j0 + k] % ctx.nLon) - tile.x0];
      rowLat[0] = block.lat[r.row];
      const a = r.j0 * nt;
      const e = r.j1 * nt;
      const arrays: PhysicsArrays = {
        time: block.time, lat: rowLat, lon,
        airTemperature: inp.air.subarray(a, e), dewPointTemperature: inp.dew.subarray(a, e), surfacePressure: inp.sp.subarray(a, e),
        windSpeed: inp.wind.subarray(a, e), solarGlobal: inp.sg.subarray(a, e), solarDirect: sd !== undefined ? inp.sd.subarray(a, e) : undefined,
        cosZenith: out.cosZenith.subarray(a, e), directFraction: out.directFraction.subarray(a, e), solar: out.solar.subarray(a, e),
        wind2m: out.wind2m.subarray(a, e), wbgtSun: out.wbgtSun.subarray(a, e), wbgtShade: out.wbgtShade.subarray(a, e),
        status: out.status.subarray(a, e),
      };
      addCounts(physics, computeHours(arrays, 0, nt, { windHeight: 10, globeDiameter: ctx.physics.globeDiameter }));
    }
    lap('physics');
    // Back to time-major over the land cells for the reduction.
    for (const r of runs) {
      const nr = r.j1 - r.j0;
      const o = r.j0 * nt;
      for (let t = 0; t < nt; t++) {
        const src = o + t * nr;
        const dst = t * nLand + r.j0;
        for (let k = 0; k < nr; k++) {
          gSun[dst + k] = out.wbgtSun[src + k];
          gShade[dst + k] = out.wbgtShade[src + k];
        }
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
