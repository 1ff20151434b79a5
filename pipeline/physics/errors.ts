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
  hint: () => 'every row needs as many fields as the header (leave a missing value empty: 1,,3); a text field holding a comma must be quoted',
});

export const PointBadValue = defineError<{ column: string; value: string; expected: string }>({
  code: 'PointBadValue',
  title: 'A cell of the point CSV is not a number',
  message: (p) => `${p.column} is "${p.value.length > 60 ? `${p.value.slice(0, 60)}…` : p.value}"; expected ${p.expected}`,
  hint: () =>
    'write numbers with a decimal point and no thousands separators (1013.25, -3.5, 1.2e3); leave a missing value empty (NA and NaN are read as missing too)',
});

export const PointBadTime = defineError<{ value: string; detail: string }>({
  code: 'PointBadTime',
  title: 'A time of the point CSV cannot be read',
  message: (p) => `time_utc "${p.value.length > 60 ? `${p.value.slice(0, 60)}…` : p.value}": ${p.detail}`,
  hint: () => 'write time_utc as ISO 8601 in UTC, the end of the averaging period: 2024-07-15T12:00Z (or 2024-07-15 12:00, read as UTC)',
});

export const PointTimeNotUtc = defineError<{ value: string; offset: string }>({
  code: 'PointTimeNotUtc',
  title: 'A time of the point CSV is not in UTC',
  message: (p) => `time_utc "${p.value}" carries the offset ${p.offset}, but the column holds UTC`,
  hint: () => 'convert the times to UTC (12:00+09:00 is 03:00Z) and write them with Z or without an offset',
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

export const PointOutputFailed = defineError<{ path: string; reason: string }>({
  code: 'PointOutputFailed',
  title: 'The point output file cannot be written',
  message: (p) => `writing ${p.path} failed: ${p.reason}`,
  hint: () => 'check that the folder of --out exists and can be written and that the disk has room; nothing was left behind',
});
