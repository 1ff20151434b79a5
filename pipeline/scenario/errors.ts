/**
 * Catalogued errors of the scenario stage: scenario definitions in the atlas configuration, and
 * change fields that cannot be put on the atlas grid or lie outside the physical range. Each
 * names the key, file, cell or month, and says what to do.
 */
import { defineError } from '../model/errors.ts';

export const ScenarioIdInvalid = defineError<{ id: string; why: string }>({
  code: 'ScenarioIdInvalid',
  title: 'A scenario id is not a slug',
  message: (p) => `scenario id "${p.id}" ${p.why}`,
  hint: () =>
    'use lower-case letters, digits and dashes, starting with a letter or digit (e.g. plus-2c); the id names the folder data/scenarios/<id>/ and the scenario in links',
});

export const ScenarioIdDuplicate = defineError<{ id: string }>({
  code: 'ScenarioIdDuplicate',
  title: 'Two scenarios have the same id',
  message: (p) => `the scenario id "${p.id}" is used twice`,
  hint: () => 'give every scenario its own id; the id names its folder of published files',
});

export const ScenarioChangeFileMissing = defineError<{ path: string; id: string }>({
  code: 'ScenarioChangeFileMissing',
  title: 'The change file of a scenario does not exist',
  message: (p) => `scenario "${p.id}": no change file at ${p.path}`,
  hint: () =>
    'check the path (relative to the atlas configuration); for the demo, `heathours demo-data --out data/demo` writes the invented change files into data/demo/scenarios/',
});

export const ChangeGridInvalid = defineError<{ file: string; detail: string }>({
  code: 'ChangeGridInvalid',
  title: 'The grid of a change file cannot be interpolated from',
  message: (p) => `${p.file}: ${p.detail}`,
  hint: () => 'give the change factors on a regular latitude-longitude grid of at least 2 × 2 points around the atlas',
});

export const ChangeGridNotCovering = defineError<{ file: string; lat: number; lon: number; extent: string }>({
  code: 'ChangeGridNotCovering',
  title: 'The grid of a change file does not cover the atlas',
  message: (p) =>
    `${p.file} does not cover the atlas cell at ${p.lat}° N, ${p.lon}° E: the file spans ${p.extent} (its outermost points and half a grid step beyond)`,
  hint: () =>
    'give a change file whose grid covers every land cell of the atlas (a global file, or a region at least half a grid step wider than the atlas on every side)',
});

export const ChangeValueMissing = defineError<{ file: string; variable: string; lat: number; lon: number; month: number }>({
  code: 'ChangeValueMissing',
  title: 'A change file has no value around an atlas cell',
  message: (p) => `${p.file}, ${p.variable}: none of the four grid points around the atlas cell at ${p.lat}° N, ${p.lon}° E has a value in month ${p.month}`,
  hint: () =>
    'the change file is missing (masked) around this land cell, e.g. a land-only file whose coast differs from the atlas; fill the missing points (cdo fillmiss) or use a file that covers the coast',
});

export const TemperatureChangeOutOfRange = defineError<{ file: string; value: number; lat: number; lon: number; month: number; limit: number }>({
  code: 'TemperatureChangeOutOfRange',
  title: 'A temperature change is not a plausible difference',
  message: (p) => `${p.file}: a temperature change of ${p.value} K at ${p.lat}° N, ${p.lon}° E in month ${p.month}; a change must lie within ±${p.limit} K`,
  hint: () =>
    'a change file holds differences (future minus baseline); values of 250–320 are absolute temperatures in K: subtract the baseline climatology first',
});

export const HumidityChangeOutOfRange = defineError<{ file: string; value: number; unit: string; range: string; lat: number; lon: number; month: number }>({
  code: 'HumidityChangeOutOfRange',
  title: 'A humidity change lies outside the physical range',
  message: (p) => `${p.file}: a humidity change of ${p.value} ${p.unit} at ${p.lat}° N, ${p.lon}° E in month ${p.month}; it must lie within ${p.range}`,
  hint: () =>
    'a relative-humidity change is in percentage points (−100 to +100); a specific-humidity change is relative, future/baseline − 1 (above −1: −0.05 = 5 % drier); check the units attribute (%, or 1 for a fraction)',
});

export const SolarChangeOutOfRange = defineError<{ file: string; value: number; lat: number; lon: number; month: number }>({
  code: 'SolarChangeOutOfRange',
  title: 'A solar radiation change lies outside the physical range',
  message: (p) =>
    `${p.file}: a relative change of solar radiation of ${p.value} at ${p.lat}° N, ${p.lon}° E in month ${p.month}; it must lie above −1 and at most +1`,
  hint: () => 'the solar change is relative, future/baseline − 1 (0.02 = 2 % more, units "1"; or in %); −1 would mean no sunlight at all',
});
