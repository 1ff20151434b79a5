/**
 * Where the structures of a NetCDF-4 (HDF5) file lie, for the fuzzer: the superblock, every
 * metadata block that starts with an HDF5 signature, and the extent of every raw data chunk
 * (from the leaves of the version-1 B-trees that index chunked datasets). Everything outside
 * the chunks is metadata: object headers, B-tree nodes, heaps, free-space records.
 * Layouts from the HDF5 File Format Specification version 3.0 (The HDF Group): §II.A superblock
 * version 2/3 (48 bytes with 8-byte offsets), §III.A.1 "Version 1 B-trees" (node type 1: raw
 * data chunks, keys = chunk size, filter mask, chunk offsets per dimension + 1). All numbers are
 * little-endian. Only well-formed base files are walked.
 */

/** Four-byte signatures of HDF5 metadata blocks (specification §III and §IV). */
const SIGNATURES = [
  'OHDR',
  'OCHK',
  'TREE',
  'HEAP',
  'GCOL',
  'SNOD',
  'BTHD',
  'BTIN',
  'BTLF',
  'FRHP',
  'FHDB',
  'FHIB',
  'FSHD',
  'FSSE',
  'SMTB',
  'EAHD',
  'EAIB',
  'EADB',
  'FAHD',
  'FADB',
];

export interface Hdf5Map {
  /** Superblock size [bytes]. */
  superblockEnd: number;
  /** Offsets of the superblock's address fields (base, extension, end of file, root) [bytes]. */
  addressFields: number[];
  /** Start of every block with a signature [bytes], sorted. */
  blocks: number[];
  /** Raw data chunks: [start, end) [bytes], sorted. */
  chunks: Array<[number, number]>;
  size: number;
}

/** Walks a well-formed HDF5 file with a version 2 or 3 superblock and 8-byte offsets. */
export function mapHdf5(bytes: Uint8Array): Hdf5Map {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const version = bytes[8];
  if ((version !== 2 && version !== 3) || bytes[9] !== 8) throw new Error('the fuzzer maps HDF5 files with a version 2/3 superblock and 8-byte offsets only');
  const blocks: number[] = [];
  const sigCodes = SIGNATURES.map((s) => [...s].map((c) => c.charCodeAt(0)));
  for (let i = 48; i + 4 <= bytes.length; i++) {
    const b0 = bytes[i];
    for (const s of sigCodes) {
      if (b0 === s[0] && bytes[i + 1] === s[1] && bytes[i + 2] === s[2] && bytes[i + 3] === s[3]) {
        blocks.push(i);
        break;
      }
    }
  }
  const chunks: Array<[number, number]> = [];
  for (const o of blocks) {
    if (bytes[o] !== 0x54 || bytes[o + 4] !== 1 || bytes[o + 5] !== 0) continue; // TREE, type 1, level 0
    const used = view.getUint16(o + 6, true);
    // Keys hold the chunk offsets of every dimension plus one; find the count that makes every
    // child a chunk inside the file.
    for (let k = 2; k <= 6; k++) {
      const keyBytes = 8 + 8 * k;
      const found: Array<[number, number]> = [];
      let ok = used > 0;
      for (let i = 0; ok && i < used; i++) {
        const key = o + 24 + i * (keyBytes + 8);
        if (key + keyBytes + 8 > bytes.length) {
          ok = false;
          break;
        }
        const size = view.getUint32(key, true);
        const addr = Number(view.getBigUint64(key + keyBytes, true));
        if (size === 0 || addr < 48 || addr + size > bytes.length) ok = false;
        else found.push([addr, addr + size]);
      }
      if (ok) {
        chunks.push(...found);
        break;
      }
    }
  }
  chunks.sort((a, b) => a[0] - b[0]);
  return { superblockEnd: 48, addressFields: [12, 20, 28, 36], blocks, chunks, size: bytes.length };
}

/** Whether byte `i` lies in a raw data chunk (binary search over the sorted chunks). */
export function inChunk(map: Hdf5Map, i: number): boolean {
  let lo = 0;
  let hi = map.chunks.length - 1;
  while (lo <= hi) {
    const m = (lo + hi) >> 1;
    const [a, b] = map.chunks[m];
    if (i < a) hi = m - 1;
    else if (i >= b) lo = m + 1;
    else return true;
  }
  return false;
}
