/**
 * The header of a NetCDF-3 classic (CDF-1) or 64-bit-offset (CDF-2) file, parsed from its
 * bytes by the grammar of "The NetCDF Classic Format Specification" (NetCDF User's Guide,
 * appendix "File Format Specifications", https://docs.unidata.ucar.edu/netcdf-c/current/file_format_specifications.html):
 *
 *   header   = magic numrecs dim_list gatt_list var_list
 *   dim_list = ABSENT | NC_DIMENSION nelems [dim ...]        dim  = name dim_length
 *   att_list = ABSENT | NC_ATTRIBUTE nelems [attr ...]       attr = name nc_type nelems [values] (padded to 4)
 *   var_list = ABSENT | NC_VARIABLE nelems [var ...]         var  = name nelems [dimid ...] vatt_list nc_type vsize begin
 *
 * Every number is big-endian; `begin` is 4 bytes in CDF-1 and 8 in CDF-2. The parser is strict:
 * every count is checked against the bytes left before anything is allocated or looped over, so
 * a damaged header costs time in proportion to the header, never to a count it claims; and every
 * way the header can be wrong is a catalogued error naming the file, the entry and its byte
 * offset. A header that runs past the bytes given asks for more ({@link HeaderNeedsBytes}), up
 * to {@link MAX_HEADER_BYTES}; no attribute may hold more than {@link MAX_ATTRIBUTE_BYTES}.
 */
import { NetcdfFileTruncated, NetcdfHeaderInvalid } from './errors.ts';

/** NetCDF-3 external types by code (spec: nc_type), with their size [bytes]. */
const TYPES: Record<number, { name: 'byte' | 'char' | 'short' | 'int' | 'float' | 'double'; bytes: number }> = {
  1: { name: 'byte', bytes: 1 },
  2: { name: 'char', bytes: 1 },
  3: { name: 'short', bytes: 2 },
  4: { name: 'int', bytes: 4 },
  5: { name: 'float', bytes: 4 },
  6: { name: 'double', bytes: 8 },
};
const NC_DIMENSION = 10;
const NC_VARIABLE = 11;
const NC_ATTRIBUTE = 12;
/** numrecs of a file still being written (spec: STREAMING). */
const STREAMING = 0xffffffff;
/** Longest name the reader accepts [bytes] (netCDF-C's NC_MAX_NAME is 256). */
const MAX_NAME = 256;
/**
 * Largest attribute value the reader accepts [bytes]. The format sets no limit; ours keeps a
 * damaged length (a flipped bit in an attribute's count) from making the parser read and decode
 * megabytes or gigabytes of data as one attribute. ERA5 attributes are well under 1 KiB; a long
 * processing history is tens of KiB.
 */
export const MAX_ATTRIBUTE_BYTES = 1 << 20;
/**
 * Longest header the reader accepts [bytes]: a header is read whole into memory, so a damaged
 * count must not make it read a large file's data as header. ERA5 headers are a few KiB.
 */
export const MAX_HEADER_BYTES = 16 << 20;

export type ClassicType = (typeof TYPES)[number]['name'];

export interface ClassicAttribute {
  name: string;
  type: ClassicType;
  /** Text (char), one number, or a list of numbers. */
  value: string | number | number[];
}

export interface ClassicDimension {
  name: string;
  /** Length; the record dimension's is the number of records. */
  size: number;
  unlimited: boolean;
}

export interface ClassicVariable {
  name: string;
  /** Dimension indices into {@link ClassicHeader.dims}. */
  dimIds: number[];
  attributes: ClassicAttribute[];
  type: ClassicType;
  /** Byte offset of the first value [bytes]. */
  begin: number;
  /** Whether the first dimension is the record dimension. */
  record: boolean;
}

export interface ClassicHeader {
  version: 1 | 2;
  numRecs: number;
  dims: ClassicDimension[];
  globalAttributes: ClassicAttribute[];
  variables: ClassicVariable[];
  /** First byte after the header [bytes]. */
  end: number;
}

/** Thrown when the header continues past the bytes given: read at least `bytes` and parse again. */
export class HeaderNeedsBytes extends Error {
  constructor(readonly bytes: number) {
    super(`the header needs at least ${bytes} bytes`);
  }
}

const latin1 = new TextDecoder('latin1');

/**
 * Parses the header in `head` (the first bytes of a file of `fileBytes` bytes). Throws
 * {@link HeaderNeedsBytes} when `head` ends inside the header (and the file has more), and
 * catalogued `NetcdfHeaderInvalid` for anything the grammar does not allow.
 */
export function parseClassicHeader(head: Uint8Array, fileBytes: number, path: string): ClassicHeader {
  const view = new DataView(head.buffer, head.byteOffset, head.byteLength);
  const version = head[3] === 2 ? 2 : 1;
  let p = 4;
  const bad = (what: string, at: number, where: { variable?: string } = {}): never => {
    throw NetcdfHeaderInvalid({ path, detail: `${what} (header byte ${at})` }, { file: path, ...where });
  };
  /** Makes sure `n` more bytes are there; past the end of the file the header is damaged or cut. */
  const need = (n: number, what: string) => {
    if (p + n <= head.length && p + n <= MAX_HEADER_BYTES) return;
    if (p + n > fileBytes) throw NetcdfFileTruncated({ path, bytes: fileBytes, expected: p + n, detail: `the header ends inside ${what}` }, { file: path });
    if (p + n > MAX_HEADER_BYTES)
      bad(
        `${what} would end the header after ${p + n} bytes, beyond the ${MAX_HEADER_BYTES >> 20} MiB a header may take: a count or length before it is damaged`,
        p,
      );
    throw new HeaderNeedsBytes(Math.min(fileBytes, MAX_HEADER_BYTES, Math.max(p + n, head.length * 4)));
  };
  const u32 = (what: string) => {
    need(4, what);
    const v = view.getUint32(p);
    p += 4;
    return v;
  };
  const offset = (what: string) => {
    if (version === 1) return u32(what);
    need(8, what);
    const v = view.getBigUint64(p);
    p += 8;
    if (v > BigInt(Number.MAX_SAFE_INTEGER)) bad(`${what} ${v} is beyond any file size`, p - 8);
    return Number(v);
  };
  /** A count of items each at least `minBytes` long: it must fit in the rest of the file. */
  const count = (what: string, minBytes: number) => {
    const at = p;
    const n = u32(what);
    if (n * minBytes > fileBytes - p) bad(`${what} is ${n}, more than the ${fileBytes - p} bytes left in the file can hold`, at);
    return n;
  };
  const name = (what: string) => {
    const at = p;
    const n = u32(`the name length of ${what}`);
    if (n === 0 || n > MAX_NAME) bad(`the name of ${what} is ${n} bytes long (1 to ${MAX_NAME} allowed)`, at);
    const padded = (n + 3) & ~3;
    need(padded, `the name of ${what}`);
    const s = latin1.decode(head.subarray(p, p + n));
    p += padded;
    // biome-ignore lint/suspicious/noControlCharactersInRegex: control characters are what this test looks for
    if (/[\0-\x1f\x7f]/.test(s)) bad(`the name of ${what} holds control characters (${JSON.stringify(s.slice(0, 40))})`, at);
    return s;
  };
  const type = (what: string) => {
    const at = p;
    const t = u32(`the type of ${what}`);
    const info = TYPES[t];
    if (!info) bad(`the type of ${what} is ${t}, not a NetCDF-3 type (1 to 6)`, at);
    return info;
  };
  const tag = (expected: number, list: string) => {
    const at = p;
    const t = u32(`the ${list} tag`);
    const n = u32(`the ${list} count`);
    if (t === 0) {
      if (n !== 0) bad(`the ${list} is marked absent but counts ${n} entries`, at);
      return false;
    }
    if (t !== expected) bad(`the ${list} tag is ${t}, expected ${expected} or 0`, at);
    p -= 4; // the count is read again, checked against the bytes left
    return true;
  };
  const attributes = (owner: string): ClassicAttribute[] => {
    if (!tag(NC_ATTRIBUTE, `attribute list of ${owner}`)) return [];
    const n = count(`the number of attributes of ${owner}`, 12);
    const out: ClassicAttribute[] = [];
    for (let i = 0; i < n; i++) {
      const an = name(`attribute ${i + 1} of ${owner}`);
      const info = type(`attribute ${an} of ${owner}`);
      const at = p;
      const ne = u32(`the length of attribute ${an} of ${owner}`);
      if (ne * info.bytes > fileBytes - p) bad(`attribute ${an} of ${owner} claims ${ne} values, more than the file holds`, at);
      if (ne * info.bytes > MAX_ATTRIBUTE_BYTES)
        bad(
          `attribute ${an} of ${owner} claims ${ne} values (${ne * info.bytes} bytes), more than the ${MAX_ATTRIBUTE_BYTES >> 20} MiB an attribute may hold: its length is damaged`,
          at,
        );
      const bytes = ne * info.bytes;
      const padded = (bytes + 3) & ~3;
      need(padded, `attribute ${an} of ${owner}`);
      out.push({ name: an, type: info.name, value: attributeValue(view, p, info.name, ne) });
      p += padded;
    }
    return out;
  };

  const numRecs = u32('the number of records');
  if (numRecs === STREAMING) bad('the number of records is "streaming": the file was still being written when it was copied', 4);
  const dims: ClassicDimension[] = [];
  let recId = -1;
  if (tag(NC_DIMENSION, 'dimension list')) {
    const n = count('the number of dimensions', 8);
    for (let i = 0; i < n; i++) {
      const dn = name(`dimension ${i + 1}`);
      const size = u32(`the length of dimension ${dn}`);
      if (size === 0) {
        if (recId >= 0) bad(`dimensions ${dims[recId].name} and ${dn} are both unlimited; a NetCDF-3 file has at most one`, p - 4);
        recId = i;
      }
      dims.push({ name: dn, size: size === 0 ? numRecs : size, unlimited: size === 0 });
    }
  }
  const globalAttributes = attributes('the file');
  const variables: ClassicVariable[] = [];
  if (tag(NC_VARIABLE, 'variable list')) {
    const n = count('the number of variables', 24);
    const names = new Set<string>();
    for (let i = 0; i < n; i++) {
      const vn = name(`variable ${i + 1}`);
      if (names.has(vn)) bad(`variable ${vn} is defined twice`, p);
      names.add(vn);
      const nd = count(`the number of dimensions of variable ${vn}`, 4);
      const dimIds: number[] = [];
      for (let k = 0; k < nd; k++) {
        const at = p;
        const id = u32(`dimension ${k + 1} of variable ${vn}`);
        if (id >= dims.length) bad(`variable ${vn} names dimension ${id}, but the file has ${dims.length} dimension(s)`, at, { variable: vn });
        if (id === recId && k > 0)
          bad(`variable ${vn} has the unlimited dimension ${dims[id].name} in place ${k + 1}; it may only be first`, at, { variable: vn });
        dimIds.push(id);
      }
      const attrs = attributes(`variable ${vn}`);
      const info = type(`variable ${vn}`);
      u32(`the size of variable ${vn}`); // vsize: recomputed from the shape (it saturates for large variables)
      const begin = offset(`the data offset of variable ${vn}`);
      variables.push({ name: vn, dimIds, attributes: attrs, type: info.name, begin, record: nd > 0 && dimIds[0] === recId });
    }
  }
  return { version, numRecs, dims, globalAttributes, variables, end: p };
}

function attributeValue(view: DataView, p: number, type: ClassicType, n: number): string | number | number[] {
  if (type === 'char') {
    return latin1.decode(new Uint8Array(view.buffer, view.byteOffset + p, n)).replace(/\0+$/, '');
  }
  const out = new Array<number>(n);
  for (let i = 0; i < n; i++) {
    switch (type) {
      case 'byte':
        out[i] = view.getInt8(p + i);
        break;
      case 'short':
        out[i] = view.getInt16(p + 2 * i);
        break;
      case 'int':
        out[i] = view.getInt32(p + 4 * i);
        break;
      case 'float':
        out[i] = view.getFloat32(p + 4 * i);
        break;
      default:
        out[i] = view.getFloat64(p + 8 * i);
    }
  }
  return n === 1 ? out[0] : out;
}
