/**
 * A check of HDF5 global heap collections before the HDF5 library parses them. NetCDF-4 keeps
 * text (variable-length strings such as ERA5's `expver`) and the DIMENSION_LIST references in
 * the global heap; HDF5 parses a collection by walking its objects, each header giving the size
 * of the next step, and a damaged size can stop that walk from advancing: a free-space object of
 * size 0 (or a size that wraps the 32-bit pointers of the WebAssembly build) makes the library
 * loop for ever on the same bytes (netCDF-C's ncdump over native HDF5 loops on such a file too;
 * test/fixtures/fuzz/netcdf4-global-heap-empty-free-space.nc). Walked here first, in JavaScript,
 * with the same steps, such a collection is refused in microseconds instead of costing the
 * metadata worker's time limit.
 *
 * Layout: HDF5 File Format Specification version 3.0 (The HDF Group), §III.E "Disk Format:
 * Level 1E - Global Heap": the collection header is the signature "GCOL", version 1, three
 * reserved bytes and the collection size ("size of lengths" bytes, including the header); each
 * object is a 2-byte heap object index, a 2-byte reference count, 4 reserved bytes, the object
 * size ("size of lengths" bytes) and its data padded to a multiple of 8 bytes; index 0 is the
 * free space, whose size covers its own header and is not padded; a tail shorter than an object
 * header is free space too. All numbers are little-endian.
 *
 * {@link guardedReads} applies the check to every read the library makes (h5wasm's Node build
 * reads the file with `fs.readSync`): a read that returns a whole collection which fails the
 * check ends in an I/O error for the library, which then fails cleanly (HDF5 reads global heap
 * collections directly, not through its metadata accumulator, so a collection starts a read).
 */
import fs from 'node:fs';

/** Collections up to this size [bytes] are checked (read whole once more when HDF5 reads them in parts). */
const MAX_CHECKED = 64 * 1024 * 1024;

/** The collection's signature, "GCOL" (specification §III.E). */
const GCOL = [0x47, 0x43, 0x4f, 0x4c];

/**
 * Checks a global heap collection that starts at `bytes[0]` ("GCOL"); `lengthBytes` is the
 * superblock's size of lengths [bytes] (4 or 8). Returns what is wrong, or null when the walk over
 * its objects ends exactly at the collection's end, or when `bytes` do not hold the whole
 * collection (nothing to say yet: HDF5 reads the rest before parsing it). `at` is where the
 * collection lies in the file [bytes], for the message.
 */
export function globalHeapProblem(bytes: Uint8Array, lengthBytes: number, at = 0): string | null {
  const header = 8 + lengthBytes;
  const objectHeader = 8 + lengthBytes;
  if (bytes.length < header || !GCOL.every((c, i) => bytes[i] === c)) return null;
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const length = (o: number) => (lengthBytes === 8 ? Number(view.getBigUint64(o, true)) : view.getUint32(o, true));
  const size = length(8);
  // HDF5 itself refuses a wrong version or a collection smaller than its minimum (4096 bytes) with
  // an error: no loop to prevent, and its own message is the better one.
  if (bytes[4] !== 1 || size < 4096 || size > bytes.length) return null;
  let p = header;
  while (p < size) {
    if (p + objectHeader > size) break; // a tail too small for an object header: free space
    const index = view.getUint16(p, true);
    const objectSize = length(p + 8);
    // HDF5 steps by the header plus the size padded to 8 bytes, or (free space) by the size alone.
    const step = index > 0 ? objectHeader + Math.ceil(objectSize / 8) * 8 : objectSize;
    if (step === 0 || step % 8 !== 0 || p + step > size) {
      const what = index === 0 ? 'the free space' : `object ${index}`;
      return (
        `the global heap collection at byte ${at} is damaged: ${what} at byte ${at + p} claims ${objectSize} bytes, ` +
        (step === 0
          ? 'so its walk cannot advance (the HDF5 library would loop for ever)'
          : p + step > size
            ? `beyond the collection's ${size} bytes`
            : 'which breaks the 8-byte alignment of the objects after it')
      );
    }
    p += step;
  }
  return null;
}

/** The superblock's size of lengths [bytes] (specification §II.A, versions 0 to 3), or null. */
export function hdf5LengthBytes(head: Uint8Array): number | null {
  if (head.length < 16 || head[0] !== 0x89 || head[1] !== 0x48 || head[2] !== 0x44 || head[3] !== 0x46) return null;
  const v = head[8];
  const n = v === 0 || v === 1 ? head[14] : v === 2 || v === 3 ? head[10] : 0;
  return n === 4 || n === 8 ? n : null;
}

/**
 * Runs `fn` (synchronous h5wasm calls on the file `path`) with every read of that library
 * checked: a read returning a damaged global heap collection fails with EIO. Returns `fn`'s value
 * or throws its error; `refused` says what the check found (the caller's reason for the failure).
 */
export function guardedReads<T>(path: string, fn: () => T): { value?: T; error?: unknown; refused?: string } {
  let lengthBytes: number | null = null;
  try {
    const fd = fs.openSync(path, 'r');
    try {
      const head = new Uint8Array(16);
      fs.readSync(fd, head, 0, 16, 0);
      lengthBytes = hdf5LengthBytes(head);
    } finally {
      fs.closeSync(fd);
    }
  } catch {
    // unreadable: the library's own open says why
  }
  let refused: string | undefined;
  const readSync = fs.readSync;
  const checked = ((fd: number, buffer: NodeJS.ArrayBufferView, ...rest: unknown[]): number => {
    const n = (readSync as (...a: unknown[]) => number)(fd, buffer, ...rest);
    if (lengthBytes === null || n < 16 || !(buffer instanceof Uint8Array || buffer instanceof Int8Array)) return n;
    const [offset, , position] = typeof rest[0] === 'number' ? (rest as [number, number, number | bigint | null]) : [0, 0, null];
    const start = buffer.byteOffset + (offset ?? 0);
    let got = new Uint8Array(buffer.buffer, start, n);
    if (got[0] !== GCOL[0] || got[1] !== GCOL[1] || got[2] !== GCOL[2] || got[3] !== GCOL[3] || got[4] !== 1) return n;
    const at = position === null || position === undefined ? -1 : Number(position);
    const size =
      lengthBytes === 8
        ? Number(new DataView(got.buffer, got.byteOffset + 8, 8).getBigUint64(0, true))
        : new DataView(got.buffer, got.byteOffset + 8, 4).getUint32(0, true);
    // HDF5 reads a large collection in two parts (the first 4096 bytes, then the rest): the whole
    // collection is read here at its first part and checked then.
    if (size > n && at >= 0 && size <= MAX_CHECKED) {
      const whole = new Uint8Array(size);
      if ((readSync as (...a: unknown[]) => number)(fd, whole, 0, size, at) === size) got = whole;
    }
    const problem = globalHeapProblem(got, lengthBytes, Math.max(0, at));
    if (problem === null) return n;
    refused ??= problem;
    throw Object.assign(new Error(problem), { code: 'EIO' });
  }) as typeof fs.readSync;
  fs.readSync = checked;
  try {
    return { value: fn(), refused };
  } catch (error) {
    return { error, refused };
  } finally {
    fs.readSync = readSync;
  }
}
