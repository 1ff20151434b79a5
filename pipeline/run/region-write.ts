/**
 * One region of the region stage (./region-stage.ts), in whichever thread runs it: its parts from
 * every merge band it overlaps are added (double-double sums, so the result does not depend on the
 * bands), its per-year area-weighted means become normals (pipeline/climate/normals.ts), and its
 * table (tidy CSV, the wide CSV and the workbook), its summary JSON and its calculator tile are
 * written. {@link RegionContext} is what every region shares (sent once to each worker of the
 * pool), {@link RegionTask} one region's own inputs (sent per region), so a thread holds one
 * region at a time. A failure that is not catalogued becomes the catalogued RegionWriteFailed,
 * naming the region, in the main thread and in a worker alike.
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { computeNormals, computeTrends, MONTHLY_COMPLETENESS, NICHE_CAVEAT, NICHE_CLASSES, NICHE_LABELS, nicheClassCode } from '../climate/index.ts';
import type { Normals } from '../climate/index.ts';
import { CELL_YEAR_HIST } from '../reduce/merge.ts';
import { PERIODS, type FigureDef } from '../reduce/figures.ts';
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
import { DEFAULT_ACCLIMATIZED_SHARE, DEFAULT_SUN_SHARE, type ShareProfile } from '../regions/workforce-shares.ts';
import { regionTableCsv } from '../publish/region-table.ts';
import { writeRegionSpreadsheets, type RegionSheetInfo } from '../publish/region-spreadsheets.ts';
import { regionWideTablesOf } from '../publish/region-wide-table.ts';
import { encodeHistogramTileYearPairs, HISTOGRAM_TILE_YEAR_MAX_BYTES } from '../publish/histogram-tiles.ts';
import { HIST_LEN } from '../reduce/layout.ts';
import type { RegionFigureNormals } from '../publish/figure-normals.ts';
import { HeathoursError } from '../model/errors.ts';
import { DiskFull, RegionWriteFailed } from './errors.ts';

/** What every region of one weather (the record or a scenario) shares; structured-cloneable. */
export interface RegionContext {
  /** The weather's data folder (`data/` or `data/scenarios/<id>/`). */
  dataDir: string;
  years: number[];
  latestYear: number;
  baseline: [number, number];
  defs: FigureDef[];
  /** Work evaluations of the build [count]. */
  nEval: number;
  sheetInfo: RegionSheetInfo;
  /** Config `regionWorkbooks`: whether the `.xlsx` is written. */
  regionWorkbooks: boolean;
  workforce?: {
    regionDefs: FigureDef[];
    /** Hours of a year of the shift pattern [h]. */
    annualHours: number;
    config: { name: string; year: number; licence: string; invented?: boolean };
  };
}

/** One region's own inputs; structured-cloneable. */
export interface RegionTask {
  /** Index of the region in the plan [index]. */
  index: number;
  region: { id: string; name: string };
  /** Its cell indices [index], covered share [1] and area [km²] (land-masked weights). */
  weights: { cells: Uint32Array; coveredFraction: number; regionArea: number };
  /** Which records of which band files belong to the region. */
  refs: Array<{ path: string; ref: RegionRecordRef }>;
  /** Its people [people] and share profile, when the atlas has a workforce. */
  workforce?: { people: number; profile: ShareProfile };
}

/** Buffers one thread reuses from region to region (one year of histogram pairs, one tile). */
export interface RegionScratch {
  acc: Float64Array;
  touched: Uint8Array;
  tile: Uint8Array;
}

export function regionScratch(nYears: number): RegionScratch {
  return {
    acc: new Float64Array(2 * CELL_YEAR_HIST),
    touched: new Uint8Array(CELL_YEAR_HIST / HIST_LEN),
    tile: new Uint8Array(nYears * HISTOGRAM_TILE_YEAR_MAX_BYTES),
  };
}

/** Writes one region's files; a failure not catalogued is thrown as RegionWriteFailed naming it. */
export async function writeRegion(ctx: RegionContext, task: RegionTask, scratch: RegionScratch): Promise<void> {
  try {
    await writeRegionFiles(ctx, task, scratch);
  } catch (e) {
    if (e instanceof HeathoursError) throw e;
    const errno = e as NodeJS.ErrnoException;
    if (errno?.code === 'ENOSPC' || errno?.code === 'EDQUOT')
      throw DiskFull({ path: errno.path ?? ctx.dataDir, what: `writing the files of region ${task.region.id}` }, { file: errno.path ?? ctx.dataDir });
    throw RegionWriteFailed({ region: task.region.id, dataDir: ctx.dataDir, detail: e instanceof Error ? e.message : String(e) }, { key: task.region.id });
  }
}

async function writeRegionFiles(ctx: RegionContext, task: RegionTask, scratch: RegionScratch): Promise<void> {
  const { region, weights: w, refs: mine } = task;
  const { years, latestYear, baseline, dataDir } = ctx;
  const nY = years.length;
  const nE = ctx.nEval;
  const wf = ctx.workforce;
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
  const figures: RegionFigureNormals[] = ctx.defs.map((def, i) => {
    const nItems = PERIODS * def.combos.length;
    const values = sums ? regionYearValues(sums[i]) : new Float64Array(nY * nItems).fill(NaN);
    const normals = computeNormals({ years, values, nItems }, { baseline, latestYear, rule: MONTHLY_COMPLETENESS });
    return {
      def,
      region: normals,
      worstValue: sums ? sums[i].worstValue : new Float64Array(nItems).fill(NaN),
      trend: computeTrends({ years, values, nItems }, annualItems(def.combos.length)),
    };
  });
  // Person-hours, full-time equivalents and the share of outdoor work time lost: the region's
  // people-weighted hours per worker, times its people and shares (pipeline/regions/person-hours.ts).
  let workforce: Record<string, unknown> | undefined;
  let workforceRows: Array<[string, string]> = [];
  if (wf && task.workforce) {
    const nanYears = (n: number) => new Float64Array(nY * n).fill(NaN);
    const hours = {
      nYears: nY,
      nEval: nE,
      above: peopleSums ? regionYearValues(peopleSums[0]) : nanYears(PERIODS * nE),
      lost: peopleSums ? regionYearValues(peopleSums[1]) : nanYears(PERIODS * nE),
      shift: peopleSums ? regionYearValues(peopleSums[2]) : nanYears(PERIODS),
    };
    const { profile, people } = task.workforce;
    const wfYears = regionWorkforceYears(hours, people, profile, wf.annualHours);
    const wfFigures = wf.regionDefs.map((def, i): RegionFigureNormals => {
      const nItems = PERIODS * def.combos.length;
      const normals = computeNormals({ years, values: wfYears[i], nItems }, { baseline, latestYear, rule: MONTHLY_COMPLETENESS });
      return {
        def,
        region: normals,
        worstValue: new Float64Array(nItems).fill(NaN),
        trend: computeTrends({ years, values: wfYears[i], nItems }, annualItems(def.combos.length)),
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
  const table = regionTableCsv(region.id, figures, baseline, latestYear, [years[0], years[nY - 1]]);
  writeFileSync(join(dataDir, 'regions', `${region.id}.csv`), table);
  await writeRegionSpreadsheets(
    dataDir,
    region,
    regionWideTablesOf(figures, ctx.sheetInfo.figureLabels, baseline, latestYear, [years[0], years[nY - 1]]),
    workforceRows.length > 0 ? { ...ctx.sheetInfo, workforce: workforceRows } : ctx.sheetInfo,
    ctx.regionWorkbooks,
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
  const { acc, touched, tile } = scratch;
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
