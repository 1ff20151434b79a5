/**
 * Computes one task: a piece of a local year for a group of consecutive tiles (shards of the same
 * piece). The group's rows are read block by block, once, and every tile of the group takes its
 * land cells from the same block, runs the physics (WBGT in sun and shade, and under a shelter
 * when an evaluation works there) and adds every hour into
 * its own partial. Reading once per group keeps the read cost per cell-hour independent of the
 * grid's width (a NetCDF-3 record or a NetCDF-4 chunk spans whole rows, often the whole grid).
 * Memory is bounded by one block of the group and the group's partials, never by the record.
 */
import type { Dataset } from '../read/index.ts';
import { cellRow, cellRowCol, type CellGrid, type HorizontalGrid } from '../model/grid.ts';
import {
  computeHours,
  emptyCounts,
  addCounts,
  applyMonthlyChange,
  emptyChangeCounts,
  type ChangeCounts,
  type KernelCounts,
  type PhysicsArrays,
} from '../physics/index.ts';
import { allocLocalHours, countedExposures, localHoursInto, type LocalHours, type WorkEvaluation, type WorkShift } from '../work/index.ts';
import { accumulateBlock, createPartial, reuseScratch, type ReduceScratch, type ShardPartial } from '../reduce/accumulator.ts';
import type { PhysicsSettings } from '../physics/settings.ts';
import type { CellChange } from '../scenario/cell-change.ts';
import type { ScenarioSpec } from '../scenario/settings.ts';
import type { ShardSpec } from './plan.ts';
import { scenarioCellChange } from './scenario-change.ts';

/** Hours per block by default: one month and a little, so a block never spans more than two local months. */
export const BLOCK_HOURS = 744;

export interface ShardContext {
  evaluations: readonly WorkEvaluation[];
  timeZone: string;
  shift: WorkShift;
  /** Modelling choices of the physics (globe diameter). */
  physics: PhysicsSettings;
  /** The dataset's horizontal grid (to turn global cell ids into rows, columns and block positions). */
  grid: HorizontalGrid;
  /** The scenarios of the build: a shard with `scenario` set has that one's changes applied before the physics. */
  scenarios: ScenarioSpec[];
}

/** One unit of work for a worker: the shards of one piece of a year over consecutive tiles. */
export interface ComputeTask {
  /** Name for logs and errors, e.g. `g00-y2021-m07` (group 0 of the tiles, local July–September 2021). */
  id: string;
  /** The shards computed together: same piece (hours, months), tiles in row order. */
  shards: ShardSpec[];
  /** Hours per block read [h] (the memory plan may choose fewer than {@link BLOCK_HOURS}). */
  blockHours: number;
}

export interface ShardResult {
  partial: ShardPartial;
  /** Wall-clock milliseconds spent reading, in physics and in the reduction [ms]. */
  timing: { read: number; physics: number; reduce: number };
  physics: KernelCounts;
  /** Clamps of relative humidity made by a scenario's changes [cell-hours] (zero for the baseline). */
  change: ChangeCounts;
  /** Cell-hours computed (land cells × hours of the year read) [–]. */
  cellHours: number;
}

/** A run of land cells in one grid row: land indices [j0, j1) and the row inside the block. */
export interface LandRun {
  row: number;
  j0: number;
  j1: number;
}

/**
 * Splits ascending global cell ids (row-major over `grid`) into one run per grid row; `y0` is the
 * block's first row.
 */
export function landRuns(cells: Int32Array, grid: CellGrid, y0: number): LandRun[] {
  const runs: LandRun[] = [];
  for (let j = 0; j < cells.length; j++) {
    const row = cellRow(grid, cells[j]) - y0;
    const last = runs[runs.length - 1];
    if (last !== undefined && last.row === row) last.j1 = j + 1;
    else runs.push({ row, j0: j, j1: j + 1 });
  }
  return runs;
}

/** The arrays a tile's block is computed in: inputs, physics outputs, the reduction's gathered arrays. */
interface BlockBuffers {
  scratch: ReduceScratch;
  local: LocalHours;
  inp: Record<'air' | 'dew' | 'sp' | 'wind' | 'sg' | 'sd', Float32Array>;
  out: Record<'cosZenith' | 'directFraction' | 'solar' | 'wind2m' | 'wbgtSun' | 'wbgtShade', Float32Array> & { status: Uint8Array };
  gSun: Float32Array;
  gShade: Float32Array;
  gAir: Float32Array;
  /** Per land cell of the tile: where its hours start in the physics' arrays, and their step (the fused reduction). */
  cellBase: Int32Array;
  cellStride: Int32Array;
  /** The shelter's physics output and gathered array, when the build counts the shelter. */
  shelter: { out: Float32Array; g: Float32Array } | undefined;
}

/**
 * The buffers of the last task, kept for the next one in this thread (a worker computes many
 * tasks): allocating and faulting in tens of MB per task cost more than a short piece's work.
 */
let kept: BlockBuffers | undefined;

/**
 * Histogram arrays of this thread's partials that are encoded and dropped, reused by the next
 * task's partials (at most one task's worth is kept; the pool's workers end with the stage).
 */
let spareHistograms: Uint16Array[] = [];

function blockBuffers(n: number, blockHours: number, evaluations: readonly WorkEvaluation[], nCells: number): BlockBuffers {
  const scratch = reuseScratch(kept?.scratch, n, evaluations);
  const mk = () => new Float32Array(n);
  const withShelter = countedExposures(evaluations).includes('shelter');
  if (kept !== undefined && kept.gAir.length >= n && kept.local.year.length >= blockHours && kept.cellBase.length >= nCells) {
    kept.scratch = scratch;
    if (!withShelter) kept.shelter = undefined;
    else if (kept.shelter === undefined || kept.shelter.g.length < n) kept.shelter = { out: mk(), g: mk() };
    return kept;
  }
  kept = {
    scratch,
    local: allocLocalHours(blockHours),
    inp: { air: mk(), dew: mk(), sp: mk(), wind: mk(), sg: mk(), sd: mk() },
    out: { cosZenith: mk(), directFraction: mk(), solar: mk(), wind2m: mk(), wbgtSun: mk(), wbgtShade: mk(), status: new Uint8Array(n) },
    gSun: mk(),
    gShade: mk(),
    gAir: mk(),
    cellBase: new Int32Array(nCells),
    cellStride: new Int32Array(nCells),
    shelter: withShelter ? { out: mk(), g: mk() } : undefined,
  };
  return kept;
}

/** What one tile of the group keeps while the blocks pass. */
interface TileState {
  shard: ShardSpec;
  partial: ShardPartial;
  /** Position of each land cell in the group's block (row-major, the group's first row = 0). */
  pos: Int32Array;
  runs: LandRun[];
  runLon: Float64Array[];
  physics: KernelCounts;
  cellHours: number;
  timing: { read: number; physics: number; reduce: number };
  /** A scenario's monthly changes at the tile's cells, applied to each block before the physics. */
  change: CellChange | undefined;
  changeCounts: ChangeCounts;
}

/** The changes of the last few (scenario, tile) pairs of this thread: a worker computes many pieces of a tile. */
const recentChanges = new Map<string, CellChange>();
const RECENT_CHANGES = 8;

async function tileChange(ctx: ShardContext, shard: ShardSpec, grid: { lat: Float64Array; lon: Float64Array }): Promise<CellChange | undefined> {
  if (shard.scenario === undefined) return undefined;
  const spec = ctx.scenarios.find((s) => s.id === shard.scenario);
  if (!spec) throw new Error(`shard ${shard.id} names scenario ${shard.scenario}, which the build does not have`);
  const key = `${JSON.stringify(spec)}|${shard.tileIndex}|${shard.cells.length}|${shard.cells[0]}`;
  let c = recentChanges.get(key);
  if (c === undefined) {
    c = await scenarioCellChange(spec, shard.cells, grid);
    if (recentChanges.size >= RECENT_CHANGES) recentChanges.delete(recentChanges.keys().next().value!);
    recentChanges.set(key, c);
  }
  return c;
}

/**
 * Computes the task's shards. Each shard's result is handed to `onShard` as soon as the last
 * block has been added (in tile order), so a caller can encode and drop it. With `recycle`, the
 * caller promises to keep nothing of a partial's histogram past `onShard`'s return: the array is
 * then reused by the next task in this thread (the build's workers, which encode and drop).
 */
export async function computeTask(
  ds: Dataset,
  task: ComputeTask,
  ctx: ShardContext,
  onShard: (shard: ShardSpec, r: ShardResult) => void | Promise<void>,
  recycle = false,
): Promise<void> {
  const first = task.shards[0];
  const y0 = first.tile.y0;
  const y1 = task.shards[task.shards.length - 1].tile.y1;
  const nCols = ctx.grid.lon.length;
  const group = { y0, y1, x0: 0, x1: nCols };
  const nBlock = (y1 - y0) * nCols;
  const tiles: TileState[] = task.shards.map((shard) => {
    const runs = landRuns(shard.cells, ctx.grid, y0);
    return {
      shard,
      partial: createPartial(shard.year, shard.cells, ctx.evaluations, shard.months, recycle ? spareHistograms : undefined),
      pos: Int32Array.from(shard.cells, (c) => {
        const { y, x } = cellRowCol(ctx.grid, c);
        return (y - y0) * nCols + x;
      }),
      runs,
      runLon: runs.map((r) => new Float64Array(r.j1 - r.j0)),
      physics: emptyCounts(),
      cellHours: 0,
      timing: { read: 0, physics: 0, reduce: 0 },
      change: undefined,
      changeCounts: emptyChangeCounts(),
    };
  });
  for (const tile of tiles) tile.change = await tileChange(ctx, tile.shard, ds.grid);
  const maxLand = Math.max(...task.shards.map((s) => s.cells.length));
  const buf = blockBuffers(task.blockHours * maxLand, task.blockHours, ctx.evaluations, maxLand);
  const [h0, h1] = first.hours;
  for (let t0 = h0; t0 < h1; t0 += task.blockHours) {
    const nt = Math.min(task.blockHours, h1 - t0);
    const tr = performance.now();
    const block = await ds.readBlock(t0, nt, group);
    const readMs = performance.now() - tr;
    // The read is shared: each tile is charged its share of land cells.
    const land = tiles.reduce((s, t) => s + t.shard.cells.length, 0);
    localHoursInto(buf.local, block.time, ctx.timeZone, ctx.shift);
    for (const tile of tiles) {
      tile.timing.read += (readMs * tile.shard.cells.length) / land;
      computeTileBlock(tile, block, nt, nBlock, buf, ctx);
    }
  }
  const spare: Uint16Array[] = [];
  for (const tile of tiles) {
    await onShard(tile.shard, { partial: tile.partial, physics: tile.physics, change: tile.changeCounts, cellHours: tile.cellHours, timing: tile.timing });
    // `onShard` has encoded the partial and keeps none of its histogram (`recycle`): the array
    // serves the next task's partials.
    if (recycle) spare.push(tile.partial.histogram);
  }
  if (recycle) spareHistograms = spare;
}

/** One block for one tile: gather its land cells, physics by grid row, back to time-major, reduce. */
function computeTileBlock(
  tile: TileState,
  block: Awaited<ReturnType<Dataset['readBlock']>>,
  nt: number,
  nBlock: number,
  buf: BlockBuffers,
  ctx: ShardContext,
): void {
  const { shard, pos, runs, runLon, timing } = tile;
  const cells = shard.cells;
  const nLand = cells.length;
  const nCols = ctx.grid.lon.length;
  const { scratch, inp, out, gSun, gShade, gAir, local } = buf;
  let tick = performance.now();
  const lap = (k: keyof typeof timing) => {
    const now = performance.now();
    timing[k] += now - tick;
    tick = now;
  };
  const f = block.fields;
  const air = f.airTemperature!;
  const dew = f.dewPointTemperature!;
  const sp = f.surfacePressure!;
  const wind = f.windSpeed10m!;
  const sg = f.solarGlobal!;
  const sd = f.solarDirect;
  // The fused reduction reads the physics' layout as it is; the general one needs time-major arrays.
  const fused = buf.scratch.groups !== null;
  // Gather the land cells: row-segment-major for the physics (and time-major air for the general
  // reduction). Physics runs on the land cells only, one grid row at a time: each row's land
  // cells form a grid of 1 row × its land columns (the columns need not be adjacent: geometry
  // takes the longitude per column). Inputs are gathered row-segment-major, `[jr0 * nt + t * nr + k]`.
  if (!fused) {
    for (let t = 0; t < nt; t++) {
      const src = t * nBlock;
      const dst = t * nLand;
      for (let j = 0; j < nLand; j++) gAir[dst + j] = air[src + pos[j]];
    }
  }
  for (const r of runs) {
    const nr = r.j1 - r.j0;
    const o = r.j0 * nt;
    for (let t = 0; t < nt; t++) {
      const src = t * nBlock;
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
  // A scenario: its monthly changes applied to the tile's hours before the physics (the delta change method).
  if (tile.change !== undefined) {
    for (const r of runs) {
      const nr = r.j1 - r.j0;
      const a = r.j0 * nt;
      const e = r.j1 * nt;
      applyMonthlyChange(
        {
          airTemperature: inp.air.subarray(a, e),
          dewPointTemperature: inp.dew.subarray(a, e),
          surfacePressure: inp.sp.subarray(a, e),
          solarGlobal: inp.sg.subarray(a, e),
          solarDirect: sd !== undefined ? inp.sd.subarray(a, e) : undefined,
        },
        nr,
        nt,
        local.month,
        tile.change,
        r.j0,
        tile.changeCounts,
      );
    }
  }
  out.status.fill(0, 0, nt * nLand);
  const rowLat = new Float64Array(1);
  for (let ri = 0; ri < runs.length; ri++) {
    const r = runs[ri];
    const lon = runLon[ri];
    // Hot loop: the block spans whole rows, so a cell's column is its id modulo the columns.
    for (let k = 0; k < lon.length; k++) lon[k] = block.lon[cells[r.j0 + k] % nCols];
    rowLat[0] = block.lat[r.row];
    const a = r.j0 * nt;
    const e = r.j1 * nt;
    const arrays: PhysicsArrays = {
      time: block.time,
      lat: rowLat,
      lon,
      airTemperature: inp.air.subarray(a, e),
      dewPointTemperature: inp.dew.subarray(a, e),
      surfacePressure: inp.sp.subarray(a, e),
      windSpeed: inp.wind.subarray(a, e),
      solarGlobal: inp.sg.subarray(a, e),
      solarDirect: sd !== undefined ? inp.sd.subarray(a, e) : undefined,
      cosZenith: out.cosZenith.subarray(a, e),
      directFraction: out.directFraction.subarray(a, e),
      solar: out.solar.subarray(a, e),
      wind2m: out.wind2m.subarray(a, e),
      wbgtSun: out.wbgtSun.subarray(a, e),
      wbgtShade: out.wbgtShade.subarray(a, e),
      // The shelter pass runs in the JavaScript kernel (the WebAssembly kernel has no shelter pass).
      wbgtShelter: buf.shelter?.out.subarray(a, e),
      status: out.status.subarray(a, e),
    };
    addCounts(tile.physics, computeHours(arrays, 0, nt, { windHeight: 10, globeDiameter: ctx.physics.globeDiameter }));
  }
  lap('physics');
  if (fused) {
    // Cell j of run r at hour t lies at r.j0 · nt + t · nr + (j − r.j0): the reduction reads there.
    const { cellBase, cellStride } = buf;
    for (const r of runs) {
      const nr = r.j1 - r.j0;
      for (let k = 0; k < nr; k++) {
        cellBase[r.j0 + k] = r.j0 * nt + k;
        cellStride[r.j0 + k] = nr;
      }
    }
    const n = nt * nLand;
    accumulateBlock(
      tile.partial,
      {
        nHours: nt,
        cellBase: cellBase.subarray(0, nLand),
        cellStride: cellStride.subarray(0, nLand),
        wbgtSun: out.wbgtSun.subarray(0, n),
        wbgtShade: out.wbgtShade.subarray(0, n),
        wbgtShelter: buf.shelter?.out.subarray(0, n),
        airTemperature: inp.air.subarray(0, n),
        local,
      },
      ctx.evaluations,
      scratch,
    );
    for (let t = 0; t < nt; t++) if (local.year[t] === shard.year) tile.cellHours += nLand;
    lap('reduce');
    return;
  }
  // Back to time-major over the land cells for the reduction (a scenario's air temperature too).
  const changed = tile.change !== undefined;
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
      if (buf.shelter !== undefined) {
        const { out: so, g } = buf.shelter;
        for (let k = 0; k < nr; k++) g[dst + k] = so[src + k];
      }
      if (changed) for (let k = 0; k < nr; k++) gAir[dst + k] = inp.air[src + k];
    }
  }
  accumulateBlock(
    tile.partial,
    {
      nHours: nt,
      wbgtSun: gSun.subarray(0, nt * nLand),
      wbgtShade: gShade.subarray(0, nt * nLand),
      wbgtShelter: buf.shelter?.g.subarray(0, nt * nLand),
      airTemperature: gAir.subarray(0, nt * nLand),
      local,
    },
    ctx.evaluations,
    scratch,
  );
  for (let t = 0; t < nt; t++) if (local.year[t] === shard.year) tile.cellHours += nLand;
  lap('reduce');
}
