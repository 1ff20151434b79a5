/**
 * A small RFC 4180 CSV reader for the tables the pipeline publishes (pipeline/formats/csv.ts
 * writes them): comma-separated, fields with a comma, quote or line break in double quotes, `""`
 * for a quote inside one, LF or CRLF line ends. Pure.
 */

/** Splits CSV text into rows of fields; a final line break adds no empty row. */
export function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let field = '';
  let i = 0;
  const n = text.length;
  let quoted = false;
  while (i < n) {
    const ch = text.charCodeAt(i);
    if (quoted) {
      if (ch === 34 /* " */) {
        if (text.charCodeAt(i + 1) === 34) {
          field += '"';
          i += 2;
          continue;
        }
        quoted = false;
        i++;
        continue;
      }
      field += text[i++];
      continue;
    }
    if (ch === 34 && field === '') {
      quoted = true;
      i++;
    } else if (ch === 44 /* , */) {
      row.push(field);
      field = '';
      i++;
    } else if (ch === 10 /* \n */ || ch === 13 /* \r */) {
      row.push(field);
      rows.push(row);
      row = [];
      field = '';
      i += ch === 13 && text.charCodeAt(i + 1) === 10 ? 2 : 1;
    } else {
      // Fast path: copy up to the next special character.
      let j = i + 1;
      while (j < n) {
        const c = text.charCodeAt(j);
        if (c === 44 || c === 10 || c === 13 || c === 34) break;
        j++;
      }
      field += text.slice(i, j);
      i = j;
    }
  }
  if (quoted) throw new SyntaxError('a quoted field is not closed before the end of the file');
  if (field !== '' || row.length > 0) {
    row.push(field);
    rows.push(row);
  }
  return rows;
}
