/**
 * Stage 4 of a build, the regions: one region at a time, its parts from every merge band it
 * overlaps are added (double-double sums, so the result does not depend on the bands), its
 * per-year area-weighted means become normals (pipeline/climate/normals.ts), and its table (tidy
 * CSV, the wide CSV and the workbook for spreadsheets), its summary and its calculator tile are
 * written. Memory holds one region. Run once per weather: the record into `data/`, each scenario
 * into `data/scenarios/<id>/` (same files, the scenario named in its workbooks).
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { computeNormals, computeTrends, MONTHLY_COMPLETENESS, NICHE_CAVEAT, NICHE_CLASSES, NICHE_LABELS, nicheClassCode } from '../climate/index.ts';
import { CELL_YEAR_HIST } from '../reduce/merge.ts';
import { PERIODS } from '../reduce/figures.ts';
import { addFigureSums, regionYearValues, weightedMeans, type RegionFigureSums } from '../regions/region-sums.ts';
import { ddAddAll, ddAddPair } from '../regions/double-double.ts';
import {
  readFigureSums,
  readHistogramInto,
  readMeans,
  RECORD_FIGURES,
  RECORD_HISTOGRAM,
  RECORD_MEANS,
  RECORD_WORKFORCE,
  type RegionRecordRef,
} from '../formats/region-parts.ts';
import { regionWorkforceYears } from '../regions/person-hours.ts';
import { DEFAULT_ACCLIMATIZED_SHARE, DEFAULT_SUN_SHARE } from '../regions/workforce-shares.ts';
import type { Normals } from '../climate/index.ts';
import { regionTableCsv } from '../publish/region-table.ts';
import { regionSheetInfo, writeRegionSpreadsheets } from '../publish/region-spreadsheets.ts';
import { STATISTIC_RULES } from '../publish/manifest.ts';
import { CAUTIONS } from '../work/index.ts';
import { CODE_VERSION } from '../model/version.ts';
import { encodeHistogramTileYearPairs, HISTOGRAM_TILE_YEAR_MAX_BYTES } from '../publish/histogram-tiles.ts';
import { HIST_LEN } from '../reduce/layout.ts';
import type { RegionFigureNormals } from '../publish/figure-normals.ts';
import { startProgress } from '../model/progress.ts';
import type { Logger } from '../model/effects.ts';
import type { BuildPlan, BuildVariant } from './plan-stage.ts';
import { describeScenario } from '../scenario/describe.ts';
import type { MergeTileSummary } from './merge-tile.ts';

export interface RegionOutcome {
  seconds: number;
}

export async function regionStage(
  plan: BuildPlan,
  variant: BuildVariant,
  tiles: readonly MergeTileSummary[],
  dataDir: string,
  generated: string,
  log: Logger,
  quiet?: boolean,
): Promise<RegionOutcome> {
  const t0 = Date.now();
  const cfg = plan.rc.config;
  // What the region workbooks' assumptions sheet says of the build (and of the scenario).
  const sc = variant.scenario;
  const sheetInfo = {
    ...regionSheetInfo({
      ...cfg,
      ...cfg.dataset,
      buildTime: generated,
      codeVersion: CODE_VERSION,
      configDigest: plan.configDigest,
      inputFiles: plan.ds.files.length,
      work: plan.work,
      figures: [...plan.defs, ...(plan.workforce?.regionDefs ?? [])],
      statistics: STATISTIC_RULES,
      cautions: CAUTIONS,
    }),
    ...(sc ? { scenario: { name: sc.name, ...describeScenario(sc, variant.check) } } : {}),
  };
  const wf = plan.workforce;
  const nE = plan.work.evaluations.length;
  // Which records of which band files belong to each region.
  const refs = plan.regions.map(() => [] as Array<{ path: string; ref: RegionRecordRef }>);
  for (const t of tiles) for (const ref of t.regionParts.records) refs[ref.region].push({ path: t.regionParts.path, ref });
  mkdirSync(join(dataDir, 'regions'), { recursive: true });
  mkdirSync(join(dataDir, 'calculator'), { recursive: true });
  const nY = plan.years.length;
  // One region's histogram pairs of one year, the slots they touch, and its calculator tile's bytes.
  const acc = new Float64Array(2 * CELL_YEAR_HIST);
  const touched = new Uint8Array(CELL_YEAR_HIST / HIST_LEN);
  const tile = new Uint8Array(nY * HISTOGRAM_TILE_YEAR_MAX_BYTES);
  const progress = startProgress(sc ? `regions (${sc.id})` : 'regions', plan.regions.length, { quiet });
  for (let r = 0; r < plan.regions.length; r++) {
    const region = plan.regions[r];
    const w = plan.weights[r];
    const mine = refs[r];
    // Figures: the parts' sums added, the year series, the normals.
    let sums: RegionFigureSums[] | undefined;
    let peopleSums: RegionFigureSums[] | undefined;
    const means = new Float64Array(8);
    for (const { path, ref } of mine) {
      if (ref.kind === RECORD_FIGURES) {
        const part = readFigureSums(path, ref);
        if (sums === undefined) sums = part;
        else part.forEach((p, i) => addFigureSums(sums![i], p));
      } else if (ref.kind === RECORD_WORKFORCE) {
        const part = readFigureSums(path, ref);
        if (peopleSums === undefined) peopleSums = part;
        else part.forEach((p, i) => addFigureSums(peopleSums![i], p));
      } else if (ref.kind === RECORD_MEANS) ddAddAll(means, readMeans(path, ref));
    }
    const figures: RegionFigureNormals[] = plan.defs.map((def, i) => {
      const nItems = PERIODS * def.combos.length;
      const values = sums ? regionYearValues(sums[i]) : new Float64Array(nY * nItems).fill(NaN);
      const normals = computeNormals(
        { years: plan.years, values, nItems },
        { baseline: cfg.baseline, latestYear: plan.latestYear, rule: MONTHLY_COMPLETENESS },
      );
      return {
        def,
        region: normals,
        worstValue: sums ? sums[i].worstValue : new Float64Array(nItems).fill(NaN),
        trend: computeTrends({ years: plan.years, values, nItems }, annualItems(def.combos.length)),
      };
    });
    // Person-hours, full-time equivalents and the share of outdoor work time lost: the region's
    // people-weighted hours per worker, times its people and shares (pipeline/regions/person-hours.ts).
    let workforce: Record<string, unknown> | undefined;
    let workforceRows: Array<[string, string]> = [];
    if (wf) {
      const nanYears = (n: number) => new Float64Array(nY * n).fill(NaN);
      const hours = {
        nYears: nY,
        nEval: nE,
        above: peopleSums ? regionYearValues(peopleSums[0]) : nanYears(PERIODS * nE),
        lost: peopleSums ? regionYearValues(peopleSums[1]) : nanYears(PERIODS * nE),
        shift: peopleSums ? regionYearValues(peopleSums[2]) : nanYears(PERIODS),
      };
      const profile = wf.shares.regions[r];
      const people = wf.regionPeople[r];
      const years = regionWorkforceYears(hours, people, profile, wf.annualHours);
      const wfFigures = wf.regionDefs.map((def, i): RegionFigureNormals => {
        const nItems = PERIODS * def.combos.length;
        const normals = computeNormals(
          { years: plan.years, values: years[i], nItems },
          { baseline: cfg.baseline, latestYear: plan.latestYear, rule: MONTHLY_COMPLETENESS },
        );
        return {
          def,
          region: normals,
          worstValue: new Float64Array(nItems).fill(NaN),
          trend: computeTrends({ years: plan.years, values: years[i], nItems }, annualItems(def.combos.length)),
        };
      });
      figures.push(...wfFigures);
      const annual = (i: number) => annualAll(wfFigures[i].region, wf.regionDefs[i].combos.length);
      workforce = {
        people,
        outdoorWorkers: people * profile.total,
        shares: profile.classes,
        sharesFrom: profile.source === '*' ? 'default rows (*)' : 'rows of this region',
        defaults: { acclimatizedShare: DEFAULT_ACCLIMATIZED_SHARE, sunShare: DEFAULT_SUN_SHARE },
        annualHours: wf.annualHours,
        raster: { name: wf.config.name, year: wf.config.year, licence: wf.config.licence, invented: wf.config.invented },
        year: { personHoursAbove: annual(0), personHoursLost: annual(1), fullTimeEquivalentsLost: annual(2), outdoorWorkTimeLostPercent: annual(3) },
      };
      workforceRows = [
        ['People (workforce raster)', `${wf.config.name}, ${wf.config.year}${wf.config.invented ? ' (INVENTED)' : ''}; licence: ${wf.config.licence}`],
        ['People in the region', `${Math.round(people)} on its land cells (the raster's people of each cell × the share of the cell inside the region)`],
        [
          'Outdoor-work shares',
          `${
            profile.classes
              .filter((c) => c.share > 0)
              .map((c) => `${c.workloadClass} ${c.share} (acclimatized ${c.acclimatized}, in the sun ${c.sun})`)
              .join('; ') || 'none'
          } — from the ${profile.source === '*' ? 'default rows' : "region's own rows"}`,
        ],
        ['Full-time equivalent', `${wf.annualHours} h: a year of the shift pattern (hours per shift × days per week × 52)`],
      ];
    }
    const table = regionTableCsv(region.id, figures, cfg.baseline, plan.latestYear, [plan.years[0], plan.years[nY - 1]]);
    writeFileSync(join(dataDir, 'regions', `${region.id}.csv`), table);
    await writeRegionSpreadsheets(
      dataDir,
      region,
      table,
      workforceRows.length > 0 ? { ...sheetInfo, workforce: workforceRows } : sheetInfo,
      cfg.regionWorkbooks,
    );
    // Mean annual temperature against the niche.
    const [mat, latest] = weightedMeans(means, 2);
    writeFileSync(
      join(dataDir, 'regions', `${region.id}.json`),
      JSON.stringify({
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
        ...(workforce ? { workforce } : {}),
      }),
    );
    // The calculator's histograms, year by year: only the slots the parts hold bins of are
    // encoded and cleared again (the same bytes as encodeHistogramTile of the dense year).
    let at = 0;
    for (let y = 0; y < nY; y++) {
      for (const { path, ref } of mine) if (ref.kind === RECORD_HISTOGRAM && ref.year === y) readHistogramInto(path, ref, acc, ddAddPair, touched);
      at = encodeHistogramTileYearPairs(acc, touched, tile, at);
      for (let s = 0; s < touched.length; s++) {
        if (touched[s] === 0) continue;
        acc.fill(0, 2 * s * HIST_LEN, 2 * (s + 1) * HIST_LEN);
        touched[s] = 0;
      }
    }
    writeFileSync(join(dataDir, 'calculator', `${region.id}.bin`), tile.subarray(0, at));
    progress.tick();
  }
  progress.done();
  const seconds = (Date.now() - t0) / 1000;
  log.info(`${plan.regions.length} region(s)${sc ? ` of scenario ${sc.id}` : ''}: tables, summaries and calculator tiles in ${seconds.toFixed(1)} s`);
  return { seconds };
}

/** Items of the whole year (period `year`) of a figure with `nCombos` combinations: (PERIODS − 1)·nCombos + k. */
function annualItems(nCombos: number): Int32Array {
  return Int32Array.from({ length: nCombos }, (_, k) => (PERIODS - 1) * nCombos + k);
}

/** The annual (period `year`) mean and 90th-percentile year of the `all` combination, null when withheld. */
function annualAll(n: Normals, nCombos: number): { mean: number | null; p90: number | null; yearsUsed: number } {
  const i = (PERIODS - 1) * nCombos + (nCombos - 1);
  const v = (x: number) => (Number.isFinite(x) ? x : null);
  return { mean: v(n.mean[i]), p90: v(n.p90[i]), yearsUsed: n.yearsUsed[i] };
}
