/**
 * Describes a NetCDF-4 file in JavaScript, without the HDF5 library: the same
 * {@link Hdf5Description} the metadata worker makes through h5wasm (hdf5-describe.ts), from the
 * file's own structures (HDF5 File Format Specification version 3.0): the superblock (§II.A,
 * hdf5-struct.ts), object headers (§IV.A.1, hdf5-layout.ts), groups (hdf5-groups.ts), the
 * messages of datasets and their attributes (hdf5-messages.ts), the global heap for
 * DIMENSION_LIST and variable-length strings (hdf5-global-heap.ts, hdf5-attr-values.ts).
 *
 * Dense links and attributes are read from their fractal heaps (hdf5-dense.ts). Whatever it
 * does not read (huge fractal heaps or deep B-trees, layout version 4, shared or
 * committed datatypes, user-defined types, soft links, big-endian attributes) or what does not
 * hold together (a bound, a checksum, a cycle, a count beyond the bytes there are) makes it
 * answer `{ declined: reason }`: the caller then asks the metadata worker, as before. It never
 * throws for the file's content, reads only inside the file, and every loop is bounded by bytes
 * already read.
 */
import { open } from 'node:fs/promises';
import { attributeValue, dimensionList, rawTypeOf } from './hdf5-attr-values.ts';
import { describedVariable, type Hdf5Description, type Hdf5Variable } from './hdf5-describe.ts';
import { btree2Records, FractalHeap } from './hdf5-dense.ts';
import { GlobalHeap } from './hdf5-global-heap.ts';
import { groupMembers, isGroup, type WalkBudget } from './hdf5-groups.ts';
import { parseLayout, readObjectHeader, type Message, type ReadAt } from './hdf5-layout.ts';
import {
  MSG_ATTRIBUTE,
  MSG_ATTRIBUTE_INFO,
  MSG_DATASPACE,
  MSG_DATATYPE,
  MSG_LAYOUT,
  parseAttribute,
  parseAttributeInfo,
  parseDataspace,
  parseDatatype,
  type RawAttribute,
} from './hdf5-messages.ts';
import { le, RawLayoutRefused, readSuperblock, refuse, SUPERBLOCK_BYTES, type Hdf5Sizes } from './hdf5-struct.ts';
import type { AttrValue, RawType, SourceDimension } from './source.ts';

/** The JS reader's answer: the description, or why the file is left to the HDF5 library. */
export type JsDescription = Hdf5Description | { declined: string };

/** HDF5 attributes of the NetCDF-4 / dimension-scale machinery (as hdf5-describe.ts hides them). */
const HIDDEN_ATTRS = new Set(['CLASS', 'NAME', 'REFERENCE_LIST', 'DIMENSION_LIST', '_Netcdf4Coordinates', '_Netcdf4Dimid', '_NCProperties', '_nc3_strict']);
/** NAME of a dimension scale that is a dimension without a coordinate variable (netCDF-C). */
const PURE_DIMENSION = 'This is a netCDF dimension but not a netCDF variable';
const PLAIN: ReadonlySet<RawType> = new Set(['byte', 'ubyte', 'short', 'ushort', 'int', 'uint', 'float', 'double']);
/** Bytes h5wasm's metadata gives a variable-length string value: a pointer of its 32-bit WebAssembly build [bytes]. */
const VLEN_STRING_BYTES = 4;
/** Groups nested deeper are refused (hdf5-describe.ts throws there too). */
const MAX_DEPTH = 32;

/** Page size of the read cache [bytes]. */
const PAGE = 16 * 1024;
/** Most pages kept (memory bounded by PAGE × this: 16 MiB). */
const PAGES_KEPT = 1024;

/** Reads through a small cache of pages of the file (metadata is many small reads near each other). */
function pagedReader(read: (at: number, n: number) => Promise<Uint8Array>, fileBytes: number): ReadAt {
  const pages = new Map<number, Uint8Array>();
  const page = async (k: number): Promise<Uint8Array> => {
    let p = pages.get(k);
    if (!p) {
      p = await read(k * PAGE, Math.min(PAGE, fileBytes - k * PAGE));
      if (pages.size >= PAGES_KEPT) pages.delete(pages.keys().next().value as number);
      pages.set(k, p);
    }
    return p;
  };
  return async (at, n) => {
    const end = Math.min(at + n, fileBytes);
    if (at < 0 || at >= end) return new Uint8Array(0);
    const k0 = Math.floor(at / PAGE);
    const k1 = Math.floor((end - 1) / PAGE);
    if (k0 === k1) return (await page(k0)).subarray(at - k0 * PAGE, end - k0 * PAGE);
    const out = new Uint8Array(end - at);
    for (let k = k0; k <= k1; k++) {
      const p = await page(k);
      const from = Math.max(at, k * PAGE);
      const to = Math.min(end, k * PAGE + p.length);
      if (to > from) out.set(p.subarray(from - k * PAGE, to - k * PAGE), from - at);
    }
    return out;
  };
}

/** Whether the JS reader is turned off (HEATHOURS_NETCDF4_JSMETA=0: every file described by the HDF5 library, as before). */
export const jsMetaOff = (): boolean => process.env.HEATHOURS_NETCDF4_JSMETA === '0';

/** Describes the NetCDF-4 file at `path` of `bytes` bytes, or declines with the reason. */
export async function describeHdf5Js(path: string, bytes: number): Promise<JsDescription> {
  let fh: Awaited<ReturnType<typeof open>> | undefined;
  try {
    fh = await open(path, 'r');
    const handle = fh;
    const read = pagedReader(async (at, n) => {
      const b = Buffer.allocUnsafe(n);
      const { bytesRead } = await handle.read(b, 0, n, at);
      return new Uint8Array(b.buffer, b.byteOffset, bytesRead);
    }, bytes);
    return await describe(read, bytes);
  } catch (e) {
    if (e instanceof RawLayoutRefused) return { declined: e.message };
    // Anything else (an I/O error, or a case this reader gets wrong) is left to the library too.
    return { declined: `the JavaScript reader failed: ${e instanceof Error ? e.message : String(e)}` };
  } finally {
    await fh?.close().catch(() => undefined);
  }
}

interface Found {
  name: string;
  header: number;
  messages: Message[];
}

/** The attributes of an object header, in the order the HDF5 library lists them (H5Aiterate2). */
async function attributes(read: ReadAt, messages: Message[], s: Hdf5Sizes, fileBytes: number): Promise<RawAttribute[]> {
  const infoMsg = messages.find((m) => m.type === MSG_ATTRIBUTE_INFO);
  const info = infoMsg ? parseAttributeInfo(infoMsg.data, s) : undefined;
  const out: RawAttribute[] = [];
  let position = 0;
  for (const m of messages) {
    if (m.type !== MSG_ATTRIBUTE) continue;
    if (m.flags & 0x02) refuse('a shared attribute message');
    out.push(parseAttribute(m.data, s, m.order ?? position));
    position++;
  }
  if (info && info.heap >= 0) {
    // Dense storage: attribute messages in a fractal heap, indexed by name (version 2 B-tree
    // record type 8: heap ID, message flags, creation order, name hash).
    if (out.length > 0) refuse('an object with both dense and compact attributes');
    const heap = await FractalHeap.open(read, info.heap, s, fileBytes);
    for (const r of await btree2Records(read, info.names, 8, s, fileBytes)) {
      if (r.length < 17) refuse('attribute name index records cut short');
      if (r[8] & 0x02) refuse('a shared attribute message');
      out.push(parseAttribute(await heap.object(r.subarray(0, 8)), s, le(r, 9, 4)));
    }
  }
  const names = new Set<string>();
  for (const a of out) {
    if (names.has(a.name)) refuse(`two attributes named ${a.name}`);
    names.add(a.name);
  }
  // Creation order when the object indexes it, else by name (byte order, as strcmp).
  if (info?.indexed) return out.sort((a, b) => a.order - b.order);
  return out.sort((a, b) => Buffer.compare(Buffer.from(a.name, 'utf8'), Buffer.from(b.name, 'utf8')));
}

async function describe(read: ReadAt, bytes: number): Promise<Hdf5Description> {
  const sb = readSuperblock(await read(0, Math.min(bytes, SUPERBLOCK_BYTES)));
  if (sb.eof > bytes) refuse(`the superblock records ${sb.eof} bytes, the file has ${bytes}`);
  const s: Hdf5Sizes = { offsets: sb.offsets, lengths: sb.lengths, base: sb.base };
  const budget: WalkBudget = { visited: new Set(), members: 0 };
  const datasets: Found[] = [];
  const groups = new Set<number>();
  const header = async (at: number) => {
    if (at < 0 || at >= bytes) refuse(`an object header address ${at} outside the file`);
    return (await readObjectHeader(read, at, s)).messages;
  };
  const walk = async (messages: Message[], prefix: string, depth: number): Promise<void> => {
    if (depth > MAX_DEPTH) refuse(`groups nested more than ${MAX_DEPTH} deep at ${prefix}`);
    for (const link of await groupMembers(read, messages, s, bytes, budget)) {
      const m = await header(link.address);
      if (isGroup(m)) {
        if (groups.has(link.address)) refuse(`group ${prefix}${link.name} reached twice`);
        groups.add(link.address);
        await walk(m, `${prefix}${link.name}/`, depth + 1);
      } else if (m.some((x) => x.type === MSG_LAYOUT)) datasets.push({ name: `${prefix}${link.name}`, header: link.address, messages: m });
      else refuse(`${prefix}${link.name} is neither a group nor a variable (a committed datatype?)`);
    }
  };
  const rootMessages = await header(sb.root);
  if (!isGroup(rootMessages)) refuse('the root object is not a group');
  groups.add(sb.root);
  await walk(rootMessages, '', 0);

  const byAddress = new Map<number, string>();
  for (const d of datasets) {
    if (byAddress.has(d.header)) refuse(`variable ${d.name} is also linked as ${byAddress.get(d.header)}`);
    byAddress.set(d.header, d.name);
  }
  const heap = new GlobalHeap(read, s, bytes);
  const rootAttrs = await attributes(read, rootMessages, s, bytes);
  let netcdf = rootAttrs.some((a) => a.name === '_NCProperties');
  const dimSizes = new Map<string, SourceDimension>();
  const variables: Hdf5Variable[] = [];
  for (const { name, header: at, messages } of datasets) {
    const one = (type: number, what: string): Message => {
      const found = messages.filter((m) => m.type === type);
      if (found.length !== 1) refuse(`variable ${name} has ${found.length} ${what} messages`);
      if (found[0].flags & 0x02) refuse(`variable ${name} has a shared ${what} message`);
      return found[0];
    };
    const space = parseDataspace(one(MSG_DATASPACE, 'dataspace').data, s);
    if (space.kind === 'null') refuse(`variable ${name} has no values (null dataspace)`);
    const dtype = parseDatatype(one(MSG_DATATYPE, 'datatype').data);
    const type = rawTypeOf(dtype) ?? refuse(`variable ${name} is of a type the JavaScript reader leaves to the HDF5 library`);
    const layout = parseLayout(one(MSG_LAYOUT, 'data layout').data, s);
    const shape = space.dims;
    const raw = await attributes(read, messages, s, bytes);
    const rawByName = new Map(raw.map((a) => [a.name, a]));
    const cls = rawByName.get('CLASS');
    const isScale = cls !== undefined && (await attributeValue(cls, heap, s)).value === 'DIMENSION_SCALE';
    if (isScale || rawByName.has('DIMENSION_LIST') || rawByName.has('_Netcdf4Dimid') || rawByName.has('_Netcdf4Coordinates')) netcdf = true;
    const attrs: Record<string, AttrValue> = {};
    const attrTypes: Record<string, RawType> = {};
    for (const a of raw) {
      if (HIDDEN_ATTRS.has(a.name)) continue;
      const v = await attributeValue(a, heap, s);
      attrs[a.name] = v.value;
      attrTypes[a.name] = v.type;
    }
    let scales: number[][] | undefined;
    if (!(isScale && shape.length === 1) && shape.length > 0) {
      const list = rawByName.get('DIMENSION_LIST');
      if (list) {
        scales = await dimensionList(list, heap, s);
        if (scales.length !== shape.length) refuse(`variable ${name} lists scales for ${scales.length} of its ${shape.length} dimensions`);
      }
    }
    const dims: string[] = [];
    for (let i = 0; i < shape.length; i++) {
      let dn: string | undefined;
      if (isScale && shape.length === 1) dn = name;
      else if (scales && scales[i].length > 0) {
        dn = byAddress.get(scales[i][0]);
        if (dn === undefined) refuse(`variable ${name}: dimension ${i} refers to an object that is not a variable`);
      }
      dn ??= `${name}_dim${i}`;
      dims.push(dn);
      if (!dimSizes.has(dn)) dimSizes.set(dn, { name: dn, size: shape[i], unlimited: space.unlimited[i] });
    }
    const nameAttr = isScale ? rawByName.get('NAME') : undefined;
    if (nameAttr) {
      const v = (await attributeValue(nameAttr, heap, s)).value;
      if (typeof v === 'string' && v.startsWith(PURE_DIMENSION)) continue;
    }
    const chunk0 = layout.kind === 'chunked' ? layout.dims[0] : 1;
    const littleEndian = dtype.cls === 'int' || dtype.cls === 'float' ? dtype.littleEndian : false;
    const valueBytes = dtype.cls === 'vstring' ? VLEN_STRING_BYTES : dtype.size;
    variables.push(describedVariable({ name, dims, shape, type, attrs, attrTypes }, chunk0, valueBytes, PLAIN.has(type) && littleEndian, at));
  }
  const globalAttrs: Record<string, AttrValue> = {};
  for (const a of rootAttrs) {
    if (HIDDEN_ATTRS.has(a.name)) continue;
    globalAttrs[a.name] = (await attributeValue(a, heap, s)).value;
  }
  return { netcdf, dims: [...dimSizes.values()], variables, globalAttrs };
}
