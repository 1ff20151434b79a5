/**
 * A streaming writer of NetCDF-4 files (HDF5 underneath) on top of h5wasm 0.10.3.
 *
 * What makes an HDF5 file a NetCDF-4 file that the reference library (Debian's `ncdump`) reads
 * with its dimensions in the intended order (NetCDF User's Guide, "NetCDF-4 format" appendix):
 * - every dimension is a coordinate dataset made a dimension scale (`CLASS` "DIMENSION_SCALE",
 *   `NAME` = the dimension name; h5wasm `make_scale`),
 * - each data variable has its axes attached to those scales (`DIMENSION_LIST` on the variable,
 *   `REFERENCE_LIST` on the scale; h5wasm `attach_scale`),
 * - each scale carries `_Netcdf4Dimid` (int) giving the dimension's id, i.e. its order,
 * - text attributes are fixed-length ASCII strings (NetCDF reads them as `char`), numeric
 *   attributes are scalars of the variable's type,
 * - the file tracks creation order, so variables and attributes list in the order written.
 *
 * Data variables are float32, chunked, compressed with zlib deflate, and written block by block
 * along their first (time) dimension, so a year of data is never in memory at once. h5wasm
 * 0.10.3 puts exactly one filter in a dataset's pipeline (`setup_dataset` calls `H5Pset_filter`
 * once), so the byte-shuffle filter cannot be added before deflate: the files use deflate alone.
 *
 * HDF5 stores object modification times in object headers. To make the bytes depend only on
 * the data, every h5wasm call runs with `Date.now` held at a fixed instant ({@link FIXED_CLOCK_MS}),
 * the clock emscripten's `time()` reads. The file is written to a temporary sibling and renamed
 * into place by {@link Netcdf4Writer.close}.
 */
import type { Dataset, File as H5File } from 'h5wasm';
import { mkdirSync, renameSync, rmSync } from 'node:fs';
import { dirname } from 'node:path';
import { temporarySibling } from '../model/effects.ts';

/** The instant all HDF5 object times are stamped with [ms since 1970 UTC] (2000-01-01 00:00 UTC). */
export const FIXED_CLOCK_MS = Date.UTC(2000, 0, 1);

/** An attribute: ASCII text, or a number stored with an explicit HDF5 type. */
export type Nc4AttrValue = string | { dtype: '<f' | '<d' | '<i' | '<h' | '<q'; value: number };
export type Nc4Attrs = Array<[string, Nc4AttrValue]>;

/** A dimension with its coordinate variable. */
export interface Nc4Dimension {
  name: string;
  /** Coordinate values: float64 [unit in attrs] or int64 (e.g. seconds since an epoch). */
  values: Float64Array | BigInt64Array;
  attrs: Nc4Attrs;
}

/** A non-dimension coordinate: a scalar int64, or one string per step of a dimension. */
export type Nc4Coordinate =
  | { kind: 'scalar-int64'; name: string; value: bigint; attrs: Nc4Attrs }
  | { kind: 'strings'; name: string; dim: string; values: string[]; attrs: Nc4Attrs };

/** A float32 data variable over `dims` (first dim is written in blocks). */
export interface Nc4Variable {
  name: string;
  dims: string[];
  attrs: Nc4Attrs;
  /** Chunk shape [values per dim]. */
  chunks: number[];
  /** zlib deflate level [1–9]. */
  deflateLevel: number;
}

export interface Nc4Spec {
  dims: Nc4Dimension[];
  coords: Nc4Coordinate[];
  vars: Nc4Variable[];
  globalAttrs: Nc4Attrs;
}

/** Runs `fn` with `Date.now` held at {@link FIXED_CLOCK_MS}. */
function atFixedClock<T>(fn: () => T): T {
  const real = Date.now;
  Date.now = () => FIXED_CLOCK_MS;
  try {
    return fn();
  } finally {
    Date.now = real;
  }
}

function putAttrs(target: { create_attribute: H5File['create_attribute'] }, attrs: Nc4Attrs): void {
  for (const [name, value] of attrs) {
    if (typeof value === 'string') {
      if (!/^[\x20-\x7e]+$/.test(value)) throw new Error(`netcdf4-writer: attribute ${name} must be non-empty printable ASCII`);
      target.create_attribute(name, value, null, `A${value.length}`);
    } else {
      const data =
        value.dtype === '<f'
          ? new Float32Array([value.value])
          : value.dtype === '<d'
            ? new Float64Array([value.value])
            : value.dtype === '<i'
              ? new Int32Array([value.value])
              : value.dtype === '<h'
                ? new Int16Array([value.value])
                : new BigInt64Array([BigInt(value.value)]);
      target.create_attribute(name, data, [], value.dtype);
    }
  }
}

type H5wasmModule = typeof import('h5wasm/node')['default'];
let h5wasm: H5wasmModule | undefined;

/**
 * Loads the h5wasm module once. Loaded on demand: instantiating it reserves several hundred MB,
 * which a run that writes only legacy files does not need.
 */
export async function h5wasmReady(): Promise<void> {
  if (!h5wasm) h5wasm = (await import('h5wasm/node')).default;
  await h5wasm.ready;
}

/** Writes one NetCDF-4 file: coordinates at open, data variables in blocks along time. */
export class Netcdf4Writer {
  readonly path: string;
  private readonly tmp: string;
  private readonly file: H5File;
  private readonly datasets = new Map<string, { ds: Dataset; shape: number[]; written: number }>();
  private closed = false;

  /** Call {@link h5wasmReady} once before constructing. */
  constructor(path: string, spec: Nc4Spec) {
    this.path = path;
    mkdirSync(dirname(path), { recursive: true });
    this.tmp = temporarySibling(path);
    const dimLength = new Map(spec.dims.map((d) => [d.name, d.values.length]));
    const lib = h5wasm;
    if (!lib) throw new Error('netcdf4-writer: call h5wasmReady() first');
    this.file = atFixedClock(() => new lib.File(this.tmp, 'w', { track_order: true }));
    try {
      atFixedClock(() => {
        const f = this.file;
        spec.dims.forEach((d, id) => {
          const isInt = d.values instanceof BigInt64Array;
          const ds = f.create_dataset({ name: d.name, data: d.values, shape: [d.values.length], dtype: isInt ? '<q' : '<d', track_order: true });
          putAttrs(ds, d.attrs);
          ds.make_scale(d.name);
          ds.create_attribute('_Netcdf4Dimid', new Int32Array([id]), [], '<i');
        });
        for (const c of spec.coords) {
          if (c.kind === 'scalar-int64') {
            const ds = f.create_dataset({ name: c.name, data: new BigInt64Array([c.value]), shape: [], dtype: '<q', track_order: true });
            putAttrs(ds, c.attrs);
          } else {
            if (c.values.length !== dimLength.get(c.dim)) throw new Error(`netcdf4-writer: ${c.name} needs one string per ${c.dim}`);
            const ds = f.create_dataset({ name: c.name, data: c.values, shape: [c.values.length], track_order: true });
            putAttrs(ds, c.attrs);
            ds.attach_scale(0, `/${c.dim}`);
          }
        }
        for (const v of spec.vars) {
          const shape = v.dims.map((d) => {
            const n = dimLength.get(d);
            if (n === undefined) throw new Error(`netcdf4-writer: ${v.name} uses undeclared dimension ${d}`);
            return n;
          });
          const chunks = v.chunks.map((c, i) => Math.max(1, Math.min(c, shape[i])));
          const ds = f.create_dataset({
            name: v.name,
            data: new Float32Array(0),
            shape: [0, ...shape.slice(1)],
            maxshape: [shape[0], ...shape.slice(1)],
            dtype: '<f',
            chunks,
            compression: 'gzip',
            compression_opts: v.deflateLevel,
            track_order: true,
          });
          ds.create_attribute('_FillValue', new Float32Array([NaN]), [], '<f');
          putAttrs(ds, v.attrs);
          v.dims.forEach((d, i) => ds.attach_scale(i, `/${d}`));
          this.datasets.set(v.name, { ds, shape, written: 0 });
        }
        putAttrs(f, spec.globalAttrs);
      });
    } catch (e) {
      this.abort();
      throw e;
    }
  }

  /**
   * Appends `nSteps` steps along the first dimension of `name` (values row-major over the
   * remaining dims). Blocks must arrive in order.
   */
  writeBlock(name: string, nSteps: number, values: Float32Array): void {
    const d = this.datasets.get(name);
    if (!d) throw new Error(`netcdf4-writer: no variable ${name}`);
    const per = d.shape.slice(1).reduce((a, b) => a * b, 1);
    if (values.length !== nSteps * per) throw new Error(`netcdf4-writer: block of ${name} needs ${nSteps * per} values`);
    if (d.written + nSteps > d.shape[0]) throw new Error(`netcdf4-writer: ${name} has only ${d.shape[0]} steps`);
    const t0 = d.written;
    atFixedClock(() => {
      d.ds.resize([t0 + nSteps, ...d.shape.slice(1)]);
      d.ds.write_slice([[t0, t0 + nSteps], ...d.shape.slice(1).map((n) => [0, n] as [number, number])], values);
    });
    d.written += nSteps;
  }

  /** Checks that every variable was filled, closes the file and renames it into place. */
  close(): void {
    if (this.closed) return;
    for (const [name, d] of this.datasets) {
      if (d.written !== d.shape[0]) {
        this.abort();
        throw new Error(`netcdf4-writer: ${name} closed after ${d.written}/${d.shape[0]} steps`);
      }
    }
    atFixedClock(() => this.file.close());
    this.closed = true;
    renameSync(this.tmp, this.path);
  }

  /** Gives up: closes and removes the temporary file; the target path is left as it was. */
  abort(): void {
    if (this.closed) return;
    this.closed = true;
    try {
      atFixedClock(() => this.file.close());
    } catch {
      /* the file may already be unusable; removing it is what matters */
    } finally {
      rmSync(this.tmp, { force: true });
    }
  }
}
