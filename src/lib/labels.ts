/** Readable names for the inventory's coded values (file formats and ERA5 layouts). */
import type { InventoryFile } from '../../pipeline/read/inventory-types.ts';

export const FORMAT_LABELS: Record<InventoryFile['format'], string> = {
  'netcdf3-classic': 'NetCDF-3 classic',
  'netcdf3-64bit-offset': 'NetCDF-3 64-bit offset',
  netcdf4: 'NetCDF-4 (HDF5)',
  zarr: 'Zarr store',
};

export const LAYOUT_LABELS: Record<InventoryFile['layout'], string> = {
  'era5-legacy': 'ERA5 legacy layout (time, packed 16-bit integers)',
  'era5-cds-2024': 'ERA5 layout of the 2024 data store (valid_time)',
  'era5-zarr': 'ERA5 analysis-ready Zarr layout (arrays named 2m_temperature, …)',
  other: 'other layout',
};
