/**
 * A scenario's monthly changes at a set of atlas cells (the I/O around pipeline/scenario): a
 * uniform warming needs nothing read; a change file is opened once per thread
 * (pipeline/read/change-file.ts), the source rows around the cells are read, interpolated onto the
 * cells (pipeline/scenario/regrid.ts) and checked (cell-change.ts).
 *
 * Memory is bounded by the cells asked for: the plan checks a scenario over every land cell in
 * bands of rows ({@link checkScenario}), a compute task asks for its tiles' cells only, and a
 * worker keeps the changes of its last few tiles.
 */
import { openChangeFile, type ChangeFile, type ChangeVariable } from '../read/change-file.ts';
import { bilinearWeights, interpolateMonths, rowsNeeded } from '../scenario/regrid.ts';
import { checkCellChange, uniformWarming, type CellChange } from '../scenario/cell-change.ts';
import { ChangeValueMissing } from '../scenario/errors.ts';
import type { ScenarioSpec } from '../scenario/settings.ts';
import type { ChangeRange, ScenarioCheck } from '../scenario/describe.ts';
import { cellCentres } from '../model/grid.ts';

export type { ChangeRange, ScenarioCheck };

/** Change files opened by this thread, by path and humidity kind. */
const opened = new Map<string, Promise<ChangeFile>>();

function changeFile(path: string, humidity: 'relative' | 'specific'): Promise<ChangeFile> {
  const key = `${humidity}|${path}`;
  let f = opened.get(key);
  if (f === undefined) {
    f = openChangeFile(path, humidity);
    opened.set(key, f);
    f.catch(() => opened.delete(key));
  }
  return f;
}

/** Closes every change file this thread opened. */
export async function closeChangeFiles(): Promise<void> {
  const all = [...opened.values()];
  opened.clear();
  for (const f of all) {
    try {
      await (await f).close();
    } catch {
      // It failed to open: nothing to close.
    }
  }
}

async function interpolate(
  cf: ChangeFile,
  v: ChangeVariable,
  w: ReturnType<typeof bilinearWeights>,
  at: { lat: Float64Array; lon: Float64Array },
): Promise<Float64Array> {
  const [r0, r1] = rowsNeeded(w);
  const rows = await cf.readRows(v, r0, r1);
  const out = new Float64Array(12 * w.n);
  const miss = interpolateMonths(w, rows, r0, r1 - r0, cf.lon.values.length, out);
  if (miss !== null) {
    throw ChangeValueMissing(
      {
        file: cf.name,
        variable: v.name,
        lat: Math.round(at.lat[miss.point] * 1e4) / 1e4,
        lon: Math.round(at.lon[miss.point] * 1e4) / 1e4,
        month: miss.month + 1,
      },
      { file: cf.path, variable: v.name },
    );
  }
  return out;
}

/**
 * The monthly changes of `spec` at `cells` (global indices of the atlas grid), checked against the
 * physical range (catalogued errors name the file, cell and month).
 */
export async function scenarioCellChange(spec: ScenarioSpec, cells: Int32Array, grid: { lat: Float64Array; lon: Float64Array }): Promise<CellChange> {
  if (spec.kind === 'warming') return uniformWarming(cells.length, spec.warming);
  const cf = await changeFile(spec.path, spec.humidity);
  const at = cellCentres(grid, cells);
  const w = bilinearWeights({ lat: cf.lat.values, lon: cf.lon.values }, at.lat, at.lon, cf.name);
  const change: CellChange = {
    nCells: cells.length,
    temperature: await interpolate(cf, cf.temperature, w, at),
    humidityKind: spec.humidity,
    humidity: cf.humidity ? await interpolate(cf, cf.humidity, w, at) : null,
    solar: cf.solar ? await interpolate(cf, cf.solar, w, at) : null,
  };
  checkCellChange(change, at.lat, at.lon, cf.name);
  return change;
}

function range(values: Float64Array, acc: { min: number; max: number; sum: number; n: number }): void {
  for (let i = 0; i < values.length; i++) {
    const x = values[i];
    if (x < acc.min) acc.min = x;
    if (x > acc.max) acc.max = x;
    acc.sum += x;
    acc.n++;
  }
}

/** Land cells checked at a time by {@link checkScenario} [cells]. */
const CHECK_CELLS = 4096;

/**
 * Checks a scenario over every land cell before anything is computed: the change file covers the
 * atlas, has a value around every land cell and stays in the physical range. Cells are taken in
 * runs of consecutive rows, so memory holds a few rows of the file at a time.
 * @param cells the atlas's land cells (global indices, ascending)
 */
export async function checkScenario(spec: ScenarioSpec, cells: Int32Array, grid: { lat: Float64Array; lon: Float64Array }): Promise<ScenarioCheck> {
  const acc = () => ({ min: Infinity, max: -Infinity, sum: 0, n: 0 });
  const t = acc();
  const h = acc();
  const s = acc();
  let hasH = false;
  let hasS = false;
  for (let i = 0; i < cells.length; i += CHECK_CELLS) {
    const c = await scenarioCellChange(spec, cells.subarray(i, Math.min(cells.length, i + CHECK_CELLS)), grid);
    range(c.temperature, t);
    if (c.humidity) {
      hasH = true;
      range(c.humidity, h);
    }
    if (c.solar) {
      hasS = true;
      range(c.solar, s);
    }
  }
  const done = (a: ReturnType<typeof acc>): ChangeRange => ({ min: a.min, max: a.max, mean: a.n > 0 ? a.sum / a.n : NaN });
  let variables: string[] = [];
  if (spec.kind === 'change-file') {
    const cf = await changeFile(spec.path, spec.humidity);
    variables = [cf.temperature, cf.humidity, cf.solar].flatMap((v) => (v ? [v.name] : []));
  }
  return { temperature: done(t), humidity: hasH ? done(h) : null, solar: hasS ? done(s) : null, variables };
}
