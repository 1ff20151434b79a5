/**
 * Where the structures of a NetCDF-3 classic or 64-bit-offset file lie, for the fuzzer: every
 * header entry's start (the truncation points), every number the header holds (counts, lengths,
 * types, dimension ids, sizes, offsets: where "interesting" values go), and the data section.
 * Walked from the grammar of "The NetCDF Classic Format Specification" (NetCDF User's Guide,
 * appendix "File Format Specifications"): magic, numrecs, dim_list, gatt_list, var_list; every
 * item big-endian and padded to 4 bytes. Only well-formed base files are walked.
 */

/** A number stored in the header: where, how wide, and what it means. */
export interface HeaderNumber {
  at: number;
  bytes: 4 | 8;
  kind: 'numrecs' | 'tag' | 'count' | 'name-length' | 'dim-length' | 'type' | 'dim-id' | 'vsize' | 'begin';
}

export interface Netcdf3Map {
  version: 1 | 2;
  /** First byte after the header [bytes]. */
  headerEnd: number;
  /** Start of every header entry (list tags, names, dims, attributes, variables) [bytes]. */
  entries: number[];
  numbers: HeaderNumber[];
  /** Start of each variable's data (`begin`) [bytes]. */
  begins: number[];
  /** Start of the record section and the size of one record [bytes]; null without records. */
  records: { start: number; size: number; count: number } | null;
  size: number;
}

const TYPE_BYTES = [0, 1, 1, 2, 4, 4, 8];
const pad4 = (n: number) => (n + 3) & ~3;

/** Walks the header of a well-formed classic (CDF-1) or 64-bit-offset (CDF-2) file. */
export function mapNetcdf3(bytes: Uint8Array): Netcdf3Map {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const version = bytes[3] as 1 | 2;
  if (bytes[0] !== 0x43 || bytes[1] !== 0x44 || bytes[2] !== 0x46 || (version !== 1 && version !== 2)) throw new Error('not a CDF-1 or CDF-2 file');
  let p = 4;
  const entries: number[] = [0, 4];
  const numbers: HeaderNumber[] = [];
  const u32 = (kind: HeaderNumber['kind']) => {
    numbers.push({ at: p, bytes: 4, kind });
    const v = view.getUint32(p);
    p += 4;
    return v;
  };
  const offset = () => {
    if (version === 1) return u32('begin');
    numbers.push({ at: p, bytes: 8, kind: 'begin' });
    const v = Number(view.getBigUint64(p));
    p += 8;
    return v;
  };
  const name = () => {
    entries.push(p);
    const n = u32('name-length');
    p += pad4(n);
  };
  const attList = () => {
    entries.push(p);
    const tag = u32('tag');
    const n = u32('count');
    if (tag === 0) return;
    for (let i = 0; i < n; i++) {
      name();
      const type = u32('type');
      const count = u32('count');
      p += pad4(count * TYPE_BYTES[type]);
    }
  };
  const numrecs = u32('numrecs');
  entries.push(p);
  const dimTag = u32('tag');
  const nDims = u32('count');
  const dimLengths: number[] = [];
  if (dimTag !== 0) {
    for (let i = 0; i < nDims; i++) {
      name();
      dimLengths.push(u32('dim-length'));
    }
  }
  attList();
  entries.push(p);
  const varTag = u32('tag');
  const nVars = u32('count');
  const begins: number[] = [];
  let recSize = 0;
  let recStart = Infinity;
  const recDim = dimLengths.indexOf(0);
  if (varTag !== 0) {
    for (let i = 0; i < nVars; i++) {
      name();
      const nd = u32('count');
      const ids: number[] = [];
      for (let k = 0; k < nd; k++) ids.push(u32('dim-id'));
      attList();
      u32('type');
      const vsize = u32('vsize');
      const begin = offset();
      begins.push(begin);
      if (nd > 0 && ids[0] === recDim) {
        recSize += vsize;
        recStart = Math.min(recStart, begin);
      }
    }
  }
  entries.push(p);
  return {
    version,
    headerEnd: p,
    entries: [...new Set(entries)].sort((a, b) => a - b),
    numbers,
    begins,
    records: Number.isFinite(recStart) ? { start: recStart, size: recSize, count: numrecs } : null,
    size: bytes.length,
  };
}
