/**
 * Spreadsheet workbooks (.xlsx, Office Open XML) from plain sheets of rows, with exceljs 4.4
 * (its streaming writer: about 3× faster than building the workbook in memory on the demo region
 * tables). Used for each region's workbook (region-spreadsheets.ts) and the estimate's workbook
 * (`heathours estimate --xlsx`). Numbers stay numbers, text stays text, an empty cell is null;
 * the first row of each sheet is bold and frozen, the title row of a notes sheet is bold.
 */
import { PassThrough } from 'node:stream';
import ExcelJS from 'exceljs';

export type CellValue = string | number | null;

/** One sheet: a name (at most 31 characters, no []:*?/\), an optional header row, rows. */
export interface SheetSpec {
  name: string;
  header?: string[];
  rows: CellValue[][];
  /** Column widths [characters]; default from the header. */
  widths?: number[];
}

/** Workbook properties. */
export interface WorkbookMeta {
  title: string;
  /** Creation time written into the file (the atlas build time keeps builds reproducible). */
  created: Date;
}

const BAD_SHEET_CHARS = /[[\]:*?/\\]/g;

/** A sheet name Excel accepts: forbidden characters replaced, at most 31 characters. */
export function sheetName(name: string): string {
  return name.replace(BAD_SHEET_CHARS, '-').slice(0, 31) || 'Sheet';
}

/** The .xlsx bytes of `sheets`. */
export async function workbookBytes(sheets: readonly SheetSpec[], meta: WorkbookMeta): Promise<Uint8Array> {
  const stream = new PassThrough();
  const chunks: Buffer[] = [];
  stream.on('data', (c: Buffer) => chunks.push(c));
  const wb = new ExcelJS.stream.xlsx.WorkbookWriter({ stream, useStyles: true, useSharedStrings: false });
  wb.creator = 'heathours';
  wb.title = meta.title;
  wb.created = meta.created;
  wb.modified = meta.created;
  for (const s of sheets) {
    const ws = wb.addWorksheet(sheetName(s.name), s.header ? { views: [{ state: 'frozen', ySplit: 1 }] } : {});
    const n = Math.max(s.header?.length ?? 0, ...s.rows.map((r) => r.length));
    ws.columns = Array.from({ length: n }, (_, i) => ({ width: s.widths?.[i] ?? Math.min(60, Math.max(10, (s.header?.[i]?.length ?? 8) + 2)) }));
    if (s.header) {
      const h = ws.addRow(s.header);
      h.font = { bold: true };
      h.commit();
    }
    for (const r of s.rows) ws.addRow(r.map((v) => (typeof v === 'number' && !Number.isFinite(v) ? null : v))).commit();
    ws.commit();
  }
  await wb.commit();
  const buf = Buffer.concat(chunks);
  return stampZipTimes(new Uint8Array(buf.buffer, buf.byteOffset, buf.byteLength), meta.created);
}

/**
 * Sets the modification time of every entry of a zip archive (the .xlsx container) to `when`, in
 * place, so the same workbook built twice is byte-identical (the zip writer stamps entries with
 * the clock). Zip layout after PKWARE's APPNOTE.TXT §4.3: the end of central directory record
 * (0x06054b50) gives the central directory; each central entry (0x02014b50) holds the DOS time and
 * date at bytes 12–15 and its local header's offset at 42; a local header (0x04034b50) holds them
 * at bytes 10–13. Throws a plain Error on a buffer that is not such an archive (a bug, not a user error).
 */
export function stampZipTimes(zip: Uint8Array, when: Date): Uint8Array {
  const dv = new DataView(zip.buffer, zip.byteOffset, zip.byteLength);
  let eocd = -1;
  for (let i = zip.length - 22; i >= Math.max(0, zip.length - 22 - 65535); i--) {
    if (dv.getUint32(i, true) === 0x06054b50) {
      eocd = i;
      break;
    }
  }
  if (eocd < 0) throw new Error('not a zip archive: no end of central directory record');
  const y = Math.min(2107, Math.max(1980, when.getUTCFullYear()));
  const date = ((y - 1980) << 9) | ((when.getUTCMonth() + 1) << 5) | when.getUTCDate();
  const time = (when.getUTCHours() << 11) | (when.getUTCMinutes() << 5) | Math.floor(when.getUTCSeconds() / 2);
  const n = dv.getUint16(eocd + 10, true);
  let p = dv.getUint32(eocd + 16, true);
  for (let k = 0; k < n; k++) {
    if (dv.getUint32(p, true) !== 0x02014b50) throw new Error(`zip central directory entry ${k} is damaged`);
    dv.setUint16(p + 12, time, true);
    dv.setUint16(p + 14, date, true);
    const local = dv.getUint32(p + 42, true);
    if (dv.getUint32(local, true) !== 0x04034b50) throw new Error(`zip local header of entry ${k} is damaged`);
    dv.setUint16(local + 10, time, true);
    dv.setUint16(local + 12, date, true);
    p += 46 + dv.getUint16(p + 28, true) + dv.getUint16(p + 30, true) + dv.getUint16(p + 32, true);
  }
  return zip;
}
