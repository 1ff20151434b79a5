/**
 * Object header messages the JavaScript NetCDF-4 metadata reader decodes (HDF5 File Format
 * Specification version 3.0, §IV.A.2): Dataspace (0x0001, §IV.A.2.b), Datatype (0x0003,
 * §IV.A.2.d; only the classes NetCDF-4 variables and attributes use), Link (0x0006, §IV.A.2.g),
 * Link Info (0x0002, §IV.A.2.c), Attribute (0x000C, §IV.A.2.m), Attribute Info (0x0015,
 * §IV.A.2.v) and Symbol Table (0x0011, §IV.A.2.r). Pure functions over the message bytes; a
 * message they do not understand or that does not hold together is refused
 * ({@link RawLayoutRefused}), never guessed.
 */
import { addr, le, refuse, type Hdf5Sizes } from './hdf5-struct.ts';

export const MSG_DATASPACE = 0x0001;
export const MSG_LINK_INFO = 0x0002;
export const MSG_DATATYPE = 0x0003;
export const MSG_LINK = 0x0006;
export const MSG_LAYOUT = 0x0008;
export const MSG_ATTRIBUTE = 0x000c;
export const MSG_SYMBOL_TABLE = 0x0011;
export const MSG_ATTRIBUTE_INFO = 0x0015;

/** A dataspace: `null` (no elements), scalar (rank 0) or simple. */
export interface Dataspace {
  kind: 'scalar' | 'simple' | 'null';
  /** Current size of each dimension [elements]. */
  dims: number[];
  /** Per dimension, whether its maximum size is unlimited (all bits set). */
  unlimited: boolean[];
}

/** Most dimensions HDF5 allows (H5S_MAX_RANK). */
const MAX_RANK = 32;

/** The Dataspace message (§IV.A.2.b, versions 1 and 2). */
export function parseDataspace(d: Uint8Array, s: Hdf5Sizes): Dataspace {
  const version = le(d, 0, 1);
  const rank = le(d, 1, 1);
  const flags = le(d, 2, 1);
  if (rank > MAX_RANK) refuse(`a dataspace of rank ${rank}`);
  if (flags & 0x02) refuse('a dataspace with a permutation index');
  let p: number;
  let kind: Dataspace['kind'];
  if (version === 1) {
    p = 8;
    kind = rank === 0 ? 'scalar' : 'simple';
  } else if (version === 2) {
    const type = le(d, 3, 1);
    if (type > 2) refuse(`dataspace type ${type}`);
    kind = type === 0 ? 'scalar' : type === 1 ? 'simple' : 'null';
    p = 4;
  } else return refuse(`dataspace version ${version}`);
  if (kind !== 'simple' && rank !== 0) refuse(`a ${kind} dataspace of rank ${rank}`);
  const dims: number[] = [];
  for (let i = 0; i < rank; i++) {
    const n = le(d, p + i * s.lengths, s.lengths);
    if (!Number.isSafeInteger(n)) refuse(`a dimension of ${n} elements`);
    dims.push(n);
  }
  p += rank * s.lengths;
  const unlimited = dims.map(() => false);
  if (flags & 0x01)
    for (let i = 0; i < rank; i++) {
      const at = p + i * s.lengths;
      let all = true;
      for (let j = 0; j < s.lengths; j++) if (le(d, at + j, 1) !== 0xff) all = false;
      if (!all && le(d, at, s.lengths) < dims[i]) refuse(`a dimension of ${dims[i]} elements above its maximum`);
      unlimited[i] = all;
    }
  return { kind, dims, unlimited };
}

/** The datatype classes a NetCDF-4 description uses (§IV.A.2.d, "Class and Version"). */
export type Datatype =
  | { cls: 'int'; size: number; signed: boolean; littleEndian: boolean }
  | { cls: 'float'; size: number; littleEndian: boolean }
  | { cls: 'string'; size: number; cset: number }
  | { cls: 'vstring'; size: number; cset: number }
  | { cls: 'vseq'; size: number; base: Datatype }
  | { cls: 'reference'; size: number; object: boolean }
  | { cls: 'other'; size: number; code: number };

/** Bytes a parsed datatype message took (the nested base type of a sequence ends inside it). */
function parseDatatypeAt(d: Uint8Array, at: number, depth: number): { t: Datatype; end: number } {
  if (depth > 4) refuse('datatypes nested more than 4 deep');
  const cv = le(d, at, 1);
  const cls = cv & 0x0f;
  const version = cv >> 4;
  if (version < 1 || version > 5) refuse(`datatype version ${version}`);
  const bits = le(d, at + 1, 3);
  const size = le(d, at + 4, 4);
  const p = at + 8;
  switch (cls) {
    case 0: {
      // Fixed-point: bit 0 byte order (1 big-endian), bit 3 signed; properties: bit offset, precision.
      le(d, p, 4);
      if (![1, 2, 4, 8].includes(size)) return { t: { cls: 'other', size, code: cls }, end: p + 4 };
      const offset = le(d, p, 2);
      const precision = le(d, p + 2, 2);
      if (offset !== 0 || precision !== 8 * size || bits & 0x06) return { t: { cls: 'other', size, code: cls }, end: p + 4 };
      return { t: { cls: 'int', size, signed: (bits & 0x08) !== 0, littleEndian: (bits & 0x41) === 0 }, end: p + 4 };
    }
    case 1: {
      // Floating-point: 12 bytes of properties; IEEE 754 single or double only.
      le(d, p, 12);
      const ieee = (size === 4 && le(d, p + 2, 2) === 32 && le(d, p + 4, 1) === 23) || (size === 8 && le(d, p + 2, 2) === 64 && le(d, p + 4, 1) === 52);
      if (!ieee || bits & 0x40) return { t: { cls: 'other', size, code: cls }, end: p + 12 };
      return { t: { cls: 'float', size, littleEndian: (bits & 0x01) === 0 }, end: p + 12 };
    }
    case 3:
      // String: bits 0-3 padding, bits 4-7 character set; no properties.
      if (size < 1) refuse('a string type of 0 bytes');
      return { t: { cls: 'string', size, cset: (bits >> 4) & 0x0f }, end: p };
    case 7:
      return { t: { cls: 'reference', size, object: (bits & 0x0f) === 0 }, end: p };
    case 9: {
      // Variable-length: bits 0-3 type (0 sequence, 1 string), bits 8-11 character set; then the base type.
      const base = parseDatatypeAt(d, p, depth + 1);
      const kind = bits & 0x0f;
      if (kind === 1) return { t: { cls: 'vstring', size, cset: (bits >> 8) & 0x0f }, end: base.end };
      if (kind === 0) return { t: { cls: 'vseq', size, base: base.t }, end: base.end };
      return refuse(`variable-length type kind ${kind}`);
    }
    default:
      // Compound, enumeration, opaque, bitfield, time, array: their properties are not walked;
      // the message must end here for the caller to use it (only as the last thing parsed).
      return { t: { cls: 'other', size, code: cls }, end: -1 };
  }
}

/** The Datatype message (§IV.A.2.d). */
export function parseDatatype(d: Uint8Array): Datatype {
  return parseDatatypeAt(d, 0, 0).t;
}

/** A decoded attribute message: name, type, dataspace and the bytes of its values. */
export interface RawAttribute {
  name: string;
  type: Datatype;
  space: Dataspace;
  data: Uint8Array;
  /** The message's creation order (version 2 headers that track it), else its position. */
  order: number;
}

const utf8 = new TextDecoder('utf-8', { fatal: true });

/** A name field: `n` bytes ending with a NUL (§IV.A.2.m "Name"); UTF-8. */
function nameAt(d: Uint8Array, at: number, n: number): string {
  if (n < 1) refuse('an empty attribute name');
  le(d, at, n);
  if (d[at + n - 1] !== 0) refuse('an attribute name without its terminating NUL');
  const bytes = d.subarray(at, at + n - 1);
  if (bytes.includes(0)) refuse('an attribute name with a NUL inside');
  try {
    return utf8.decode(bytes);
  } catch {
    return refuse('an attribute name that is not UTF-8');
  }
}

const pad8 = (n: number) => (n + 7) & ~7;

/** The Attribute message (§IV.A.2.m, versions 1–3); shared datatypes or dataspaces are refused. */
export function parseAttribute(d: Uint8Array, s: Hdf5Sizes, order: number): RawAttribute {
  const version = le(d, 0, 1);
  const flags = le(d, 1, 1);
  const nameSize = le(d, 2, 2);
  const typeSize = le(d, 4, 2);
  const spaceSize = le(d, 6, 2);
  if (version < 1 || version > 3) refuse(`attribute message version ${version}`);
  if (version >= 2 && flags & 0x03) refuse('an attribute with a shared datatype or dataspace');
  let p = version === 3 ? 9 : 8;
  const padded = version === 1 ? pad8 : (n: number) => n;
  const name = nameAt(d, p, nameSize);
  p += padded(nameSize);
  le(d, p, typeSize);
  const typeBytes = d.subarray(p, p + typeSize);
  const type = parseDatatype(typeBytes);
  p += padded(typeSize);
  le(d, p, spaceSize);
  const space = parseDataspace(d.subarray(p, p + spaceSize), s);
  p += padded(spaceSize);
  const count = space.kind === 'null' ? 0 : space.dims.reduce((a, b) => a * b, 1);
  const bytes = count * type.size;
  if (!Number.isSafeInteger(bytes) || p + bytes > d.length) refuse(`attribute ${name}: ${count} values of ${type.size} bytes in a message of ${d.length}`);
  return { name, type, space, data: d.subarray(p, p + bytes), order };
}

/** A hard link of a group (§IV.A.2.g); soft and external links are refused. */
export interface HardLink {
  name: string;
  address: number;
  /** Creation order, when the message carries it. */
  order?: number;
}

/** The Link message (§IV.A.2.g, version 1). */
export function parseLink(d: Uint8Array, s: Hdf5Sizes): HardLink {
  const version = le(d, 0, 1);
  if (version !== 1) refuse(`link message version ${version}`);
  const flags = le(d, 1, 1);
  let p = 2;
  let type = 0;
  if (flags & 0x08) type = le(d, p++, 1);
  let order: number | undefined;
  if (flags & 0x04) {
    order = le(d, p, 8);
    p += 8;
  }
  if (flags & 0x10) p += 1; // character set of the name: ASCII or UTF-8, both read as UTF-8
  const lengthBytes = 1 << (flags & 0x03);
  const n = le(d, p, lengthBytes);
  p += lengthBytes;
  if (n < 1) refuse('an empty link name');
  le(d, p, n);
  const bytes = d.subarray(p, p + n);
  if (bytes.includes(0)) refuse('a link name with a NUL inside');
  let name: string;
  try {
    name = utf8.decode(bytes);
  } catch {
    return refuse('a link name that is not UTF-8');
  }
  if (name.includes('/')) refuse(`a link name with a slash (${name})`);
  p += n;
  if (type !== 0) refuse(`link ${name} is ${type === 1 ? 'a soft link' : type === 64 ? 'an external link' : `of type ${type}`}`);
  const address = addr(d, p, s.offsets);
  if (address < 0) refuse(`link ${name} without an address`);
  return order === undefined ? { name, address } : { name, address, order };
}

/** Creation order flags of a Link Info or Attribute Info message, and where dense storage lives (-1: none) [bytes]. */
export interface DenseInfo {
  tracked: boolean;
  indexed: boolean;
  /** Fractal heap of the link or attribute messages, or -1 when they are in the object header. */
  heap: number;
  /** Version 2 B-tree indexing them by name. */
  names: number;
}

/** The Link Info message (§IV.A.2.c). */
export function parseLinkInfo(d: Uint8Array, s: Hdf5Sizes): DenseInfo {
  const version = le(d, 0, 1);
  if (version !== 0) refuse(`link info version ${version}`);
  const flags = le(d, 1, 1);
  const p = 2 + (flags & 0x01 ? 8 : 0);
  return { tracked: (flags & 0x01) !== 0, indexed: (flags & 0x02) !== 0, heap: addr(d, p, s.offsets), names: addr(d, p + s.offsets, s.offsets) };
}

/** The Attribute Info message (§IV.A.2.v). */
export function parseAttributeInfo(d: Uint8Array, s: Hdf5Sizes): DenseInfo {
  const version = le(d, 0, 1);
  if (version !== 0) refuse(`attribute info version ${version}`);
  const flags = le(d, 1, 1);
  const p = 2 + (flags & 0x01 ? 2 : 0);
  return { tracked: (flags & 0x01) !== 0, indexed: (flags & 0x02) !== 0, heap: addr(d, p, s.offsets), names: addr(d, p + s.offsets, s.offsets) };
}

/** The Symbol Table message (§IV.A.2.r): the group's version 1 B-tree and local heap [bytes]. */
export function parseSymbolTable(d: Uint8Array, s: Hdf5Sizes): { btree: number; heap: number } {
  const btree = addr(d, 0, s.offsets);
  const heap = addr(d, s.offsets, s.offsets);
  if (btree < 0 || heap < 0) refuse('a symbol table without its B-tree or local heap');
  return { btree, heap };
}
