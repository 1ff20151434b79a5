/**
 * What a NetCDF-4 file holds, described from its HDF5 metadata: dimensions from HDF5 dimension
 * scales (the NetCDF-4 storage model: a coordinate variable is a dimension scale, other
 * variables carry DIMENSION_LIST), groups walked recursively, every variable's shape, storage
 * type, chunking and attributes. The result is plain data (it crosses threads: the description
 * is made in the metadata worker, hdf5-meta-worker.ts, because reading DIMENSION_LIST and text
 * goes through HDF5's global heap, where damaged files can make the library loop for ever).
 */
import type { File as H5File, Group as H5Group, Dataset as H5Dataset } from 'h5wasm/node';
import type { AttrValue, RawType, SourceDimension } from './source.ts';

/** The h5wasm classes used (passed in: the module is loaded by the caller). */
export interface H5Classes {
  Group: typeof import('h5wasm/node').Group;
  Dataset: typeof import('h5wasm/node').Dataset;
}

/** HDF5 attributes that belong to the NetCDF-4 / dimension-scale machinery, not to the user. */
const HIDDEN_ATTRS = new Set(['CLASS', 'NAME', 'REFERENCE_LIST', 'DIMENSION_LIST', '_Netcdf4Coordinates', '_Netcdf4Dimid', '_NCProperties', '_nc3_strict']);
/** NAME of a dimension scale that is a dimension without a coordinate variable (netCDF-C). */
const PURE_DIMENSION = 'This is a netCDF dimension but not a netCDF variable';

export interface H5Metadata {
  type: number;
  size: number;
  signed?: boolean;
  vlen?: boolean;
  littleEndian?: boolean;
  shape?: number[] | null;
  maxshape?: number[] | null;
  chunks?: number[] | null;
}

export interface Hdf5Variable {
  /** Name with group path, no leading slash (`grp1/T`). */
  name: string;
  dims: string[];
  shape: number[];
  type: RawType;
  attrs: Record<string, AttrValue>;
  attrTypes: Record<string, RawType>;
  /** Chunk length along the first dimension (1 when not chunked) [values]. */
  chunk0: number;
  /** Bytes per value as stored in memory by HDF5 [bytes]. */
  valueBytes: number;
  /** Values are fixed-size, little-endian numbers that can be read straight into a typed array. */
  plain: boolean;
  /**
   * Byte address of the variable's object header (an HDF5 object reference holds it, Format
   * Specification §VII "Object Reference"), or null when it could not be had.
   */
  header: number | null;
}

/** What names and shapes a variable, found the same way by both describers. */
export type Hdf5VariableNaming = Pick<Hdf5Variable, 'name' | 'dims' | 'shape' | 'type' | 'attrs' | 'attrTypes'>;

/**
 * A variable's description from what a describer found: its naming, the chunk length along its
 * first dimension [values] (1 unless a whole positive number), the bytes per value [bytes],
 * whether those are plain little-endian numbers, and its object header's address [bytes].
 */
export function describedVariable(naming: Hdf5VariableNaming, chunk0: number, valueBytes: number, plain: boolean, header: number | null): Hdf5Variable {
  return { ...naming, chunk0: Number.isSafeInteger(chunk0) && chunk0 >= 1 ? chunk0 : 1, valueBytes, plain, header };
}

export interface Hdf5Description {
  /** Whether the file carries NetCDF-4 markers (dimension scales or netCDF attributes). */
  netcdf: boolean;
  dims: SourceDimension[];
  variables: Hdf5Variable[];
  globalAttrs: Record<string, AttrValue>;
}

export function rawType(m: H5Metadata): RawType {
  if (m.type === 0) {
    const s = m.signed !== false;
    switch (m.size) {
      case 1:
        return s ? 'byte' : 'ubyte';
      case 2:
        return s ? 'short' : 'ushort';
      case 4:
        return s ? 'int' : 'uint';
      case 8:
        return s ? 'int64' : 'uint64';
    }
  }
  if (m.type === 1) return m.size === 4 ? 'float' : m.size === 8 ? 'double' : 'other';
  if (m.type === 3) return 'string';
  return 'other';
}

/** An attribute or dataset value as plain numbers or text; 1-element arrays become scalars. */
export function plainValue(v: unknown): AttrValue | undefined {
  if (v === null || v === undefined) return undefined;
  if (typeof v === 'string' || typeof v === 'number') return v;
  if (typeof v === 'bigint') return Number(v);
  if (typeof v === 'boolean') return v ? 1 : 0;
  if (ArrayBuffer.isView(v)) {
    const arr = Array.from(v as unknown as ArrayLike<number | bigint>, (x) => Number(x));
    return arr.length === 1 ? arr[0] : arr;
  }
  if (Array.isArray(v)) {
    if (v.every((x) => typeof x === 'string')) return v.length === 1 ? (v[0] as string) : (v as string[]);
    if (v.every((x) => typeof x === 'number' || typeof x === 'bigint')) {
      const arr = v.map((x) => Number(x));
      return arr.length === 1 ? arr[0] : arr;
    }
  }
  return undefined;
}

const PLAIN: ReadonlySet<RawType> = new Set(['byte', 'ubyte', 'short', 'ushort', 'int', 'uint', 'float', 'double']);

/** Describes an open file. Throws what h5wasm throws (the caller catalogues it). */
export function describeHdf5(f: H5File, h5: H5Classes): Hdf5Description {
  const datasets: Array<{ name: string; ds: H5Dataset }> = [];
  const walk = (g: H5Group, prefix: string, depth: number) => {
    if (depth > 32) throw new Error(`groups nested more than 32 deep at ${prefix}`);
    for (const key of g.keys()) {
      const e = g.get(key);
      if (e instanceof h5.Group) walk(e, `${prefix}${key}/`, depth + 1);
      else if (e instanceof h5.Dataset) datasets.push({ name: `${prefix}${key}`, ds: e });
    }
  };
  walk(f, '', 0);
  const rootAttrs = f.attrs;
  let netcdf = '_NCProperties' in rootAttrs;
  const dimSizes = new Map<string, SourceDimension>();
  const variables: Hdf5Variable[] = [];
  for (const { name, ds } of datasets) {
    const meta = ds.metadata as unknown as H5Metadata;
    const shape = (ds.shape ?? []).map(Number);
    for (const n of shape) if (!Number.isSafeInteger(n) || n < 0) throw new Error(`${name} has a dimension of length ${n}`);
    const attrs: Record<string, AttrValue> = {};
    const attrTypes: Record<string, RawType> = {};
    const raw = ds.attrs;
    const isScale = raw.CLASS !== undefined && plainValue(safe(() => raw.CLASS.value)) === 'DIMENSION_SCALE';
    if (isScale || 'DIMENSION_LIST' in raw || '_Netcdf4Dimid' in raw || '_Netcdf4Coordinates' in raw) netcdf = true;
    for (const [an, a] of Object.entries(raw)) {
      if (HIDDEN_ATTRS.has(an)) continue;
      const val = plainValue(safe(() => a.value));
      if (val === undefined) continue;
      attrs[an] = val;
      attrTypes[an] = rawType(a.metadata as unknown as H5Metadata);
    }
    const dims: string[] = [];
    for (let i = 0; i < shape.length; i++) {
      let dn: string | undefined;
      if (isScale && shape.length === 1) dn = name;
      else {
        const scales = safe(() => ds.get_attached_scales(i)) ?? [];
        if (scales.length > 0) dn = scales[0].replace(/^\//, '');
      }
      dn ??= `${name}_dim${i}`;
      dims.push(dn);
      const maxshape = meta.maxshape ?? shape;
      const unlimited = (maxshape[i] ?? 0) > Number.MAX_SAFE_INTEGER || (maxshape[i] ?? 0) < 0;
      if (!dimSizes.has(dn)) dimSizes.set(dn, { name: dn, size: shape[i], unlimited });
    }
    const nameAttr = isScale ? plainValue(safe(() => raw.NAME.value)) : undefined;
    if (typeof nameAttr === 'string' && nameAttr.startsWith(PURE_DIMENSION)) continue;
    const type = rawType(meta);
    const plain = PLAIN.has(type) && meta.vlen !== true && meta.littleEndian !== false;
    variables.push(
      describedVariable({ name, dims, shape, type, attrs, attrTypes }, Number(meta.chunks?.[0] ?? 1), Number(meta.size) || 0, plain, headerAddress(ds)),
    );
  }
  const globalAttrs: Record<string, AttrValue> = {};
  for (const [an, a] of Object.entries(rootAttrs)) {
    if (HIDDEN_ATTRS.has(an)) continue;
    const val = plainValue(safe(() => a.value));
    if (val !== undefined) globalAttrs[an] = val;
  }
  return { netcdf, dims: [...dimSizes.values()], variables, globalAttrs };
}

/** Reads a text variable (string or char) as one string per outer index. */
export function readHdf5Strings(f: H5File, name: string, h5: H5Classes, shape: number[]): string[] {
  const ds = f.get(name);
  if (!(ds instanceof h5.Dataset)) throw new Error(`${name} is not a variable`);
  const out: unknown = ds.value;
  if (typeof out === 'string') return [out];
  if (Array.isArray(out)) return out.map((x) => String(x));
  if (out instanceof Uint8Array || out instanceof Int8Array) {
    const len = shape.length > 0 ? shape[shape.length - 1] : 1;
    const dec = new TextDecoder('latin1');
    const res: string[] = [];
    for (let i = 0; i < out.length; i += len)
      res.push(
        dec
          .decode(new Uint8Array(out.buffer, out.byteOffset + i, len))
          .replace(/\0+$/, '')
          .trim(),
      );
    return res;
  }
  return [];
}

/** The object header address [bytes] of a dataset: the 8 bytes of its object reference (hobj_ref_t, little-endian). */
function headerAddress(ds: H5Dataset): number | null {
  const ref = safe(() => ds.create_reference().ref_data);
  if (!ref || ref.length !== 8) return null;
  let x = 0;
  for (let i = 7; i >= 0; i--) x = x * 256 + ref[i];
  return Number.isSafeInteger(x) ? x : null;
}

function safe<T>(fn: () => T): T | undefined {
  try {
    return fn();
  } catch {
    return undefined;
  }
}
