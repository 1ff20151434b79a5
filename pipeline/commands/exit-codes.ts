/**
 * The exit status of `heathours`, by what went wrong (README "Exit status", `heathours --help`):
 * - 0: done;
 * - 1: internal error, a bug in heathours (printed with its stack; please report it);
 * - 2: usage or configuration: the command line, a configuration file (atlas.yaml, workload
 *   classes), or where and how the command was asked to run (output folder, lock, port);
 * - 3: input data: a NetCDF, CSV, GeoJSON, partial or published data file is missing, unreadable
 *   or inconsistent;
 * - 141: standard output or error was closed by the reader (`heathours errors | head`): the
 *   command stopped quietly, as a shell reports a process ended by SIGPIPE (128 + 13).
 * Every catalogued error is listed once below, as usage or as data; test/cli/exit-codes.test.ts
 * fails for a code that is in neither list.
 */

export const EXIT = { ok: 0, internal: 1, usage: 2, data: 3, closedPipe: 141 } as const;

/** Catalogued errors that exit with {@link EXIT.usage}. */
export const USAGE_ERRORS: readonly string[] = [
  'UsageError', 'ShardSliceInvalid', 'MergeSliceInvalid', 'BuildLocked', 'ZipMemberCacheUnwritable',
  'MemoryBudgetTooSmall', 'MemoryBudgetInvalid', 'DiskFull',
  'ConfigNotFound', 'ConfigSyntax', 'ConfigInvalid', 'ConfigInputMissing', 'ConfigRegionsMissing', 'ConfigWorkforceFileMissing',
  'NetcdfNoFiles', 'YearsOutsideData', 'NoLandCells',
  'DemoYearsInvalid', 'DemoYearOutOfRange', 'DemoLayoutUnknown', 'DemoGridInvalid', 'DemoSeedInvalid', 'DemoOutputUnwritable',
  'PointClassesNotFound', 'PointClassesSyntax', 'PointOptionInvalid',
  'WorkloadClassesFileMissing', 'WorkloadClassesInvalid', 'WorkloadClassDuplicate', 'WorkloadClassUnknown',
  'MetabolicRateOutOfRange', 'RestRateNotBelowWork', 'WorkSettingsInvalid', 'WorkShiftInvalid', 'WorkWeekdayUnknown',
  'WorkTimeZoneUnknown', 'ClothingEnsembleUnknown', 'ClothingAdjustmentOutOfRange', 'WorkParameterInvalid', 'LimitOutsideHistogram',
  'ClimateBadPeriod', 'ClimateBadRule', 'ClimatePeriodNotInStack', 'ClimateProbabilityOutOfRange',
  'LayerRampUnknown', 'LayerClassesInvalid', 'LayerDomainInvalid', 'LayerNoDataValueInvalid', 'LayerCategoriesInvalid',
  'PreviewDirMissing', 'PreviewPortBusy', 'SiteOutputUnwritable', 'SiteDataDirUnset',
  'EstimateNumberInvalid', 'EstimateChoiceUnknown', 'EstimateMonthsEmpty', 'EstimatePeriodInvalid', 'EstimateRegionUnknown',
  'EstimateCellInvalid', 'EstimatePointOutsideGrid', 'EstimateAtlasNotFound', 'EstimateScenarioUnknown',
  'ScheduleDateInvalid', 'ScheduleNumberInvalid', 'ScheduleShiftInvalid', 'ScheduleDaysInvalid', 'ScheduleHolidayInvalid',
  'ScheduleTooManyPatterns', 'ScheduleNotFinished', 'ScheduleDeadlineUnreachable',
  'EstimateCellInvalid', 'EstimatePointOutsideGrid',
  'ScenarioIdInvalid', 'ScenarioIdDuplicate', 'ScenarioChangeFileMissing',
  'CsvMalformed', 'PointBadTime', 'PointBadValue', 'PointTimeNotUtc', 'PointOutputFailed',
];

/** Catalogued errors that exit with {@link EXIT.data}. */
export const DATA_ERRORS: readonly string[] = [
  'NetcdfFileNotFound', 'NetcdfFileEmpty', 'NetcdfFileTruncated', 'NetcdfUnknownFormat', 'NetcdfCdf5Unsupported', 'NetcdfGribFile',
  'NetcdfNotNetcdf4', 'NetcdfHeaderInvalid', 'NetcdfTimeUnits', 'NetcdfCalendarUnsupported', 'NetcdfTimeNotHourly', 'NetcdfNoTimeAxis',
  'NetcdfUnitUnknown', 'NetcdfUnitImplausible', 'MissingNetcdfVariable', 'NetcdfGridMismatch', 'NetcdfGridUnsupported',
  'NetcdfDimensionUnsupported', 'NetcdfTimeGap', 'NetcdfDuplicateHours', 'NetcdfBlockOutOfRange', 'NetcdfReadFailed',
  'ZipArchiveUnreadable', 'ZipArchiveEmpty', 'ZipMemberNotNetcdf', 'ZipMemberUnsupported', 'ZipMemberDamaged', 'InputsIncomplete',
  'PartialsIncomplete', 'PartialsInconsistent', 'PartialCorrupt', 'PartialFormatUnknown', 'PartialsDuplicated', 'PartialsForeign',
  'BandsIncomplete', 'BandsDuplicated', 'BandsForeign',
  'EstimateAtlasInvalid', 'ScheduleNoWeatherYears',
  'PointInputNotFound', 'PointMissingColumn', 'PointBadRow',
  'PointTileCountTooLarge', 'PointTileCorrupt', 'PointTileYearsIncomplete', 'PointTileCellsMismatch',
  'RegionNotGeoJson', 'RegionNoFeatures', 'RegionWrongGeometry', 'RegionMissingId', 'RegionBadId', 'RegionMissingName',
  'RegionDuplicateId', 'RegionRingTooShort', 'RegionRingNotClosed', 'RegionBadPosition', 'RegionCoordinateOutOfRange',
  'RegionRingDegenerate', 'RegionSelfIntersecting', 'RegionHoleOutside', 'RegionAroundPole', 'RegionOutsideGrid',
  'RegionNoLandCells', 'RegionGridInvalid', 'RegionFieldShape',
  'ClimateShapeMismatch', 'ClimateYearsNotAscending', 'ClimateBadHourCounts',
  'WbgtHistogramInvalid', 'CellTileInvalid', 'CellOutsideGrid', 'CellFigureMissing',
  'LayerGridEmpty', 'LayerValuesLength', 'LayerGridIrregular', 'LayerCoordinateInvalid', 'LayerNoData',
  'SiteDataMissing', 'SiteDataUnreadable', 'SiteDataInvalid', 'SiteBuildFailed',
  'EstimateDataUnavailable', 'EstimateYearsMismatch', 'EstimateAtlasInvalid', 'ScheduleNoWeatherYears',
  'WorkforceRasterUnreadable', 'WorkforceRasterBands', 'WorkforceRasterCrs', 'WorkforceRasterGeoreference', 'WorkforceCountInvalid',
  'WorkforceRasterNotCovering', 'WorkforceSharesColumns', 'WorkforceSharesEmpty', 'WorkforceSharesBadValue', 'WorkforceSharesDuplicate',
  'WorkforceSharesRegionUnknown', 'WorkforceSharesClassUnknown', 'WorkforceSharesSum', 'WorkforceSharesMissing', 'WorkforceSharesEvaluation',
  'EstimateDataUnavailable', 'EstimateYearsMismatch',
  'ChangeFileNoTemperature', 'ChangeFileNotMonthly', 'ChangeFileHumidityMismatch', 'ChangeFileNotADifference',
  'ChangeGridInvalid', 'ChangeGridNotCovering', 'ChangeValueMissing',
  'TemperatureChangeOutOfRange', 'HumidityChangeOutOfRange', 'SolarChangeOutOfRange',
  'NetcdfDataUnreadable', 'NetcdfReadStuck', 'NetcdfTimeValueInvalid', 'NetcdfChunkDamaged',
  'ZarrStoreUnreachable', 'ZarrStoreUnlisted', 'ZarrMetadataInvalid', 'ZarrGridMismatch', 'ZarrChunkUnreadable',
];

const USAGE = new Set(USAGE_ERRORS);

/** Exit status of a catalogued error (a code missing from both lists counts as input data). */
export function exitCodeOf(code: string): number {
  return USAGE.has(code) ? EXIT.usage : EXIT.data;
}

/** The exit status table as `heathours --help` and `heathours errors` print it. */
export const EXIT_STATUS_HELP = `Exit status:
  0    done
  1    internal error: a bug in heathours (please report it with the command you ran)
  2    usage or configuration: a wrong option or argument, an invalid configuration file,
       an output folder, lock or port that cannot be used
  3    input data: a NetCDF, CSV, GeoJSON, partial or data file is missing, unreadable or inconsistent
  141  the reader closed standard output (e.g. \`heathours errors | head\`): stopped quietly`;
