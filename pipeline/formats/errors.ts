/** Catalogued errors of the file formats shared by the stages (pipeline/formats). */
import { defineError } from '../model/errors.ts';

export const CsvMalformed = defineError<{ path: string; detail: string }>({
  code: 'CsvMalformed',
  title: 'A CSV file cannot be split into fields',
  message: (p) => `${p.path}: ${p.detail}`,
  hint: () =>
    'enclose a field that holds a comma, a quote or a line break in double quotes and write a quote inside it twice ("5"" pipe"); check the line for a quote opened and never closed (RFC 4180)',
});
