/**
 * The CSV download of an estimate (RFC 4180, pipeline/formats/csv.ts): first `#` lines with the
 * title, the invented-data label, the settings (temperatures in °C) and the cautions, then a
 * header with the unit in each column name and one line per row of the page's table.
 * Readers skip the `#` lines (pandas `comment="#"`, R `comment.char = "#"`).
 */
import { CAUTION_SUMMARY } from '../../../pipeline/work/index.ts';
import { csvLine, roundTo } from '../../../pipeline/formats/csv.ts';
import type { EstimateContext } from './context.ts';
import type { EstimateResult } from './estimate.ts';
import { summaryLines, summaryText } from './summary.ts';
import { ESTIMATE_COLUMNS, estimateRows } from './table.ts';

/** The CSV text of an estimate. */
export function estimateCsv(r: EstimateResult, ctx: EstimateContext, atlasTitle: string): string {
  const comment = (s: string) => `# ${s.replace(/[\r\n]+/g, ' ')}\n`;
  let out = comment(`Heat-stress working-hours estimate: ${atlasTitle}`);
  if (ctx.invented) out += comment('INVENTED DATA: this atlas is built from invented, synthetic data; no real place or climate is described.');
  out += comment('Screening estimate from histograms of modelled hourly WBGT; not safety advice and not a site measurement.');
  for (const line of summaryLines(r, ctx)) out += comment(`${line.label}: ${summaryText(line, 'C')}`);
  out += comment('Statistics: mean and 90th-percentile year (Hyndman-Fan type 7) across the baseline years; monthly rows are for one such month, the last row for the whole period.');
  out += comment(`Cautions: ${CAUTION_SUMMARY}`);
  out += csvLine(['period', 'label', ...ESTIMATE_COLUMNS.map((c) => c.csv)]);
  for (const row of estimateRows(r)) {
    out += csvLine([row.key, row.label, ...ESTIMATE_COLUMNS.map((c) => roundTo(row.values[c.key], c.csvDigits))]);
  }
  return out;
}

/** A file name for the download, e.g. `estimate-varn-shore-moderate.csv`. */
export function estimateFileName(r: EstimateResult): string {
  const place = r.inputs.place.kind === 'region' ? r.inputs.place.id : `cell-${r.inputs.place.cell}`;
  const work = r.inputs.classId ?? `${Math.round(r.inputs.workRate)}w`;
  return `estimate-${place}-${work}-${r.inputs.acclimatization}-${r.inputs.exposure}.csv`;
}
