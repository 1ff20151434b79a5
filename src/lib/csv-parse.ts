/**
 * Parses CSV text (RFC 4180: comma-separated, fields with a comma, quote or line break in double
 * quotes, `""` for a quote inside) into rows of strings. Used at build time to read the
 * pipeline's tables; the writer is pipeline/formats/csv.ts.
 */

/** All records of `text`, the header included; a final line break ends the last record. */
export function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let field = '';
  let quoted = false;
  let i = 0;
  const n = text.length;
  while (i < n) {
    const ch = text[i];
    if (quoted) {
      if (ch === '"') {
        if (text[i + 1] === '"') {
          field += '"';
          i += 2;
          continue;
        }
        quoted = false;
      } else field += ch;
      i += 1;
      continue;
    }
    if (ch === '"' && field === '') quoted = true;
    else if (ch === ',') {
      row.push(field);
      field = '';
    } else if (ch === '\n' || ch === '\r') {
      row.push(field);
      rows.push(row);
      row = [];
      field = '';
      if (ch === '\r' && text[i + 1] === '\n') i += 1;
    } else field += ch;
    i += 1;
  }
  if (field !== '' || row.length > 0) {
    row.push(field);
    rows.push(row);
  }
  return rows;
}

/** Records as objects keyed by the header's names. */
export function parseCsvObjects(text: string): Array<Record<string, string>> {
  const [head, ...rows] = parseCsv(text);
  if (!head) return [];
  return rows.map((r) => Object.fromEntries(head.map((h, k) => [h, r[k] ?? ''])));
}
