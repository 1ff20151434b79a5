/** Opens any supported NetCDF file: the format is detected from its magic bytes (format.ts). */
import { detectFormat } from './format.ts';
import { openClassicFile } from './classic-file.ts';
import { openHdf5File } from './hdf5-file.ts';
import type { SourceFile } from './source.ts';

/** Opens `path` as NetCDF-3 classic / 64-bit offset (netcdfjs) or NetCDF-4 (h5wasm). */
export async function openSourceFile(path: string): Promise<SourceFile> {
  const { format, bytes } = await detectFormat(path);
  if (format === 'netcdf4') return openHdf5File(path, bytes);
  return openClassicFile(path, format, bytes);
}
