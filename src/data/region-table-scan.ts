/**
 * One pass over the bytes of a region table (`data/regions/<id>.csv`, pipeline/publish/
 * region-table.ts) that gives both what the site gathers from it (pipeline/run/site-digest.ts):
 * the rows a filter keeps, as {@link parseRegionTable} gives them, and the values of the rows of
 * some statistics by key, as `regionTableValues` (region-values.ts) gives them. The bytes are
 * read into a buffer the caller keeps, so no 0.5 MB string is made per table (on this kind of
 * machine a fresh megabyte costs about 3 ms of page faults), and a line's fields become strings
 * only when its statistic is wanted.
 *
 * Only the plain tables the pipeline writes are read here: the header in the pipeline's column
 * order, ASCII, `\n` line ends, no quotes, twelve fields a line, the region's own id, periods
 * `01`–`12`/`year`, numbers that parse. Anything else returns undefined and the caller reads the
 * table with the careful readers, whose catalogued errors name the file and row; so both ways
 * give the same rows, values and errors.
 */
import { isAscii } from 'node:buffer';
import { REGION_TABLE_COLUMNS } from '../../pipeline/publish/region-table.ts';
import type { RegionTableRow, RowFilter } from './region-row.ts';

/** What one pass gives. */
export interface RegionTableScan {
  /** The rows `keep` accepts, in the table's order. */
  rows: RegionTableRow[];
  /** The value of the row of each wanted key, in the order of the keys [h or °C]; NaN when the row is missing or empty. */
  values: Float64Array;
}

/**
 * The rows whose values are wanted, by key: `period|figure|class|acclimatization|exposure|method|statistic`
 * (region-values.ts), '' for none. Made once per table kind, used for every region.
 */
export class WantedKeys {
  readonly statistics: ReadonlySet<string>;
  readonly count: number;
  /** The keys' bytes as the table writes them (commas between fields) and their indices, by the hash of those bytes. */
  private readonly byHash = new Map<number, Array<{ bytes: Buffer; indices: number[] }>>();
  constructor(keys: readonly string[]) {
    this.count = keys.length;
    const stats = new Set<string>();
    keys.forEach((k, i) => {
      if (k === '') return;
      stats.add(k.slice(k.lastIndexOf('|') + 1));
      const bytes = Buffer.from(k.replaceAll('|', ','), 'latin1');
      const h = hashBytes(bytes, 0, bytes.length);
      const groups = this.byHash.get(h) ?? [];
      this.byHash.set(h, groups);
      const same = groups.find((g) => g.bytes.equals(bytes));
      if (same) same.indices.push(i);
      else groups.push({ bytes, indices: [i] });
    });
    this.statistics = stats;
  }
  /** Indices of the keys written as `buf[from, to)`, or undefined. */
  find(buf: Buffer, from: number, to: number): number[] | undefined {
    const groups = this.byHash.get(hashBytes(buf, from, to));
    if (!groups) return undefined;
    for (const g of groups) if (g.bytes.length === to - from && buf.compare(g.bytes, 0, g.bytes.length, from, to) === 0) return g.indices;
    return undefined;
  }
}

/** FNV-1a (32 bits) of `buf[from, to)`. */
function hashBytes(buf: Buffer, from: number, to: number): number {
  let h = 0x811c9dc5;
  for (let i = from; i < to; i++) h = Math.imul(h ^ buf[i], 0x01000193);
  return h >>> 0;
}

const HEADER = Buffer.from(`${REGION_TABLE_COLUMNS.join(',')}\n`, 'latin1');
const N_FIELDS = REGION_TABLE_COLUMNS.length;
const COMMA = 44;
const NEWLINE = 10;
const QUOTE = 34;
const CR = 13;
const PERIOD = /^(0[1-9]|1[0-2]|year)$/;

/**
 * The strings of one column's few distinct values (periods, figures, classes, statistics…), so a
 * field is compared as bytes instead of becoming a new string on every line. Columns with many
 * values (more than {@link INTERN_MAX}) are sliced as usual past that.
 */
class Interner {
  private readonly bytes: Buffer[] = [];
  private readonly strings: string[] = [];
  /** The field `buf[from, to)` as a string. */
  of(buf: Buffer, from: number, to: number): string {
    const n = to - from;
    const bytes = this.bytes;
    for (let j = 0; j < bytes.length; j++) {
      const b = bytes[j];
      if (b.length !== n) continue;
      let i = 0;
      while (i < n && b[i] === buf[from + i]) i++;
      if (i === n) return this.strings[j];
    }
    const s = buf.toString('latin1', from, to);
    if (bytes.length < INTERN_MAX) {
      bytes.push(Buffer.from(s, 'latin1'));
      this.strings.push(s);
    }
    return s;
  }
}

/** Distinct values remembered per column [count]. */
const INTERN_MAX = 32;

/**
 * Scans the first `length` bytes of `buf` (the table of region `regionId`): the rows `keep`
 * accepts and the values of the rows whose statistic is in `statistics`; undefined when the table
 * is not plainly the pipeline's (see the file comment).
 */
export function scanRegionTable(buf: Buffer, length: number, regionId: string, keep: RowFilter, wanted: WantedKeys): RegionTableScan | undefined {
  if (length < HEADER.length || buf.compare(HEADER, 0, HEADER.length, 0, HEADER.length) !== 0) return undefined;
  const id = Buffer.from(regionId, 'latin1');
  if (id.toString('latin1') !== regionId) return undefined;
  // A quote, a carriage return or a byte past ASCII anywhere leaves the table to the careful readers.
  const body = buf.subarray(0, length);
  if (!isAscii(body) || body.indexOf(QUOTE) >= 0 || body.indexOf(CR) >= 0) return undefined;
  // One interner per text column (period, figure, class, acclimatization, exposure, method, statistic, unit, baseline).
  const col = Array.from({ length: N_FIELDS }, () => new Interner());
  const c = new Int32Array(N_FIELDS - 1);
  const rows: RegionTableRow[] = [];
  const values = new Float64Array(wanted.count).fill(NaN);
  const statistics = wanted.statistics;
  let pos = HEADER.length;
  while (pos < length) {
    let end = buf.indexOf(NEWLINE, pos);
    if (end < 0 || end > length) end = length;
    const from = pos;
    pos = end + 1;
    if (end === from) continue;
    // The commas of the line (quotes, carriage returns and bytes past ASCII were ruled out above).
    let k = 0;
    for (let i = from; i < end; i++) {
      if (buf[i] === COMMA) {
        if (k === N_FIELDS - 1) return undefined;
        c[k++] = i;
      }
    }
    if (k !== N_FIELDS - 1) return undefined;
    const period = col[1].of(buf, c[0] + 1, c[1]);
    const figure = col[2].of(buf, c[1] + 1, c[2]);
    const statistic = col[7].of(buf, c[6] + 1, c[7]);
    const kept = keep(period, figure, statistic);
    const valued = statistics.has(statistic);
    if (!kept && !valued) continue;
    const raw = buf.toString('latin1', c[7] + 1, c[8]);
    const value = raw === '' ? NaN : Number(raw);
    if (raw !== '' && !Number.isFinite(value)) return undefined;
    if (valued) {
      // A key of the table is unique in it (region-table.ts writes each once): the last row wins, as in a map.
      const at = wanted.find(buf, c[0] + 1, c[7]);
      if (at) for (const i of at) values[i] = value;
    }
    if (!kept) continue;
    const workloadClass = col[3].of(buf, c[2] + 1, c[3]);
    const acclimatization = col[4].of(buf, c[3] + 1, c[4]);
    const exposure = col[5].of(buf, c[4] + 1, c[5]);
    const method = col[6].of(buf, c[5] + 1, c[6]);
    if (c[0] - from !== id.length || buf.compare(id, 0, id.length, from, c[0]) !== 0 || !PERIOD.test(period)) return undefined;
    const yearsUsed = Number(buf.toString('latin1', c[9] + 1, c[10]));
    if (!Number.isInteger(yearsUsed) || yearsUsed < 0) return undefined;
    rows.push({
      period,
      figure,
      workloadClass,
      acclimatization,
      exposure,
      method,
      statistic,
      value,
      unit: col[9].of(buf, c[8] + 1, c[9]),
      yearsUsed,
      baseline: col[11].of(buf, c[10] + 1, end),
    });
  }
  return { rows, values };
}
