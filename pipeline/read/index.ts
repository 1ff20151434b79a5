/** The read stage's public API (barrel). */
export { inspectFile, type FileInspection, type VariableInspection, type TimeAxisInspection, type InspectionProblem } from './inspect.ts';
export {
  openDataset,
  hourIso,
  REQUIRED_FIELDS,
  type Dataset,
  type DatasetFileInfo,
  type OpenDatasetOptions,
  type SummaryChunkCache,
  type SummaryAccumulator,
  type SummaryPart,
  type SummaryChunk,
} from './dataset.ts';
export { detectFormat, formatFromMagic, type NetcdfFormat } from './format.ts';
export { parseTimeUnits, decodeTimes, encodeTimes, isoSeconds, type TimeCoding } from './cf-time.ts';
export { recognizeEra5, ERA5_ROLES, type Era5Role, type Era5Short } from './era5-variables.ts';
export { normalizeLatitude, normalizeLongitude, wrapLongitude } from './grid-normalize.ts';
export type { Layout } from './layout.ts';
