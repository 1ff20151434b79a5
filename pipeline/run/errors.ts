/** Catalogued errors of the build orchestration. */
import { defineError } from '../model/errors.ts';

export const YearsOutsideData = defineError<{ key: string; first: number; last: number; dataFirst: string; dataLast: string }>({
  code: 'YearsOutsideData',
  title: 'Configured years are not covered by the input data',
  message: (p) => `${p.key} ${p.first}-${p.last} asks for years the data do not hold (the data run from ${p.dataFirst} to ${p.dataLast}, UTC)`,
  hint: () => 'add the missing years of input files (dataset.files), or narrow `years` / `baseline` in the configuration',
});

export const NoLandCells = defineError<{ detail: string }>({
  code: 'NoLandCells',
  title: 'No grid cell is left to compute',
  message: (p) => p.detail,
  hint: () => 'lower dataset.landSeaMask.threshold, or remove landSeaMask when the inputs are land-only (ERA5-Land)',
});

export const WorkloadClassesFileMissing = defineError<{ path: string }>({
  code: 'WorkloadClassesFileMissing',
  title: 'The workload-classes file does not exist',
  message: (p) => `no workload-classes file at ${p.path}`,
  hint: () => 'set work.classesFile (relative to the atlas configuration) or copy content/workload-classes.yaml beside it',
});
