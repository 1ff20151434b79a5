/**
 * Each region's spreadsheet downloads, next to its tidy table:
 * - `data/regions/<id>.wide.csv`: the figures in hours with the months across (region-wide-table.ts;
 *   °C figures stay in the tidy table and the workbook), UTF-8 with a byte order mark;
 * - `data/regions/<id>.xlsx`: a workbook with the hours and the temperatures by month, the
 *   assumptions (the atlas build, its data, the work settings, what the statistics mean) and the
 *   cautions (workbook.ts, exceljs).
 * The build calls {@link writeRegionSpreadsheets} for one region at a time, right after it writes
 * that region's tidy table, with the wide tables made from the same figures, so memory holds one
 * region's tables.
 */
import { join } from 'node:path';
import { writeFileAtomic } from '../model/effects.ts';
import type { Caution } from '../work/cautions.ts';
import { wideCsv, type WideTable } from './region-wide-table.ts';
import { workbookBytes, type CellValue, type SheetSpec } from './workbook.ts';

/** What the assumptions sheet says about the atlas. */
export interface RegionSheetInfo {
  atlasTitle: string;
  invented: boolean;
  attribution: string;
  buildTime: string;
  codeVersion: string;
  configDigest: string;
  inputFiles: number;
  years: [number, number];
  baseline: [number, number];
  timeZone: string;
  /** Work settings in words: key → text. */
  work: Array<[string, string]>;
  /** Workload classes: id, name, metabolic rate [W]. */
  classes: Array<{ id: string; name: string; metabolicRate: number }>;
  /** Figure id → readable label. */
  figureLabels: ReadonlyMap<string, string>;
  /** Statistic id → what it is. */
  statistics: Readonly<Record<string, string>>;
  cautions: readonly Caution[];
  /** The region's workforce in words (the people raster, its name, year and licence, the shares), when the atlas has one. */
  workforce?: Array<[string, string]>;
  /** For a scenario's tables: what it is, its source, and that it is a what-if, not a forecast. */
  scenario?: { name: string; what: string; source: string; caveat: string };
}

/** Sheets of the workforce tables, by unit: person-hours, per km², full-time equivalents, share of time (names ≤ 31 characters). */
const WORKFORCE_SHEETS: ReadonlyArray<[string, string]> = [
  ['person-h', 'Person-hours by month'],
  ['FTE', 'Full-time equivalents by month'],
  ['%', 'Outdoor time lost by month'],
  ['person-h km-2', 'Person-hours per km² by month'],
];

/** Paths of a region's spreadsheet files below `data/`. */
export const regionWidePath = (id: string) => `regions/${id}.wide.csv`;
export const regionWorkbookPath = (id: string) => `regions/${id}.xlsx`;

const tableSheet = (name: string, t: WideTable): SheetSpec => ({
  name,
  header: t.header,
  rows: t.rows.map((r): CellValue[] => [
    ...r.keys,
    ...r.values.map((v) => (Number.isFinite(v) ? v : null)),
    Number.isFinite(r.yearsUsed) ? r.yearsUsed : null,
    r.baseline,
  ]),
  widths: t.header.map((h, i) => (i === 1 ? 48 : i < 7 ? 16 : Math.max(11, h.length + 1))),
});

/** The assumptions sheet's rows (pure). */
export function assumptionRows(region: { id: string; name: string }, info: RegionSheetInfo): CellValue[][] {
  const rows: CellValue[][] = [
    ['Region', `${region.name} (${region.id})`],
    ['Atlas', info.atlasTitle],
    ...(info.scenario
      ? ([
          ['Scenario', `${info.scenario.name}: a what-if, not a forecast`],
          ['Scenario: what', info.scenario.what],
          ['Scenario: source', info.scenario.source],
          ['Scenario: how to read it', info.scenario.caveat],
        ] as CellValue[][])
      : []),
    ...(info.invented ? [['Data', 'INVENTED DATA: built from invented, synthetic data; no real place or climate is described.'] as CellValue[]] : []),
    ['Data credit', info.attribution],
    ['Built', `${info.buildTime}, code ${info.codeVersion}, configuration ${info.configDigest}, ${info.inputFiles} input files`],
    ['Years built', `${info.years[0]}–${info.years[1]}`],
    ['Baseline (normal period)', `${info.baseline[0]}–${info.baseline[1]}`],
    ['Local time', `${info.timeZone} (IANA zone of the local hours, months and shifts)`],
    ['Values', 'area-weighted mean over the region’s land grid cells of each year’s figure, then the statistic across the baseline years'],
    ...info.work.map(([k, v]): CellValue[] => [k, v]),
    ...(info.workforce
      ? [
          [] as CellValue[],
          [
            'Workforce figures',
            'person-hours = Σ over the land cells of people × share of the cell inside the region × outdoor-work share × hours per worker; the statistic across the baseline years of each year’s total',
          ] as CellValue[],
          ...info.workforce.map(([k, v]): CellValue[] => [k, v]),
        ]
      : []),
    [],
    ['Workload class', 'Name', 'Metabolic rate [W]'],
    ...info.classes.map((c): CellValue[] => [c.id, c.name, c.metabolicRate]),
    [],
    ['Statistic', 'Meaning'],
    ...Object.entries(info.statistics).map(([k, v]): CellValue[] => [k, v]),
  ];
  return rows;
}

/** The workbook's sheets (pure). */
export function regionWorkbookSheets(region: { id: string; name: string }, tables: readonly WideTable[], info: RegionSheetInfo): SheetSpec[] {
  const hours = tables.find((t) => t.unit === 'h');
  const temps = tables.find((t) => t.unit === 'degC');
  return [
    ...(hours ? [tableSheet('Hours by month', hours)] : []),
    ...(temps ? [tableSheet('Temperatures by month', temps)] : []),
    ...WORKFORCE_SHEETS.flatMap(([unit, name]) => {
      const t = tables.find((x) => x.unit === unit);
      return t ? [tableSheet(name, t)] : [];
    }),
    { name: 'Assumptions', header: ['Item', 'Value', ''], rows: assumptionRows(region, info), widths: [28, 100, 20] },
    { name: 'Cautions', header: ['Caution', 'Basis'], rows: info.cautions.map((c) => [c.text, c.basis]), widths: [110, 40] },
  ];
}

/**
 * Writes `<id>.wide.csv` and, unless `workbook` is false (config `regionWorkbooks`), `<id>.xlsx`
 * under `dataDir/regions/` from the region's wide tables (region-wide-table.ts: made from its
 * figures, `regionWideTablesOf`, or read from its tidy table, `regionWideTables`).
 */
export async function writeRegionSpreadsheets(
  dataDir: string,
  region: { id: string; name: string },
  tables: readonly WideTable[],
  info: RegionSheetInfo,
  workbook = true,
): Promise<void> {
  const hours = tables.find((t) => t.unit === 'h');
  if (hours) await writeFileAtomic(join(dataDir, regionWidePath(region.id)), wideCsv(hours));
  if (!workbook) return;
  const bytes = await workbookBytes(regionWorkbookSheets(region, tables, info), {
    title: `${info.atlasTitle}: ${region.name}`,
    created: new Date(info.buildTime),
  });
  await writeFileAtomic(join(dataDir, regionWorkbookPath(region.id)), bytes);
}

/** The build's facts the assumptions sheet needs, as the build holds them. */
export interface RegionSheetFacts {
  title: string;
  invented: boolean;
  attribution?: string;
  buildTime: string;
  codeVersion: string;
  configDigest: string;
  inputFiles: number;
  years: [number, number];
  baseline: [number, number];
  timeZone: string;
  work: {
    settings: {
      limitModel: string;
      airMovement: boolean;
      acclimatization: readonly string[];
      exposures: readonly string[];
      restLocation: string;
      clothing: { ensemble?: string; hood?: boolean; cav?: number };
    };
    clothingAdjustment: number;
    rest: { metabolicRate: number };
    shift: { start: number; end: number; days: readonly string[] };
    classes: ReadonlyArray<{ id: string; name: string; metabolicRate: number }>;
  };
  figures: ReadonlyArray<{ id: string; label: string }>;
  statistics: Readonly<Record<string, string>>;
  cautions: readonly Caution[];
  /** For a scenario's tables: what it is, its source, and that it is a what-if, not a forecast. */
  scenario?: { name: string; what: string; source: string; caveat: string };
}

/** The assumptions of a build in words. */
export function regionSheetInfo(f: RegionSheetFacts): RegionSheetInfo {
  const w = f.work;
  const s = w.settings;
  const pad = (h: number) => `${String(h % 24).padStart(2, '0')}:00`;
  const clothing =
    s.clothing.cav !== undefined
      ? `a clothing adjustment value of ${s.clothing.cav} °C-WBGT`
      : `${s.clothing.ensemble ?? 'work-clothes'}${s.clothing.hood ? ' with hood' : ''}`;
  return {
    atlasTitle: f.title,
    invented: f.invented,
    attribution: f.attribution ?? '',
    buildTime: f.buildTime,
    codeVersion: f.codeVersion,
    configDigest: f.configDigest,
    inputFiles: f.inputFiles,
    years: f.years,
    baseline: f.baseline,
    timeZone: f.timeZone,
    work: [
      [
        'Limit model',
        s.limitModel === 'curve-2017'
          ? 'continuous curves (NIOSH 2016 REL/RAL, ISO 7243:2017 form)'
          : `ISO 7243:1989 table${s.airMovement ? ', air movement' : ''}`,
      ],
      ['Acclimatization', s.acclimatization.join(', ')],
      ['Exposure', exposureLine(s.exposures)],
      ['Breaks', s.restLocation === 'shade' ? 'in the shade' : 'in the same place as the work'],
      ['Rest metabolic rate', `${w.rest.metabolicRate} W`],
      ['Clothing', `${clothing} (adjustment ${w.clothingAdjustment} °C-WBGT added to the WBGT)`],
      ['Shift', `${pad(w.shift.start)}–${pad(w.shift.end)} local time, ${w.shift.days.join(' ')}`],
      ['Units', 'h per worker: hours of one worker in a month (or the year); °C: degrees Celsius'],
    ],
    classes: w.classes.map((c) => ({ id: c.id, name: c.name, metabolicRate: c.metabolicRate })),
    figureLabels: new Map(f.figures.map((x) => [x.id, x.label])),
    statistics: f.statistics,
    cautions: f.cautions,
  };
}

/**
 * The workbook's exposure line: the names as configured; with the opt-in shelter each exposure
 * with its model (the line of a sun-and-shade build stays as it was, so such builds publish the
 * same bytes as before the shelter existed).
 */
export function exposureLine(exposures: readonly string[]): string {
  if (!exposures.includes('shelter')) return exposures.join(', ');
  const model: Record<string, string> = {
    sun: 'sun',
    shade: 'shade (open sky with the sun removed)',
    shelter: 'shelter (under a roof or canopy, a shelter at air temperature \u2014 Lemke & Kjellstrom 2012)',
  };
  return exposures.map((x) => model[x] ?? x).join(', ');
}
