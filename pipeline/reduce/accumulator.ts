/**
 * The per-shard accumulator: integer counts per land cell of one tile and one (local) year,
 * filled block by block from hourly WBGT in sun and shade (and under a shelter when the build
 * counts that exposure) and air temperature. Pure: arrays in,
 * counts out; the orchestration (pipeline/run) reads the blocks and runs the physics.
 */
import {
  aboveLimitInto,
  workFractionInto,
  kjellstrom2018LossInto,
  dunne2013LossInto,
  groupEvaluations,
  exposureWbgt,
  prepareLoss,
  normalCdfFast,
  dunne2013Loss,
  type EvaluationGroup,
  type LocalHours,
  type PreparedLoss,
  type Exposure,
  type WorkEvaluation,
  countedExposures,
} from '../work/index.ts';
import { CENTI, HIST_LEN, HOURS, LOSS_VIEWS, MILLI, MONTHS, N_EXPOSURES, N_LOSS, histIndex } from './layout.ts';

/** Counts of one shard (tile × year). Per-cell arrays are cell-major, see layout.ts. */
export interface ShardPartial {
  /** Local calendar year of the shard. */
  year: number;
  /** Global cell indices (row-major in the dataset grid) of the land cells counted, ascending. */
  cells: Int32Array;
  /** Evaluation keys, in index order (`class.acclimatization.exposure`). */
  evalKeys: string[];
  /**
   * The exposures counted per cell × month (index `x` of capacityLoss, wbgtSum, wbgtMax): `sun`,
   * `shade`, and `shelter` when an evaluation works under a shelter
   * (pipeline/work/work-settings.ts countedExposures). The histograms hold sun and shade only.
   */
  exposures: Exposure[];
  /** Hours of each local month of the year that the data cover [h], per month. */
  coveredHours: Uint32Array;
  /** Hours of each local month of the year [h] (what a complete year holds), per month. */
  expectedHours: Uint32Array;
  /** Per cell × month: hours with a valid WBGT in every counted exposure [h]. */
  validHours: Uint32Array;
  /** Per cell × month: valid hours inside the work shift [h]. */
  shiftHours: Uint32Array;
  /** Per cell × month × evaluation: hours above the limit, all hours [h]. */
  aboveAll: Uint32Array;
  /** Per cell × month × evaluation: hours above the limit inside the shift [h]. */
  aboveShift: Uint32Array;
  /** Per cell × month × evaluation: hours lost to rest inside the shift [milli-h]. */
  lostShift: Uint32Array;
  /** Per cell × month × exposure × loss view: capacity-loss hours inside the shift [milli-h]. */
  capacityLoss: Uint32Array;
  /** Per cell × month × exposure: sum of hourly WBGT [centi-°C], integer-valued. */
  wbgtSum: Float64Array;
  /** Per cell × month × exposure: highest hourly WBGT [centi-°C]; −32768 when none. */
  wbgtMax: Int16Array;
  /** Per cell × month: sum of hourly air temperature [centi-°C] and hours counted [h]. */
  airSum: Float64Array;
  airHours: Uint32Array;
  /**
   * Local months [m0, m1) (0 = January) the histograms hold: a shard that is a piece of a year
   * only needs its own months.
   */
  months: [number, number];
  /**
   * Hours in each WBGT bin [h] (layout.ts HIST_EDGES), per month of `months` × local hour × cell
   * × exposure × bin: month-major, so that one hour's cells sit together in the hot loop and a
   * piece of a year holds only its own months (the merge turns it cell-major, see merge.ts).
   */
  histogram: Uint16Array;
  /** Per cell: hours whose WBGT solve failed (NaN) or whose inputs were rejected [h]. */
  failedHours: Uint32Array;
}

/** Histogram values one month of `nCells` cells holds in a partial. */
export const histPerMonth = (nCells: number): number => HOURS * nCells * N_EXPOSURES * HIST_LEN;

/**
 * An empty partial for `cells` of one year, its histograms for the local months [m0, m1)
 * (default the whole year). `spare`: histogram arrays of partials that are done with (encoded
 * and dropped); one of the right length is taken from it and cleared instead of allocating a new
 * one (tens of MB per shard, whose fresh pages cost more than clearing).
 */
export function createPartial(
  year: number,
  cells: Int32Array,
  evaluations: readonly WorkEvaluation[],
  months: [number, number] = [0, MONTHS],
  spare?: Uint16Array[],
): ShardPartial {
  const nc = cells.length;
  const nE = evaluations.length;
  const cm = nc * MONTHS;
  const exposures = countedExposures(evaluations);
  const nX = exposures.length;
  return {
    year,
    cells,
    evalKeys: evaluations.map((e) => e.key),
    exposures,
    coveredHours: new Uint32Array(MONTHS),
    expectedHours: expectedMonthHours(year),
    validHours: new Uint32Array(cm),
    shiftHours: new Uint32Array(cm),
    aboveAll: new Uint32Array(cm * nE),
    aboveShift: new Uint32Array(cm * nE),
    lostShift: new Uint32Array(cm * nE),
    capacityLoss: new Uint32Array(cm * nX * N_LOSS),
    wbgtSum: new Float64Array(cm * nX),
    wbgtMax: new Int16Array(cm * nX).fill(-32768),
    airSum: new Float64Array(cm),
    airHours: new Uint32Array(cm),
    months: [months[0], months[1]],
    histogram: histogramArray((months[1] - months[0]) * histPerMonth(nc), spare),
    failedHours: new Uint32Array(nc),
  };
}

/** A zeroed histogram array of `n` bins [h]: a cleared one from `spare` when one has that length, else a new one. */
function histogramArray(n: number, spare: Uint16Array[] | undefined): Uint16Array {
  const i = spare === undefined ? -1 : spare.findIndex((h) => h.length === n);
  if (i < 0) return new Uint16Array(n);
  const h = spare!.splice(i, 1)[0];
  h.fill(0);
  return h;
}

/**
 * Hours in each month of a year [h]: days × 24 (local clock; a daylight-saving day's 23 or 25
 * hours are not distinguished, as the completeness rule works in whole days).
 */
export function expectedMonthHours(year: number): Uint32Array {
  const out = new Uint32Array(MONTHS);
  for (let m = 0; m < MONTHS; m++) out[m] = 24 * new Date(Date.UTC(year, m + 1, 0)).getUTCDate();
  return out;
}

/**
 * One block of hourly values for the shard's cells, time-major: `x[t * nCells + c]`; or, with
 * `cellBase` and `cellStride`, cell c's value of hour t at `x[cellBase[c] + t * cellStride[c]]`
 * (the physics' layout, rows of land cells one after the other, time-major inside a row; the
 * fused path reads it as it is, the general path needs time-major blocks).
 */
export interface ReduceBlock {
  nHours: number;
  /** Per cell: where its hour 0 lies in every array, and the step from one hour to the next [values]. */
  cellBase?: Int32Array;
  cellStride?: Int32Array;
  /** WBGT in the sun [°C]; NaN where not computed. */
  wbgtSun: Float32Array;
  /** WBGT in the shade [°C]; NaN where not computed. */
  wbgtShade: Float32Array;
  /** WBGT under a shelter [°C]; required when the partial counts the shelter exposure. */
  wbgtShelter?: Float32Array;
  /** Air temperature [°C]. */
  airTemperature: Float32Array;
  /** Local calendar of each hour (pipeline/work/shifts.ts), length ≥ nHours. */
  local: LocalHours;
}

/** Scratch arrays reused across blocks and shards (no allocation in the hot path). */
export interface ReduceScratch {
  fraction: Float32Array;
  above: Uint8Array;
  loss: Float32Array;
  /** Evaluation groups for the fused path, or null when the general path is needed. */
  groups: EvaluationGroup[] | null;
  losses: PreparedLoss[];
  /**
   * Clothing adjustment value added to the WBGT before the capacity-loss functions [°C-WBGT]: the
   * functions relate capacity to the WBGT of workers in ordinary work clothes, and WBGT + CAV is
   * the WBGT at which such workers carry the same load (pipeline/work/capacity-loss.ts). One
   * value per build: every evaluation carries the same clothing.
   */
  lossCav: number;
  /** The evaluations the groups were made for (a scratch serves one list). */
  evaluations: readonly WorkEvaluation[];
}

/**
 * The clothing adjustment value of the evaluations [°C-WBGT] (0 without evaluations); a
 * RangeError if they differ (the work settings give every evaluation the same clothing).
 */
export function buildCav(evaluations: readonly WorkEvaluation[]): number {
  const cav = evaluations.length > 0 ? evaluations[0].kernel.k.cav : 0;
  for (const e of evaluations) {
    if (e.kernel.k.cav !== cav)
      throw new RangeError(`evaluation ${e.key} has clothing adjustment ${e.kernel.k.cav}, ${evaluations[0].key} has ${cav}: a build has one clothing`);
  }
  return cav;
}

/**
 * Scratch for blocks of up to `n` cell-hours. `general` forces the per-evaluation path (tests
 * compare the two paths).
 */
export function createScratch(n: number, evaluations: readonly WorkEvaluation[], general = false): ReduceScratch {
  return {
    fraction: new Float32Array(n),
    above: new Uint8Array(n),
    loss: new Float32Array(n),
    groups: general ? null : groupEvaluations(evaluations),
    losses: LOSS_VIEWS.map((v) => prepareLoss(v.intensity)),
    lossCav: buildCav(evaluations),
    evaluations,
  };
}

/**
 * A scratch for the next shard: `prev` itself when it is large enough and made for the same
 * evaluations, else a new one. Workers keep one scratch for all their shards.
 */
export function reuseScratch(prev: ReduceScratch | undefined, n: number, evaluations: readonly WorkEvaluation[]): ReduceScratch {
  const fits = prev !== undefined && prev.groups !== null && prev.evaluations === evaluations && prev.fraction.length >= n;
  return fits ? prev : createScratch(n, evaluations, false);
}

/** The histogram month of local month `m` (0-based) in partial `p`, or a RangeError outside its months. */
function windowMonth(p: ShardPartial, m: number): number {
  const i = m - p.months[0];
  if (i < 0 || m >= p.months[1]) {
    throw new RangeError(`an hour of local month ${m + 1} fell outside the shard's months ${p.months[0] + 1}-${p.months[1]}`);
  }
  return i;
}

/**
 * Adds one block into the partial. Hours whose local year is not the partial's year are skipped
 * (blocks may straddle the new year in local time).
 * @param evaluations The same list (and order) the partial was created with
 */
export function accumulateBlock(p: ShardPartial, block: ReduceBlock, evaluations: readonly WorkEvaluation[], scratch: ReduceScratch): void {
  if (p.exposures.length > 2 && block.wbgtShelter === undefined) throw new RangeError('the partial counts the shelter exposure, the block has no shelter WBGT');
  if (scratch.groups !== null) accumulateFused(p, block, evaluations.length, scratch.groups, scratch.losses, scratch.lossCav);
  else if (block.cellBase !== undefined) throw new RangeError('the general path of the reduction needs a time-major block (no cellBase)');
  else accumulateGeneral(p, block, evaluations, scratch);
}

/**
 * The fused path: one pass over the cell-hours; per group one exponential, and only when the
 * hour is above the group's lowest limit. Gives the same counts as the general path.
 *
 * Cell by cell, and the block's hours of the year inside (the block is time-major, so the reads
 * step by the number of cells): one cell's counters of a month (its hours, sums, maxima, its 16
 * evaluations' counts, its 24 histogram rows) stay in the processor's first-level cache for the
 * whole month, where an hour-by-hour loop over all cells fetched every counter again each hour.
 * The counts are integers (sums of integers in doubles, far below 2⁵³), so the order of the
 * additions changes nothing.
 */
function accumulateFused(p: ShardPartial, block: ReduceBlock, nE: number, groups: EvaluationGroup[], losses: PreparedLoss[], cav: number): void {
  const nc = p.cells.length;
  const hist = p.histogram;
  const { wbgtSun, wbgtShade, airTemperature, local } = block;
  const nX = p.exposures.length;
  const shelter = nX > 2;
  // Without the shelter the shade array stands in for it (never read: no group works there).
  const wbgtShelter = block.wbgtShelter ?? wbgtShade;
  const cellBase = block.cellBase;
  const cellStride = block.cellStride;
  // The partial's arrays and the groups' constants as locals: the loop below runs per cell-hour.
  const { airSum, airHours, failedHours, validHours, shiftHours, wbgtSum, wbgtMax, aboveAll, aboveShift, lostShift, capacityLoss } = p;
  const nG = groups.length;
  const groupX = Uint8Array.from(groups, (g) => (g.exposure === 'sun' ? 0 : g.exposure === 'shade' ? 1 : 2));
  const gCav = Float64Array.from(groups, (g) => g.cav);
  const gLowest = Float64Array.from(groups, (g) => g.lowestLimit);
  const gC0 = Float64Array.from(groups, (g) => g.c0);
  const gC1 = Float64Array.from(groups, (g) => g.c1);
  const gMembers = groups.map((g) => g.members);
  const gLimits = groups.map((g) => g.limitWork);
  const gRest = groups.map((g) => g.restRate);
  const gInvDelta = groups.map((g) => g.invDelta);
  // The capacity-loss functions (lossPrepared): Kjellstrom et al. 2018 as Φ((w − μ)/σ), whose
  // value is below the 0.0005 that rounds to a counted milli-hour for z < −3.3 (Φ(−3.3) =
  // 0.000483, scipy.stats.norm.cdf), so Φ is not evaluated there; Dunne et al. 2013 is 0 up to
  // 25 °C. The counts are those of lossPrepared (test/reduce/accumulator.test.ts).
  const nL = losses.length;
  const lossKj = Uint8Array.from(losses, (l) => (l.kind === 'kjellstrom-2018' ? 1 : 0));
  const lossMean = Float64Array.from(losses, (l) => l.mean);
  const lossInvSd = Float64Array.from(losses, (l) => l.invSd);
  // The block's hours of this year, with their month, histogram month, local hour and shift flag.
  const hours = new Int32Array(block.nHours);
  const hourMonth = new Int32Array(block.nHours);
  const hourHist = new Int32Array(block.nHours);
  const hourShift = new Uint8Array(block.nHours);
  let nh = 0;
  for (let t = 0; t < block.nHours; t++) {
    if (local.year[t] !== p.year) continue;
    const m = local.month[t] - 1;
    p.coveredHours[m]++;
    hours[nh] = t;
    hourMonth[nh] = m;
    hourHist[nh] = (windowMonth(p, m) * HOURS + local.hour[t]) * nc;
    hourShift[nh] = local.inShift[t] === 1 ? 1 : 0;
    nh++;
  }
  for (let c = 0; c < nc; c++) {
    const cmBase = c * MONTHS;
    const base = cellBase === undefined ? c : cellBase[c];
    const stride = cellStride === undefined ? nc : cellStride[c];
    for (let k = 0; k < nh; k++) {
      const i = base + hours[k] * stride;
      const m = hourMonth[k];
      const shift = hourShift[k] === 1;
      const cm = cmBase + m;
      const ta = airTemperature[i];
      if (ta === ta) {
        airSum[cm] += Math.round(ta * CENTI);
        airHours[cm]++;
      }
      const ws = wbgtSun[i];
      const wd = wbgtShade[i];
      const wh = shelter ? wbgtShelter[i] : wd;
      if (ws !== ws || wd !== wd || (shelter && wh !== wh)) {
        failedHours[c]++;
        continue;
      }
      validHours[cm]++;
      const s = Math.round(ws * CENTI);
      const d = Math.round(wd * CENTI);
      const xm = cm * nX;
      wbgtSum[xm] += s;
      wbgtSum[xm + 1] += d;
      if (s > wbgtMax[xm]) wbgtMax[xm] = s;
      if (d > wbgtMax[xm + 1]) wbgtMax[xm + 1] = d;
      if (shelter) {
        const r = Math.round(wh * CENTI);
        wbgtSum[xm + 2] += r;
        if (r > wbgtMax[xm + 2]) wbgtMax[xm + 2] = r;
      }
      const hb = (hourHist[k] + c) * N_EXPOSURES * HIST_LEN;
      hist[hb + histIndex(ws)]++;
      hist[hb + HIST_LEN + histIndex(wd)]++;
      const eBase = cm * nE;
      for (let gi = 0; gi < nG; gi++) {
        const gx = groupX[gi];
        const w = (gx === 0 ? ws : gx === 1 ? wd : wh) + gCav[gi];
        if (!(w > gLowest[gi])) continue;
        const members = gMembers[gi];
        const limits = gLimits[gi];
        if (!shift) {
          // Outside the shift only the hours above each limit are counted: no work fraction.
          for (let j = 0; j < members.length; j++) if (w > limits[j]) aboveAll[eBase + members[j]]++;
          continue;
        }
        // allowedMetabolicRate and memberWorkFraction (pipeline/work/evaluation-groups.ts), inline.
        const mLim = Math.exp(gC0[gi] - gC1[gi] * w);
        const rest = gRest[gi];
        const invDelta = gInvDelta[gi];
        for (let j = 0; j < members.length; j++) {
          if (!(w > limits[j])) continue;
          const e = eBase + members[j];
          aboveAll[e]++;
          aboveShift[e]++;
          const f = (mLim - rest[j]) * invDelta[j];
          lostShift[e] += Math.round((1 - (f > 0 ? f : 0)) * MILLI);
        }
      }
      if (shift) {
        shiftHours[cm]++;
        const lb = cm * nX * N_LOSS;
        // Capacity loss at the effective WBGT (WBGT + CAV; see ReduceScratch.lossCav).
        for (let x = 0; x < nX; x++) {
          const wEff = (x === 0 ? ws : x === 1 ? wd : wh) + cav;
          const xb = lb + x * N_LOSS;
          for (let l = 0; l < nL; l++) {
            let a: number;
            if (lossKj[l] === 1) {
              const z = (wEff - lossMean[l]) * lossInvSd[l];
              if (z < -3.3) continue;
              a = normalCdfFast(z);
            } else {
              if (!(wEff > 25)) continue;
              a = dunne2013Loss(wEff);
            }
            if (a >= 0.0005) capacityLoss[xb + l] += Math.round(a * MILLI);
          }
        }
      }
    }
  }
}

/** The general path: one vectorised work-fraction pass per evaluation (any limit model, any rest place). */
function accumulateGeneral(p: ShardPartial, block: ReduceBlock, evaluations: readonly WorkEvaluation[], scratch: ReduceScratch): void {
  const nc = p.cells.length;
  const hist = p.histogram;
  const nt = block.nHours;
  const n = nt * nc;
  if (scratch.fraction.length < n) throw new RangeError(`scratch holds ${scratch.fraction.length} values, block needs ${n}`);
  const { wbgtSun, wbgtShade, airTemperature, local } = block;
  const nX = p.exposures.length;
  const shelter = nX > 2;
  const wbgtShelter = block.wbgtShelter ?? wbgtShade;
  // An hour counts when every counted exposure has a WBGT.
  const invalid = (i: number): boolean => wbgtSun[i] !== wbgtSun[i] || wbgtShade[i] !== wbgtShade[i] || (shelter && wbgtShelter[i] !== wbgtShelter[i]);
  const nE = evaluations.length;
  const fraction = scratch.fraction.subarray(0, n);
  const above = scratch.above.subarray(0, n);
  const loss = scratch.loss.subarray(0, n);

  // Hour-level bookkeeping: which hours belong to this year, their month, shift flag.
  const inYear = new Uint8Array(nt);
  for (let t = 0; t < nt; t++) {
    if (local.year[t] === p.year) {
      inYear[t] = 1;
      p.coveredHours[local.month[t] - 1]++;
    }
  }

  // Per-evaluation counts: one vectorised work-fraction pass per evaluation.
  for (let e = 0; e < nE; e++) {
    const ev = evaluations[e];
    const work = exposureWbgt(ev.exposure, wbgtSun, wbgtShade, block.wbgtShelter);
    const rest = ev.restWbgt === 'shade' ? wbgtShade : null;
    aboveLimitInto(above, work, ev.kernel);
    workFractionInto(fraction, work, rest, ev.kernel);
    for (let t = 0; t < nt; t++) {
      if (inYear[t] === 0) continue;
      const m = local.month[t] - 1;
      const shift = local.inShift[t];
      const row = t * nc;
      for (let c = 0; c < nc; c++) {
        const i = row + c;
        if (above[i] === 0 || invalid(i)) continue;
        const k = (c * MONTHS + m) * nE + e;
        p.aboveAll[k]++;
        if (shift === 1) {
          p.aboveShift[k]++;
          p.lostShift[k] += Math.round((1 - fraction[i]) * MILLI);
        }
      }
    }
  }

  // Capacity-loss views at the effective WBGT (WBGT + CAV), inside the shift only, per exposure.
  const cav = scratch.lossCav;
  for (let x = 0; x < nX; x++) {
    const wbgt = exposureWbgt(p.exposures[x], wbgtSun, wbgtShade, block.wbgtShelter);
    for (let l = 0; l < N_LOSS; l++) {
      const view = LOSS_VIEWS[l];
      if (view.intensity !== undefined) kjellstrom2018LossInto(loss, wbgt, view.intensity, cav);
      else dunne2013LossInto(loss, wbgt, cav);
      for (let t = 0; t < nt; t++) {
        if (inYear[t] === 0 || local.inShift[t] === 0) continue;
        const m = local.month[t] - 1;
        const row = t * nc;
        for (let c = 0; c < nc; c++) {
          if (invalid(row + c)) continue;
          const v = loss[row + c];
          if (v > 0) p.capacityLoss[((c * MONTHS + m) * nX + x) * N_LOSS + l] += Math.round(v * MILLI);
        }
      }
    }
  }

  // Hour counts, WBGT sums/maxima, air temperature, histograms. The fused path repeats these
  // lines inline on purpose: moved into a shared function (numbers passed as arguments) it ran
  // ~40 % slower; test/reduce/accumulator.test.ts checks that both paths give the same counts.
  for (let t = 0; t < nt; t++) {
    if (inYear[t] === 0) continue;
    const m = local.month[t] - 1;
    const mw = windowMonth(p, m);
    const h = local.hour[t];
    const shift = local.inShift[t];
    const row = t * nc;
    for (let c = 0; c < nc; c++) {
      const i = row + c;
      const cm = c * MONTHS + m;
      const ta = airTemperature[i];
      if (ta === ta) {
        p.airSum[cm] += Math.round(ta * CENTI);
        p.airHours[cm]++;
      }
      const ws = wbgtSun[i];
      const wd = wbgtShade[i];
      const wh = shelter ? wbgtShelter[i] : wd;
      if (ws !== ws || wd !== wd || (shelter && wh !== wh)) {
        p.failedHours[c]++;
        continue;
      }
      p.validHours[cm]++;
      if (shift === 1) p.shiftHours[cm]++;
      const s = Math.round(ws * CENTI);
      const d = Math.round(wd * CENTI);
      const xm = cm * nX;
      p.wbgtSum[xm] += s;
      p.wbgtSum[xm + 1] += d;
      if (s > p.wbgtMax[xm]) p.wbgtMax[xm] = s;
      if (d > p.wbgtMax[xm + 1]) p.wbgtMax[xm + 1] = d;
      if (shelter) {
        const r = Math.round(wh * CENTI);
        p.wbgtSum[xm + 2] += r;
        if (r > p.wbgtMax[xm + 2]) p.wbgtMax[xm + 2] = r;
      }
      const hb = ((mw * HOURS + h) * nc + c) * N_EXPOSURES * HIST_LEN;
      hist[hb + histIndex(ws)]++;
      hist[hb + HIST_LEN + histIndex(wd)]++;
    }
  }
}
