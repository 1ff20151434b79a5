/**
 * Stage 1 of a build, the plan: configuration, work settings and regions checked before any data
 * is read; the dataset opened (files hashed); the land cells, the regions' cell weights, the
 * shards with their cache keys, the compute groups and merge bands that fit the memory budget,
 * and the estimate of memory, time and disk, printed before anything is computed.
 */
import { existsSync, readFileSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { basename, dirname, join, resolve } from 'node:path';
import { createHash } from 'node:crypto';
import { parseYamlStrict, type ResolvedConfig } from '../config/load.ts';
import { ConfigSyntax } from '../config/errors.ts';
import { openDataset, type Dataset } from '../read/index.ts';
import { countedExposures, parseWorkloadClasses, resolveWorkSettings, type ResolvedWork } from '../work/index.ts';
import { parseRegionFile, checkUniqueRegionIds, allRegionCellWeights, applyLandMask, type CellWeights, type Region } from '../regions/index.ts';
import type { RegionTileCells } from '../regions/region-sums.ts';
import { figureDefs, type FigureDef } from '../reduce/figures.ts';
import { gridFields, type GridField } from '../publish/grid-fields.ts';
import { DEFAULT_CELL_TILE } from '../publish/cell-figures.ts';
import type { Logger } from '../model/effects.ts';
import { gridCellCount, landCellsOf, lowerBound, rowRange, type LandCells } from '../model/grid.ts';
import { planShards, scenarioShards, yearPieces, type ShardSpec } from './plan.ts';
import type { ScenarioSpec } from '../scenario/settings.ts';
import { sha256File } from '../read/dataset-file.ts';
import { checkScenario, closeChangeFiles, type ScenarioCheck } from './scenario-change.ts';
import { shardProvenance } from './shard-key.ts';
import type { KeyedShard } from './shard-sources.ts';
import { BLOCK_HOURS, type ComputeTask, type ShardContext } from './compute-task.ts';
import { DEFAULT_MEMORY_BUDGET, formatBytes, parseMemorySize, planMemory, publicationBlocks, type MemoryPlan } from './memory-plan.ts';
import { siteParts } from './site-parts.ts';
import { estimateBuild, type BuildEstimate } from './estimate.ts';
import { rowsId } from './rows-id.ts';
import { planWorkforce, type WorkforcePlan } from './workforce-plan.ts';
import { cellAreaSr, describeGridCells } from '../regions/grid-cells.ts';
import { EARTH_RADIUS_KM } from '../regions/spherical-area.ts';
import type { BandWorkforce } from './merge-tile.ts';
import { MemoryBudgetInvalid, NoLandCells, WorkloadClassesFileMissing, YearsOutsideData } from './errors.ts';
import { checkCoverage } from '../read/coverage.ts';
import { coverageProblems } from '../read/coverage-text.ts';
import { InputsIncomplete } from '../read/errors.ts';
import { shortBaselineWarning } from '../publish/baseline-length.ts';

const HOUR_MS = 3_600_000;

export interface PlanOptions {
  /** Worker threads; default all cores. */
  jobs?: number;
  /** Memory budget text (`4G`); default the config's `memory`, else 3 G. */
  memory?: string;
  /**
   * Distributed merge: plan only slice K of N of the publication blocks (a contiguous run of
   * them, {@link sliceBlocks}) as merge bands.
   */
  mergeSlice?: { k: number; n: number };
  /** Plan no merge bands (the assemble step of a distributed run merges nothing). */
  noMerge?: boolean;
  /** The build ends with the site (not data only, not a shard or merge task): its memory and time are planned too. */
  site?: boolean;
  /**
   * The completeness rule of the coverage check: hours a built year may miss per variable
   * [h]; default 0 (every hour of every built year).
   */
  maxMissingHours?: number;
}

/** One merge band: its rows, land cells, the shards holding them and the regions it overlaps. */
export interface MergeBand {
  id: string;
  rows: [number, number];
  /** The publication blocks the band is made of (rows), whose files it writes. */
  blocks: Array<[number, number]>;
  cells: Int32Array;
  /** Shard tiles (indices) holding the band's cells. */
  tiles: number[];
  /** The band's cells lie in a shard tile that holds more (the merge skips the others). */
  subset: boolean;
  regions: RegionTileCells[];
  /** The band's people and share profiles, when the atlas has a workforce. */
  workforce?: BandWorkforce;
}

/**
 * One weather the build computes and publishes: the record itself (the baseline) or a scenario
 * made from it. Each has its own shards (the scenario's keyed by its parameters) and publishes the
 * same files under its own folder of data/.
 */
export interface BuildVariant {
  /** The scenario, or undefined for the record. */
  scenario: ScenarioSpec | undefined;
  /** Folder below `data/` it publishes into: '' for the record, `scenarios/<id>` for a scenario. */
  dataPath: string;
  /** Short name for logs and scratch folders: `baseline` or the scenario id. */
  label: string;
  shards: ShardSpec[];
  /** What the plan found in the scenario's changes (ranges over the land cells and months). */
  check?: ScenarioCheck;
}

export interface BuildPlan {
  rc: ResolvedConfig;
  work: ResolvedWork;
  /** Digest of the configuration that shapes the results and of the workload classes [hex] (resultConfigText). */
  configDigest: string;
  regions: Region[];
  weights: CellWeights[];
  ds: Dataset;
  years: number[];
  latestYear: number;
  /** The grid's land cells: their row-major ids (ascending), land cells per row. */
  land: LandCells;
  /** The record's shards (the baseline); each variant's are in `variants`. */
  shards: ShardSpec[];
  /** Every shard of every variant with its provenance and cache key. */
  keyed: KeyedShard[];
  /** The scenarios of the configuration, resolved (change files hashed). */
  scenarios: ScenarioSpec[];
  /** The record first, then each scenario. */
  variants: BuildVariant[];
  /** The shard tiles: rows and land cells. */
  tiles: Array<{ y0: number; y1: number; cells: number }>;
  tasks: ComputeTask[];
  /** Every publication block of the grid (rows), and the merge bands planned (of a slice's blocks with `mergeSlice`). */
  blocks: Array<[number, number]>;
  bands: MergeBand[];
  defs: FigureDef[];
  fields: GridField[];
  memory: MemoryPlan;
  jobs: number;
  context: ShardContext;
  estimate: BuildEstimate;
  /** The people raster on the land cells and the shares, when the config has `workforce`. */
  workforce?: WorkforcePlan;
  /** SHA-256 of the workforce raster and shares table [hex], when configured (also in `configDigest`). */
  workforceDigests?: { raster: string; shares: string };
  close(): Promise<void>;
}

/** Builds the plan and logs what it chose and what the build will cost. */
export async function planBuild(rc: ResolvedConfig, o: PlanOptions, log: Logger): Promise<BuildPlan> {
  const cfg = rc.config;
  // Work settings and regions are checked before any data is read.
  const classesPath = resolve(dirname(rc.path), cfg.work.classesFile);
  if (!existsSync(classesPath)) throw WorkloadClassesFileMissing({ path: classesPath }, { file: rc.path, key: 'work.classesFile' });
  const classesText = readFileSync(classesPath, 'utf8');
  const allClasses = parseWorkloadClasses(
    parseYamlStrict(classesText, (detail) => ConfigSyntax({ detail }, { file: classesPath })),
    classesPath,
  );
  const work = resolveWorkSettings(cfg.work, allClasses, { file: rc.path });
  const regions: Region[] = rc.regionFiles.flatMap((f) => parseRegionFile(readFileSync(f, 'utf8'), f));
  checkUniqueRegionIds(regions);
  const memoryText = o.memory ?? cfg.memory;
  const budget = memoryText === undefined ? DEFAULT_MEMORY_BUDGET : parseMemorySize(memoryText);
  if (budget === undefined) throw MemoryBudgetInvalid({ text: memoryText! }, o.memory !== undefined ? { key: '--memory' } : { file: rc.path, key: 'memory' });
  // The workforce files are part of what a build was made from: their bytes go into the digest.
  const workforceDigests = rc.workforce ? { raster: await sha256File(rc.workforce.raster), shares: await sha256File(rc.workforce.shares) } : undefined;
  const digest = createHash('sha256').update(resultConfigText(cfg)).update('\0').update(classesText);
  if (workforceDigests) digest.update(`\0workforce ${workforceDigests.raster} ${workforceDigests.shares}`);
  const configDigest = digest.digest('hex');

  log.info(
    `heathours build: atlas "${cfg.id}", ${rc.inputFiles.length} input file(s), ${regions.length} region(s), ${work.evaluations.length} work evaluations`,
  );
  const baselineWarning = shortBaselineWarning(cfg.baseline);
  if (baselineWarning) log.warn(baselineWarning);
  const datasetOptions = { product: cfg.dataset.product, landSeaMask: cfg.dataset.landSeaMask };
  await checkInputCoverage(rc, o.maxMissingHours ?? 0, log);
  const ds = await openDataset(rc.inputFiles, { ...datasetOptions, memberCache: memberCacheDir(rc) });
  for (const note of ds.notes) log.warn(note);
  try {
    checkYears(ds.time, cfg.years, 'years', rc.path);
    const landCells = landCellsOf(ds.grid, ds.landMask);
    const cells = landCells.ids;
    const nGrid = gridCellCount(landCells);
    const nLand = cells.length;
    if (nLand === 0) throw NoLandCells({ detail: `the land-sea mask leaves none of the ${nGrid} cells` }, { file: rc.path, key: 'dataset.landSeaMask' });
    const land = ds.landMask ?? new Uint8Array(nGrid).fill(1);
    const weights = allRegionCellWeights(regions, ds.grid).map((w) => applyLandMask(w, land));
    const workforce = await planWorkforce(rc, ds.grid, cells, regions, weights, work.evaluations, work.shift, log);

    // The shards, each with its provenance and cache key.
    const years = range(cfg.years[0], cfg.years[1]);
    const shards = planShards(
      landCells,
      years,
      (y) => yearPieces(ds.time, y, cfg.timeZone, cfg.shards.monthsPerPiece),
      cfg.shards.cellsPerTile,
      cfg.shards.monthsPerPiece,
    );
    const settings = { ...datasetOptions, timeZone: cfg.timeZone, shift: work.shift, evaluations: work.evaluations, physics: cfg.physics };
    // Scenarios: resolved, and checked over every land cell before anything is computed.
    const scenarios: ScenarioSpec[] = [];
    for (const sc of cfg.scenarios) {
      const base = { id: sc.id, name: sc.name, ...(sc.description !== undefined ? { description: sc.description } : {}) };
      if (sc.warming !== undefined) scenarios.push({ ...base, kind: 'warming', warming: sc.warming });
      else {
        const path = rc.changeFiles[sc.id];
        scenarios.push({ ...base, kind: 'change-file', path, file: basename(path), sha256: await sha256File(path), humidity: sc.humidity! });
      }
    }
    const variants: BuildVariant[] = [{ scenario: undefined, dataPath: '', label: 'baseline', shards }];
    try {
      for (const sc of scenarios) {
        const check = await checkScenario(sc, cells, ds.grid);
        variants.push({ scenario: sc, dataPath: `scenarios/${sc.id}`, label: sc.id, shards: scenarioShards(shards, sc.id), check });
        const f = (x: number) => (Math.round(x * 100) / 100).toFixed(2);
        log.info(
          `scenario ${sc.id} (${sc.kind === 'warming' ? `uniform warming ${sc.warming} K` : `change factors ${sc.file}`}): air temperature ${f(check.temperature.min)} … ${f(check.temperature.max)} K` +
            (check.humidity
              ? `, humidity ${f(check.humidity.min)} … ${f(check.humidity.max)} ${sc.kind === 'change-file' && sc.humidity === 'specific' ? '(relative change of q)' : 'points of RH'}`
              : '') +
            (check.solar ? `, solar ${f(check.solar.min * 100)} … ${f(check.solar.max * 100)} %` : '') +
            ' over the land cells and months',
        );
      }
    } finally {
      await closeChangeFiles();
    }
    const keyed: KeyedShard[] = variants.flatMap((v) =>
      v.shards.map((shard) => ({ shard, ...shardProvenance(shard, ds.files, ds.time, settings, v.scenario) })),
    );
    const tiles: BuildPlan['tiles'] = [];
    for (const s of shards) if (!tiles[s.tileIndex]) tiles[s.tileIndex] = { y0: s.tile.y0, y1: s.tile.y1, cells: s.cells.length };
    const jobs = Math.max(1, o.jobs ?? availableParallelism());

    // What fits the memory budget.
    const defs = figureDefs(
      work.evaluations.map((e) => e.key),
      countedExposures(work.evaluations),
    );
    if (workforce) defs.push(workforce.densityDef);
    const fields = gridFields(defs);
    const allBlocks = publicationBlocks(landCells, DEFAULT_CELL_TILE.rows, cfg.shards.cellsPerBlock);
    const blocks = o.noMerge ? [] : o.mergeSlice ? sliceBlocks(allBlocks, o.mergeSlice.k, o.mergeSlice.n) : allBlocks;
    const memory = planMemory({
      budget,
      jobs,
      land: landCells,
      tiles,
      years: years.length,
      monthsPerPiece: cfg.shards.monthsPerPiece,
      evaluations: work.evaluations.length,
      exposures: countedExposures(work.evaluations).length,
      combos: defs.reduce((s, d) => s + d.combos.length, 0),
      gridFields: fields.length,
      blocks,
      maxBlockHours: BLOCK_HOURS,
      variants: variants.length,
      ...(o.site ? { site: { regions: regions.length, parts: siteParts(regions.length, jobs) } } : {}),
    });
    const tasks = computeTasks(
      variants.map((v) => v.shards),
      memory,
    );
    const bands = mergeBands(memory.mergeBands, blocks, landCells, tiles, weights);
    if (workforce) addBandWorkforce(bands, landCells, weights, workforce, work.evaluations.length);
    const latestYear = years[years.length - 1];
    const estimate = estimateBuild({
      shards: variants.flatMap((v) => v.shards),
      land: landCells,
      years: years.length,
      regions: regions.length,
      jobs,
      fields: fields.length,
      memory,
      evaluations: work.evaluations.length,
      variants: variants.length,
    });
    log.info(
      `plan: ${nLand} land cells of ${nGrid}, ${keyed.length} shards (${tiles.length} tile(s) × pieces of ${years.length} year(s)${variants.length > 1 ? ` × the record and ${scenarios.length} scenario(s)` : ''}) in ${tasks.length} compute tasks ` +
        `(${memory.groups.length} group(s) of tiles read together, blocks of ${memory.blockHours} h), ${bands.length} merge band(s), ${jobs} worker(s)`,
    );
    log.info(
      `memory budget ${formatBytes(budget)}: estimated peak ${formatBytes(Math.max(memory.computePeak, memory.mergePeak, memory.sitePeak))} ` +
        `(computing ${formatBytes(memory.computePeak)}, merging ${formatBytes(memory.mergePeak)}` +
        `${o.site ? `, site ${formatBytes(memory.sitePeak)} in ${memory.siteParts} Astro process(es)` : ''})`,
    );
    log.info(`estimate: ${estimate.text}`);
    return {
      rc,
      work,
      configDigest,
      regions,
      weights,
      ds,
      years,
      latestYear,
      land: landCells,
      shards,
      keyed,
      scenarios,
      variants,
      tiles,
      tasks,
      blocks: allBlocks,
      bands,
      defs,
      fields,
      memory,
      jobs,
      context: { evaluations: work.evaluations, timeZone: cfg.timeZone, shift: work.shift, physics: cfg.physics, grid: ds.grid, scenarios },
      estimate,
      workforce,
      workforceDigests,
      close: () => ds.close(),
    };
  } catch (e) {
    await ds.close();
    throw e;
  }
}

/**
 * Slice K of N of the publication blocks for a distributed merge: the contiguous run
 * [⌊(K − 1)·B/N⌋, ⌊K·B/N⌋) of the B blocks, so a task's blocks lie together and form few bands
 * (a slice may be empty when N > B).
 */
export function sliceBlocks<T>(blocks: readonly T[], k: number, n: number): T[] {
  return blocks.slice(Math.floor(((k - 1) * blocks.length) / n), Math.floor((k * blocks.length) / n));
}

/**
 * The compute tasks: per piece of a year, one task per group of tiles (the plan's groups) and set
 * of weathers (the record and the scenarios, as many as the plan lets one task hold: they share
 * the task's reads).
 * @param variants each weather's shards (the same pieces and tiles in each)
 */
function computeTasks(variants: ReadonlyArray<readonly ShardSpec[]>, memory: MemoryPlan): ComputeTask[] {
  const byPiece = new Map<string, ShardSpec[][]>();
  variants.forEach((shards, v) => {
    for (const s of shards) {
      const key = `${s.year}|${s.hours[0]}|${s.hours[1]}`;
      const lists = byPiece.get(key) ?? variants.map(() => []);
      lists[v].push(s);
      byPiece.set(key, lists);
    }
  });
  const tasks: ComputeTask[] = [];
  const per = Math.max(1, memory.variantsPerTask);
  for (const lists of byPiece.values()) {
    const byTile = lists.map((list) => new Map(list.map((s) => [s.tileIndex, s])));
    memory.groups.forEach((g, gi) => {
      for (let v0 = 0; v0 < variants.length; v0 += per) {
        const members = byTile.slice(v0, v0 + per).flatMap((m) => g.map((i) => m.get(i)).filter((s): s is ShardSpec => s !== undefined));
        if (members.length === 0) continue;
        const id = members[0].id.replace(/^t\d+/, `g${String(gi).padStart(2, '0')}`);
        tasks.push({ id, shards: members, blockHours: memory.blockHours });
      }
    });
  }
  return tasks;
}

/** The merge bands with their cells, the shard tiles they read and the regions they overlap. */
function mergeBands(
  rows: ReadonlyArray<[number, number]>,
  blocks: ReadonlyArray<[number, number]>,
  land: LandCells,
  tiles: BuildPlan['tiles'],
  weights: readonly CellWeights[],
): MergeBand[] {
  const { ids: cells, nx: nLon } = land;
  // Which band each land cell is in, and its position there.
  const bands: MergeBand[] = rows.map(([y0, y1]) => {
    const [a, b] = rowRange(land, y0, y1);
    const tileIdx = tiles.flatMap((t, i) => (t.y0 < y1 && t.y1 > y0 ? [i] : []));
    const subset = tileIdx.some((i) => tiles[i].y0 < y0 || tiles[i].y1 > y1);
    const mine = blocks.filter(([b0, b1]) => b0 >= y0 && b1 <= y1).map(([b0, b1]): [number, number] => [b0, b1]);
    return { id: rowsId([y0, y1]), rows: [y0, y1], blocks: mine, cells: cells.slice(a, b), tiles: tileIdx, subset, regions: [] };
  });
  const bandOfRow = new Int32Array(land.ny).fill(-1);
  rows.forEach(([y0, y1], i) => bandOfRow.fill(i, y0, y1));
  weights.forEach((w, r) => {
    // The region's land weights, their sum for its histograms (in the order of its cells).
    let total = 0;
    for (let j = 0; j < w.cells.length; j++) total += w.weight[j];
    const byBand = new Map<number, number[]>();
    for (let j = 0; j < w.cells.length; j++) {
      // Hot loop: plain row = id / nx.
      const bi = bandOfRow[Math.floor(w.cells[j] / nLon)] ?? -1;
      if (bi < 0) continue;
      const list = byBand.get(bi) ?? [];
      list.push(j);
      byBand.set(bi, list);
    }
    for (const [bi, js] of byBand) {
      const band = bands[bi];
      band.regions.push({
        region: r,
        local: Int32Array.from(js, (j) => lowerBound(band.cells, w.cells[j])),
        cells: Int32Array.from(js, (j) => w.cells[j]),
        weight: Float64Array.from(js, (j) => w.weight[j]),
        histWeight: Float64Array.from(js, (j) => w.weight[j] / total),
      });
    }
  });
  return bands.filter((b) => b.cells.length > 0);
}

/**
 * Hands each merge band its part of the workforce: its cells' people, share profiles and areas,
 * and per region it overlaps the people weights p_cell / P (p_cell the cell's people inside the
 * region, P their sum over the region; area weights for a region without people, whose
 * person-hours are then 0).
 */
function addBandWorkforce(bands: MergeBand[], land: LandCells, weights: readonly CellWeights[], wf: WorkforcePlan, nEval: number): void {
  const g = describeGridCells(land.grid);
  const R2 = EARTH_RADIUS_KM * EARTH_RADIUS_KM;
  for (const band of bands) {
    // The band's cells are the land cells of its rows: positions [a, b) in the plan's lists.
    const [a, b] = rowRange(land, band.rows[0], band.rows[1]);
    const areaKm2 = Float64Array.from(band.cells, (c) => R2 * cellAreaSr(g, c));
    const regions: RegionTileCells[] = band.regions.map((rc) => {
      const w = weights[rc.region];
      const total = wf.regionPeople[rc.region];
      const weight = Float64Array.from(rc.cells, (cell, k) => (total > 0 ? wf.regionCellPeople[rc.region][lowerBound(w.cells, cell)] / total : rc.weight[k]));
      return { region: rc.region, local: rc.local, cells: rc.cells, weight, histWeight: new Float64Array(0) };
    });
    band.workforce = {
      people: wf.people.slice(a, b),
      profile: wf.profile.slice(a, b),
      areaKm2,
      profileWeights: wf.profileWeights,
      nEval,
      regions,
    };
  }
}

function range(a: number, b: number): number[] {
  return Array.from({ length: b - a + 1 }, (_, i) => a + i);
}

/** Each configured local year must be held by the data, up to the completeness margin (10 days). */
/**
 * The coverage check before anything is read for computing (pipeline/read/coverage.ts): the
 * built years must lie in the data (`YearsOutsideData`), and every hour of them must be there
 * once, up to `maxMissing` hours per year and variable (`InputsIncomplete`, naming the missing
 * hours and the downloads that would hold them). Preliminary ERA5T hours are logged.
 */
async function checkInputCoverage(rc: ResolvedConfig, maxMissing: number, log: Logger): Promise<void> {
  const years = rc.config.years;
  const cov = await checkCoverage(rc.inputFiles, { years, memberCache: memberCacheDir(rc) });
  if (cov.span) checkYears({ start: cov.span.first, count: Math.round((cov.span.last - cov.span.first) / HOUR_MS) + 1 }, years, 'years', rc.path);
  const problems = coverageProblems(cov, maxMissing);
  if (problems.length > 0) {
    throw InputsIncomplete(
      {
        years: `${years[0]}–${years[1]}`,
        problems,
        rule: maxMissing === 0 ? 'every hour of every built year' : `at most ${maxMissing} missing hour(s) per year and variable (--max-missing-hours)`,
      },
      { file: rc.path, key: 'dataset.files' },
    );
  }
  const t = cov.variables.find((v) => v.era5t.length > 0);
  for (const run of t?.era5t ?? [])
    log.warn(`${run.hours} h of ${t!.variable} are preliminary ERA5T (stamps ${run.from} to ${run.to}); rebuild with final ERA5 when it is published`);
}

/** Where ZIP members that cannot be read in place are unpacked (pipeline/read/zip-archive.ts). */
export function memberCacheDir(rc: ResolvedConfig): string {
  return join(rc.cacheDir, 'zip-members');
}

function checkYears(time: { start: number; count: number }, years: [number, number], key: string, file: string): void {
  const end = time.start + (time.count - 1) * HOUR_MS;
  const margin = 10 * 24 * HOUR_MS;
  if (time.start > Date.UTC(years[0], 0, 1) + margin || end < Date.UTC(years[1] + 1, 0, 1) - margin) {
    throw YearsOutsideData(
      { key, first: years[0], last: years[1], dataFirst: new Date(time.start).toISOString(), dataLast: new Date(end).toISOString() },
      { file, key },
    );
  }
}

/** Keys of the configuration that change how a build runs, never what it publishes. */
const EXECUTION_KEYS = new Set(['memory', 'shards', 'cache']);

/**
 * The configuration as it shapes the results, as canonical text (keys sorted, execution settings
 * such as the memory budget, the tiling and the cache folder left out), so that one atlas built
 * with two budgets carries one configuration digest.
 */
export function resultConfigText(cfg: object): string {
  const canonical = (v: unknown): unknown =>
    Array.isArray(v)
      ? v.map(canonical)
      : v !== null && typeof v === 'object'
        ? Object.fromEntries(
            Object.keys(v)
              .sort()
              .map((k) => [k, canonical((v as Record<string, unknown>)[k])]),
          )
        : v;
  const top = Object.fromEntries(Object.entries(cfg).filter(([k]) => !EXECUTION_KEYS.has(k)));
  return JSON.stringify(canonical(top));
}
