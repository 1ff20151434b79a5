/**
 * What the estimate knows about the atlas: years, baseline, time zone, the work settings the
 * atlas was built with (classes, rest rate, limit model, clothing, shift), the regions with their
 * tiles, the grid with the cell chunks, and the build it came from. The page reads it at build
 * time (src/data/estimate.ts) and hands it to the browser in a data attribute; `heathours
 * estimate` reads the same files (pipeline/run/estimate-atlas.ts).
 */
import type { Acclimatization, LimitModelId } from '../work/limit-curves.ts';
import type { WorkShift } from '../work/shifts.ts';
import type { Exposure, RestLocation } from '../work/work-settings.ts';

export interface EstimateClass {
  id: string;
  name: string;
  /** Work metabolic rate [W]. */
  metabolicRate: number;
  description: string;
}

export interface EstimateGrid {
  nLat: number;
  nLon: number;
  /** Centre of row 0 [° N] and column 0 [° E]; steps [°]. Cell id = row × nLon + column. */
  lat0: number;
  dLat: number;
  lon0: number;
  dLon: number;
}

export interface EstimateChunk {
  /** Path below the site root, e.g. `data/calculator/cells/0000.bin`. */
  path: string;
  firstCell: number;
  lastCell: number;
}

/**
 * A what-if climate published beside the record (`data/scenarios/<id>/`, the same files): the
 * manifest's words for it, shown wherever its figures are.
 */
export interface EstimateScenario {
  id: string;
  name: string;
  /** `uniform warming` or `change factors` (pipeline/scenario/describe.ts). */
  kind: string;
  /** What it changes, in one sentence. */
  what: string;
  /** Where its changes come from. */
  source: string;
  /** Its folder below the site root, `data/scenarios/<id>/`. */
  dataPath: string;
}

export interface EstimateContext {
  /** Years in every tile, ascending [year]. */
  years: number[];
  baseline: [number, number];
  /** IANA zone of the local hours. */
  timeZone: string;
  invented: boolean;
  /** Rest metabolic rate [W]. */
  restRate: number;
  classes: EstimateClass[];
  limitModel: LimitModelId;
  airMovement: boolean;
  /** The atlas's own settings: the calculator's defaults, which reproduce the region tables. */
  defaults: {
    classId: string;
    acclimatization: Acclimatization;
    exposure: Exposure;
    restLocation: RestLocation;
    clothing: { ensemble: string; hood: boolean } | { cav: number };
    shift: WorkShift;
  };
  regions: Array<{ id: string; name: string; path: string }>;
  /** Null when the atlas has no per-cell tiles. */
  cells: { grid: EstimateGrid; chunks: EstimateChunk[] } | null;
  /** The build the figures come from (manifest). */
  build: { title: string; buildTime: string; codeVersion: string; configDigest: string; inputs: number };
  /** The atlas's scenarios in the manifest's order (empty without any). */
  scenarios: EstimateScenario[];
  /** What every scenario is and is not (the manifest's `scenarioCaveat`); empty without scenarios. */
  scenarioCaveat: string;
}

/** What {@link makeEstimateContext} reads from the manifest and the calculator indexes (validated by the caller). */
export interface EstimateContextParts {
  manifest: {
    atlas: { title: string; invented: boolean };
    buildTime: string;
    codeVersion: string;
    configDigest: string;
    inputs: unknown[];
    timeZone: string;
    work: {
      rest: { metabolicRate: number };
      classes: Array<{ id: string; name: string; metabolicRate: number; description: string }>;
      limitModel: LimitModelId;
      airMovement: boolean;
      acclimatization: Acclimatization[];
      exposures: Exposure[];
      restLocation: RestLocation;
      clothing: { ensemble?: string; hood?: boolean; cav?: number };
    };
    scenarioCaveat?: string;
    scenarios?: Array<{ id: string; name: string; words: { kind: string; what: string; source: string }; dataPath: string }>;
  };
  /** The manifest's shift, checked (pipeline/work/shifts.ts validateShift). */
  shift: WorkShift;
  calculator: { years: number[]; baseline: [number, number]; regions: Array<{ id: string; name: string; path: string }> };
  cells: { grid: EstimateGrid; chunks: EstimateChunk[] } | null;
}

/**
 * The estimate's context from the atlas's files, the same for the page (src/data/estimate.ts) and
 * the CLI (pipeline/run/estimate-atlas.ts). Defaults: the class `moderate` when the atlas has it,
 * else its first; the first acclimatization state of the atlas and its first exposure the
 * histograms hold (sun or shade: the calculator's histograms have no shelter).
 */
export function makeEstimateContext(p: EstimateContextParts): EstimateContext {
  const m = p.manifest;
  const w = m.work;
  const classId = w.classes.some((c) => c.id === 'moderate') ? 'moderate' : w.classes[0].id;
  const clothing = w.clothing.cav !== undefined ? { cav: w.clothing.cav } : { ensemble: w.clothing.ensemble ?? 'work-clothes', hood: w.clothing.hood ?? false };
  return {
    years: p.calculator.years,
    baseline: p.calculator.baseline,
    timeZone: m.timeZone,
    invented: m.atlas.invented,
    restRate: w.rest.metabolicRate,
    classes: w.classes.map((c) => ({ id: c.id, name: c.name, metabolicRate: c.metabolicRate, description: c.description })),
    limitModel: w.limitModel,
    airMovement: w.airMovement,
    defaults: {
      classId,
      acclimatization: w.acclimatization[0],
      exposure: w.exposures.find((x) => x !== 'shelter') ?? 'sun',
      restLocation: w.restLocation,
      clothing,
      shift: p.shift,
    },
    regions: p.calculator.regions.map((r) => ({ id: r.id, name: r.name, path: r.path })),
    cells: p.cells ? { grid: p.cells.grid, chunks: p.cells.chunks.map((c) => ({ path: c.path, firstCell: c.firstCell, lastCell: c.lastCell })) } : null,
    build: { title: m.atlas.title, buildTime: m.buildTime, codeVersion: m.codeVersion, configDigest: m.configDigest, inputs: m.inputs.length },
    scenarios: (m.scenarios ?? []).map((s) => ({
      id: s.id,
      name: s.name,
      kind: s.words.kind,
      what: s.words.what,
      source: s.words.source,
      dataPath: s.dataPath,
    })),
    scenarioCaveat: m.scenarios && m.scenarios.length > 0 ? (m.scenarioCaveat ?? '') : '',
  };
}
