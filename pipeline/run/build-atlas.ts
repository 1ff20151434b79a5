/**
 * `heathours build`: the whole atlas. Configuration → dataset → shards on worker threads
 * (physics, work, reduce) → exact merge → normals, the niche, regions → published files → the
 * static site. Everything is written into a staging folder first; the output folder is replaced
 * only when the whole build succeeded, so a failed build publishes nothing.
 */
import { existsSync, readFileSync } from 'node:fs';
import { mkdir, rm, writeFile } from 'node:fs/promises';
import { availableParallelism } from 'node:os';
import { basename, dirname, join, resolve } from 'node:path';
import { createHash } from 'node:crypto';
import { parse as parseYaml } from 'yaml';
import { loadConfig } from '../config/load.ts';
import { openDataset } from '../read/index.ts';
import { parseWorkloadClasses, resolveWorkSettings, CAUTIONS } from '../work/index.ts';
import { parseRegionFile, checkUniqueRegionIds, allRegionCellWeights, applyLandMask, type Region } from '../regions/index.ts';
import { NICHE_CAVEAT, NICHE_LABELS, nicheClassCode, NICHE_CLASSES } from '../climate/index.ts';
import { mergeYear, type YearCounts } from '../reduce/merge.ts';
import type { ShardPartial } from '../reduce/accumulator.ts';
import { emptyCounts, addCounts } from '../physics/index.ts';
import { consoleLogger, silentLogger, type Logger } from '../model/effects.ts';
import { startProgress } from '../model/progress.ts';
import { CODE_VERSION } from '../model/version.ts';
import { planShards, sliceShards, yearPieces } from './plan.ts';
import { shardProvenance } from './shard-key.ts';
import { describeSources, sourcesFromCache, sourcesFromPartials, type KeyedShard, type ShardSource } from './shard-sources.ts';
import { partialPath, readPartialFile } from './partial-store.ts';
import { fileSummaryCache } from './summary-cache.ts';
import { withProcessLock } from '../model/lock.ts';
import { runShards } from './shard-pool.ts';
import { computeFigures } from './figures.ts';
import { figureNormals, nicheStep, type FigureNormals, type NicheResult } from './climate-step.ts';
import { BuildLocked, NoLandCells, WorkloadClassesFileMissing, YearsOutsideData } from './errors.ts';
import { makeInventory } from '../publish/inventory.ts';
import { regionTableCsv } from '../publish/region-table.ts';
import { cellTableCsv } from '../publish/cell-table.ts';
import { writeAtlasLayers } from '../publish/atlas-layers.ts';
import { listArtefacts, STATISTIC_RULES, type Manifest } from '../publish/manifest.ts';
import { buildSite } from '../publish/site.ts';
import { compareBuilds, type BuildFacts } from '../publish/changes.ts';
import { figureDefs } from './figures.ts';
import { regionHistograms } from '../reduce/region-histograms.ts';
import { encodeHistogramTile, histogramIndex } from '../publish/histogram-tiles.ts';
import { writeCellFigures } from '../publish/cell-figures.ts';
import { PointTileStore } from '../publish/point-tiles.ts';
import { shortBaselineWarning } from '../publish/baseline-length.ts';
import { DATA_DICTIONARY_PATH, dataDictionaryCsv } from '../publish/data-dictionary.ts';
import { LOSS_VIEWS } from '../reduce/layout.ts';

const HOUR_MS = 3_600_000;

export interface BuildAtlasOptions {
  configPath: string;
  /** Output folder; default the config's `output`. */
  outDir?: string;
  /** Worker threads; default all cores. */
  jobs?: number;
  quiet?: boolean;
  /** Skip the Astro site (publish data files only, into outDir/data). */
  dataOnly?: boolean;
  logger?: Logger;
  /** Partial cache folder; default the config's `cache`; `false` computes every shard and keeps nothing. */
  cache?: string | false;
  /** Distributed run: compute slice `k` of `n` of the shards into `partialsDir`; publish nothing. */
  shard?: { k: number; n: number; partialsDir: string };
  /** Distributed run: merge the partials under this folder and publish (computes nothing). */
  mergeDir?: string;
}

export interface BuildReport {
  outDir: string;
  shards: number;
  /** Shards computed in this run, and reused (cache) or merged (partial files) [–]. */
  computed: number;
  reused: number;
  /** Land cell-hours computed in this run [–]. */
  cellHours: number;
  /** Seconds spent computing shards (wall clock) [s]. */
  computeSeconds: number;
  /** Seconds spent merging the partials, from the first merge to the last [s]. */
  mergeSeconds: number;
  /** Bytes of partial files written in this run [B]. */
  partialBytes: number;
  /** Seconds from the merged years to the published output: normals, tables, layers, site [s]. */
  publishSeconds: number;
  totalSeconds: number;
  physics: ReturnType<typeof emptyCounts>;
}

export async function buildAtlas(o: BuildAtlasOptions): Promise<BuildReport> {
  const rc = await loadConfig(o.configPath);
  const outDir = resolve(o.outDir ?? rc.outputDir);
  if (o.shard) return runBuild(o, rc, outDir);
  await mkdir(dirname(outDir), { recursive: true });
  // Two builds into one output folder must not interleave: the second stops with a clear error.
  return withProcessLock(`${outDir}.build-lock`, () => runBuild(o, rc, outDir), {
    onWait: (pid) => {
      throw BuildLocked({ outDir, pid }, { file: rc.path });
    },
  });
}

async function runBuild(o: BuildAtlasOptions, rc: Awaited<ReturnType<typeof loadConfig>>, outDir: string): Promise<BuildReport> {
  const t0 = Date.now();
  const base = o.logger ?? (o.quiet ? silentLogger : consoleLogger);
  // Every line carries the seconds since the start, so a slow step shows itself.
  const stamp = () => `[${((Date.now() - t0) / 1000).toFixed(1).padStart(5)} s]`;
  const log: Logger = { info: (m) => base.info(`${stamp()} ${m}`), warn: (m) => base.warn(`${stamp()} ${m}`) };
  const cfg = rc.config;

  // Work settings and regions are checked before any data is read.
  const classesPath = resolve(dirname(rc.path), cfg.work.classesFile);
  if (!existsSync(classesPath)) throw WorkloadClassesFileMissing({ path: classesPath }, { file: rc.path, key: 'work.classesFile' });
  const classesText = readFileSync(classesPath, 'utf8');
  const allClasses = parseWorkloadClasses(parseYaml(classesText), classesPath);
  const work = resolveWorkSettings(cfg.work, allClasses, { file: rc.path });
  const regions: Region[] = rc.regionFiles.flatMap((f) => parseRegionFile(readFileSync(f, 'utf8'), f));
  checkUniqueRegionIds(regions);

  log.info(`heathours build: atlas "${cfg.id}", ${rc.inputFiles.length} input file(s), ${regions.length} region(s), ${work.evaluations.length} work evaluations`);
  const baselineWarning = shortBaselineWarning(cfg.baseline);
  if (baselineWarning) log.warn(baselineWarning);
  const datasetOptions = { product: cfg.dataset.product, landSeaMask: cfg.dataset.landSeaMask };
  const ds = await openDataset(rc.inputFiles, datasetOptions);
  try {
    checkYears(ds.time, cfg.years, 'years', rc.path);
    const nLat = ds.grid.lat.length;
    const nLon = ds.grid.lon.length;
    const nGrid = nLat * nLon;
    const land = ds.landMask ?? new Uint8Array(nGrid).fill(1);
    const cellList: number[] = [];
    for (let i = 0; i < nGrid; i++) if (land[i] === 1) cellList.push(i);
    if (cellList.length === 0) throw NoLandCells({ detail: `the land-sea mask leaves none of the ${nGrid} cells` }, { file: rc.path, key: 'dataset.landSeaMask' });
    const cells = Int32Array.from(cellList);
    const weights = allRegionCellWeights(regions, ds.grid).map((w) => applyLandMask(w, land));

    // The plan, each shard's provenance, and where its partial comes from.
    const years = range(cfg.years[0], cfg.years[1]);
    const shards = planShards(nLat, nLon, land, years, (y) => yearPieces(ds.time, y, cfg.timeZone, cfg.shards.monthsPerPiece), cfg.shards.cellsPerTile, cfg.shards.monthsPerPiece);
    const settings = { ...datasetOptions, timeZone: cfg.timeZone, shift: work.shift, evaluations: work.evaluations };
    const keyed: KeyedShard[] = shards.map((shard) => ({ shard, ...shardProvenance(shard, ds.files, ds.time, settings) }));
    const jobs = Math.max(1, o.jobs ?? availableParallelism());
    const workerInit = (returnPartials: boolean) => ({
      files: rc.inputFiles,
      datasetOptions: { ...datasetOptions, digests: false, reuseBlockBuffers: true },
      context: { evaluations: work.evaluations, timeZone: cfg.timeZone, shift: work.shift, nLon },
      returnPartials,
    });
    const physics = emptyCounts();
    const timing = { read: 0, physics: 0, reduce: 0 };
    let cellHours = 0;
    let partialBytes = 0;
    const taskMeta = (k: KeyedShard) => ({ shardId: k.shard.id, year: k.shard.year, tileIndex: k.shard.tileIndex, key: k.key, provenance: k.provenance as unknown as Record<string, unknown> });
    const addTiming = (r: { timing: typeof timing }) => {
      timing.read += r.timing.read;
      timing.physics += r.timing.physics;
      timing.reduce += r.timing.reduce;
    };

    if (o.shard) {
      // One slice of a distributed run: compute its shards into DIR/slice-K-of-N, publish nothing.
      const { k, n, partialsDir } = o.shard;
      const sliceDir = join(resolve(partialsDir), `slice-${k}-of-${n}`);
      const slice = sliceShards(shards, k, n).map((s) => keyed.find((x) => x.shard.id === s.id)!);
      const sources = sourcesFromCache(slice, sliceDir);
      for (const line of describeSources(slice, sources)) log.info(line);
      const tasks = slice.flatMap((kd, i) => (sources[i].kind === 'compute' ? [{ shard: kd.shard, store: { path: partialPath(sliceDir, kd.shard.id), meta: taskMeta(kd) } }] : []));
      log.info(`slice ${k}/${n}: ${slice.length} of ${shards.length} shards, ${tasks.length} to compute on ${jobs} worker(s), into ${sliceDir}`);
      const progress = startProgress('shards', tasks.length, { quiet: o.quiet });
      const tc = Date.now();
      await runShards(tasks, workerInit(false), jobs, (_shard, out) => {
        addCounts(physics, out.result.physics);
        cellHours += out.result.cellHours;
        partialBytes += out.storedBytes;
        addTiming(out.result);
        progress.tick();
      });
      progress.done();
      const computeSeconds = (Date.now() - tc) / 1000;
      const totalSeconds = (Date.now() - t0) / 1000;
      log.info(`slice ${k}/${n} done: ${tasks.length} computed, ${slice.length - tasks.length} reused, ${(partialBytes / 1e6).toFixed(1)} MB of partials, ${totalSeconds.toFixed(1)} s`);
      return { outDir: sliceDir, shards: slice.length, computed: tasks.length, reused: slice.length - tasks.length, cellHours, computeSeconds, mergeSeconds: 0, partialBytes, publishSeconds: 0, totalSeconds, physics };
    }

    let sources: ShardSource[];
    const cacheDir = o.cache === false || o.mergeDir ? undefined : join(resolve(o.cache ?? rc.cacheDir), cfg.id);
    if (o.mergeDir) sources = sourcesFromPartials(keyed, resolve(o.mergeDir)).sources;
    else sources = sourcesFromCache(keyed, cacheDir);
    log.info(`dataset opened (${ds.files.length} files, SHA-256 of each), ${shards.length} shards planned`);
    for (const line of describeSources(keyed, sources)) log.info(line);

    // Each year is merged as soon as its last partial is there (computed now, or read from a
    // file), and its cell histograms are folded into region histograms and dropped: memory
    // holds one year of histograms, not the record.
    const landIndex = new Int32Array(nGrid).fill(-1);
    cells.forEach((g, i) => (landIndex[g] = i));
    const merged = new Map<number, YearCounts>();
    const regionHist = new Map<number, Float32Array[]>();
    const pointTiles = new PointTileStore(cells);
    const pending = new Map<number, { partials: Array<{ id: string; partial: ShardPartial }>; toCompute: number }>(
      years.map((y) => [y, { partials: [], toCompute: 0 }]),
    );
    sources.forEach((s, i) => {
      if (s.kind === 'compute') pending.get(keyed[i].shard.year)!.toCompute += 1;
    });
    let mergeMs = 0;
    const finishYear = (year: number) => {
      const tm = Date.now();
      const slot = pending.get(year)!;
      keyed.forEach((kd, i) => {
        const s = sources[i];
        if (kd.shard.year !== year || s.kind !== 'file') return;
        const { partial, meta } = readPartialFile(s.path);
        addCounts(physics, meta.report.physics as unknown as ReturnType<typeof emptyCounts>);
        slot.partials.push({ id: kd.shard.id, partial });
      });
      slot.partials.sort((a, b) => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
      const yc = mergeYear(year, cells, slot.partials.map((p) => p.partial), slot.partials.map((p) => p.id));
      regionHist.set(year, regionHistograms(yc, weights, landIndex));
      pointTiles.addYear(yc);
      yc.histogram = new Uint16Array(0);
      merged.set(year, yc);
      slot.partials = [];
      mergeMs += Date.now() - tm;
    };
    const tasks = keyed.flatMap((kd, i) => {
      const s = sources[i];
      return s.kind === 'compute' ? [{ shard: kd.shard, store: s.storePath ? { path: s.storePath, meta: taskMeta(kd) } : undefined }] : [];
    });
    log.info(`computing ${tasks.length} of ${shards.length} shards (${cells.length} land cells × ${years.length} years in all) on ${jobs} worker(s)`);
    const progress = startProgress('shards', tasks.length, { quiet: o.quiet });
    const tc = Date.now();
    const stop = new AbortController();
    const computing = runShards(tasks, workerInit(true), jobs, (shard, out) => {
      const slot = pending.get(shard.year)!;
      slot.partials.push({ id: shard.id, partial: out.result.partial! });
      slot.toCompute -= 1;
      addCounts(physics, out.result.physics);
      cellHours += out.result.cellHours;
      partialBytes += out.storedBytes;
      addTiming(out.result);
      if (slot.toCompute === 0) finishYear(shard.year);
      progress.tick();
    }, stop.signal);
    computing.catch(() => undefined); // awaited below; a failure meanwhile is not unhandled
    // Years whose shards are all reused are merged meanwhile (the workers have their first
    // shards already), one year per turn of the event loop so that results are taken in between.
    const reusedYears = years.filter((y) => pending.get(y)!.toCompute === 0);
    let reusedMs = 0;
    try {
      for (const y of reusedYears) {
        await new Promise((r) => setImmediate(r));
        const tm = Date.now();
        finishYear(y);
        reusedMs += Date.now() - tm;
      }
    } catch (e) {
      stop.abort(e);
      await computing.catch(() => undefined);
      throw e;
    }
    if (reusedYears.length > 0) log.info(`${reusedYears.length} year(s) whose shards were all reused merged (${(reusedMs / 1000).toFixed(1)} s)`);
    await computing;
    progress.done();
    const computeSeconds = (Date.now() - tc) / 1000;
    if (tasks.length > 0) {
      log.info(`computed ${(cellHours / 1e6).toFixed(1)} M cell-hours in ${computeSeconds.toFixed(1)} s (${(cellHours / computeSeconds / 1e6).toFixed(2)} M/s); ${physics.notConverged} not converged, ${physics.rejected} rejected, ${physics.dewPointClamped} dew points clamped`);
      const perCellHour = (ms: number) => ((ms * 1e6) / Math.max(1, cellHours)).toFixed(0);
      log.info(`worker time per land cell-hour: read ${perCellHour(timing.read)} ns, physics ${perCellHour(timing.physics)} ns, reduce ${perCellHour(timing.reduce)} ns`);
    }
    const reused = shards.length - tasks.length;
    // Counts of the whole record (reused shards report what their computation counted).
    const allCellHours = sources.reduce((n, s) => n + (s.kind === 'file' ? s.meta.report.cellHours : 0), cellHours);

    const tp = Date.now();
    // Merge, normals, niche.
    const yearCounts: YearCounts[] = years.map((y) => merged.get(y)!);
    const ctx = { years, baseline: cfg.baseline, latestYear: years[years.length - 1], cells, nGrid, regions: weights };
    const figures = computeFigures(yearCounts).map((s) => figureNormals(s, ctx));
    const niche = nicheStep(yearCounts, ctx);
    log.info('normals, percentiles and the niche computed');

    // Publish into a staging folder, then build the site from it.
    const stage = join(dirname(outDir), `.${basename(outDir)}.stage-${process.pid}`);
    await rm(stage, { recursive: true, force: true });
    const dataDir = join(stage, 'data');
    await mkdir(join(dataDir, 'regions'), { recursive: true });
    try {
      const generated = process.env.HEATHOURS_BUILD_TIME ?? new Date().toISOString();
      const regionTables = new Map(regions.map((rg, r) => [rg.id, regionTableCsv(r, rg.id, figures, cfg.baseline, ctx.latestYear)]));
      log.info('summarising the inputs for the inventory');
      const inventory = makeInventory(cfg, ds, await ds.summary(cacheDir ? fileSummaryCache(join(cacheDir, 'summary')) : undefined), generated);
      log.info('inventory summarised');
      await writeFile(join(dataDir, 'inventory.json'), JSON.stringify(inventory, null, 1));
      await writeFile(join(dataDir, 'regions.geojson'), regionsGeoJson(regions));
      for (let r = 0; r < regions.length; r++) {
        await writeFile(join(dataDir, 'regions', `${regions[r].id}.csv`), regionTables.get(regions[r].id)!);
        await writeFile(join(dataDir, 'regions', `${regions[r].id}.json`), JSON.stringify(regionSummary(r, regions[r], weights[r], niche, figures)));
      }
      await writeFile(join(dataDir, 'atlas-cells.csv'), cellTableCsv(figures, cells, ds.grid.lat, ds.grid.lon));
      await writeFile(join(stage, DATA_DICTIONARY_PATH), dataDictionaryCsv({
        figures: figures.map((f) => f.series.def), classes: work.classes, acclimatization: work.settings.acclimatization, exposures: work.settings.exposures,
        lossViews: LOSS_VIEWS, statistics: STATISTIC_RULES, baseline: cfg.baseline, latestYear: ctx.latestYear,
      }));
      await writeFile(join(dataDir, 'niche.json'), JSON.stringify(nicheJson(niche, cells, ds.grid)));
      await writeCellFigures(dataDir, figures, cells, ds.grid, niche);
      await mkdir(join(dataDir, 'calculator'), { recursive: true });
      await writeFile(join(dataDir, 'calculator', 'index.json'), JSON.stringify(histogramIndex(years, cfg.baseline, regions)));
      for (let r = 0; r < regions.length; r++) {
        await writeFile(join(dataDir, 'calculator', `${regions[r].id}.bin`), encodeHistogramTile(years.map((y) => regionHist.get(y)![r])));
      }
      // What changed since the build now in outDir (if any), for the site.
      const configDigest = createHash('sha256').update(rc.text).update('\0').update(classesText).digest('hex');
      const changes = compareBuilds(readPreviousFacts(join(outDir, 'data')), {
        buildTime: generated, codeVersion: CODE_VERSION, configDigest, years: cfg.years, baseline: cfg.baseline,
        inputs: ds.files, regionTables, regionNames: new Map(regions.map((rg) => [rg.id, rg.name])),
      });
      await writeFile(join(dataDir, 'changes.json'), JSON.stringify(changes, null, 1));
      if (changes.hasPrevious) {
        log.info(`since the previous build: ${changes.yearsAdded.length} year(s) added, inputs ${changes.inputs.added.length} added / ${changes.inputs.changed.length} changed / ${changes.inputs.removed.length} removed, ${changes.normals.moved} of ${changes.normals.compared} normals of hours lost and hours above the limit moved`);
      }
      await pointTiles.write(dataDir, { years, grid: ds.grid });
      log.info('tables, niche and calculator tiles written; drawing the layers');
      const layerProgress = startProgress('layers', countLayers(figures), { quiet: o.quiet });
      const layers = await writeAtlasLayers(dataDir, ds.grid, cells, figures, niche, () => layerProgress.tick());
      layerProgress.done();
      const artefacts = await listArtefacts(stage, describeArtefact);
      const manifest: Manifest = {
        manifestVersion: 1,
        atlas: { id: cfg.id, title: cfg.title, invented: cfg.dataset.invented, attribution: cfg.dataset.attribution },
        buildTime: generated,
        codeVersion: CODE_VERSION,
        configDigest,
        inputs: ds.files,
        years: cfg.years,
        baseline: cfg.baseline,
        latestYear: ctx.latestYear,
        timeZone: cfg.timeZone,
        work: { ...work.settings, clothingAdjustment: work.clothingAdjustment, rest: work.rest, classes: work.classes, cautions: CAUTIONS },
        figures: figureDefs(work.evaluations.map((e) => e.key)).map((d) => ({ id: d.id, label: d.label, units: d.units, combos: d.combos })),
        statistics: STATISTIC_RULES,
        counts: { shards: shards.length, landCells: cells.length, cellHours: allCellHours, notConverged: physics.notConverged, rejected: physics.rejected, dewPointClamped: physics.dewPointClamped },
        layers,
        artefacts,
      };
      await writeFile(join(dataDir, 'manifest.json'), JSON.stringify(manifest, null, 1));
      if (o.dataOnly) {
        const { replaceDirAtomic } = await import('../model/effects.ts');
        const { cp } = await import('node:fs/promises');
        await replaceDirAtomic(outDir, async (tmp) => cp(dataDir, join(tmp, 'data'), { recursive: true }));
      } else {
        log.info('building the site');
        await buildSite({ dataDir: stage, outDir, quiet: o.quiet, base: cfg.site.base });
      }
    } finally {
      await rm(stage, { recursive: true, force: true });
    }
    const totalSeconds = (Date.now() - t0) / 1000;
    log.info(`atlas written to ${outDir} in ${totalSeconds.toFixed(1)} s`);
    return { outDir, shards: shards.length, computed: tasks.length, reused, cellHours, computeSeconds, mergeSeconds: mergeMs / 1000, partialBytes, publishSeconds: (Date.now() - tp) / 1000, totalSeconds, physics };
  } finally {
    await ds.close();
  }
}

/** The facts of the build published in `dataDir`, or null when there is none (or it cannot be read). */
function readPreviousFacts(dataDir: string): BuildFacts | null {
  try {
    const m = JSON.parse(readFileSync(join(dataDir, 'manifest.json'), 'utf8')) as Manifest;
    const regionTables = new Map<string, string>();
    const regionNames = new Map<string, string>();
    const gj = JSON.parse(readFileSync(join(dataDir, 'regions.geojson'), 'utf8')) as { features: Array<{ properties: { id: string; name: string } }> };
    for (const f of gj.features) {
      const p = join(dataDir, 'regions', `${f.properties.id}.csv`);
      if (existsSync(p)) regionTables.set(f.properties.id, readFileSync(p, 'utf8'));
      regionNames.set(f.properties.id, f.properties.name);
    }
    return { buildTime: m.buildTime, codeVersion: m.codeVersion, configDigest: m.configDigest, years: m.years, baseline: m.baseline, inputs: m.inputs, regionTables, regionNames };
  } catch {
    return null;
  }
}

function range(a: number, b: number): number[] {
  return Array.from({ length: b - a + 1 }, (_, i) => a + i);
}

/** Each configured local year must be held by the data, up to the completeness margin (10 days). */
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

/** RFC 7946 coordinates of a parsed polygon: rings closed again, longitudes as parsed (continuous). */
function polygonCoordinates(p: Region['polygons'][number]): number[][][] {
  return p.rings.map((ring) => {
    const pts: number[][] = [];
    for (let i = 0; i < ring.length; i += 2) pts.push([ring[i], ring[i + 1]]);
    pts.push([ring[0], ring[1]]);
    return pts;
  });
}

function regionsGeoJson(regions: Region[]): string {
  return JSON.stringify({
    type: 'FeatureCollection',
    features: regions.map((r) => ({
      type: 'Feature',
      properties: { id: r.id, name: r.name },
      geometry:
        r.polygons.length === 1
          ? { type: 'Polygon', coordinates: polygonCoordinates(r.polygons[0]) }
          : { type: 'MultiPolygon', coordinates: r.polygons.map(polygonCoordinates) },
    })),
  });
}

function regionSummary(r: number, region: Region, w: { cells: Uint32Array; coveredFraction: number; regionArea: number }, niche: NicheResult, figures: readonly FigureNormals[]) {
  void figures;
  const mat = niche.regionBaselineMat[r];
  const latest = niche.regionLatestMat[r];
  return {
    id: region.id,
    name: region.name,
    cells: Array.from(w.cells),
    coveredFraction: w.coveredFraction,
    areaKm2: w.regionArea,
    niche: {
      baselineMat: mat,
      latestMat: latest,
      shift: latest - mat,
      baselineClass: Number.isFinite(mat) ? NICHE_CLASSES[nicheClassCode(mat)] : null,
      latestClass: Number.isFinite(latest) ? NICHE_CLASSES[nicheClassCode(latest)] : null,
      labels: NICHE_LABELS,
      caveat: NICHE_CAVEAT,
    },
  };
}

function nicheJson(n: NicheResult, cells: Int32Array, grid: { lat: Float64Array; lon: Float64Array }) {
  const nLon = grid.lon.length;
  const a = n.assessment;
  return {
    caveat: NICHE_CAVEAT,
    labels: NICHE_LABELS,
    cells: Array.from(cells, (g, c) => ({
      cell: g,
      lat: grid.lat[Math.floor(g / nLon)],
      lon: grid.lon[g % nLon],
      baselineMat: round2(a.baselineMat[c]),
      latestMat: round2(a.latestMat[c]),
      shift: round2(a.shift[c]),
      baselineClass: Number.isFinite(a.baselineMat[c]) ? NICHE_CLASSES[a.baselineClass[c]] : null,
      distanceToMainMode: round2(a.baselineDistance[c]),
    })),
  };
}

const round2 = (v: number) => (Number.isFinite(v) ? Math.round(v * 100) / 100 : null);

function countLayers(figures: readonly FigureNormals[]): number {
  const per: Record<string, number> = { 'hours-above-limit-shift': 2, 'hours-lost-shift': 2, 'capacity-loss-shift': 1, 'wbgt-mean': 1 };
  return figures.reduce((n, f) => n + (per[f.series.def.id] ?? 0) * f.series.def.combos.length * 13, 0) + 2;
}

function describeArtefact(path: string): { kind: Manifest['artefacts'][number]['kind']; description: string; units?: string } {
  if (path.endsWith('.png')) return { kind: 'layer-png', description: 'map layer (Web Mercator rows), see layers[]' };
  if (path.endsWith('.tif')) return { kind: 'layer-geotiff', description: 'map layer, Float32 GeoTIFF, EPSG:4326', };
  if (path === DATA_DICTIONARY_PATH) return { kind: 'table', description: 'data dictionary: label, unit and unit in words of every column and code of the region tables and the cell table' };
  if (path.endsWith('.csv')) {
    return path.includes('/regions/')
      ? { kind: 'table', description: 'region table: statistics across years per month, workload class, acclimatization and exposure', units: 'unit column' }
      : { kind: 'table', description: 'per-cell table: shift hours above the limit and hours lost', units: 'h' };
  }
  if (path.includes('/calculator/cells/')) return { kind: path.endsWith('.bin') ? 'histogram' : 'json', description: 'calculator histograms of hourly WBGT per grid cell (whole hours per year, month, local hour and exposure; format in pipeline/publish/point-tile-codec.ts, chunks in calculator/cells/index.json)', units: 'h' };
  if (path.endsWith('.bin')) return { kind: 'histogram', description: 'calculator histograms of hourly WBGT per year, month, local hour and exposure (format in calculator/index.json)', units: 'h' };
  if (path.endsWith('.geojson')) return { kind: 'geojson', description: 'region outlines' };
  if (path.endsWith('changes.json')) return { kind: 'json', description: 'what changed since the previous build: years, inputs, the figures that moved most' };
  if (path.startsWith('data/cells/')) return { kind: 'json', description: 'per-cell figures for the map, in tiles (the numbers of atlas-cells.csv, plus mean WBGT, capacity loss and the niche; layout in data/cells/index.json)', units: 'per figure in data/cells/index.json' };
  return { kind: 'json', description: path.endsWith('inventory.json') ? 'dataset inventory' : 'data for the site' };
}
