/**
 * Which kind of file a path holds, from its first bytes (magic numbers of the NetCDF format
 * specification, https://docs.unidata.ucar.edu/netcdf-c/current/file_format_specifications.html,
 * and the HDF5 format specification §2.2 "Format Signature"). Unsupported kinds (CDF-5, GRIB,
 * empty files, anything else) are catalogued errors that say what to convert with.
 */
import { open, stat } from 'node:fs/promises';
import { NetcdfCdf5Unsupported, NetcdfFileEmpty, NetcdfFileNotFound, NetcdfFileTruncated, NetcdfGribFile, NetcdfUnknownFormat } from './errors.ts';
import { hasHdf5Signature } from './hdf5-struct.ts';

/** File formats the reader can open (names as in pipeline/read/inventory-types.ts). */
export type NetcdfFormat = 'netcdf3-classic' | 'netcdf3-64bit-offset' | 'netcdf4';

/** What an input is read as: a NetCDF format, or a Zarr store (zarr-store.ts). */
export type InputFormat = NetcdfFormat | 'zarr';

/** Classifies the first bytes of a file; `path` names the file in errors. */
export function formatFromMagic(head: Uint8Array, path: string): NetcdfFormat {
  if (head.length === 0) throw NetcdfFileEmpty({ path }, { file: path });
  const c = (i: number) => head[i];
  if (c(0) === 0x43 && c(1) === 0x44 && c(2) === 0x46) {
    if (head.length < 4) throw NetcdfFileTruncated({ path, bytes: head.length, expected: 32, detail: 'not even a whole format signature' }, { file: path });
    if (c(3) === 1) return 'netcdf3-classic';
    if (c(3) === 2) return 'netcdf3-64bit-offset';
    if (c(3) === 5) throw NetcdfCdf5Unsupported({ path }, { file: path });
  }
  if (hasHdf5Signature(head)) return 'netcdf4';
  if (c(0) === 0x47 && c(1) === 0x52 && c(2) === 0x49 && c(3) === 0x42) throw NetcdfGribFile({ path }, { file: path });
  const magic = [...head.subarray(0, 8)].map((b) => (b >= 0x20 && b < 0x7f ? String.fromCharCode(b) : `\\x${b.toString(16).padStart(2, '0')}`)).join('');
  throw NetcdfUnknownFormat({ path, magic }, { file: path });
}

/** Reads the first bytes of `path` and classifies them; also returns the file size [bytes]. */
export async function detectFormat(path: string): Promise<{ format: NetcdfFormat; bytes: number }> {
  let bytes: number;
  try {
    const s = await stat(path);
    if (!s.isFile()) throw new Error('not a file');
    bytes = s.size;
  } catch {
    throw NetcdfFileNotFound({ path }, { file: path });
  }
  const fh = await open(path, 'r');
  try {
    const head = new Uint8Array(Math.min(8, bytes));
    if (head.length > 0) await fh.read(head, 0, head.length, 0);
    return { format: formatFromMagic(head, path), bytes };
  } finally {
    await fh.close();
  }
}
