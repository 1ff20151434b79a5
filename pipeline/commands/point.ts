/**
 * `heathours point --in IN.csv --out OUT.csv [--classes FILE] [--unacclimatized] [--cav X] [--globe-diameter M]`:
 * hourly WBGT (sun, open-sky shade, shelter) and work figures for tabular weather data
 * (input and output columns: {@link POINT_HELP}, pipeline/physics/README.md).
 * Streams the input; rows with out-of-range inputs or failed solves get empty outputs and a
 * `status` naming the reason; the output appears atomically.
 *
 * Work columns, per workload class (default: content/workload-classes.yaml): `limit_<class>_c`,
 * the WBGT limit at the class's rate as a measured WBGT, L(M_w) − CAV [°C] (docs/methods.md §8.2,
 * curve-2017, acclimatized unless `--unacclimatized`), and `work_fraction_<class>`, the allowable
 * work fraction of the hour [0–1] (docs/methods.md §8.6) with the work in the sun (`wbgt_c`) and rest
 * in the same place, clothing adjustment `--cav` (default 0). Screening values only: local
 * regulations and a competent person decide (docs/methods.md §14).
 */
import { createWriteStream, existsSync, statSync } from 'node:fs';
import { rename, rm, mkdir } from 'node:fs/promises';
import { dirname } from 'node:path';
import { once } from 'node:events';
import { temporarySibling } from '../model/effects.ts';
import { startProgress } from '../model/progress.ts';
import './catalogue.ts';
import { HeathoursError } from '../model/errors.ts';
import { csvField } from '../formats/csv.ts';
import { readCsvRecords } from '../formats/csv-file.ts';
import {
  PointBadRow,
  PointClassesNotFound,
  PointClassesSyntax,
  PointInputNotFound,
  PointMissingColumn,
  PointOptionInvalid,
  PointOutputFailed,
} from '../physics/errors.ts';
import { computePoint } from '../physics/point-row.ts';
import { pointInputFromCells } from '../physics/point-input.ts';
import { statusName } from '../physics/status.ts';
import { globeFactors, GLOBE_DIAMETER_RANGE } from '../physics/liljegren-solve.ts';
import { D_GLOBE_STANDARD } from '../physics/constants.ts';
import { readFileSync } from 'node:fs';
import { packagePath } from '../model/package-root.ts';
import { parseYamlStrict } from '../config/load.ts';
import { parseWorkloadClasses, prepareWorkKernel, allowableWorkFraction, type WorkKernel, type WorkloadClasses } from '../work/index.ts';

const REQUIRED = ['time_utc', 'lat', 'lon', 'ta_c', 'pressure_hpa', 'wind_ms', 'solar_wm2'] as const;
const PHYSICS_OUTPUT = [
  'cos_zenith',
  'direct_fraction',
  'wind_2m_ms',
  'tg_c',
  'tnwb_c',
  'tpsy_c',
  'wbgt_c',
  'tg_shade_c',
  'tnwb_shade_c',
  'wbgt_shade_c',
  'tg_shelter_c',
  'tnwb_shelter_c',
  'wbgt_shelter_c',
] as const;

export { POINT_HELP } from './point-help.ts';

/** The shipped workload classes (content/workload-classes.yaml), the default of `--classes`. */
export const DEFAULT_CLASSES_FILE = packagePath('content', 'workload-classes.yaml');

/** Options of the work columns. */
export interface PointWorkOptions {
  /** Workload-classes YAML file; default {@link DEFAULT_CLASSES_FILE}. */
  classesFile?: string;
  /** Use the unacclimatized limit curve (default: acclimatized). */
  unacclimatized?: boolean;
  /** Clothing adjustment value [°C-WBGT], default 0. */
  cav?: number;
  /** Globe diameter [m], default 0.15 (the standard globe, as the atlas: physics.globeDiameter). */
  globeDiameter?: number;
}

/**
 * Column names of one class: `limit_<id>_c`, `work_fraction_<id>`, with the dashes of the class id
 * turned into underscores (`very-high` → `limit_very_high_c`). Class ids are lower-case letters,
 * digits and dashes (pipeline/work/workload-classes.ts), so two ids never give the same column.
 */
export function classColumns(id: string): [string, string] {
  const k = id.replace(/-/g, '_');
  return [`limit_${k}_c`, `work_fraction_${k}`];
}

/** Reads and validates a workload-classes file (catalogued errors for a missing or bad file). */
export function loadWorkloadClasses(file: string): WorkloadClasses {
  if (!existsSync(file)) throw PointClassesNotFound({ path: file });
  const raw = parseYamlStrict(readFileSync(file, 'utf8'), (detail) => PointClassesSyntax({ detail }, { file }));
  return parseWorkloadClasses(raw, file);
}

/**
 * One prepared work-fraction kernel per class (docs/methods.md §8.6, pipeline/work): curve-2017 limits,
 * acclimatized unless asked, rest in the same place, the given clothing adjustment.
 */
export function prepareClassKernels(opts: PointWorkOptions = {}): { id: string; columns: [string, string]; kernel: WorkKernel }[] {
  const cav = opts.cav ?? 0;
  if (!Number.isFinite(cav)) throw PointOptionInvalid({ option: '--cav', value: String(opts.cav), expected: 'a number of °C-WBGT from 0 to 20' });
  const classes = loadWorkloadClasses(opts.classesFile ?? DEFAULT_CLASSES_FILE);
  return classes.classes.map((c) => ({
    id: c.id,
    columns: classColumns(c.id),
    kernel: prepareWorkKernel({
      workRate: c.metabolicRate,
      restRate: classes.rest.metabolicRate,
      clothingAdjustment: cav,
      limit: { model: 'curve-2017', acclimatization: opts.unacclimatized ? 'unacclimatized' : 'acclimatized' },
    }),
  }));
}

/** Summary of a point run. */
export interface PointSummary {
  rows: number;
  ok: number;
  byStatus: Record<string, number>;
  dewPointClamped: number;
}

/** `-` for `--in` / `--out`: standard input / output. */
export const STANDARD_STREAM = '-';

/**
 * Runs the point computation from `inPath` to `outPath`; throws catalogued errors for a bad file.
 * `-` reads standard input or writes standard output (streamed as rows are computed, so not
 * atomic: a failure leaves the rows written so far).
 */
export async function runPoint(inPath: string, outPath: string, opts: { quiet?: boolean } & PointWorkOptions = {}): Promise<PointSummary> {
  const fromStdin = inPath === STANDARD_STREAM;
  if (fromStdin) process.stdin.setEncoding('utf8');
  else if (!existsSync(inPath) || !statSync(inPath).isFile()) throw PointInputNotFound({ path: inPath }, { file: inPath });
  const d = opts.globeDiameter ?? D_GLOBE_STANDARD;
  if (!(d >= GLOBE_DIAMETER_RANGE[0] && d <= GLOBE_DIAMETER_RANGE[1])) {
    throw PointOptionInvalid({
      option: '--globe-diameter',
      value: String(opts.globeDiameter),
      expected: `a diameter in metres from ${GLOBE_DIAMETER_RANGE[0]} to ${GLOBE_DIAMETER_RANGE[1]}`,
    });
  }
  const globe = globeFactors(d);
  const work = prepareClassKernels(opts);
  const OUTPUT: string[] = [...PHYSICS_OUTPUT, ...work.flatMap((w) => w.columns), 'status'];
  const inName = fromStdin ? 'standard input' : inPath;
  const size = fromStdin ? 0 : statSync(inPath).size;
  const progress = startProgress('point', size, { quiet: opts.quiet, unit: 'MB read', scale: 1e6 });
  const toStdout = outPath === STANDARD_STREAM;
  if (!toStdout) {
    try {
      await mkdir(dirname(outPath), { recursive: true });
    } catch (e) {
      throw PointOutputFailed({ path: outPath, reason: (e as Error).message }, { file: outPath });
    }
  }
  const tmp = toStdout ? '' : temporarySibling(outPath);
  const out: NodeJS.WritableStream = toStdout ? process.stdout : createWriteStream(tmp, { encoding: 'utf8' });
  // A write error (a full disk, a folder that cannot be written) is kept and reported, never left
  // as an unhandled stream event.
  let writeError: Error | undefined;
  if (!toStdout) {
    out.on('error', (e: Error) => {
      writeError ??= e;
    });
  }
  const summary: PointSummary = { rows: 0, ok: 0, byStatus: {}, dewPointClamped: 0 };
  const write = async (s: string) => {
    if (writeError) throw PointOutputFailed({ path: outPath, reason: writeError.message }, { file: outPath });
    if (!out.write(s)) await once(out, 'drain');
  };
  try {
    let header: string[] | undefined;
    let col: Record<string, number> = {};
    let bytes = 0;
    for await (const [line, fields] of readCsvRecords(inName, fromStdin ? process.stdin : undefined)) {
      bytes += fields.reduce((a, f) => a + f.length + 1, 0);
      if (!header) {
        header = fields.map((h) => h.trim());
        const seen = new Set<string>();
        for (const h of header) {
          if (h !== '' && seen.has(h)) throw PointBadRow({ detail: `the header names column "${h}" twice` }, { file: inName, row: line });
          seen.add(h);
        }
        col = Object.fromEntries(header.map((h, i) => [h, i]));
        for (const c of REQUIRED) if (!(c in col)) throw PointMissingColumn({ column: c, present: header }, { file: inName, row: line });
        if (!('rh_pct' in col) && !('td_c' in col)) throw PointMissingColumn({ column: 'rh_pct or td_c', present: header }, { file: inName, row: line });
        const extra = OUTPUT.filter((c) => !(c in col));
        await write(`${[...header, ...extra].map(csvField).join(',')}\r\n`);
        col.__extra = extra.length;
        continue;
      }
      if (fields.length !== header.length) {
        throw PointBadRow({ detail: `line ${line} has ${fields.length} field(s), the header has ${header.length}` }, { file: inName, row: line });
      }
      const input = pointInputFromCells((name) => (name in col ? fields[col[name]] : undefined), { path: inName, row: line });
      const r = computePoint(input, globe);
      summary.rows++;
      const name = statusName(r.status);
      summary.byStatus[name] = (summary.byStatus[name] ?? 0) + 1;
      if (r.status === 0) summary.ok++;
      if (r.dewPointClamped) summary.dewPointClamped++;
      const ok = r.status === 0;
      const f = (v: number, d: number) => (ok && Number.isFinite(v) ? v.toFixed(d) : '');
      const values: Record<string, string> = {
        cos_zenith: f(r.cosZenith, 6),
        direct_fraction: f(r.directFraction, 6),
        wind_2m_ms: f(r.wind2m, 4),
        tg_c: f(r.tg, 4),
        tnwb_c: f(r.tnwb, 4),
        tpsy_c: f(r.tpsy, 4),
        wbgt_c: f(r.wbgt, 4),
        tg_shade_c: f(r.tgShade, 4),
        tnwb_shade_c: f(r.tnwbShade, 4),
        wbgt_shade_c: f(r.wbgtShade, 4),
        tg_shelter_c: f(r.tgShelter, 4),
        tnwb_shelter_c: f(r.tnwbShelter, 4),
        wbgt_shelter_c: f(r.wbgtShelter, 4),
        status: name,
      };
      // Work columns: the limit as a measured WBGT, L(M_w) − CAV, and the allowable work fraction
      // with exposure in the sun (wbgt_c) and rest in the same place.
      for (const w of work) {
        values[w.columns[0]] = ok ? w.kernel.threshold.toFixed(3) : '';
        values[w.columns[1]] = f(allowableWorkFraction(r.wbgt, null, w.kernel), 4);
      }
      const row = header.map((h, i) => (OUTPUT.includes(h) ? values[h] : (fields[i] ?? '')));
      for (const c of OUTPUT) if (!(c in col)) row.push(values[c]);
      await write(`${row.map(csvField).join(',')}\r\n`);
      progress.tick(bytes);
      bytes = 0;
    }
    if (!header) throw PointMissingColumn({ column: 'time_utc', present: [] }, { file: inName, row: 1 });
    if (!toStdout) {
      out.end();
      await once(out, 'finish');
      if (writeError) throw PointOutputFailed({ path: outPath, reason: writeError.message }, { file: outPath });
      await rename(tmp, outPath);
    }
    progress.done();
    return summary;
  } catch (e) {
    // Nothing half-written: the stream is closed before its temporary file is removed.
    if (!toStdout) {
      const file = out as ReturnType<typeof createWriteStream>;
      if (!file.closed) {
        const closed = once(file, 'close').catch(() => undefined);
        file.destroy();
        await closed;
      }
      await rm(tmp, { force: true });
    }
    if (!toStdout && e instanceof Error && !(e instanceof HeathoursError) && 'code' in e && typeof e.code === 'string' && /^E[A-Z]+$/.test(e.code)) {
      throw PointOutputFailed({ path: outPath, reason: e.message }, { file: outPath });
    }
    throw e;
  }
}

/** What `heathours point` does once its options are parsed (loaded only when the command runs). */
export async function pointAction(opts: {
  in: string;
  out: string;
  quiet?: boolean;
  classes?: string;
  unacclimatized?: boolean;
  cav?: string;
  globeDiameter?: string;
}): Promise<void> {
  const cav = opts.cav === undefined ? 0 : Number(opts.cav);
  if (opts.cav !== undefined && (opts.cav.trim() === '' || !Number.isFinite(cav))) {
    throw PointOptionInvalid({ option: '--cav', value: opts.cav, expected: 'a number of °C-WBGT from 0 to 20' });
  }
  const globeDiameter = opts.globeDiameter === undefined ? undefined : Number(opts.globeDiameter);
  if (opts.globeDiameter !== undefined && (opts.globeDiameter.trim() === '' || !Number.isFinite(globeDiameter))) {
    throw PointOptionInvalid({
      option: '--globe-diameter',
      value: opts.globeDiameter,
      expected: `a diameter in metres from ${GLOBE_DIAMETER_RANGE[0]} to ${GLOBE_DIAMETER_RANGE[1]}`,
    });
  }
  const s = await runPoint(opts.in, opts.out, { quiet: opts.quiet, classesFile: opts.classes, unacclimatized: opts.unacclimatized, cav, globeDiameter });
  const rest = Object.entries(s.byStatus)
    .filter(([k]) => k !== 'ok')
    .map(([k, v]) => `${k} ${v}`)
    .join(', ');
  process.stderr.write(
    `point: ${s.rows} rows, ${s.ok} computed${rest ? `; not computed: ${rest}` : ''}; dew point clamped to air temperature in ${s.dewPointClamped}\n`,
  );
}
