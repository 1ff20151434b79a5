/**
 * Which ERA5 layout a file follows (docs/methods.md §2.3): the legacy CDS layout (NetCDF-3, int16
 * packed, `time` in "hours since 1900-01-01") or the 2024 CDS layout (NetCDF-4, `valid_time` in
 * "seconds since 1970-01-01", `expver` and `number` coordinates) or the analysis-ready Zarr layout
 * (zarr-store.ts: arrays named by the data store's long variable names); anything else is `other`.
 */
import { attrText } from './attrs.ts';
import { recognizeEra5 } from './era5-variables.ts';
import type { SourceFile } from './source.ts';
import { STORE_NAMES } from './era5-variables.ts';

export type Layout = 'era5-legacy' | 'era5-cds-2024' | 'era5-zarr' | 'other';

export function detectLayout(sf: SourceFile): Layout {
  const era5 = sf.variables.filter((v) => v.dims.length >= 2 && recognizeEra5(v));
  if (era5.length === 0) return 'other';
  if (sf.format === 'zarr') return era5.some((v) => STORE_NAMES.has(v.name)) ? 'era5-zarr' : 'other';
  const vt = sf.variables.find((v) => v.name === 'valid_time');
  if (sf.format === 'netcdf4' && vt && /^seconds since 1970-01-01/i.test(attrText(vt, 'units') ?? '')) return 'era5-cds-2024';
  const t = sf.variables.find((v) => v.name === 'time');
  const packed = era5.some((v) => v.type === 'short' && 'scale_factor' in v.attrs);
  if (sf.format !== 'netcdf4' && t && /^hours since 1900-01-01/i.test(attrText(t, 'units') ?? '') && packed) return 'era5-legacy';
  return 'other';
}
