/** Catalogued errors of the demo stage (`heathours demo-data` and `writeDemoDataset`). */
import { defineError } from '../model/errors.ts';

export const DemoYearsInvalid = defineError<{ text: string }>({
  code: 'DemoYearsInvalid',
  title: 'The years of the demo data could not be read',
  message: (p) => `"${p.text}" is not a year, a range of years or a comma-separated list of years`,
  hint: () => 'write --years 2020-2024 (a range), --years 2025 (one year) or --years 2020,2022 (a list)',
});

export const DemoYearOutOfRange = defineError<{ year: number; first: number; last: number }>({
  code: 'DemoYearOutOfRange',
  title: 'A year of the demo data is outside the supported range',
  message: (p) => `year ${p.year} is outside ${p.first}–${p.last}, the years the solar-position formulas are documented for`,
  hint: (p) => `pick years between ${p.first} and ${p.last}, e.g. --years 2020-2024`,
});

export const DemoLayoutUnknown = defineError<{ layout: string }>({
  code: 'DemoLayoutUnknown',
  title: 'The file layout of the demo data is not known',
  message: (p) => `layout "${p.layout}" is not one of legacy, netcdf4, mixed`,
  hint: () => 'use --layout legacy (NetCDF-3, packed int16), --layout netcdf4 (NetCDF-4, float32) or --layout mixed (legacy up to 2022, NetCDF-4 after)',
});

export const DemoGridInvalid = defineError<{ grid: string }>({
  code: 'DemoGridInvalid',
  title: 'The grid of the demo data is not valid',
  message: (p) =>
    `grid ${p.grid} is neither "small", "default", "country" nor a size NLATxNLON@RESOLUTION (at most 1,000,000 cells, a resolution of at most 5°)`,
  hint: () =>
    'use --grid default (32 × 34 cells at 0.25°), --grid small (8 × 10 cells at 1°), --grid country (160 × 160 cells at 0.1°) or a size such as --grid 300x300@0.1',
});

export const DemoSeedInvalid = defineError<{ seed: string }>({
  code: 'DemoSeedInvalid',
  title: 'The random seed of the demo data is not an integer',
  message: (p) => `seed "${p.seed}" is not an integer between 0 and 2147483647`,
  hint: () => 'pass --seed with a whole number, e.g. --seed 7 (the same seed gives the same bytes)',
});

export const DemoOutputUnwritable = defineError<{ dir: string; reason: string }>({
  code: 'DemoOutputUnwritable',
  title: 'The output folder of the demo data cannot be written',
  message: (p) => `cannot write into ${p.dir}: ${p.reason}`,
  hint: () => 'pass --out with a folder you may write to (it is created if missing), e.g. --out data/demo',
});
