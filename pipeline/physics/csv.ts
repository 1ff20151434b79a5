/**
 * A small streaming CSV reader and writer: RFC 4180 quoting (quoted fields with commas, quotes
 * doubled, line breaks inside quotes), CRLF or LF line ends. Rows are yielded one at a time so
 * large files are never held in memory.
 */
import { createReadStream } from 'node:fs';
import { createInterface } from 'node:readline';
import { PointBadRow } from './errors.ts';

/** Splits one record's text into fields; returns null if a quote is still open. */
export function splitCsvRecord(text: string): string[] | null {
  const out: string[] = [];
  let field = '';
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const ch = text[i];
    if (quoted) {
      if (ch === '"') {
        if (text[i + 1] === '"') {
          field += '"';
          i++;
        } else quoted = false;
      } else field += ch;
    } else if (ch === '"') quoted = true;
    else if (ch === ',') {
      out.push(field);
      field = '';
    } else field += ch;
  }
  if (quoted) return null;
  out.push(field);
  return out;
}

/**
 * Yields [lineNumber (1-based, of the record's first line), fields] for every record of a file,
 * or of a stream (`input`, e.g. standard input; `path` then only names it in errors).
 */
export async function* readCsvRecords(path: string, input?: NodeJS.ReadableStream): AsyncGenerator<[number, string[]]> {
  const rl = createInterface({ input: input ?? createReadStream(path, { encoding: 'utf8' }), crlfDelay: Infinity });
  let pending = '';
  let startLine = 0;
  let line = 0;
  for await (const raw of rl) {
    line++;
    const text = raw.endsWith('\r') ? raw.slice(0, -1) : raw;
    if (pending === '') startLine = line;
    const joined = pending === '' ? text : `${pending}\n${text}`;
    const fields = splitCsvRecord(joined);
    if (fields === null) {
      pending = joined;
      continue;
    }
    pending = '';
    if (joined.trim() === '') continue;
    yield [startLine, fields];
  }
  if (pending !== '') throw PointBadRow({ detail: `a quoted field opened on line ${startLine} is never closed` }, { file: path, row: startLine });
}

/** Quotes a field if it needs it. */
export function csvField(v: string): string {
  return /[",\r\n]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v;
}
