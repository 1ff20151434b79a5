/**
 * Catalogued errors of the read stage: files that are not (supported) NetCDF, CF attributes we
 * cannot decode, units we cannot trust, and multi-file datasets that do not fit together. Every
 * error names the file (and the variable where there is one) and says what to do.
 */
import { defineError } from '../model/errors.ts';

export const NetcdfFileNotFound = defineError<{ path: string }>({
  code: 'NetcdfFileNotFound',
  title: 'An input file does not exist',
  message: (p) => `no file at ${p.path}`,
  hint: () => 'check the path (and the glob patterns of dataset.files, or the folders of dataset.zarr, in the configuration)',
});

export const NetcdfNoFiles = defineError<Record<string, never>>({
  code: 'NetcdfNoFiles',
  title: 'A dataset was opened without any file',
  message: () => 'the list of input files is empty',
  hint: () => 'name at least one NetCDF file (dataset.files in the configuration)',
});

export const NetcdfFileEmpty = defineError<{ path: string }>({
  code: 'NetcdfFileEmpty',
  title: 'An input file is empty',
  message: (p) => `${p.path} has 0 bytes`,
  hint: () => 'the download or copy probably failed; fetch the file again',
});

export const NetcdfFileTruncated = defineError<{ path: string; bytes: number; expected: number | null; detail: string }>({
  code: 'NetcdfFileTruncated',
  title: 'An input file is cut short',
  message: (p) => `${p.path} has ${p.bytes} bytes` + (p.expected !== null ? ` but its header says it needs at least ${p.expected}` : '') + ` (${p.detail})`,
  hint: () => 'the download or copy was interrupted; fetch the file again and compare its size or checksum',
});

export const NetcdfUnknownFormat = defineError<{ path: string; magic: string }>({
  code: 'NetcdfUnknownFormat',
  title: 'An input file is not a NetCDF file',
  message: (p) => `${p.path} starts with bytes ${p.magic}, which is neither NetCDF-3 (CDF\\x01, CDF\\x02) nor NetCDF-4 (\\x89HDF)`,
  hint: () => 'give a NetCDF file (.nc); `file NAME` or `ncdump -k NAME` tells what it is',
});

export const NetcdfCdf5Unsupported = defineError<{ path: string }>({
  code: 'NetcdfCdf5Unsupported',
  title: 'CDF-5 (64-bit data) NetCDF files are not supported',
  message: (p) => `${p.path} is a CDF-5 file (magic CDF\\x05), which the reader cannot read`,
  hint: (p) => `convert it to NetCDF-4 with the NetCDF tools: nccopy -k nc4 ${p.path} out.nc`,
});

export const NetcdfGribFile = defineError<{ path: string }>({
  code: 'NetcdfGribFile',
  title: 'An input file is GRIB, not NetCDF',
  message: (p) => `${p.path} is a GRIB file (magic GRIB)`,
  hint: (p) => `convert it to NetCDF first: grib_to_netcdf -o out.nc ${p.path} (ecCodes), or cdo -f nc4 copy ${p.path} out.nc`,
});

export const NetcdfNotNetcdf4 = defineError<{ path: string }>({
  code: 'NetcdfNotNetcdf4',
  title: 'An HDF5 file is not a NetCDF-4 file',
  message: (p) => `${p.path} is HDF5 but carries neither dimension scales nor netCDF attributes, so its dimensions cannot be known`,
  hint: () => 'write the file with a NetCDF library (netCDF4, xarray, nccopy -k nc4), or give the dimensions as HDF5 dimension scales',
});

export const NetcdfHeaderInvalid = defineError<{ path: string; detail: string }>({
  code: 'NetcdfHeaderInvalid',
  title: 'The header of a NetCDF file cannot be read',
  message: (p) => `${p.path}: ${p.detail}`,
  hint: () => 'check the file with `ncdump -h`; if that fails too the file is damaged and must be fetched again',
});

export const NetcdfTimeUnits = defineError<{ units: string; detail: string }>({
  code: 'NetcdfTimeUnits',
  title: 'The time units of a variable cannot be decoded',
  message: (p) => `time units "${p.units}": ${p.detail}`,
  hint: () => 'time units must read "<seconds|minutes|hours|days> since YYYY-MM-DD[ hh:mm:ss[.f]][ Z|+hh:mm]" (CF conventions §4.4)',
});

export const NetcdfTimeValueInvalid = defineError<{ index: number; value: string; detail: string }>({
  code: 'NetcdfTimeValueInvalid',
  title: 'A value of a time axis is not a date',
  message: (p) => `time value ${p.value} (step ${p.index + 1}): ${p.detail}`,
  hint: () => 'the time coordinate is damaged or holds missing values; fetch the file again, or check it with `ncdump -v time FILE`',
});

export const NetcdfCalendarUnsupported = defineError<{ calendar: string; detail: string }>({
  code: 'NetcdfCalendarUnsupported',
  title: 'The calendar of a time axis is not supported',
  message: (p) => `calendar "${p.calendar}": ${p.detail}`,
  hint: () =>
    'supported calendars: standard / gregorian (for dates from 1582-10-15 on) and proleptic_gregorian; reanalysis files use these. Convert model calendars (noleap, 360_day, julian) with cdo setcalendar or regrid in time first',
});

export const NetcdfTimeNotHourly = defineError<{ detail: string }>({
  code: 'NetcdfTimeNotHourly',
  title: 'A time axis is not on whole hours',
  message: (p) => p.detail,
  hint: () => 'the atlas needs hourly data stamped on the hour (ERA5 / ERA5-Land hourly); monthly or daily means cannot be used',
});

export const NetcdfNoTimeAxis = defineError<{ detail: string }>({
  code: 'NetcdfNoTimeAxis',
  title: 'A file has no time axis that can be decoded',
  message: (p) => p.detail,
  hint: () => 'the file needs a time coordinate (time or valid_time) with CF units such as "hours since 1900-01-01"',
});

export const NetcdfUnitUnknown = defineError<{ units: string; expected: string }>({
  code: 'NetcdfUnitUnknown',
  title: 'A variable has units the reader does not know',
  message: (p) => `units "${p.units}" are not one of the units accepted for this quantity (${p.expected})`,
  hint: () => 'fix the units attribute (ncatted -a units,VAR,o,c,"K" file.nc) or convert the variable to one of the accepted units',
});

export const NetcdfUnitImplausible = defineError<{ units: string; min: number; max: number; detail: string }>({
  code: 'NetcdfUnitImplausible',
  title: 'The values of a variable do not fit its units',
  message: (p) => `units say "${p.units}" but the values run from ${p.min} to ${p.max}: ${p.detail}`,
  hint: () => 'the units attribute is probably wrong; correct it (ncatted -a units,VAR,o,c,"K" file.nc) after checking the values with ncdump',
});

export const MissingNetcdfVariable = defineError<{ name: string; detail: string }>({
  code: 'MissingNetcdfVariable',
  title: 'A required variable is missing from the dataset',
  message: (p) => `no ${p.name}: ${p.detail}`,
  hint: () =>
    'request the variable from the data store for every month in the dataset (ERA5 short names t2m, d2m, sp, u10, v10, ssrd, optional fdir, strd, lsm)',
});

export const NetcdfGridMismatch = defineError<{ fileA: string; fileB: string; detail: string }>({
  code: 'NetcdfGridMismatch',
  title: 'The files of a dataset are on different grids',
  message: (p) => `${p.fileA} and ${p.fileB} differ: ${p.detail}`,
  hint: () => 'request every file with the same area and grid resolution, or regrid them to one grid (cdo remapbil) before building',
});

export const NetcdfGridUnsupported = defineError<{ detail: string }>({
  code: 'NetcdfGridUnsupported',
  title: 'A grid the reader cannot use',
  message: (p) => p.detail,
  hint: () => 'the reader needs a regular latitude/longitude grid with 1-D, strictly monotonic latitude and longitude coordinates',
});

export const NetcdfDimensionUnsupported = defineError<{ detail: string }>({
  code: 'NetcdfDimensionUnsupported',
  title: 'A variable has dimensions the reader cannot use',
  message: (p) => p.detail,
  hint: () =>
    'dimensions other than time, latitude, longitude (and expver) must have length 1; select one member/level first (cdo sellevel, ncks -d number,0) and keep latitude, longitude as the last two dimensions (ncpdq -a time,latitude,longitude)',
});

export const NetcdfTimeGap = defineError<{ from: string; to: string; where: string }>({
  code: 'NetcdfTimeGap',
  title: 'The hourly time axis of the dataset has a gap',
  message: (p) => `no data for the hours ${p.from} to ${p.to} (end of hour, UTC), ${p.where}`,
  hint: () =>
    'add the file(s) for the missing months, or restrict the configuration to years without gaps; a gap inside one file means a time value of it is damaged (fetch it again)',
});

export const NetcdfDuplicateHours = defineError<{ variable: string; hour: string; fileA: string; fileB: string }>({
  code: 'NetcdfDuplicateHours',
  title: 'The same hour appears twice in the dataset',
  message: (p) => `${p.variable} at ${p.hour} is in ${p.fileA} and again in ${p.fileB}`,
  hint: () => 'remove the duplicated file (the same month downloaded twice?) from the input list',
});

export const NetcdfBlockOutOfRange = defineError<{ detail: string }>({
  code: 'NetcdfBlockOutOfRange',
  title: 'A block was requested outside the dataset',
  message: (p) => p.detail,
  hint: () => 'ask for hours in [0, time.count) and a tile inside the grid',
});

export const NetcdfReadFailed = defineError<{ path: string; detail: string }>({
  code: 'NetcdfReadFailed',
  title: 'Reading data from a NetCDF file failed',
  message: (p) => `${p.path}: ${p.detail}`,
  hint: () => 'check the file with `ncdump -v VAR FILE`; a damaged file must be fetched again',
});

export const NetcdfReadStuck = defineError<{ path: string; what: string; seconds: number; again?: boolean }>({
  code: 'NetcdfReadStuck',
  title: 'Reading a NetCDF-4 file did not finish',
  message: (p) =>
    p.again
      ? `${p.path}: ${p.what} did not finish within ${p.seconds} s earlier in this run, and the file has not changed since; the HDF5 library loops on damaged metadata of this file`
      : `${p.path}: ${p.what} did not finish within ${p.seconds} s; the HDF5 library loops on damaged metadata of this file`,
  hint: () => "the file is damaged: fetch it again and compare its size or checksum with the source (netCDF-C's ncdump loops on such a file too)",
});

export const NetcdfDataUnreadable = defineError<{ path: string; variable: string; from: string; to: string; detail: string }>({
  code: 'NetcdfDataUnreadable',
  title: 'Values of a NetCDF file cannot be read',
  message: (p) => `${p.path}: ${p.variable} for the hours ${p.from} to ${p.to} (end of hour, UTC) cannot be read: ${p.detail}`,
  hint: () =>
    'the file is damaged in its data (a compressed chunk does not inflate, or its index points nowhere): fetch it again; `ncdump -v VAR FILE` stops at the same place',
});

/** The one GDAL command that reprojects a count raster to EPSG:4326 while keeping its totals (shown in hints). */
export const REPROJECT_COMMAND = 'gdalwarp -t_srs EPSG:4326 -r sum -tr D D IN.tif OUT.tif';

export const WorkforceRasterUnreadable = defineError<{ path: string; detail: string }>({
  code: 'WorkforceRasterUnreadable',
  title: 'The workforce raster cannot be read as a GeoTIFF',
  message: (p) => `${p.path}: ${p.detail}`,
  hint: () =>
    'check that workforce.raster is a GeoTIFF (gdalinfo shows its driver and size) and that it was copied whole; compressed files are fine (DEFLATE, LZW, ZSTD)',
});

export const WorkforceRasterBands = defineError<{ path: string; bands: number }>({
  code: 'WorkforceRasterBands',
  title: 'The workforce raster has more than one band',
  message: (p) => `${p.path} has ${p.bands} bands; a people raster has one band of counts per pixel`,
  hint: () => 'write the band of people alone: gdal_translate -b N IN.tif OUT.tif (N the band number gdalinfo lists), and point workforce.raster at OUT.tif',
});

export const WorkforceRasterCrs = defineError<{ path: string; crs: string }>({
  code: 'WorkforceRasterCrs',
  title: 'The workforce raster is not in EPSG:4326 (longitude and latitude, WGS 84)',
  message: (p) => `${p.path} is in ${p.crs}; heathours aggregates people rasters in EPSG:4326 only`,
  hint: () =>
    `reproject it first, keeping the counts: ${REPROJECT_COMMAND} (D a pixel size in degrees no finer than the source's, e.g. 0.008333 for a 1 km raster), ` +
    'then check that gdalinfo -stats gives about the same total, and point workforce.raster at OUT.tif',
});

export const WorkforceRasterGeoreference = defineError<{ path: string; detail: string }>({
  code: 'WorkforceRasterGeoreference',
  title: 'The workforce raster has no usable north-up georeference',
  message: (p) => `${p.path}: ${p.detail}`,
  hint: () => `heathours needs an unrotated longitude/latitude raster; write a north-up copy with ${REPROJECT_COMMAND}`,
});

export const ChangeFileNoTemperature = defineError<{ path: string; variables: string[] }>({
  code: 'ChangeFileNoTemperature',
  title: 'A change file has no temperature change',
  message: (p) => `${p.path} holds no variable named tas or with standard_name air_temperature (it holds: ${p.variables.join(', ') || 'no variable'})`,
  hint: () =>
    'a scenario change file needs the monthly change of near-surface air temperature as `tas` (or standard_name air_temperature), a difference in K or degC on (time or month, lat, lon); rename it with ncrename -v OLD,tas',
});

export const ChangeFileNotMonthly = defineError<{ path: string; variable: string; detail: string }>({
  code: 'ChangeFileNotMonthly',
  title: 'A change file does not hold one change per calendar month',
  message: (p) => `${p.path}, ${p.variable}: ${p.detail}`,
  hint: () =>
    'give 12 monthly changes, January to December in any order, along a time axis whose CF time coordinate falls in each month once (as cdo ymonmean writes) or a `month` coordinate holding 1…12',
});

export const ChangeFileHumidityMismatch = defineError<{ path: string; want: string; found: string }>({
  code: 'ChangeFileHumidityMismatch',
  title: 'The humidity change of a change file is not of the kind the scenario names',
  message: (p) => `the scenario says humidity: ${p.want}, but ${p.path} holds ${p.found}`,
  hint: () =>
    'set `humidity: relative` for a change of relative humidity in percentage points (hurs) or `humidity: specific` for a relative change of specific humidity (huss), whichever the file holds',
});

export const ChangeFileNotADifference = defineError<{ path: string; variable: string; detail: string }>({
  code: 'ChangeFileNotADifference',
  title: 'A change file holds temperatures, not temperature changes',
  message: (p) => `${p.path}, ${p.variable}: ${p.detail}`,
  hint: () =>
    'a change file holds differences (the future minus the baseline, e.g. +1.8 K); subtract the baseline climatology first (cdo sub future.nc baseline.nc) and mark it with units_metadata = "temperature: difference"',
});

export const ZipArchiveUnreadable = defineError<{ path: string; detail: string }>({
  code: 'ZipArchiveUnreadable',
  title: 'A ZIP archive cannot be read',
  message: (p) => `${p.path} is not a readable ZIP archive: ${p.detail}`,
  hint: () =>
    'the download was probably interrupted (a ZIP keeps its table of contents at the very end); fetch the archive again and compare its size, or test it with `unzip -t`',
});

export const ZipArchiveEmpty = defineError<{ path: string }>({
  code: 'ZipArchiveEmpty',
  title: 'A ZIP archive holds no files',
  message: (p) => `${p.path} holds no file members (only folders, or nothing)`,
  hint: () => 'fetch the request again; the data store sends an archive with one NetCDF file per stream',
});

export const ZipMemberNotNetcdf = defineError<{ path: string; member: string; magic: string }>({
  code: 'ZipMemberNotNetcdf',
  title: 'A file inside a ZIP archive is not NetCDF',
  message: (p) => `member ${p.member} of ${p.path} starts with bytes ${p.magic}, which is neither NetCDF-3 (CDF\\x01, CDF\\x02) nor NetCDF-4 (\\x89HDF)`,
  hint: () => 'request NetCDF from the data store (data_format netcdf), or unzip the archive and list only its NetCDF files in dataset.files',
});

export const ZipMemberUnsupported = defineError<{ path: string; member: string; detail: string }>({
  code: 'ZipMemberUnsupported',
  title: 'A file inside a ZIP archive is stored in a way heathours does not read',
  message: (p) => `member ${p.member} of ${p.path}: ${p.detail}`,
  hint: () => 'unzip the archive with a tool that handles it (`unzip`, `7z x`) and list the NetCDF files in dataset.files instead of the archive',
});

export const ZipMemberDamaged = defineError<{ path: string; member: string; detail: string }>({
  code: 'ZipMemberDamaged',
  title: 'A file inside a ZIP archive is damaged',
  message: (p) => `member ${p.member} of ${p.path} is damaged: ${p.detail}`,
  hint: () => 'fetch the archive again (`unzip -t` shows which members fail their CRC-32 check)',
});

export const ZipMemberCacheUnwritable = defineError<{ dir: string; member: string; detail: string }>({
  code: 'ZipMemberCacheUnwritable',
  title: 'A compressed member of a ZIP archive could not be unpacked into the cache',
  message: (p) => `unpacking ${p.member} into ${p.dir} failed: ${p.detail}`,
  hint: () => 'free disk space in the cache folder (config `cache`), or store the archive without compression (`zip -0`), whose members are read in place',
});

export const InputsIncomplete = defineError<{ years: string; problems: string[]; rule: string }>({
  code: 'InputsIncomplete',
  title: 'The input files do not cover the years the atlas builds',
  message: (p) => `the coverage check of the input files found, for the years ${p.years} (${p.rule}):\n${p.problems.map((x) => `    ${x}`).join('\n')}`,
  hint: () =>
    'download the missing months (`heathours request --config atlas.yaml` writes the requests) or remove the duplicated files, then build again; ' +
    '`heathours inspect --coverage FOLDER` shows the whole table. `build --max-missing-hours N` accepts up to N missing hours per year and variable ' +
    '(a month missing more than 240 hours is withheld from the figures anyway)',
});

export const ZarrStoreUnreachable = defineError<{ location: string; detail: string; timeoutS: number }>({
  code: 'ZarrStoreUnreachable',
  title: 'A Zarr store cannot be reached',
  message: (p) => `${p.location}: ${p.detail}`,
  hint: (p) =>
    `check the URL in dataset.zarr (it names the store's root folder, where .zmetadata or zarr.json lies) and that this machine can reach it ` +
    `(each request waits at most ${p.timeoutS} s); or copy the store to a local folder and name the folder instead`,
});

export const ZarrStoreUnlisted = defineError<{ location: string }>({
  code: 'ZarrStoreUnlisted',
  title: 'A Zarr store over HTTP has no consolidated metadata',
  message: (p) =>
    `${p.location} has no consolidated metadata (.zmetadata, or consolidated_metadata in zarr.json), and a store over HTTP cannot be listed otherwise`,
  hint: () =>
    "consolidate the store's metadata where it is written (zarr.consolidate_metadata, or xarray's to_zarr(consolidated=True)), or copy it to a local folder and name the folder in dataset.zarr",
});

export const ZarrMetadataInvalid = defineError<{ location: string; detail: string }>({
  code: 'ZarrMetadataInvalid',
  title: 'The metadata of a Zarr store cannot be used',
  message: (p) => `${p.location}: ${p.detail}`,
  hint: () =>
    'the store is damaged or not a Zarr store in the expected layout (arrays with .zarray or zarr.json, dimensions named by _ARRAY_DIMENSIONS or dimension_names); ' +
    'copy it again, or check it with zarr-python (`zarr.open_group(PATH).info`)',
});

export const ZarrGridMismatch = defineError<{ location: string; dimension: string; variableA: string; sizeA: number; variableB: string; sizeB: number }>({
  code: 'ZarrGridMismatch',
  title: 'Arrays of a Zarr store disagree on a dimension',
  message: (p) => `${p.location}: dimension ${p.dimension} has length ${p.sizeA} in array ${p.variableA} but ${p.sizeB} in array ${p.variableB}`,
  hint: () =>
    'all variables of one store must share their grid and hours; put variables on other grids or hours into a store of their own, or regrid them first (e.g. `cdo remapbil`)',
});

export const ZarrChunkUnreadable = defineError<{ location: string; variable: string; slab: string; detail: string }>({
  code: 'ZarrChunkUnreadable',
  title: 'A chunk of a Zarr store cannot be read',
  message: (p) => `${p.location}: ${p.variable} at indices ${p.slab} cannot be read: ${p.detail}`,
  hint: () => 'a chunk of the store is damaged (it does not decompress, or holds the wrong number of bytes): copy the store (or that array) again',
});

export const NetcdfChunkDamaged = defineError<{ path: string; variable: string; chunk: string; at: number; size: number; detail: string }>({
  code: 'NetcdfChunkDamaged',
  title: 'A compressed chunk of a NetCDF-4 file is damaged',
  message: (p) => `${p.path}: variable ${p.variable}, the chunk starting at ${p.chunk} (${p.size} bytes at byte ${p.at}): ${p.detail}`,
  hint: () => 'the file is damaged in its data: fetch it again and compare its size or checksum with the source; `ncdump -v VAR FILE` stops at the same chunk',
});
