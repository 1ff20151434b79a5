/**
 * Opens any supported NetCDF file, or a NetCDF member of a ZIP archive (`archive.zip!/member.nc`,
 * zip-archive.ts): the format is detected from its magic bytes (format.ts).
 */
import { stat } from 'node:fs/promises';
import { detectFormat, formatFromMagic } from './format.ts';
import { openClassicFile } from './classic-file.ts';
import { openHdf5File } from './hdf5-file.ts';
import { HeathoursError } from '../model/errors.ts';
import { NetcdfFileEmpty, NetcdfUnknownFormat, ZipMemberNotNetcdf } from './errors.ts';
import { defaultMemberCache, findMember, memberFile, memberPath, parseMemberPath, readHead, sha256Range } from './zip-archive.ts';
import type { SourceFile } from './source.ts';
import { isZarrLocation, openZarrStore } from './zarr-store.ts';

export interface OpenSourceOptions {
  /** Folder for unpacked ZIP members (deflated, or NetCDF-4); default a folder in the system's temp folder. */
  memberCache?: string;
}

/**
 * Opens `path` as NetCDF-3 classic / 64-bit offset or NetCDF-4 (h5wasm); a member path opens the
 * member; an HTTP(S) URL, a path ending in `.zarr` or a folder opens a Zarr store (zarr-store.ts).
 */
export async function openSourceFile(path: string, opts: OpenSourceOptions = {}): Promise<SourceFile> {
  if (
    isZarrLocation(path) ||
    (await stat(path).then(
      (s) => s.isDirectory(),
      () => false,
    ))
  )
    return openZarrStore(path);
  if (parseMemberPath(path)) return openMember(path, opts);
  const { format, bytes } = await detectFormat(path);
  if (format === 'netcdf4') return openHdf5File(path, bytes);
  return openClassicFile(path, format, bytes);
}

/**
 * A member of a ZIP archive: a stored NetCDF-3 member is read in place (byte ranges of the
 * archive); any other member is read from its copy in the member cache (zip-archive.ts says
 * why). Either way the file is named by its member path and its digest is that of its bytes.
 */
async function openMember(path: string, opts: OpenSourceOptions): Promise<SourceFile> {
  const { archive, member: m } = await findMember(path);
  const range = { path: archive, offset: m.dataStart, length: m.uncompressedSize };
  const crc = { crc32: m.crc32, archive, member: m.name };
  if (m.method === 0) {
    const head = await readHead(range, 8);
    const format = memberFormat(head, archive, m.name);
    if (format !== 'netcdf4') {
      const sf = await openClassicFile(path, format, m.uncompressedSize, range);
      sf.digest = () => sha256Range(range, crc);
      return sf;
    }
  }
  const file = await memberFile(archive, m, opts.memberCache ?? defaultMemberCache());
  const whole = { path: file, offset: 0, length: m.uncompressedSize };
  const format = memberFormat(await readHead(whole, 8), archive, m.name);
  const sf = format === 'netcdf4' ? await openHdf5File(file, m.uncompressedSize) : await openClassicFile(file, format, m.uncompressedSize);
  // Errors and the inventory name the member, not the cache copy.
  const named: SourceFile = Object.assign(sf, { path });
  named.digest = () => sha256Range(whole, crc);
  return named;
}

/** The NetCDF format of a member's first bytes; anything else is `ZipMemberNotNetcdf` (GRIB keeps its own error). */
function memberFormat(head: Uint8Array, archive: string, member: string) {
  const path = memberPath(archive, member);
  try {
    return formatFromMagic(head, path);
  } catch (e) {
    if (e instanceof HeathoursError && (e.code === NetcdfUnknownFormat.code || e.code === NetcdfFileEmpty.code)) {
      const magic = [...head.subarray(0, 8)].map((b) => (b >= 0x20 && b < 0x7f ? String.fromCharCode(b) : `\\x${b.toString(16).padStart(2, '0')}`)).join('');
      throw ZipMemberNotNetcdf({ path: archive, member, magic: magic || '(none: the member is empty)' }, { file: path });
    }
    throw e;
  }
}
