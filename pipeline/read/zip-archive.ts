/**
 * ZIP archives as input: the data store delivers a request as one archive holding a NetCDF file
 * per stream. An archive named in `dataset.files` stands for its members; a member is named
 * `<archive>!/<member>` (the `!/` separator of Java's jar URLs) everywhere the reader passes
 * paths on (workers, errors), and by its own name (what `unzip` would write) in the inventory.
 *
 * How a member's bytes are reached (ZIP format: PKWARE APPNOTE.TXT 6.3.10, §4.3.7 local file
 * header, §4.4.5 compression method 0 "stored" and 8 "deflated"; the central directory is read
 * by yauzl, which validates it):
 * - a STORED NetCDF-3 member is read in place: the classic reader reads byte ranges of the
 *   archive at the member's data offset (no copy, no extraction);
 * - a DEFLATED member cannot be read in place: a deflate stream has no random access (RFC 1951
 *   §3.2: each block depends on the 32 KiB window before it), so it is inflated once into the
 *   cache folder (sizes and CRC-32 checked against the central directory) and read from there;
 * - a STORED NetCDF-4 member is copied once into the cache folder too: HDF5 (h5wasm) opens files
 *   by path only and finds a superblock only at offsets 0, 512, 1024, 2048, … (HDF5 File Format
 *   Specification §II.A), which a member's data offset generally is not.
 * The cache copy is named by the archive's path, size and modification time and the member's
 * name and CRC-32, written to a temporary name and renamed, so workers share it and a changed
 * archive gets a new copy. What a member holds, its digest, is the same as the unzipped file's.
 */
import { createHash, randomBytes } from 'node:crypto';
import { createReadStream, createWriteStream } from 'node:fs';
import { mkdir, open, rename, rm, stat } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { basename, join } from 'node:path';
import { pipeline } from 'node:stream/promises';
import { Transform } from 'node:stream';
import { threadId } from 'node:worker_threads';
import { crc32, createInflateRaw } from 'node:zlib';
import yauzl from 'yauzl';
import { NetcdfFileNotFound, ZipArchiveEmpty, ZipArchiveUnreadable, ZipMemberCacheUnwritable, ZipMemberDamaged, ZipMemberUnsupported } from './errors.ts';

declare module 'yauzl' {
  interface ZipFile {
    /** yauzl ≥ 3.0 (README "readLocalFileHeader"); not in @types/yauzl 2.10. */
    readLocalFileHeader(entry: Entry, options: { minimal: true }, callback: (err: Error | null, local?: { fileDataStart: number }) => void): void;
  }
}

/** Between an archive's path and a member's name in a member path. */
export const MEMBER_SEPARATOR = '!/';

/** One file member of an archive, from its central directory and local header. */
export interface ZipMember {
  /** Name inside the archive (may contain folders). */
  name: string;
  /** 0 stored, 8 deflated (APPNOTE §4.4.5). */
  method: number;
  /** Sizes [bytes]. */
  compressedSize: number;
  uncompressedSize: number;
  /** CRC-32 of the uncompressed bytes (APPNOTE §4.4.7). */
  crc32: number;
  /** Offset of the member's (compressed) data in the archive [bytes]. */
  dataStart: number;
  encrypted: boolean;
}

/** Whether a path names a ZIP archive (by its extension). */
export function isZipPath(path: string): boolean {
  return /\.zip$/i.test(path);
}

/** `archive!/member`. */
export function memberPath(archive: string, member: string): string {
  return `${archive}${MEMBER_SEPARATOR}${member}`;
}

/** The archive and member of a member path, or null for a plain path. */
export function parseMemberPath(path: string): { archive: string; member: string } | null {
  const m = /\.zip!\//i.exec(path);
  if (!m) return null;
  return { archive: path.slice(0, m.index + 4), member: path.slice(m.index + 4 + MEMBER_SEPARATOR.length) };
}

/** The name a path is listed under: a member by its own file name, a file by its base name. */
export function inputName(path: string): string {
  const ref = parseMemberPath(path);
  return basename(ref ? ref.member : path);
}

/** Members already listed in this thread, by archive path, with the archive's size and time. */
const listed = new Map<string, { size: number; mtimeMs: number; members: ZipMember[] }>();

/** Lists the file members of an archive (folders left out), in archive order. */
export async function listZipMembers(archive: string): Promise<ZipMember[]> {
  let st: Awaited<ReturnType<typeof stat>>;
  try {
    st = await stat(archive);
    if (!st.isFile()) throw new Error('not a file');
  } catch {
    throw NetcdfFileNotFound({ path: archive }, { file: archive });
  }
  const known = listed.get(archive);
  if (known && known.size === st.size && known.mtimeMs === st.mtimeMs) return known.members;
  const members = await readCentralDirectory(archive);
  if (members.length === 0) throw ZipArchiveEmpty({ path: archive }, { file: archive });
  listed.set(archive, { size: st.size, mtimeMs: st.mtimeMs, members });
  return members;
}

function readCentralDirectory(archive: string): Promise<ZipMember[]> {
  const unreadable = (e: unknown) => ZipArchiveUnreadable({ path: archive, detail: e instanceof Error ? e.message : String(e) }, { file: archive });
  return new Promise((resolve, reject) => {
    yauzl.open(archive, { lazyEntries: true, autoClose: false, strictFileNames: false, validateEntrySizes: true }, (err, zip) => {
      if (err || !zip) return reject(unreadable(err));
      const out: ZipMember[] = [];
      const fail = (e: unknown) => {
        zip.close();
        reject(e);
      };
      zip.on('error', (e) => fail(unreadable(e)));
      zip.on('end', () => {
        zip.close();
        resolve(out);
      });
      zip.on('entry', (entry: yauzl.Entry) => {
        if (/\/$/.test(entry.fileName)) return zip.readEntry();
        const encrypted = (entry.generalPurposeBitFlag & 1) !== 0;
        // The data start is after the local header, whose extra field may differ from the central one (APPNOTE §4.3.7).
        zip.readLocalFileHeader(entry, { minimal: true }, (e2: Error | null, local?: { fileDataStart: number }) => {
          if (e2 || !local) return fail(unreadable(e2 ?? new Error(`no local header for ${entry.fileName}`)));
          if (local.fileDataStart + entry.compressedSize > zip.fileSize) {
            return fail(
              unreadable(
                new Error(
                  `member ${entry.fileName} runs past the end of the archive (its data end at byte ${local.fileDataStart + entry.compressedSize}, the archive has ${zip.fileSize})`,
                ),
              ),
            );
          }
          out.push({
            name: entry.fileName,
            method: entry.compressionMethod,
            compressedSize: entry.compressedSize,
            uncompressedSize: entry.uncompressedSize,
            crc32: entry.crc32 >>> 0,
            dataStart: local.fileDataStart,
            encrypted,
          });
          zip.readEntry();
        });
      });
      zip.readEntry();
    });
  });
}

/** Replaces every `.zip` path by the member paths of its members; other paths pass unchanged. */
export async function expandArchives(paths: string[]): Promise<string[]> {
  const out: string[] = [];
  for (const p of paths) {
    if (!isZipPath(p)) out.push(p);
    else for (const m of await listZipMembers(p)) out.push(memberPath(p, m.name));
  }
  return out;
}

/**
 * Every input with archives expanded, in the order of the names they are listed under (a member
 * by its member name, ties by path), so an archive and its unzipped files come in the same order.
 */
export async function orderedInputs(paths: string[]): Promise<string[]> {
  const inputs = (await expandArchives(paths)).map((p) => ({ p, name: inputName(p) }));
  inputs.sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : a.p < b.p ? -1 : a.p > b.p ? 1 : 0));
  return inputs.map((x) => x.p);
}

/** The member a member path names. */
export async function findMember(path: string): Promise<{ archive: string; member: ZipMember }> {
  const ref = parseMemberPath(path)!;
  const m = (await listZipMembers(ref.archive)).find((x) => x.name === ref.member);
  if (!m) throw NetcdfFileNotFound({ path }, { file: path });
  if (m.encrypted) throw ZipMemberUnsupported({ path: ref.archive, member: m.name, detail: 'it is encrypted' }, { file: path });
  if (m.method !== 0 && m.method !== 8) {
    throw ZipMemberUnsupported(
      { path: ref.archive, member: m.name, detail: `compression method ${m.method} (only 0 stored and 8 deflated are read, APPNOTE §4.4.5)` },
      { file: path },
    );
  }
  return { archive: ref.archive, member: m };
}

/** Where a file's bytes lie: a whole file, or a range of an archive (a stored member). */
export interface ByteRange {
  path: string;
  offset: number;
  length: number;
}

/** Reads up to `n` first bytes of a range. */
export async function readHead(r: ByteRange, n: number): Promise<Uint8Array> {
  const fh = await open(r.path, 'r');
  try {
    const head = new Uint8Array(Math.min(n, r.length));
    let done = 0;
    while (done < head.length) {
      const { bytesRead } = await fh.read(head, done, head.length - done, r.offset + done);
      if (bytesRead === 0) break;
      done += bytesRead;
    }
    return head.subarray(0, done);
  } finally {
    await fh.close();
  }
}

/** SHA-256 [hex] of a range; for a member, also checks its CRC-32 against the central directory. */
export async function sha256Range(r: ByteRange, expectCrc?: { crc32: number; archive: string; member: string }): Promise<string> {
  const h = createHash('sha256');
  let crc = 0;
  let n = 0;
  if (r.length > 0) {
    for await (const chunk of createReadStream(r.path, { start: r.offset, end: r.offset + r.length - 1, highWaterMark: 1 << 20 })) {
      h.update(chunk as Buffer);
      if (expectCrc) crc = crc32(chunk as Buffer, crc);
      n += (chunk as Buffer).length;
    }
  }
  if (expectCrc) {
    const where = { file: memberPath(expectCrc.archive, expectCrc.member) };
    if (n !== r.length) throw ZipMemberDamaged({ path: expectCrc.archive, member: expectCrc.member, detail: `${n} bytes of ${r.length} could be read` }, where);
    if (crc >>> 0 !== expectCrc.crc32) {
      throw ZipMemberDamaged(
        { path: expectCrc.archive, member: expectCrc.member, detail: `its CRC-32 is ${hex(crc)}, the archive's directory says ${hex(expectCrc.crc32)}` },
        where,
      );
    }
  }
  return h.digest('hex');
}

const hex = (x: number) => (x >>> 0).toString(16).padStart(8, '0');

/** Default folder for unpacked members when none is configured. */
export function defaultMemberCache(): string {
  return join(tmpdir(), 'heathours-zip-members');
}

/**
 * The member as a file of its own in `cacheDir` (deflated members inflated, stored NetCDF-4
 * members copied), made once and reused while the archive is unchanged. Sizes and CRC-32 are
 * checked while writing; a failure leaves nothing behind.
 */
export async function memberFile(archive: string, m: ZipMember, cacheDir: string): Promise<string> {
  const st = await stat(archive);
  const key = createHash('sha256').update(`${archive}\0${st.size}\0${st.mtimeMs}\0${m.name}\0${m.crc32}\0${m.uncompressedSize}`).digest('hex').slice(0, 32);
  const ext = /\.[A-Za-z0-9]{1,8}$/.exec(m.name)?.[0] ?? '';
  const target = join(cacheDir, `${key}${ext}`);
  try {
    if ((await stat(target)).size === m.uncompressedSize) return target;
  } catch {
    // not there yet
  }
  const where = { file: memberPath(archive, m.name) };
  try {
    await mkdir(cacheDir, { recursive: true });
  } catch (e) {
    throw ZipMemberCacheUnwritable({ dir: cacheDir, member: memberPath(archive, m.name), detail: (e as Error).message }, where);
  }
  const tmp = join(cacheDir, `.${key}.${process.pid}.${threadId}.${randomBytes(4).toString('hex')}.part`);
  let crc = 0;
  let n = 0;
  const count = new Transform({
    transform(chunk: Buffer, _enc, done) {
      crc = crc32(chunk, crc);
      n += chunk.length;
      done(null, chunk);
    },
  });
  try {
    const raw = () => createReadStream(archive, { start: m.dataStart, end: m.dataStart + m.compressedSize - 1 });
    try {
      if (m.compressedSize === 0) await pipeline(emptyStream(), count, createWriteStream(tmp));
      else if (m.method === 0) await pipeline(raw(), count, createWriteStream(tmp));
      else await pipeline(raw(), createInflateRaw(), count, createWriteStream(tmp)); // method 8 is raw RFC 1951 deflate (APPNOTE §4.4.5)
    } catch (e) {
      const code = (e as NodeJS.ErrnoException).code;
      if (code === 'ENOSPC' || code === 'EACCES' || code === 'EROFS' || code === 'EDQUOT') {
        throw ZipMemberCacheUnwritable({ dir: cacheDir, member: memberPath(archive, m.name), detail: (e as Error).message }, where);
      }
      throw ZipMemberDamaged({ path: archive, member: m.name, detail: `it does not inflate: ${(e as Error).message}` }, where);
    }
    if (n !== m.uncompressedSize)
      throw ZipMemberDamaged({ path: archive, member: m.name, detail: `it unpacks to ${n} bytes, the archive's directory says ${m.uncompressedSize}` }, where);
    if (crc >>> 0 !== m.crc32)
      throw ZipMemberDamaged({ path: archive, member: m.name, detail: `its CRC-32 is ${hex(crc)}, the archive's directory says ${hex(m.crc32)}` }, where);
    await rename(tmp, target);
    return target;
  } finally {
    await rm(tmp, { force: true });
  }
}

function emptyStream() {
  return new Transform({ transform: (_c, _e, d) => d() }).end();
}
