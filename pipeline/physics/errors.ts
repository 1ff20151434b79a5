/** Catalogued errors of the physics stage (the `point` command's input file). */
import { defineError } from '../model/errors.ts';

export const PointInputNotFound = defineError<{ path: string }>({
  code: 'PointInputNotFound',
  title: 'The point CSV file does not exist',
  message: (p) => `no file at ${p.path}`,
  hint: () => 'pass --in with the path of a CSV file with one row per hour (columns: see README, "point CSV columns")',
});

export const PointMissingColumn = defineError<{ column: string; present: string[] }>({
  code: 'PointMissingColumn',
  title: 'The point CSV lacks a required column',
  message: (p) => `required column "${p.column}" is missing (header has: ${p.present.join(', ') || 'nothing'})`,
  hint: (p) =>
    p.column === 'rh_pct or td_c'
      ? 'add a relative humidity column rh_pct [%] or a dew point column td_c [°C]'
      : `add a column named exactly "${p.column}" to the header row`,
});

export const PointBadRow = defineError<{ detail: string }>({
  code: 'PointBadRow',
  title: 'A row of the point CSV cannot be read',
  message: (p) => p.detail,
  hint: () => 'check the row for an unclosed quote or a wrong number of fields',
});

export const PointClassesNotFound = defineError<{ path: string }>({
  code: 'PointClassesNotFound',
  title: 'The workload-classes file for `point` does not exist',
  message: (p) => `no workload-classes file at ${p.path}`,
  hint: () => 'pass --classes with the path of a YAML file shaped like content/workload-classes.yaml, or leave it out for the default classes',
});

export const PointClassesSyntax = defineError<{ detail: string }>({
  code: 'PointClassesSyntax',
  title: 'The workload-classes file for `point` is not valid YAML',
  message: (p) => p.detail,
  hint: () => 'fix the YAML syntax at the line shown (indentation with spaces, a colon after each key)',
});

export const PointOptionInvalid = defineError<{ option: string; value: string; expected: string }>({
  code: 'PointOptionInvalid',
  title: 'An option of `point` has an invalid value',
  message: (p) => `${p.option} is "${p.value}"; expected ${p.expected}`,
  hint: (p) =>
    p.option === '--cav'
      ? 'give the clothing adjustment value in °C-WBGT, e.g. --cav 2 (0 for work clothes)'
      : p.option === '--globe-diameter'
        ? 'give the diameter in metres, e.g. --globe-diameter 0.15 for the 150 mm standard globe'
        : 'see `heathours point --help`',
});
