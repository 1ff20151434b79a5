/**
 * Stage 5 of a build, publishing what is whole-atlas: the map layers and the per-cell NetCDF (each
 * grid field put together from the merge bands' pieces, one field in memory at a time), the
 * indexes of the per-cell files, niche.json (the bands' entries joined), the region outlines, the
 * inventory, what changed since the previous build, and the manifest of every file.
 */
import { closeSync, createWriteStream, existsSync, openSync, readFileSync, readSync } from 'node:fs';
import { writeFile } from 'node:fs/promises';
import { once } from 'node:events';
import { join } from 'node:path';
import { CAUTIONS } from '../work/index.ts';
import type { Region } from '../regions/index.ts';
import { CODE_VERSION } from '../model/version.ts';
import type { Logger } from '../model/effects.ts';
import { startProgress } from '../model/progress.ts';
import { closePieces, readGridField } from '../formats/grid-pieces.ts';
import { writeJsonFile } from '../formats/json-file.ts';
import { addFieldRange, countLayers, emptyFieldRange, writeAtlasLayers } from '../publish/atlas-layers.ts';
import { writeCellNetcdf } from '../publish/cell-netcdf.ts';
import { gridFieldUnits } from '../publish/grid-fields.ts';
import { gridCellCount } from '../model/grid.ts';
import { cellFiguresIndex, CELL_NETCDF_PATH, DEFAULT_CELL_TILE } from '../publish/cell-figures.ts';
import { writePointTileIndex } from '../publish/point-tiles.ts';
import { histogramIndex } from '../publish/histogram-tiles.ts';
import { nicheJsonHead, NICHE_JSON_TAIL } from '../publish/niche-json.ts';
import { makeInventory } from '../publish/inventory.ts';
import { compareBuilds, type BuildFacts, type RegionTables } from '../publish/changes.ts';
import { DATA_DICTIONARY_PATH, dataDictionaryCsv } from '../publish/data-dictionary.ts';
import { LOSS_VIEWS } from '../reduce/layout.ts';
import { listArtefacts, STATISTIC_RULES, type Manifest, type ManifestScenario, type ManifestWorkforce } from '../publish/manifest.ts';
import { DEFAULT_ACCLIMATIZED_SHARE, DEFAULT_SUN_SHARE } from '../regions/workforce-shares.ts';
import type { WorkforcePlan } from './workforce-plan.ts';
import { basename } from 'node:path';
import { fileSummaryCache } from './summary-cache.ts';
import type { BuildPlan, BuildVariant } from './plan-stage.ts';
import { describeScenario, SCENARIO_CAVEAT } from '../scenario/describe.ts';
import type { MergeTileSummary } from './merge-tile.ts';
import { workerInit, type ComputeOutcome } from './compute-stage.ts';
import { runTasks, type PoolTask } from './shard-pool.ts';
import type { SummaryChunkCache, SummaryPart } from '../read/index.ts';

export interface PublishInput {
  plan: BuildPlan;
  /** Per weather (plan.variants order): the merged bands' summaries. */
  tiles: ReadonlyArray<readonly MergeTileSummary[]>;
  compute: ComputeOutcome;
  /** The staging folder (it holds `data/`), and the output folder of the previous build. */
  stage: string;
  outDir: string;
  /** Cache folder of the inventory's summary chunks, or undefined. */
  summaryCacheDir?: string;
  generated: string;
  log: Logger;
  quiet?: boolean;
}

export async function publishStage(p: PublishInput): Promise<Manifest> {
  const { plan, log } = p;
  const cfg = plan.rc.config;
  const dataDir = join(p.stage, 'data');
  // The inventory's summary of the inputs reads every value of every input file once: its chunks
  // (UTC years) not in the cache run on worker threads while this thread draws the layers.
  const summaryCache = p.summaryCacheDir ? fileSummaryCache(p.summaryCacheDir) : undefined;
  const stopSummary = new AbortController();
  const summaryParts = summariseInWorkers(plan, summaryCache, stopSummary.signal);
  summaryParts.catch(() => undefined); // awaited below; a failure before then stops it in `finally`
  try {
    // Each weather's gridded files and indexes: the record into data/, a scenario into data/scenarios/<id>/.
    const layersOf: Manifest['layers'][] = [];
    for (let vi = 0; vi < plan.variants.length; vi++) layersOf.push(await publishVariant(p, plan.variants[vi], p.tiles[vi]));
    await writeRegionsGeoJson(join(dataDir, 'regions.geojson'), plan.regions);

    log.info('summarising the inputs for the inventory');
    const inventory = makeInventory(cfg, plan.ds, await plan.ds.summary(summaryCache, await summaryParts), p.generated);
    await writeFile(join(dataDir, 'inventory.json'), JSON.stringify(inventory, null, 1));
    return await publishIndexes(p, layersOf);
  } finally {
    stopSummary.abort();
  }
}

/**
 * The summary chunks of the inputs that the cache does not hold, computed on up to `plan.jobs`
 * worker threads (one chunk per task), by cache key.
 */
async function summariseInWorkers(plan: BuildPlan, cache: SummaryChunkCache | undefined, signal: AbortSignal): Promise<Map<string, SummaryPart>> {
  const parts = new Map<string, SummaryPart>();
  const todo = plan.ds.summaryChunks().filter((c) => cache?.get(c.key) === undefined);
  const tasks = todo.map((c): PoolTask => ({ kind: 'summary', hours: c.hours, key: c.key }));
  await runTasks(tasks, workerInit(plan), plan.jobs, { onSummaryPart: (key, part) => parts.set(key, part) }, signal);
  return parts;
}

/** The build's indexes, what changed and the manifest, after the layers and the inventory. */
async function publishIndexes(p: PublishInput, layersOf: Manifest['layers'][]): Promise<Manifest> {
  const { plan, log } = p;
  const cfg = plan.rc.config;
  const dataDir = join(p.stage, 'data');
  const layers = layersOf[0];

  // What changed since the build now in outDir (if any), for the site.
  const changes = compareBuilds(readPreviousFacts(join(p.outDir, 'data')), {
    buildTime: p.generated,
    codeVersion: CODE_VERSION,
    configDigest: plan.configDigest,
    years: cfg.years,
    baseline: cfg.baseline,
    inputs: plan.ds.files,
    regionTables: tablesOnDisk(
      dataDir,
      plan.regions.map((r) => r.id),
    ),
    regionNames: new Map(plan.regions.map((rg) => [rg.id, rg.name])),
  });
  await writeJsonFile(join(dataDir, 'changes.json'), changes);
  if (changes.hasPrevious) {
    log.info(
      `since the previous build: ${changes.yearsAdded.length} year(s) added, inputs ${changes.inputs.added.length} added / ${changes.inputs.changed.length} changed / ${changes.inputs.removed.length} removed, ${changes.normals.moved} of ${changes.normals.compared} normals of hours lost and hours above the limit moved`,
    );
  }
  await writeFile(
    join(p.stage, DATA_DICTIONARY_PATH),
    dataDictionaryCsv({
      figures: [...plan.defs, ...(plan.workforce?.regionDefs ?? [])],
      classes: plan.work.classes,
      acclimatization: plan.work.settings.acclimatization,
      exposures: plan.work.settings.exposures,
      lossViews: LOSS_VIEWS,
      statistics: STATISTIC_RULES,
      baseline: cfg.baseline,
      latestYear: plan.latestYear,
      years: [plan.years[0], plan.years[plan.years.length - 1]],
    }),
  );

  const artefacts = await listArtefacts(p.stage, describeArtefact);
  const work = plan.work;
  const manifest: Manifest = {
    manifestVersion: 1,
    atlas: { id: cfg.id, title: cfg.title, invented: cfg.dataset.invented, attribution: cfg.dataset.attribution },
    buildTime: p.generated,
    codeVersion: CODE_VERSION,
    configDigest: plan.configDigest,
    inputs: plan.ds.files,
    years: cfg.years,
    baseline: cfg.baseline,
    latestYear: plan.latestYear,
    timeZone: cfg.timeZone,
    physics: cfg.physics,
    work: { ...work.settings, clothingAdjustment: work.clothingAdjustment, rest: work.rest, classes: work.classes, cautions: CAUTIONS },
    figures: plan.defs.map((d) => ({ id: d.id, label: d.label, units: d.units, combos: d.combos })),
    statistics: STATISTIC_RULES,
    counts: {
      shards: plan.shards.length,
      landCells: plan.land.ids.length,
      cellHours: p.compute.byVariant.baseline.cellHours,
      notConverged: p.compute.byVariant.baseline.physics.notConverged,
      rejected: p.compute.byVariant.baseline.physics.rejected,
      dewPointClamped: p.compute.byVariant.baseline.physics.dewPointClamped,
    },
    layers,
    artefacts,
    ...(plan.workforce && plan.workforceDigests ? { workforce: manifestWorkforce(plan.workforce, plan.workforceDigests) } : {}),
    scenarioCaveat: SCENARIO_CAVEAT,
    scenarios: plan.variants.slice(1).map((v, i): ManifestScenario => {
      const sc = v.scenario!;
      const c = p.compute.byVariant[v.label];
      return {
        id: sc.id,
        name: sc.name,
        ...(sc.description !== undefined ? { description: sc.description } : {}),
        definition:
          sc.kind === 'warming'
            ? { kind: 'warming', warming: sc.warming }
            : { kind: 'change-file', changeFile: sc.file, sha256: sc.sha256, humidity: sc.humidity, variables: v.check!.variables },
        words: describeScenario(sc, v.check),
        changes: { temperature: v.check!.temperature, humidity: v.check!.humidity, solar: v.check!.solar },
        dataPath: `data/${v.dataPath}/`,
        counts: {
          shards: v.shards.length,
          cellHours: c.cellHours,
          notConverged: c.physics.notConverged,
          rejected: c.physics.rejected,
          humidityClampedHigh: c.change.humidityClampedHigh,
          humidityClampedLow: c.change.humidityClampedLow,
        },
        layers: layersOf[i + 1],
      };
    }),
  };
  // Written in pieces: ~45 MB of JSON at 10,000 regions (pipeline/formats/json-file.ts).
  await writeJsonFile(join(dataDir, 'manifest.json'), manifest);
  return manifest;
}

/** A path below the site root (`data/…`) moved into a weather's folder (`data/scenarios/<id>/…` for a scenario). */
export function variantPath(path: string, v: BuildVariant): string {
  return v.dataPath === '' ? path : path.replace(/^data\//, `data/${v.dataPath}/`);
}

/**
 * One weather's gridded files and indexes: its layers and per-cell NetCDF (each field put
 * together from the bands' pieces, one field in memory at a time), the indexes of its per-cell
 * files, calculator tiles and niche.json, every path in them pointing into its own folder.
 */
async function publishVariant(p: PublishInput, v: BuildVariant, tiles: readonly MergeTileSummary[]): Promise<Manifest['layers']> {
  const { plan, log } = p;
  const cfg = plan.rc.config;
  const grid = plan.ds.grid;
  const dataDir = join(p.stage, 'data', v.dataPath);
  const at = (path: string) => variantPath(path, v);
  const sc = v.scenario;

  // Gridded fields: layers and the NetCDF, one field at a time from the bands' pieces.
  const range = emptyFieldRange(plan.fields.length);
  for (const t of tiles) addFieldRange(range, { min: t.fieldMin, max: t.fieldMax });
  const pieces = tiles.map((t) => t.piece);
  const fds = new Map<string, number>();
  const buffer = new Float32Array(gridCellCount(grid));
  const field = (i: number) => readGridField(pieces, i, grid, { units: gridFieldUnits(plan.defs, plan.fields[i]) }, fds, buffer);
  let layers: Manifest['layers'];
  try {
    const progress = startProgress(sc ? `layers (${sc.id})` : 'layers', countLayers(plan.fields), { quiet: p.quiet });
    layers = (await writeAtlasLayers(dataDir, plan.defs, plan.fields, range, field, () => progress.tick())).map((l) => ({
      ...l,
      png: at(l.png),
      tif: at(l.tif),
      mapImages: l.mapImages.map((m) => ({ ...m, path: at(m.path) })),
    }));
    progress.done();
    log.info(`${layers.length} map layers drawn (PNG and tiled GeoTIFF)${sc ? ` for scenario ${sc.id}` : ''}; writing the per-cell NetCDF`);
    const words = sc ? describeScenario(sc, v.check) : undefined;
    writeCellNetcdf(
      join(p.stage, at(CELL_NETCDF_PATH)),
      grid,
      plan.defs,
      plan.fields,
      {
        title: sc ? `${cfg.title}: scenario ${sc.name} (a what-if, not a forecast)` : cfg.title,
        invented: cfg.dataset.invented,
        source:
          `heathours ${CODE_VERSION} from ${plan.ds.files.length} input file(s) (${cfg.dataset.product})` +
          (sc ? `; scenario ${sc.id}: ${words!.what} ${words!.source}` : ''),
        // No clock time: the same inputs and settings give the same bytes (the build time is in the manifest).
        history: `heathours ${CODE_VERSION} build of atlas ${cfg.id}`,
        baseline: cfg.baseline,
        ...(sc ? { scenario: words!.caveat } : {}),
      },
      field,
    );
  } finally {
    closePieces(fds);
  }

  // Indexes of the per-cell files, and niche.json from the bands' entries.
  const tables = tiles.flatMap((t) => t.cellTables.map((c) => ({ path: at(c.path), rows: c.rows })));
  const index = cellFiguresIndex(
    plan.defs,
    grid,
    tiles.flatMap((t) => t.cellChunks),
    DEFAULT_CELL_TILE,
    tables,
  );
  await writeJsonFile(
    join(dataDir, 'cells', 'index.json'),
    { ...index, chunks: index.chunks.map((c) => ({ ...c, path: at(c.path) })), netcdf: at(index.netcdf) },
    0,
  );
  await writePointTileIndex(dataDir, { years: plan.years, grid, chunks: tiles.flatMap((t) => t.pointChunks.map((c) => ({ ...c, path: at(c.path) }))) });
  const hist = histogramIndex(plan.years, cfg.baseline, plan.regions);
  // One entry per region: written in pieces (pipeline/formats/json-file.ts).
  await writeJsonFile(join(dataDir, 'calculator', 'index.json'), { ...hist, regions: hist.regions.map((r) => ({ ...r, path: at(r.path) })) }, 0);
  await joinFiles(
    join(dataDir, 'niche.json'),
    nicheJsonHead(),
    tiles.map((t) => t.nicheFragment),
    ',',
    NICHE_JSON_TAIL,
  );
  return layers;
}

/** Writes `head`, the files' texts separated by `sep`, and `tail` into `path`, streaming. */
async function joinFiles(path: string, head: string, files: readonly string[], sep: string, tail: string): Promise<void> {
  const out = createWriteStream(path);
  const put = async (b: string | Uint8Array) => {
    if (!out.write(b)) await once(out, 'drain');
  };
  await put(head);
  let first = true;
  for (const f of files) {
    const fd = openSync(f, 'r');
    try {
      const buf = Buffer.alloc(1 << 20);
      let n = readSync(fd, buf, 0, buf.length, null);
      if (n > 0 && !first) await put(sep);
      if (n > 0) first = false;
      while (n > 0) {
        await put(Buffer.from(buf.subarray(0, n)));
        n = readSync(fd, buf, 0, buf.length, null);
      }
    } finally {
      closeSync(fd);
    }
  }
  await put(tail);
  out.end();
  await once(out, 'finish');
}

/** RFC 7946 coordinates of a parsed polygon: rings closed again, longitudes as parsed (continuous). */
function polygonCoordinates(p: Region['polygons'][number]): number[][][] {
  return p.rings.map((ring) => {
    const pts: number[][] = [];
    for (let i = 0; i < ring.length; i += 2) pts.push([ring[i], ring[i + 1]]);
    pts.push([ring[0], ring[1]]);
    return pts;
  });
}

/** The region outlines, one feature at a time (the bytes of JSON.stringify of the whole collection). */
async function writeRegionsGeoJson(path: string, regions: readonly Region[]): Promise<void> {
  const out = createWriteStream(path);
  const put = async (s: string) => {
    if (!out.write(s)) await once(out, 'drain');
  };
  await put('{"type":"FeatureCollection","features":[');
  for (let i = 0; i < regions.length; i++) {
    const r = regions[i];
    const feature = {
      type: 'Feature',
      properties: { id: r.id, name: r.name },
      geometry:
        r.polygons.length === 1
          ? { type: 'Polygon', coordinates: polygonCoordinates(r.polygons[0]) }
          : { type: 'MultiPolygon', coordinates: r.polygons.map(polygonCoordinates) },
    };
    await put((i > 0 ? ',' : '') + JSON.stringify(feature));
  }
  await put(']}');
  out.end();
  await once(out, 'finish');
}

/** Region tables read from a data folder when asked for. */
function tablesOnDisk(dataDir: string, ids: readonly string[]): RegionTables {
  const set = new Set(ids);
  const path = (id: string) => join(dataDir, 'regions', `${id}.csv`);
  return {
    ids: () => ids,
    has: (id) => set.has(id),
    get: (id) => (set.has(id) && existsSync(path(id)) ? readFileSync(path(id), 'utf8') : undefined),
  };
}

/** The facts of the build published in `dataDir`, or null when there is none (or it cannot be read). */
function readPreviousFacts(dataDir: string): BuildFacts | null {
  try {
    const m = JSON.parse(readFileSync(join(dataDir, 'manifest.json'), 'utf8')) as Manifest;
    const gj = JSON.parse(readFileSync(join(dataDir, 'regions.geojson'), 'utf8')) as { features: Array<{ properties: { id: string; name: string } }> };
    const ids = gj.features.map((f) => f.properties.id);
    const regionNames = new Map(gj.features.map((f) => [f.properties.id, f.properties.name]));
    return {
      buildTime: m.buildTime,
      codeVersion: m.codeVersion,
      configDigest: m.configDigest,
      years: m.years,
      baseline: m.baseline,
      inputs: m.inputs,
      regionTables: tablesOnDisk(dataDir, ids),
      regionNames,
    };
  } catch {
    return null;
  }
}

/** What a published file is; a scenario's file is described as the record's, with the scenario named. */
function describeArtefact(path: string): { kind: Manifest['artefacts'][number]['kind']; description: string; units?: string } {
  const m = /^data\/scenarios\/([a-z0-9-]+)\/(.+)$/.exec(path);
  if (m === null) return describeRecordArtefact(path);
  const d = describeRecordArtefact(`data/${m[2]}`);
  return { ...d, description: `scenario ${m[1]} (a what-if, not a forecast): ${d.description}` };
}

function describeRecordArtefact(path: string): { kind: Manifest['artefacts'][number]['kind']; description: string; units?: string } {
  if (path.endsWith('.png')) return { kind: 'layer-png', description: 'map layer (Web Mercator rows), see layers[]' };
  if (path.endsWith('.tif')) return { kind: 'layer-geotiff', description: 'map layer, Float32 GeoTIFF with internal tiles, EPSG:4326' };
  if (path === DATA_DICTIONARY_PATH)
    return { kind: 'table', description: 'data dictionary: label, unit and unit in words of every column and code of the region tables and the cell tables' };
  if (path.endsWith('.wide.csv'))
    return {
      kind: 'table',
      description: 'region table for spreadsheets: hours per worker with the months across, one row per figure, class, acclimatization, exposure and statistic',
      units: 'h per worker (in each month header)',
    };
  if (path.endsWith('.xlsx'))
    return {
      kind: 'table',
      description: 'region workbook: hours and temperatures by month, the assumptions (build, data, work settings, statistics) and the cautions',
      units: 'h per worker, °C (in the headers)',
    };
  if (path.endsWith('.nc'))
    return {
      kind: 'netcdf',
      description:
        'per-cell figures of the whole grid, CF-1.8 NetCDF (64-bit offset): shift hours above the limit and hours lost per worker (baseline mean, median, P90 year, years used) by period and evaluation, mean annual temperature and its niche class',
      units: 'per variable (units attribute)',
    };
  if (path.endsWith('.csv')) {
    return path.includes('/regions/')
      ? { kind: 'table', description: 'region table: statistics across years per month, workload class, acclimatization and exposure', units: 'unit column' }
      : { kind: 'table', description: 'per-cell table of one band of grid rows: shift hours above the limit and hours lost', units: 'h' };
  }
  if (path.includes('/calculator/cells/'))
    return {
      kind: path.endsWith('.bin') ? 'histogram' : 'json',
      description:
        'calculator histograms of hourly WBGT per grid cell (whole hours per year, month, local hour and exposure; format in pipeline/publish/point-tile-codec.ts, chunks in calculator/cells/index.json)',
      units: 'h',
    };
  if (path.endsWith('.bin'))
    return {
      kind: 'histogram',
      description: 'calculator histograms of hourly WBGT per year, month, local hour and exposure (format in calculator/index.json)',
      units: 'h',
    };
  if (path.endsWith('.geojson')) return { kind: 'geojson', description: 'region outlines' };
  if (path.endsWith('changes.json')) return { kind: 'json', description: 'what changed since the previous build: years, inputs, the figures that moved most' };
  if (path.startsWith('data/cells/'))
    return {
      kind: 'json',
      description:
        'per-cell figures for the map, in tiles (the numbers of the cell tables, plus mean WBGT, capacity loss and the niche; layout in data/cells/index.json)',
      units: 'per figure in data/cells/index.json',
    };
  return { kind: 'json', description: path.endsWith('inventory.json') ? 'dataset inventory' : 'data for the site' };
}

/** The manifest's account of the workforce raster and shares. */
function manifestWorkforce(wf: WorkforcePlan, digests: { raster: string; shares: string }): ManifestWorkforce {
  const r = wf.aggregate.raster;
  const round = (x: number) => Math.round(x * 10) / 10;
  return {
    name: wf.config.name,
    year: wf.config.year,
    licence: wf.config.licence,
    invented: wf.config.invented,
    raster: {
      file: basename(wf.rasterPath),
      sha256: digests.raster,
      width: r.width,
      height: r.height,
      pixelDegrees: [r.dLon, Math.abs(r.dLatRow)],
      sampleType: r.sampleType,
      noData: r.noData === null ? null : Number.isNaN(r.noData) ? 'nan' : r.noData,
    },
    shares: { file: basename(wf.sharesPath), sha256: digests.shares, defaults: { acclimatizedShare: DEFAULT_ACCLIMATIZED_SHARE, sunShare: DEFAULT_SUN_SHARE } },
    peopleOnLand: round(wf.peopleOnLand),
    peopleOffLand: round(wf.aggregate.offLand),
    peopleOutsideGrid: round(wf.aggregate.outsideGrid),
    annualHours: wf.annualHours,
    figures: wf.regionDefs.map((d) => ({ id: d.id, label: d.label, units: d.units, combos: d.combos })),
  };
}
