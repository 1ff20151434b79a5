/**
 * The CSV download of the monthly table (RFC 4180, pipeline/formats/csv.ts), UTF-8 with a byte
 * order mark (it holds ° and −, which spreadsheets otherwise misread). First come comment lines,
 * each `#,"text"`: a reader that skips `#` lines (pandas `comment="#"`, R `comment.char = "#"`)
 * skips them, and a spreadsheet shows the text whole in the second column (commas inside are
 * quoted); then a header with the unit in each column name and one line per row of the table.
 */
import { CAUTION_SUMMARY } from '../../../pipeline/work/cautions.ts';
import { csvLine, roundTo } from '../../../pipeline/formats/csv.ts';
import type { EstimateContext } from '../../../pipeline/schedule/context.ts';
import type { ResolvedPlace } from '../../../pipeline/schedule/place.ts';
import type { EstimateResult } from './estimate.ts';
import { summaryLines, summaryText } from './summary.ts';
import { ESTIMATE_COLUMNS, estimateRows } from './table.ts';

/** Byte order mark that starts the file. */
export const BOM = '\uFEFF';

/** A comment line: `#` in the first column, the text (quoted when it needs it) in the second. */
export function commentLine(text: string): string {
  return csvLine(['#', text.replace(/[\r\n]+/g, ' ')]);
}

/** The CSV text of the monthly table. */
export function estimateCsv(r: EstimateResult, ctx: EstimateContext, atlasTitle: string, place: ResolvedPlace): string {
  let out = BOM + commentLine(`Heat-stress working-hours estimate: ${atlasTitle}`);
  if (ctx.invented) out += commentLine('INVENTED DATA: this atlas is built from invented, synthetic data; no real place or climate is described.');
  out += commentLine('Screening estimate from histograms of modelled hourly WBGT; not safety advice and not a site measurement.');
  for (const line of summaryLines(r, ctx, place)) out += commentLine(`${line.label}: ${summaryText(line, 'C')}`);
  out += commentLine(
    'Statistics: mean and 90th-percentile year (Hyndman-Fan type 7) across the baseline years; monthly rows are for one such month, the last row for the whole period.',
  );
  out += commentLine(`Cautions: ${CAUTION_SUMMARY}`);
  out += csvLine(['period', 'label', ...ESTIMATE_COLUMNS.map((c) => c.csv)]);
  for (const row of estimateRows(r)) {
    out += csvLine([row.key, row.label, ...ESTIMATE_COLUMNS.map((c) => roundTo(row.values[c.key], c.csvDigits))]);
  }
  return out;
}

export { estimateFileName } from './file-name.ts';
