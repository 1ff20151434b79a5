/**
 * What both file backends (classic NetCDF-3 by byte range, NetCDF-4 through HDF5) offer the rest
 * of the reader: the file's dimensions, variables with their attributes, and hyperslab reads that
 * return raw (still encoded) values as typed arrays in native byte order.
 */
import type { InputFormat } from './format.ts';

/** An attribute value as stored: a number, a list of numbers, or text. */
export type AttrValue = number | number[] | string | string[];

/** The storage type of a variable (NetCDF names). */
export type RawType = 'byte' | 'ubyte' | 'char' | 'short' | 'ushort' | 'int' | 'uint' | 'int64' | 'uint64' | 'float' | 'double' | 'string' | 'other';

/** Raw values of a hyperslab, native byte order, row-major over the requested dims. */
export type RawArray = Int8Array | Uint8Array | Int16Array | Uint16Array | Int32Array | Uint32Array | Float32Array | Float64Array;

/** One hyperslab wanted by {@link SourceFile.readSlabs}. */
export interface SlabRequest {
  v: SourceVariable;
  start: number[];
  count: number[];
}

/**
 * Raw values of (part of) a hyperslab, without copies: either a native typed array (`view`
 * null; positions in elements), or big-endian file bytes read through `view` (positions in
 * bytes). Value at index vector `i` (relative to the piece): `base + Σ i[k] * strides[k]`.
 */
export interface RawSlab {
  data: RawArray;
  /** Big-endian bytes of a classic file when non-null; `data` is then a Uint8Array. */
  view: DataView | null;
  type: RawType;
  /** Position of the piece's first value [elements, or bytes with `view`]. */
  base: number;
  /** Step of each requested dimension [elements, or bytes with `view`]. */
  strides: number[];
}

/**
 * Receives request `i`'s indices [`from`, `from + n`) along its first dimension (relative to
 * the request's start) as `slab`.
 */
export type SlabSink = (i: number, slab: RawSlab, from: number, n: number) => void;

/** Row-major strides [elements] of a dense array of shape `count`. */
export function denseStrides(count: readonly number[]): number[] {
  const s = new Array<number>(count.length);
  let m = 1;
  for (let k = count.length - 1; k >= 0; k--) {
    s[k] = m;
    m *= count[k];
  }
  return s;
}

export interface SourceDimension {
  /** Name, with its group path for NetCDF-4 groups (`grp1/time`); plain in the root group. */
  name: string;
  size: number;
  unlimited: boolean;
}

export interface SourceVariable {
  /** Name including its group path (`grp1/T`); plain in the root group. */
  name: string;
  /** Dimension names (group-qualified like `name`), outermost first. */
  dims: string[];
  shape: number[];
  type: RawType;
  /** Attributes; the type of each numeric attribute is kept in `attrTypes`. */
  attrs: Record<string, AttrValue>;
  /** Storage type of each numeric attribute (for CF valid_range in packed or unpacked units). */
  attrTypes: Record<string, RawType>;
}

export interface SourceFile {
  path: string;
  format: InputFormat;
  /** File size [bytes]. */
  bytes: number;
  dims: SourceDimension[];
  variables: SourceVariable[];
  globalAttrs: Record<string, AttrValue>;
  /**
   * Reads `count[i]` values from `start[i]` along each dimension of `v`, as raw numbers in
   * row-major order. Numeric types only.
   */
  read(v: SourceVariable, start: number[], count: number[]): Promise<RawArray>;
  /**
   * Reads several hyperslabs at once and hands each over in pieces along its first requested
   * dimension, as a view that is only valid during the `sink` call (buffers are reused). Classic
   * files read one byte range per window of records for all requests together; NetCDF-4 files
   * read one chunk-aligned hyperslab per request.
   */
  readSlabs(reqs: SlabRequest[], sink: SlabSink): Promise<void>;
  /** Reads a whole variable as numbers (coordinates), int64 included, as Float64Array. */
  readNumbers(v: SourceVariable): Promise<Float64Array>;
  /** Reads a text variable (char or string) as one string per outer index. */
  readStrings(v: SourceVariable): Promise<string[]>;
  /**
   * SHA-256 [hex] of the file's bytes when they are not the file at `path` (a ZIP member: its
   * uncompressed bytes, CRC-32 checked); absent for plain files (hash the file).
   */
  digest?: () => Promise<string>;
  /**
   * How `readSlabs` reads a variable, where a backend has more than one way (NetCDF-4:
   * `node:zlib` for chunks read and inflated directly, else `HDF5 library: <why>`).
   */
  readPath?(v: SourceVariable): Promise<string>;
  close(): Promise<void>;
}

/** Size [bytes] of one value of a fixed-size raw type. */
export function rawTypeBytes(t: RawType): number {
  switch (t) {
    case 'byte':
    case 'ubyte':
    case 'char':
      return 1;
    case 'short':
    case 'ushort':
      return 2;
    case 'int':
    case 'uint':
    case 'float':
      return 4;
    case 'int64':
    case 'uint64':
    case 'double':
      return 8;
    default:
      return 0;
  }
}

/** Whether values of this type are numbers the CF decoders handle. */
export function isNumericType(t: RawType): boolean {
  return t !== 'char' && t !== 'string' && t !== 'other';
}

/** Product of a list of sizes. */
export function product(xs: readonly number[]): number {
  let p = 1;
  for (const x of xs) p *= x;
  return p;
}
