/**
 * What a shard's partial depends on, and the cache key made from it. A partial is reused only
 * when every part is the same; when one differs, {@link explainChange} names it, so each build
 * step can say why it recomputed.
 *
 * Parts (DESIGN.md §3):
 * - the code: package version and a digest of the sources that compute a shard (read, physics,
 *   work, reduce, model, run/compute-task.ts) and the partial file format;
 * - the inputs: name and SHA-256 of each file holding any hour of the shard's piece of its local
 *   year (pipeline/run/plan.ts), and of the static files (the land-sea mask);
 * - the configuration parts the counts depend on: product and land-sea mask, time zone, work
 *   shift, and the work evaluations (class id and metabolic rate, acclimatization, exposure,
 *   rest place, the prepared limit kernel with the clothing adjustment), and the physics
 *   settings (the globe diameter);
 * - the shard itself: year, piece (hours), tile and its land cells;
 * - the scenario it computes (pipeline/scenario): none for the record, the warming [K], or the
 *   change file's name, SHA-256 and humidity kind.
 * Titles, descriptions, regions, baseline years and publishing options are not parts: changing
 * them reuses every partial.
 */
import { createHash } from 'node:crypto';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { DatasetFileInfo } from '../read/index.ts';
import type { WorkEvaluation, WorkShift } from '../work/index.ts';
import { CODE_VERSION } from '../model/version.ts';
import { packagePath } from '../model/package-root.ts';
import { PARTIAL_FORMAT } from '../formats/partial-file.ts';
import type { PhysicsSettings } from '../physics/settings.ts';
import type { ScenarioSpec } from '../scenario/settings.ts';
import type { ShardSpec } from './plan.ts';

const HOUR_MS = 3_600_000;
/** The TypeScript sources of the pipeline, also when the compiled bundle runs: the digest is the same either way. */
const PIPELINE = packagePath('pipeline');
/** Folders (under pipeline/) and files whose sources decide a shard's counts. */
const COMPUTE_SOURCES = ['read', 'scenario', 'physics', 'work', 'reduce', 'model', 'run/compute-task.ts', 'run/scenario-change.ts'];

function sourceFiles(path: string): string[] {
  if (path.endsWith('.ts') || path.endsWith('.mjs')) return [path];
  return readdirSync(join(PIPELINE, path), { withFileTypes: true })
    .filter((e) => e.isDirectory() || /\.(ts|mjs)$/.test(e.name))
    .flatMap((e) => sourceFiles(join(path, e.name)))
    .sort();
}

/** SHA-256 of the shard-computing sources [hex, 16 digits]; same sources, same digest. */
export const COMPUTE_CODE_DIGEST: string = (() => {
  const h = createHash('sha256');
  for (const f of COMPUTE_SOURCES.flatMap(sourceFiles))
    h.update(f)
      .update('\0')
      .update(readFileSync(join(PIPELINE, f)))
      .update('\0');
  return h.digest('hex').slice(0, 16);
})();

/** The configuration parts every shard depends on. */
export interface ComputeSettings {
  product: string;
  landSeaMask: unknown;
  timeZone: string;
  shift: WorkShift;
  evaluations: readonly WorkEvaluation[];
  physics: PhysicsSettings;
}

/** The provenance of one shard's partial: the parts listed in the file comment. */
export interface ShardProvenance {
  code: { version: string; sources: string; partialFormat: number };
  inputs: Array<{ name: string; sha256: string }>;
  settings: {
    product: string;
    landSeaMask: unknown;
    timeZone: string;
    shift: WorkShift;
    evaluations: Array<{ key: string; workloadClass: { id: string; metabolicRate: number }; restWbgt: string | null; kernel: unknown }>;
    physics: PhysicsSettings;
  };
  /** `hours`: first and last hour of the piece as UTC time stamps (ISO 8601), not indices, so adding earlier data keeps keys. */
  shard: { year: number; utcYear: number; hours: [string, string]; tile: ShardSpec['tile']; cells: string };
  /** What the shard's weather is: the record (null) or a scenario's changes of it (its name and title are not parts). */
  scenario: ScenarioPart | null;
}

/** The parts of a scenario a shard's counts depend on. */
export type ScenarioPart = { warming: number } | { changeFile: string; sha256: string; humidity: string };

/** The cache-key part of a scenario (undefined: the record). */
export function scenarioPart(s: ScenarioSpec | undefined): ScenarioPart | null {
  if (s === undefined) return null;
  return s.kind === 'warming' ? { warming: s.warming } : { changeFile: s.file, sha256: s.sha256, humidity: s.humidity };
}

/** Digest of the settings alone [hex, 16 digits]: what the merge compares across partials. */
export function settingsDigest(s: ComputeSettings): string {
  return sha(JSON.stringify(settingsPart(s))).slice(0, 16);
}

function settingsPart(s: ComputeSettings): ShardProvenance['settings'] {
  return {
    product: s.product,
    landSeaMask: s.landSeaMask ?? null,
    timeZone: s.timeZone,
    shift: s.shift,
    evaluations: s.evaluations.map((e) => ({
      key: e.key,
      workloadClass: { id: e.workloadClass.id, metabolicRate: e.workloadClass.metabolicRate },
      restWbgt: e.restWbgt,
      kernel: e.kernel,
    })),
    physics: s.physics,
  };
}

function sha(text: string | Uint8Array): string {
  return createHash('sha256').update(text).digest('hex');
}

/** Files holding any of the hours [h0, h1) (dataset hour indices), and the files without a time axis. */
export function inputsForHours(files: readonly DatasetFileInfo[], time: { start: number }, hours: [number, number]): Array<{ name: string; sha256: string }> {
  const from = time.start + hours[0] * HOUR_MS;
  const to = time.start + (hours[1] - 1) * HOUR_MS;
  return files
    .filter((f) => !f.timeStart || (Date.parse(f.timeEnd) >= from && Date.parse(f.timeStart) <= to))
    .map((f) => ({ name: f.name, sha256: f.sha256 }))
    .sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0));
}

/** The provenance of `shard` (of `scenario`, or of the record) and its cache key [hex]. */
export function shardProvenance(
  shard: ShardSpec,
  files: readonly DatasetFileInfo[],
  time: { start: number },
  s: ComputeSettings,
  scenario?: ScenarioSpec,
): { provenance: ShardProvenance; key: string } {
  const provenance: ShardProvenance = {
    code: { version: CODE_VERSION, sources: COMPUTE_CODE_DIGEST, partialFormat: PARTIAL_FORMAT },
    inputs: inputsForHours(files, time, shard.hours),
    settings: settingsPart(s),
    shard: {
      year: shard.year,
      utcYear: shard.utcYear,
      hours: hoursIso(time, shard.hours),
      tile: shard.tile,
      cells: sha(new Uint8Array(shard.cells.buffer, shard.cells.byteOffset, shard.cells.byteLength)).slice(0, 16),
    },
    scenario: scenarioPart(scenario),
  };
  return { provenance, key: sha(JSON.stringify(provenance)) };
}

function hoursIso(time: { start: number }, hours: [number, number]): [string, string] {
  return [new Date(time.start + hours[0] * HOUR_MS).toISOString(), new Date(time.start + (hours[1] - 1) * HOUR_MS).toISOString()];
}

/** Why a stored partial of provenance `old` does not serve `now`, in words; [] when it does. */
export function explainChange(old: ShardProvenance, now: ShardProvenance): string[] {
  const why: string[] = [];
  if (old.code?.version !== now.code.version) why.push(`code version ${old.code?.version} → ${now.code.version}`);
  else if (old.code?.sources !== now.code.sources) why.push('the computing code changed (source digest)');
  if (old.code?.partialFormat !== now.code.partialFormat) why.push('partial format changed');
  const before = new Map((old.inputs ?? []).map((f) => [f.name, f.sha256]));
  const after = new Map(now.inputs.map((f) => [f.name, f.sha256]));
  for (const [name, digest] of after) {
    if (!before.has(name)) why.push(`input ${name} is new to this year`);
    else if (before.get(name) !== digest) why.push(`input ${name} changed`);
  }
  for (const name of before.keys()) if (!after.has(name)) why.push(`input ${name} is gone`);
  const os = old.settings;
  const ns = now.settings;
  if (os?.product !== ns.product || JSON.stringify(os?.landSeaMask) !== JSON.stringify(ns.landSeaMask)) why.push('dataset product or land-sea mask changed');
  if (os?.timeZone !== ns.timeZone) why.push(`time zone ${os?.timeZone} → ${ns.timeZone}`);
  if (JSON.stringify(os?.shift) !== JSON.stringify(ns.shift)) why.push('work shift changed');
  if (JSON.stringify(os?.physics) !== JSON.stringify(ns.physics)) {
    why.push(`physics settings changed (globe diameter ${os?.physics?.globeDiameter ?? 'unset'} → ${ns.physics.globeDiameter} m)`);
  }
  if (JSON.stringify(os?.evaluations) !== JSON.stringify(ns.evaluations)) why.push(describeEvaluationChange(os?.evaluations ?? [], ns.evaluations));
  if (JSON.stringify(old.shard?.hours) !== JSON.stringify(now.shard.hours))
    why.push(`its hours are now ${now.shard.hours.join(' to ')} (were ${old.shard?.hours?.join(' to ')})`);
  if (old.shard?.cells !== now.shard.cells || JSON.stringify(old.shard?.tile) !== JSON.stringify(now.shard.tile))
    why.push('the tile holds other cells (grid, mask or tiling changed)');
  if (JSON.stringify(old.scenario ?? null) !== JSON.stringify(now.scenario ?? null))
    why.push(describeScenarioChange(old.scenario ?? null, now.scenario ?? null));
  return why;
}

function describeScenarioChange(a: ScenarioPart | null, b: ScenarioPart | null): string {
  const words = (p: ScenarioPart | null) =>
    p === null
      ? 'the record'
      : 'warming' in p
        ? `a uniform warming of ${p.warming} K`
        : `the change file ${p.changeFile} (${p.humidity} humidity, SHA-256 ${p.sha256.slice(0, 12)}…)`;
  if (a !== null && b !== null && 'changeFile' in a && 'changeFile' in b && a.changeFile === b.changeFile && a.humidity === b.humidity)
    return `the scenario's change file ${b.changeFile} changed`;
  return `the scenario changed: ${words(a)} → ${words(b)}`;
}

function describeEvaluationChange(a: ShardProvenance['settings']['evaluations'], b: ShardProvenance['settings']['evaluations']): string {
  const byKey = (l: typeof a) => new Map(l.map((e) => [e.key, JSON.stringify(e)]));
  const ma = byKey(a);
  const mb = byKey(b);
  const changed = [...mb.keys()].filter((k) => ma.has(k) && ma.get(k) !== mb.get(k));
  const added = [...mb.keys()].filter((k) => !ma.has(k));
  const removed = [...ma.keys()].filter((k) => !mb.has(k));
  const classes = (keys: string[]) => [...new Set(keys.map((k) => k.split('.')[0]))].join(', ');
  const parts = [
    changed.length ? `changed: ${classes(changed)}` : '',
    added.length ? `added: ${classes(added)}` : '',
    removed.length ? `removed: ${classes(removed)}` : '',
  ].filter(Boolean);
  return (
    `work evaluations changed (${parts.join('; ') || 'order'}); every class is counted in the same pass over the hourly WBGT, ` +
    'so the shard recomputes whole (the physics, shared by all classes, is most of its cost)'
  );
}
