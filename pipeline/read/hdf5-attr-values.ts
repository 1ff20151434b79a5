/**
 * Attribute values of a NetCDF-4 file decoded in JavaScript as the HDF5 library hands them to
 * this project through h5wasm (hdf5-describe.ts `plainValue`): integers and IEEE floats as
 * numbers (one value a number, several an array; 64-bit integers through BigInt to Number),
 * fixed-length strings cut at their first NUL and decoded as UTF-8 or as "ascii" (the WHATWG
 * label h5wasm's TextDecoder uses: windows-1252), variable-length strings from the global heap
 * cut at their first NUL (UTF-8, or one character per byte for ASCII, as Emscripten's
 * AsciiToString), and DIMENSION_LIST's variable-length object references as object header
 * addresses. Layouts: HDF5 File Format Specification version 3.0, §IV.A.2.d (datatypes) and
 * §III.E (global heap IDs in variable-length data). Anything else is refused.
 */
import type { AttrValue, RawType } from './source.ts';
import { type GlobalHeap, heapId } from './hdf5-global-heap.ts';
import type { Datatype, RawAttribute } from './hdf5-messages.ts';
import { le, refuse, type Hdf5Sizes } from './hdf5-struct.ts';

/** The raw type h5wasm's metadata gives a datatype (hdf5-describe.ts `rawType`), or null when the JS reader does not describe it. */
export function rawTypeOf(t: Datatype): RawType | null {
  if (t.cls === 'int') {
    const s = t.signed;
    return t.size === 1 ? (s ? 'byte' : 'ubyte') : t.size === 2 ? (s ? 'short' : 'ushort') : t.size === 4 ? (s ? 'int' : 'uint') : s ? 'int64' : 'uint64';
  }
  if (t.cls === 'float') return t.size === 4 ? 'float' : 'double';
  if (t.cls === 'string' || t.cls === 'vstring') return 'string';
  return null;
}

const ascii = new TextDecoder('ascii');
const utf8 = new TextDecoder('utf-8');
const utf8Strict = new TextDecoder('utf-8', { fatal: true });

/** Numbers of `count` values of an integer or float type stored little-endian in `b`. */
function numbers(t: Datatype, b: Uint8Array, count: number): number[] {
  const v = new DataView(b.buffer, b.byteOffset, b.byteLength);
  const out: number[] = [];
  for (let i = 0; i < count; i++) {
    const o = i * t.size;
    if (t.cls === 'float') out.push(t.size === 4 ? v.getFloat32(o, true) : v.getFloat64(o, true));
    else if (t.cls === 'int') {
      if (t.size === 8) out.push(Number(t.signed ? v.getBigInt64(o, true) : v.getBigUint64(o, true)));
      else if (t.size === 4) out.push(t.signed ? v.getInt32(o, true) : v.getUint32(o, true));
      else if (t.size === 2) out.push(t.signed ? v.getInt16(o, true) : v.getUint16(o, true));
      else out.push(t.signed ? v.getInt8(o) : v.getUint8(o));
    }
  }
  return out;
}

/** One variable-length string's bytes decoded as h5wasm does: cut at the first NUL. */
function vstring(bytes: Uint8Array, cset: number): string {
  const nul = bytes.indexOf(0);
  const b = nul < 0 ? bytes : bytes.subarray(0, nul);
  if (cset === 1) {
    try {
      return utf8Strict.decode(b);
    } catch {
      return refuse('a variable-length string that is not UTF-8');
    }
  }
  let s = '';
  for (const c of b) s += String.fromCharCode(c);
  return s;
}

/** Bytes of one variable-length element's data: its length (4 bytes) then a global heap ID. */
async function vlenData(heap: GlobalHeap, b: Uint8Array, at: number, s: Hdf5Sizes, baseSize: number): Promise<Uint8Array> {
  const n = le(b, at, 4);
  if (n === 0) return new Uint8Array(0);
  const id = heapId(b, at + 4, s);
  if (id.collection < 0) refuse('a variable-length element without its global heap collection');
  const o = await heap.object(id.collection, id.index);
  if (n * baseSize > o.length) refuse(`a variable-length element of ${n} values in a heap object of ${o.length} bytes`);
  return o.subarray(0, n * baseSize);
}

/** An attribute's value as plain numbers or text (1-element arrays become scalars), with its raw type. */
export async function attributeValue(a: RawAttribute, heap: GlobalHeap, s: Hdf5Sizes): Promise<{ value: AttrValue; type: RawType }> {
  const t = a.type;
  const type = rawTypeOf(t);
  if (type === null) return refuse(`attribute ${a.name} of a type the JavaScript reader leaves to the HDF5 library`);
  if (a.space.kind === 'null') return refuse(`attribute ${a.name} without values (null dataspace)`);
  const count = a.space.dims.reduce((x, y) => x * y, 1);
  if (count < 1) return refuse(`attribute ${a.name} without values`);
  if ((t.cls === 'int' || t.cls === 'float') && !t.littleEndian) return refuse(`attribute ${a.name} stored big-endian`);
  const one = <T>(arr: T[]): T | T[] => (arr.length === 1 ? arr[0] : arr);
  if (t.cls === 'int' || t.cls === 'float') return { value: one(numbers(t, a.data, count)), type };
  if (t.cls === 'string') {
    const dec = t.cset === 1 ? utf8 : ascii;
    const out: string[] = [];
    for (let i = 0; i < count; i++) {
      let b = a.data.subarray(i * t.size, (i + 1) * t.size);
      const nul = b.indexOf(0);
      if (nul >= 0) b = b.subarray(0, nul);
      out.push(dec.decode(b));
    }
    return { value: one(out), type };
  }
  if (t.cls === 'vstring') {
    if (t.size !== 4 + s.offsets + 4) refuse(`variable-length strings of ${t.size} bytes`);
    const out: string[] = [];
    for (let i = 0; i < count; i++) out.push(vstring(await vlenData(heap, a.data, i * t.size, s, 1), t.cset));
    return { value: one(out), type };
  }
  return refuse(`attribute ${a.name} of a type the JavaScript reader leaves to the HDF5 library`);
}

/**
 * DIMENSION_LIST (a variable-length sequence of object references per dimension, HDF5 Dimension
 * Scale Specification 1.0 §3.2 and Format Specification §IV.A.2.d class 7): per dimension, the
 * object header addresses of the scales attached [bytes].
 */
export async function dimensionList(a: RawAttribute, heap: GlobalHeap, s: Hdf5Sizes): Promise<number[][]> {
  const t = a.type;
  if (t.cls !== 'vseq' || t.base.cls !== 'reference' || !t.base.object) return refuse('a DIMENSION_LIST that is not of object references');
  if (t.size !== 4 + s.offsets + 4) refuse(`DIMENSION_LIST elements of ${t.size} bytes`);
  const refBytes = t.base.size;
  if (refBytes !== s.offsets) refuse(`object references of ${refBytes} bytes`);
  if (a.space.kind !== 'simple' || a.space.dims.length !== 1) refuse('a DIMENSION_LIST that is not one-dimensional');
  const out: number[][] = [];
  for (let i = 0; i < a.space.dims[0]; i++) {
    const b = await vlenData(heap, a.data, i * t.size, s, refBytes);
    const refs: number[] = [];
    for (let j = 0; j < b.length; j += refBytes) refs.push(le(b, j, refBytes));
    out.push(refs);
  }
  return out;
}
