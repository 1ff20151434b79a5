/**
 * The partial file: one shard's integer counts (ShardPartial) on disk, for the cache, for
 * distributed runs (`heathours build --shard K/N --partials DIR`) and for the merge. Lossless:
 * decoding gives back the exact arrays, so a merge of decoded partials equals a merge of the
 * partials in memory, byte for byte.
 *
 * Layout (all integers little-endian):
 *   8 bytes   magic "HHPART\x01\n" (the 7th byte is the format version)
 *   4 bytes   uint32 length H of the header
 *   H bytes   header, UTF-8 JSON: { format, meta, evalKeys, exposures, months, fields: [{ name, type, length }], payloadBytes }
 *   P bytes   payload: raw DEFLATE (RFC 1951, zlib level 1) of the fields' bytes in header order;
 *             the histogram (months of the piece only, month-major) is stored sparse first (per
 *             month × hour × cell × exposure slot: uint16 first bin, uint16 n, then n uint16
 *             counts), since most bins are empty
 *   32 bytes  SHA-256 of everything before it
 * A truncated, corrupt or foreign file fails the checksum or the structure checks with
 * PartialCorrupt (naming the file); a file of another format version with PartialFormatUnknown.
 */
import { createHash } from 'node:crypto';
import { deflateRawSync, inflateRawSync } from 'node:zlib';
import type { ShardPartial } from '../reduce/accumulator.ts';
import { HIST_LEN, MONTHS } from '../reduce/layout.ts';
import { denseHistogram, sparseHistogram, sparseHistogramProblem } from '../reduce/sparse-histogram.ts';
import type { SparsePartial } from '../reduce/merge.ts';
import type { Exposure } from '../work/work-settings.ts';
import { PartialCorrupt, PartialFormatUnknown } from '../reduce/errors.ts';

/** Version of the file layout; bump on any change of the bytes written. */
export const PARTIAL_FORMAT = 3;
const MAGIC = Buffer.from([0x48, 0x48, 0x50, 0x41, 0x52, 0x54, PARTIAL_FORMAT, 0x0a]);
const DIGEST_BYTES = 32;

/** What a partial file says about where it came from (pipeline/run/shard-key.ts fills it). */
export interface PartialMeta {
  shardId: string;
  year: number;
  tileIndex: number;
  /** Cache key: SHA-256 of the provenance below [hex]. */
  key: string;
  provenance: Record<string, unknown>;
  /**
   * Physics counts and cell-hours of the computation, for the build report; for a scenario's shard
   * also the clamps its changes made (pipeline/physics/delta-change.ts).
   */
  report: { cellHours: number; physics: Record<string, number>; change?: Record<string, number> };
}

type ArrayField = Exclude<keyof ShardPartial, 'year' | 'evalKeys' | 'exposures' | 'months'>;
type TypeName = 'Int32Array' | 'Uint32Array' | 'Float64Array' | 'Int16Array' | 'Uint16Array';
const CTORS = { Int32Array, Uint32Array, Float64Array, Int16Array, Uint16Array } as const;

/** The array fields in file order (the histogram last, stored sparse). */
const FIELDS: ArrayField[] = [
  'cells',
  'coveredHours',
  'expectedHours',
  'validHours',
  'shiftHours',
  'aboveAll',
  'aboveShift',
  'lostShift',
  'capacityLoss',
  'wbgtSum',
  'wbgtMax',
  'airSum',
  'airHours',
  'failedHours',
  'histogram',
];

interface FieldEntry {
  name: ArrayField;
  type: TypeName;
  /** Elements of the decoded array. */
  length: number;
  /** Bytes in the payload (the sparse form for the histogram). */
  bytes: number;
}

interface Header {
  format: number;
  meta: PartialMeta;
  evalKeys: string[];
  /** The exposures the per-exposure counts hold (ShardPartial.exposures). */
  exposures: Exposure[];
  /** Local months [m0, m1) of the histogram (0 = January). */
  months: [number, number];
  fields: FieldEntry[];
  payloadBytes: number;
}

function bytesOf(a: ArrayBufferView): Buffer {
  return Buffer.from(a.buffer, a.byteOffset, a.byteLength);
}

/** Encodes a partial and its provenance into the bytes of a partial file. */
export function encodePartial(p: ShardPartial, meta: PartialMeta): Uint8Array {
  const parts: Buffer[] = [];
  const fields: FieldEntry[] = FIELDS.map((name) => {
    const a = p[name];
    const stored = name === 'histogram' ? sparseHistogram(a as Uint16Array) : a;
    const buf = bytesOf(stored);
    parts.push(buf);
    return { name, type: a.constructor.name as TypeName, length: a.length, bytes: buf.length };
  });
  const payload = deflateRawSync(Buffer.concat(parts), { level: 1 });
  const header: Header = { format: PARTIAL_FORMAT, meta, evalKeys: p.evalKeys, exposures: p.exposures, months: p.months, fields, payloadBytes: payload.length };
  const headerBytes = Buffer.from(JSON.stringify(header), 'utf8');
  const len = Buffer.alloc(4);
  len.writeUInt32LE(headerBytes.length);
  const body = Buffer.concat([MAGIC, len, headerBytes, payload]);
  const digest = createHash('sha256').update(body).digest();
  return Buffer.concat([body, digest]);
}

/** Reads the header of a partial file after checking its checksum (no payload decoding). */
export function readPartialHeader(bytes: Uint8Array, file: string): { meta: PartialMeta; header: Header; payloadStart: number } {
  const buf = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  if (buf.length < MAGIC.length + 4 + DIGEST_BYTES) throw PartialCorrupt({ file, detail: `only ${buf.length} bytes` });
  if (!buf.subarray(0, 6).equals(MAGIC.subarray(0, 6))) throw PartialCorrupt({ file, detail: 'it does not start like a heathours partial file' });
  if (buf[6] !== PARTIAL_FORMAT) throw PartialFormatUnknown({ file, format: buf[6], expected: PARTIAL_FORMAT });
  const body = buf.subarray(0, buf.length - DIGEST_BYTES);
  const want = buf.subarray(buf.length - DIGEST_BYTES);
  if (!createHash('sha256').update(body).digest().equals(want))
    throw PartialCorrupt({ file, detail: 'checksum mismatch (truncated or changed after it was written)' });
  const hLen = buf.readUInt32LE(MAGIC.length);
  const hStart = MAGIC.length + 4;
  if (hStart + hLen > body.length) throw PartialCorrupt({ file, detail: 'header runs past the end' });
  let header: Header;
  try {
    header = JSON.parse(buf.subarray(hStart, hStart + hLen).toString('utf8')) as Header;
  } catch {
    throw PartialCorrupt({ file, detail: 'header is not JSON' });
  }
  if (header.format !== PARTIAL_FORMAT) throw PartialFormatUnknown({ file, format: header.format, expected: PARTIAL_FORMAT });
  if (hStart + hLen + header.payloadBytes !== body.length) throw PartialCorrupt({ file, detail: 'payload length does not match the header' });
  const m = header.months;
  if (!Array.isArray(m) || m.length !== 2 || !Number.isInteger(m[0]) || !Number.isInteger(m[1]) || m[0] < 0 || m[1] > MONTHS || m[0] >= m[1]) {
    throw PartialCorrupt({ file, detail: `its months ${JSON.stringify(m)} are not a range of local months` });
  }
  const x = header.exposures;
  if (!Array.isArray(x) || x.length < 2 || x.length > 3 || x[0] !== 'sun' || x[1] !== 'shade' || (x.length === 3 && x[2] !== 'shelter')) {
    throw PartialCorrupt({ file, detail: `its exposures ${JSON.stringify(x)} are not sun, shade (and shelter)` });
  }
  return { meta: header.meta, header, payloadStart: hStart + hLen };
}

/** Decodes a whole partial file (checksum, header, payload) back into the partial. */
export function decodePartial(bytes: Uint8Array, file: string): { meta: PartialMeta; partial: ShardPartial } {
  const { meta, partial, slots } = decodeSparse(bytes, file);
  const { sparseHistogram: sparse, ...rest } = partial;
  return { meta, partial: { ...rest, histogram: denseHistogram(sparse, slots) } };
}

/**
 * Decodes a partial file keeping the histogram in its sparse form (pipeline/reduce/sparse-histogram.ts),
 * checked, for a merge that adds it into the year as it is (pipeline/reduce/merge.ts).
 */
export function decodePartialSparse(bytes: Uint8Array, file: string): { meta: PartialMeta; partial: SparsePartial } {
  const { meta, partial } = decodeSparse(bytes, file);
  return { meta, partial };
}

function decodeSparse(bytes: Uint8Array, file: string): { meta: PartialMeta; partial: SparsePartial; slots: number } {
  const { meta, header, payloadStart } = readPartialHeader(bytes, file);
  const buf = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  let raw: Buffer;
  try {
    raw = inflateRawSync(buf.subarray(payloadStart, payloadStart + header.payloadBytes));
  } catch (e) {
    throw PartialCorrupt({ file, detail: `payload does not inflate (${(e as Error).message})` });
  }
  const out: Partial<Record<ArrayField, ArrayBufferView>> = {};
  let sparse: Uint16Array | undefined;
  let slots = 0;
  let off = 0;
  for (const f of header.fields) {
    const ctor = CTORS[f.type];
    if (!ctor || !FIELDS.includes(f.name)) throw PartialCorrupt({ file, detail: `unknown field ${f.name} of type ${f.type}` });
    if (off + f.bytes > raw.length) throw PartialCorrupt({ file, detail: `field ${f.name} runs past the payload` });
    // Copy into a fresh, aligned buffer.
    const slice = new Uint8Array(f.bytes);
    slice.set(raw.subarray(off, off + f.bytes));
    off += f.bytes;
    if (f.name === 'histogram') {
      if (f.length % HIST_LEN !== 0 || (f.bytes & 1) !== 0)
        throw PartialCorrupt({ file, detail: `histogram of ${f.length} bins is not whole slots of ${HIST_LEN}` });
      sparse = new Uint16Array(slice.buffer);
      slots = f.length / HIST_LEN;
      const problem = sparseHistogramProblem(sparse, slots);
      if (problem !== undefined) throw PartialCorrupt({ file, detail: problem });
      out.histogram = sparse;
    } else {
      const a = new ctor(slice.buffer);
      if (a.length !== f.length) throw PartialCorrupt({ file, detail: `field ${f.name} holds ${a.length} values, header says ${f.length}` });
      out[f.name] = a;
    }
  }
  if (off !== raw.length) throw PartialCorrupt({ file, detail: `${raw.length - off} payload bytes left over` });
  for (const name of FIELDS) if (!out[name]) throw PartialCorrupt({ file, detail: `field ${name} is missing` });
  const { histogram: _, ...fields } = out as unknown as Omit<ShardPartial, 'year' | 'evalKeys' | 'exposures' | 'months'>;
  return {
    meta,
    partial: {
      ...fields,
      sparseHistogram: sparse!,
      year: meta.year,
      evalKeys: header.evalKeys,
      exposures: [...header.exposures],
      months: [header.months[0], header.months[1]],
    },
    slots,
  };
}
