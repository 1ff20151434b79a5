/**
 * CSV (RFC 4180, https://www.rfc-editor.org/rfc/rfc4180): the one reader and writer of the
 * pipeline. Fields are separated by commas; a field holding a comma, a quote or a line break is
 * enclosed in double quotes, with a quote inside written twice.
 *
 * Reading (here the parser, pure, as the browser's estimate page also loads this file; the file
 * reader is csv-file.ts) goes record by record (memory bounded by one record, at most
 * {@link MAX_RECORD_CHARS}), tolerates what spreadsheets and other systems add (a UTF-8 byte
 * order mark, CRLF or CR line ends, blank lines), and refuses what would shift or merge values
 * with the catalogued `CsvMalformed`, naming the file and the line: a quote that is never
 * closed, text after a closing quote, a quote inside an unquoted field, a record too long to be
 * real. Writing quotes only what needs quoting.
 */
import { CsvMalformed } from './errors.ts';

/** Longest record the reader accepts [characters]: far beyond any real row, short of a whole file. */
export const MAX_RECORD_CHARS = 1 << 20;

/** One record: the line it starts on (1-based) and its fields. */
export type CsvRecord = [line: number, fields: string[]];

/**
 * Parses CSV text fed in pieces; `push` returns the records completed so far and `end` the last
 * one. Pure: the caller does the reading (csv-file.ts `readCsvRecords`).
 */
export class CsvParser {
  private fields: string[] = [];
  private field = '';
  /** 0 field start, 1 unquoted, 2 quoted, 3 a quote inside a quoted field. */
  private state = 0;
  private line = 1;
  private recordLine = 1;
  private recordChars = 0;
  private lastWasCr = false;
  private first = true;

  constructor(private readonly path: string) {}

  push(text: string): CsvRecord[] {
    const out: CsvRecord[] = [];
    let i = 0;
    if (this.first && text.length > 0) {
      this.first = false;
      if (text.charCodeAt(0) === 0xfeff) i = 1; // UTF-8 byte order mark
    }
    for (; i < text.length; i++) {
      const c = text.charCodeAt(i);
      // A CR LF pair is one line end: the LF after a CR that ended a record or a line is skipped.
      if (this.lastWasCr) {
        this.lastWasCr = false;
        if (c === 10) continue;
      }
      if (++this.recordChars > MAX_RECORD_CHARS) {
        this.fail(
          this.recordLine,
          `the record that starts on line ${this.recordLine} is longer than ${MAX_RECORD_CHARS} characters${this.state === 2 ? ' (a quote opened in it is never closed)' : ''}`,
        );
      }
      switch (this.state) {
        case 0:
          if (c === 34) this.state = 2;
          else if (c === 44) this.fields.push('');
          else if (c === 10 || c === 13) this.endRecord(out, c);
          else {
            this.field = text[i];
            this.state = 1;
          }
          break;
        case 1:
          if (c === 44) this.endField();
          else if (c === 10 || c === 13) this.endRecord(out, c);
          else if (c === 34) this.fail(this.line, `line ${this.line}, field ${this.fields.length + 1}: a quote inside an unquoted field`);
          else this.field += text[i];
          break;
        case 2:
          if (c === 34) this.state = 3;
          else if (c === 10 || c === 13) {
            this.newLine(c);
            this.field += '\n'; // a line break inside quotes, CR LF or CR alone, reads as LF
          } else this.field += text[i];
          break;
        default:
          if (c === 34) {
            this.field += '"';
            this.state = 2;
          } else if (c === 44) this.endField();
          else if (c === 10 || c === 13) this.endRecord(out, c);
          else this.fail(this.line, `line ${this.line}, field ${this.fields.length + 1}: text after the closing quote`);
      }
    }
    return out;
  }

  /** The last record (a file need not end with a line break). */
  end(): CsvRecord[] {
    if (this.state === 2) this.fail(this.recordLine, `a quoted field opened on line ${this.recordLine} is never closed`);
    const out: CsvRecord[] = [];
    if (this.state !== 0 || this.fields.length > 0) this.endRecord(out, 0);
    return out;
  }

  private fail(line: number, detail: string): never {
    throw CsvMalformed({ path: this.path, detail }, { file: this.path, row: line });
  }

  private newLine(c: number): void {
    this.line++;
    this.lastWasCr = c === 13;
  }

  private endField(): void {
    this.fields.push(this.field);
    this.field = '';
    this.state = 0;
  }

  private endRecord(out: CsvRecord[], c: number): void {
    this.fields.push(this.field);
    const blank = this.fields.length === 1 && this.fields[0].trim() === '';
    if (!blank) out.push([this.recordLine, this.fields]);
    this.fields = [];
    this.field = '';
    this.state = 0;
    this.recordChars = 0;
    if (c !== 0) this.newLine(c);
    this.recordLine = this.line;
  }
}

/** Quotes a field if it needs it; numbers are written as they print, non-finite ones empty. */
/**
 * The fields of one CSV record given as one text (no line end needed; a quoted field may hold
 * line breaks) [the record's fields], or null when a quote is left open. Catalogued CsvMalformed
 * for a stray quote. For whole files use {@link CsvParser} or csv-file.ts `readCsvRecords`.
 */
export function splitCsvRecord(text: string): string[] | null {
  const p = new CsvParser('(text)');
  try {
    const records = [...p.push(text), ...p.end()];
    if (records.length === 0) return [''];
    return records.length === 1 ? records[0][1] : null;
  } catch (e) {
    if (/never closed|quote opened/.test((e as Error).message)) return null;
    throw e;
  }
}

export function csvField(v: string | number | undefined | null): string {
  if (v === undefined || v === null) return '';
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : '';
  return /[",\r\n]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v;
}

/** One record, fields quoted as needed, ended by LF. */
export function csvLine(fields: ReadonlyArray<string | number | undefined | null>): string {
  return fields.map(csvField).join(',') + '\n';
}

/** Rounds to `digits` decimals and drops trailing zeros; NaN stays NaN (written empty). */
export function roundTo(v: number, digits: number): number {
  if (!Number.isFinite(v)) return NaN;
  const f = 10 ** digits;
  return Math.round(v * f) / f;
}
