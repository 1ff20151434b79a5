/**
 * A streaming writer of NetCDF-3 classic (CDF-1) and 64-bit-offset (CDF-2) files, written from the published format
 * specification ("The NetCDF Classic Format Specification", Unidata NetCDF User's Guide,
 * appendix "File Format Specifications"): magic `CDF\x01`, the number of records, the dimension,
 * global-attribute and variable lists, then the data of the fixed-size variables, then the
 * records, each record holding one slab of every record variable in header order. Everything is
 * big-endian; names, attribute values and variable slabs are padded to 4 bytes.
 *
 * The header is written first (the number of records is known in advance), then fixed variables
 * one by one (each whole, or appended in consecutive pieces: {@link Netcdf3Writer.appendFixed}),
 * then records one by one, so a year of data, or a country's grid of figures, is never held in
 * memory at once. The 64-bit-offset variant (magic `CDF\x02`) differs only in 8-byte `begin`
 * offsets, so files past 2 GiB are possible.
 * The file is written to a temporary sibling and renamed into place by {@link Netcdf3Writer.close};
 * {@link Netcdf3Writer.abort} removes the temporary file.
 */
import { closeSync, fsyncSync, mkdirSync, openSync, renameSync, rmSync, writeSync } from 'node:fs';
import { dirname } from 'node:path';
import { temporarySibling } from '../model/effects.ts';

/** NetCDF-3 external types and their codes (spec: nc_type). */
export const NC3_TYPES = { byte: 1, char: 2, short: 3, int: 4, float: 5, double: 6 } as const;
export type Nc3Type = keyof typeof NC3_TYPES;
const TYPE_SIZE: Record<Nc3Type, number> = { byte: 1, char: 1, short: 2, int: 4, float: 4, double: 8 };

/** An attribute value: text (NC_CHAR), or numbers of one numeric type. */
export type Nc3AttrValue = string | { type: Exclude<Nc3Type, 'char'>; values: ArrayLike<number> };

export interface Nc3Attr {
  name: string;
  value: Nc3AttrValue;
}

export interface Nc3Dim {
  name: string;
  /** Length [–]; `'unlimited'` makes it the record dimension (at most one, first in `dims` of a variable). */
  length: number | 'unlimited';
}

export interface Nc3Var {
  name: string;
  /** External type; `char` variables take their values as character codes (0–255). */
  type: Nc3Type;
  /** Dimension names, outermost first. A record variable has the record dimension first. */
  dims: string[];
  attrs: Nc3Attr[];
}

export interface Nc3Header {
  dims: Nc3Dim[];
  attrs: Nc3Attr[];
  vars: Nc3Var[];
  /** Number of records that will be written [–] (0 when there is no record dimension). */
  numRecords: number;
  /** `classic` (CDF-1, default) or `64bit-offset` (CDF-2). */
  format?: 'classic' | '64bit-offset';
}

/** Values of one variable slab, in the variable's type (converted on write). */
export type Nc3Values = ArrayLike<number>;

const NC_DIMENSION = 0x0a;
const NC_VARIABLE = 0x0b;
const NC_ATTRIBUTE = 0x0c;
/** Largest begin offset of CDF-1 (32-bit signed) [bytes]. */
const MAX_OFFSET_CDF1 = 2 ** 31 - 1;
/** Largest vsize field (32-bit unsigned); larger variables write this value (spec). */
const MAX_VSIZE = 2 ** 32 - 1;

const pad4 = (n: number): number => (n + 3) & ~3;

/** Growable big-endian byte buffer for the header. */
class HeaderBytes {
  private buf = new Uint8Array(4096);
  private view = new DataView(this.buf.buffer);
  length = 0;
  private ensure(n: number): void {
    if (this.length + n <= this.buf.length) return;
    const next = new Uint8Array(Math.max(this.buf.length * 2, this.length + n));
    next.set(this.buf);
    this.buf = next;
    this.view = new DataView(next.buffer);
  }
  int(v: number): void {
    this.ensure(4);
    this.view.setInt32(this.length, v);
    this.length += 4;
  }
  uint(v: number): void {
    this.ensure(4);
    this.view.setUint32(this.length, v);
    this.length += 4;
  }
  int64(v: number): void {
    this.ensure(8);
    this.view.setBigInt64(this.length, BigInt(v));
    this.length += 8;
  }
  bytes(b: Uint8Array): void {
    this.ensure(pad4(b.length));
    this.buf.set(b, this.length);
    this.length += pad4(b.length);
  }
  name(s: string): void {
    const b = new TextEncoder().encode(s);
    this.int(b.length);
    this.bytes(b);
  }
  result(): Uint8Array {
    return this.buf.slice(0, this.length);
  }
}

function encodeValues(type: Nc3Type, values: Nc3Values, out: Uint8Array, offset: number): void {
  const v = new DataView(out.buffer, out.byteOffset, out.byteLength);
  const n = values.length;
  switch (type) {
    case 'byte':
    case 'char':
      for (let i = 0; i < n; i++) v.setInt8(offset + i, values[i]);
      break;
    case 'short':
      for (let i = 0; i < n; i++) v.setInt16(offset + 2 * i, values[i]);
      break;
    case 'int':
      for (let i = 0; i < n; i++) v.setInt32(offset + 4 * i, values[i]);
      break;
    case 'float':
      for (let i = 0; i < n; i++) v.setFloat32(offset + 4 * i, values[i]);
      break;
    case 'double':
      for (let i = 0; i < n; i++) v.setFloat64(offset + 8 * i, values[i]);
      break;
  }
}

function writeAttrList(h: HeaderBytes, attrs: Nc3Attr[]): void {
  if (attrs.length === 0) {
    h.int(0);
    h.int(0);
    return;
  }
  h.int(NC_ATTRIBUTE);
  h.int(attrs.length);
  for (const a of attrs) {
    h.name(a.name);
    if (typeof a.value === 'string') {
      const b = new TextEncoder().encode(a.value);
      h.int(NC3_TYPES.char);
      h.int(b.length);
      h.bytes(b);
    } else {
      const { type, values } = a.value;
      const b = new Uint8Array(values.length * TYPE_SIZE[type]);
      encodeValues(type, values, b, 0);
      h.int(NC3_TYPES[type]);
      h.int(values.length);
      h.bytes(b);
    }
  }
}

/** Layout of one variable in the file, computed from the header. */
interface VarLayout {
  v: Nc3Var;
  isRecord: boolean;
  /** Number of values in the whole variable (fixed) or in one record (record variable) [–]. */
  count: number;
  /** Bytes of the whole variable (fixed) or of one record slab, padded to 4 [bytes]. */
  vsize: number;
  begin: number;
}

function layoutOf(header: Nc3Header): { bytes: Uint8Array; vars: VarLayout[]; recordSize: number } {
  const dimIndex = new Map<string, number>();
  header.dims.forEach((d, i) => {
    if (dimIndex.has(d.name)) throw new Error(`netcdf3-writer: dimension ${d.name} declared twice`);
    dimIndex.set(d.name, i);
  });
  const unlimited = header.dims.filter((d) => d.length === 'unlimited');
  if (unlimited.length > 1) throw new Error('netcdf3-writer: at most one unlimited dimension');
  const vars: VarLayout[] = header.vars.map((v) => {
    let count = 1;
    let isRecord = false;
    v.dims.forEach((name, k) => {
      const i = dimIndex.get(name);
      if (i === undefined) throw new Error(`netcdf3-writer: variable ${v.name} uses undeclared dimension ${name}`);
      const len = header.dims[i].length;
      if (len === 'unlimited') {
        if (k !== 0) throw new Error(`netcdf3-writer: the record dimension must come first in ${v.name}`);
        isRecord = true;
      } else count *= len;
    });
    return { v, isRecord, count, vsize: pad4(count * TYPE_SIZE[v.type]), begin: 0 };
  });
  const recordVars = vars.filter((l) => l.isRecord);
  // Spec: a single record variable of byte/char/short is not padded within the record.
  if (recordVars.length === 1) recordVars[0].vsize = recordVars[0].count * TYPE_SIZE[recordVars[0].v.type];
  const recordSize = recordVars.reduce((s, l) => s + l.vsize, 0);

  const wide = header.format === '64bit-offset';
  const build = (): HeaderBytes => {
    const h = new HeaderBytes();
    h.bytes(new Uint8Array([0x43, 0x44, 0x46, wide ? 0x02 : 0x01]));
    h.int(unlimited.length ? header.numRecords : 0);
    if (header.dims.length === 0) {
      h.int(0);
      h.int(0);
    } else {
      h.int(NC_DIMENSION);
      h.int(header.dims.length);
      for (const d of header.dims) {
        h.name(d.name);
        h.int(d.length === 'unlimited' ? 0 : d.length);
      }
    }
    writeAttrList(h, header.attrs);
    if (vars.length === 0) {
      h.int(0);
      h.int(0);
    } else {
      h.int(NC_VARIABLE);
      h.int(vars.length);
      for (const l of vars) {
        h.name(l.v.name);
        h.int(l.v.dims.length);
        for (const d of l.v.dims) h.int(dimIndex.get(d)!);
        writeAttrList(h, l.v.attrs);
        h.int(NC3_TYPES[l.v.type]);
        if (wide) h.uint(Math.min(l.vsize, MAX_VSIZE));
        else h.int(Math.min(l.vsize, MAX_OFFSET_CDF1));
        if (wide) h.int64(l.begin);
        else h.int(l.begin);
      }
    }
    return h;
  };
  // The header's size does not depend on the begin values, so build once to measure, then again.
  let offset = build().length;
  for (const l of vars.filter((x) => !x.isRecord)) {
    l.begin = offset;
    offset += l.vsize;
  }
  for (const l of recordVars) {
    l.begin = offset;
    offset += l.vsize;
  }
  const last = offset + recordSize * Math.max(0, header.numRecords - 1);
  if (!wide && last > MAX_OFFSET_CDF1) throw new Error(`netcdf3-writer: ${last} bytes do not fit the CDF-1 format (2 GiB offsets); use format '64bit-offset'`);
  return { bytes: build().result(), vars, recordSize };
}

/** Writes one NetCDF-3 classic file in order: fixed variables, then records. */
export class Netcdf3Writer {
  readonly path: string;
  private readonly tmp: string;
  private fd: number;
  private readonly vars: VarLayout[];
  private readonly fixedOrder: VarLayout[];
  private readonly recordVars: VarLayout[];
  private readonly recordBuf: Uint8Array;
  private readonly numRecords: number;
  private nextFixed = 0;
  /** Values of the current fixed variable written so far by appendFixed [–]. */
  private fixedDone = 0;
  private recordsWritten = 0;
  private closed = false;

  constructor(path: string, header: Nc3Header) {
    const { bytes, vars, recordSize } = layoutOf(header);
    this.path = path;
    this.vars = vars;
    this.fixedOrder = vars.filter((l) => !l.isRecord);
    this.recordVars = vars.filter((l) => l.isRecord);
    this.recordBuf = new Uint8Array(recordSize);
    this.numRecords = this.recordVars.length ? header.numRecords : 0;
    mkdirSync(dirname(path), { recursive: true });
    this.tmp = temporarySibling(path);
    this.fd = openSync(this.tmp, 'w');
    this.put(bytes);
  }

  private put(b: Uint8Array): void {
    let done = 0;
    while (done < b.length) done += writeSync(this.fd, b, done, b.length - done);
  }

  /** Byte offset of a variable's data in the file (its `begin`) [bytes]. For tests and tools. */
  beginOf(name: string): number {
    const l = this.vars.find((x) => x.v.name === name);
    if (!l) throw new Error(`netcdf3-writer: no variable ${name}`);
    return l.begin;
  }

  /** Writes the whole of the next fixed-size variable; must be called in header order. */
  writeFixed(name: string, values: Nc3Values): void {
    const l = this.fixedOrder[this.nextFixed];
    if (!l || l.v.name !== name) throw new Error(`netcdf3-writer: expected fixed variable ${l?.v.name ?? '(none left)'}, got ${name}`);
    if (values.length !== l.count) throw new Error(`netcdf3-writer: ${name} needs ${l.count} values, got ${values.length}`);
    if (this.fixedDone !== 0) throw new Error(`netcdf3-writer: ${name} was begun with appendFixed`);
    const b = new Uint8Array(l.vsize);
    encodeValues(l.v.type, values, b, 0);
    this.put(b);
    this.nextFixed++;
  }

  /**
   * Appends the next values of the next fixed-size variable (C order); the variable is done, and
   * its padding written, when all its values have come. Must follow header order like writeFixed.
   */
  appendFixed(name: string, values: Nc3Values): void {
    const l = this.fixedOrder[this.nextFixed];
    if (!l || l.v.name !== name) throw new Error(`netcdf3-writer: expected fixed variable ${l?.v.name ?? '(none left)'}, got ${name}`);
    if (this.fixedDone + values.length > l.count) throw new Error(`netcdf3-writer: ${name} needs ${l.count} values, got ${this.fixedDone + values.length}`);
    const size = TYPE_SIZE[l.v.type];
    const b = new Uint8Array(values.length * size);
    encodeValues(l.v.type, values, b, 0);
    this.put(b);
    this.fixedDone += values.length;
    if (this.fixedDone === l.count) {
      const padding = l.vsize - l.count * size;
      if (padding > 0) this.put(new Uint8Array(padding));
      this.fixedDone = 0;
      this.nextFixed++;
    }
  }

  /** Writes the next record: one slab per record variable, keyed by variable name. */
  writeRecord(slabs: Record<string, Nc3Values>): void {
    if (this.nextFixed !== this.fixedOrder.length) throw new Error('netcdf3-writer: write every fixed variable before the records');
    if (this.recordsWritten >= this.numRecords) throw new Error(`netcdf3-writer: only ${this.numRecords} records were declared`);
    this.recordBuf.fill(0);
    let off = 0;
    for (const l of this.recordVars) {
      const values = slabs[l.v.name];
      if (!values || values.length !== l.count) throw new Error(`netcdf3-writer: record slab of ${l.v.name} needs ${l.count} values`);
      encodeValues(l.v.type, values, this.recordBuf, off);
      off += l.vsize;
    }
    this.put(this.recordBuf);
    this.recordsWritten++;
  }

  /** Checks that everything declared was written, then renames the file into place. */
  close(): void {
    if (this.closed) return;
    if (this.nextFixed !== this.fixedOrder.length || this.recordsWritten !== this.numRecords) {
      this.abort();
      throw new Error(`netcdf3-writer: ${this.path} closed after ${this.recordsWritten}/${this.numRecords} records`);
    }
    fsyncSync(this.fd);
    closeSync(this.fd);
    this.closed = true;
    renameSync(this.tmp, this.path);
  }

  /** Gives up: closes and removes the temporary file; the target path is left as it was. */
  abort(): void {
    if (this.closed) return;
    this.closed = true;
    try {
      closeSync(this.fd);
    } finally {
      rmSync(this.tmp, { force: true });
    }
  }
}
