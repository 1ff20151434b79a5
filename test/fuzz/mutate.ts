/**
 * Mutants of a base file, damaged the way downloads and disks damage files: bits flipped, bytes
 * overwritten, a 512-byte sector zeroed, the file cut short, junk appended, bytes lost or
 * doubled; plus structure-aware damage (a header count, length, type or offset set to an
 * extreme value). Binary damage is weighted to the header and metadata, where it changes what a
 * reader does; text damage (CSV, YAML) to the tokens a parser looks at.
 *
 * Mutant `index` is a pure function of (seed, format, index) (draw.ts). The first mutants of each
 * format are the truncation sweep: the base cut at every structure boundary in turn; random
 * mutants follow.
 */
import { Draw } from './draw.ts';
import { inChunk, type Hdf5Map } from './structure-hdf5.ts';
import type { Netcdf3Map } from './structure-netcdf3.ts';

export type FormatId = 'netcdf3-classic' | 'netcdf3-64bit-offset' | 'netcdf4' | 'point-csv' | 'atlas-yaml';
export const FORMATS: readonly FormatId[] = ['netcdf3-classic', 'netcdf3-64bit-offset', 'netcdf4', 'point-csv', 'atlas-yaml'];

export type Base =
  | { format: 'netcdf3-classic' | 'netcdf3-64bit-offset'; bytes: Uint8Array; map: Netcdf3Map }
  | { format: 'netcdf4'; bytes: Uint8Array; map: Hdf5Map }
  | { format: 'point-csv' | 'atlas-yaml'; bytes: Uint8Array; map: TextMap };

export interface Mutant {
  bytes: Uint8Array;
  /** What was done, one step per entry (printed when the mutant fails). */
  recipe: string[];
}

/** Line starts and token boundaries of a text file [bytes]. */
export interface TextMap {
  lines: number[];
  tokens: number[];
}

export function mapText(bytes: Uint8Array): TextMap {
  const lines = [0];
  const tokens: number[] = [];
  for (let i = 0; i < bytes.length; i++) {
    const c = bytes[i];
    if (c === 0x0a && i + 1 < bytes.length) lines.push(i + 1);
    // , " : - # space [ ] { } newline: where a CSV field or a YAML token starts or ends.
    if (c === 0x2c || c === 0x22 || c === 0x3a || c === 0x2d || c === 0x23 || c === 0x20 || c === 0x5b || c === 0x5d || c === 0x7b || c === 0x7d || c === 0x0a)
      tokens.push(i);
  }
  return { lines, tokens };
}

const STREAM: Record<FormatId, number> = { 'netcdf3-classic': 1, 'netcdf3-64bit-offset': 2, netcdf4: 3, 'point-csv': 4, 'atlas-yaml': 5 };

const cutsOf = new WeakMap<Base, number[]>();

/** The structure boundaries the truncation sweep cuts at, in order [bytes] (worked out once per base). */
export function truncationPoints(base: Base): number[] {
  let cuts = cutsOf.get(base);
  if (!cuts) {
    cuts = findTruncationPoints(base);
    cutsOf.set(base, cuts);
  }
  return cuts;
}

function findTruncationPoints(base: Base): number[] {
  const pts = new Set<number>();
  if (base.format === 'netcdf4') {
    const m = base.map;
    for (const a of [0, 4, 8, 9, 12, 20, 28, 36, 44, m.superblockEnd]) pts.add(a);
    for (const b of m.blocks) pts.add(b);
    // Chunk starts and ends: every 16th chunk, and the last (a truncation anywhere in the data
    // section meets the same checks).
    m.chunks.forEach(([a, b], i) => {
      if (i % 16 === 0 || i === m.chunks.length - 1) {
        pts.add(a);
        pts.add(b);
      }
    });
    pts.add(m.size - 1);
  } else if (base.format === 'point-csv' || base.format === 'atlas-yaml') {
    // Every line start, and inside the first quoted field or key of each line.
    for (const l of base.map.lines) pts.add(l);
    let line = -1;
    for (const t of base.map.tokens) {
      const c = base.bytes[t];
      if (c === 0x0a) line = t;
      else if ((c === 0x22 || c === 0x3a) && line !== -2) {
        pts.add(t + 1);
        line = -2;
      }
    }
  } else {
    const m = base.map as Netcdf3Map;
    for (const e of m.entries) pts.add(e);
    for (const b of m.begins) pts.add(b);
    if (m.records) {
      // The record section's first records, one in the middle and the last ones.
      const { start, size, count } = m.records;
      for (const r of [1, 2, Math.floor(count / 2), count - 1]) pts.add(start + r * size);
      for (const b of m.begins) if (b >= start) pts.add(b + (count - 1) * size);
    }
    pts.add(m.size - 1);
  }
  return [...pts].filter((p) => p >= 0 && p < base.bytes.length).sort((a, b) => a - b);
}

/** Makes mutant `index` of `base` under `seed`. */
export function makeMutant(base: Base, seed: number, index: number): Mutant {
  const cuts = truncationPoints(base);
  if (index < cuts.length)
    return {
      bytes: base.bytes.slice(0, cuts[index]),
      recipe: [`truncate at ${cuts[index]} of ${base.bytes.length} bytes (structure boundary ${index + 1} of ${cuts.length})`],
    };
  const d = new Draw(seed, STREAM[base.format], index);
  let bytes: Uint8Array = base.bytes.slice();
  const recipe: string[] = [];
  const steps = 1 + d.weighted([70, 20, 10]);
  const text = base.format === 'point-csv' || base.format === 'atlas-yaml';
  for (let s = 0; s < steps; s++) bytes = text ? textStep(base, bytes, d, recipe) : binaryStep(base, bytes, d, recipe);
  return { bytes, recipe };
}

// ---------------------------------------------------------------------------------------------
// Binary damage

/** Values that break header numbers: zero, small, sign and width edges, around the file size. */
function extremes(old: number, size: number, width: number): number[] {
  const max = width === 8 ? 2 ** 53 : 2 ** 32 - 1;
  return [
    0,
    1,
    2,
    3,
    4,
    5,
    6,
    7,
    8,
    10,
    11,
    12,
    0x7f,
    0x80,
    0xff,
    0x7fff,
    0xffff,
    0x7fffffff,
    0x80000000,
    0xffffffff,
    max,
    old + 1,
    old - 1,
    old * 2,
    old + 4096,
    size,
    size + 1,
    size - 1,
  ].map((v) => Math.max(0, Math.min(max, Math.round(v))));
}

/** A position in the metadata (header / HDF5 metadata) with the given probability, else anywhere. */
function position(base: Base, len: number, d: Draw, pMeta: number): { at: number; where: string } {
  if (d.next() < pMeta) {
    if (base.format === 'netcdf4') {
      for (let k = 0; k < 64; k++) {
        const at = d.int(len);
        if (!inChunk(base.map, at)) return { at, where: 'metadata' };
      }
    } else if (base.format === 'netcdf3-classic' || base.format === 'netcdf3-64bit-offset') {
      return { at: d.int(Math.min(len, base.map.headerEnd)), where: 'header' };
    }
  }
  return { at: d.int(len), where: 'anywhere' };
}

function writeUint(bytes: Uint8Array, at: number, width: number, v: number, littleEndian: boolean): void {
  const b = new Uint8Array(8);
  new DataView(b.buffer).setBigUint64(0, BigInt(v), littleEndian);
  const part = littleEndian ? b.subarray(0, width) : b.subarray(8 - width);
  for (let i = 0; i < width && at + i < bytes.length; i++) bytes[at + i] = part[i];
}

function binaryStep(base: Base, bytes: Uint8Array, d: Draw, recipe: string[]): Uint8Array {
  const len = bytes.length;
  if (len === 0) return bytes;
  // flip, number, byte, zero sector, truncate, append, lose/double bytes
  const op = d.weighted([35, 22, 10, 10, 15, 4, 4]);
  switch (op) {
    case 0: {
      const n = 1 + d.int(4);
      for (let i = 0; i < n; i++) {
        const { at, where } = position(base, len, d, 0.85);
        const bit = d.int(8);
        bytes[at] ^= 1 << bit;
        recipe.push(`flip bit ${bit} of byte ${at} (${where})`);
      }
      return bytes;
    }
    case 1: {
      if (base.format === 'netcdf4') {
        const m = base.map;
        const width = d.pick([1, 2, 4, 8]);
        const anchor = d.next() < 0.3 ? d.pick(m.addressFields) : d.pick(m.blocks) + 4 + d.int(60);
        const v = d.pick(extremes(0, m.size, width === 8 ? 8 : 4));
        writeUint(bytes, anchor, width, width === 8 ? v : v % 2 ** (8 * width), true);
        recipe.push(`set the ${width}-byte little-endian number at ${anchor} (near an HDF5 structure) to ${v % 2 ** (8 * width)}`);
        return bytes;
      }
      if (base.format === 'netcdf3-classic' || base.format === 'netcdf3-64bit-offset') {
        const f = d.pick(base.map.numbers);
        const view = new DataView(base.bytes.buffer, base.bytes.byteOffset, base.bytes.byteLength);
        const old = f.bytes === 8 ? Number(view.getBigUint64(f.at)) : view.getUint32(f.at);
        const v = d.pick(extremes(old, base.map.size, f.bytes));
        writeUint(bytes, f.at, f.bytes, v, false);
        recipe.push(`set the header ${f.kind} at ${f.at} from ${old} to ${v}`);
        return bytes;
      }
      return bytes;
    }
    case 2: {
      const { at, where } = position(base, len, d, 0.85);
      const v = d.pick([0x00, 0xff, 0x7f, 0x80, d.int(256)]);
      bytes[at] = v;
      recipe.push(`set byte ${at} (${where}) to 0x${v.toString(16)}`);
      return bytes;
    }
    case 3: {
      const { at, where } = position(base, len, d, 0.7);
      const s = at & ~511;
      bytes.fill(0, s, Math.min(len, s + 512));
      recipe.push(`zero the 512-byte sector at ${s} (${where})`);
      return bytes;
    }
    case 4: {
      const cuts = truncationPoints(base).filter((c) => c < len);
      const c = cuts.length > 0 && d.next() < 0.8 ? cuts[d.int(cuts.length)] + d.pick([0, 0, 0, 1, -1, 2, 3]) : d.int(len);
      const at = Math.max(0, Math.min(len - 1, c));
      recipe.push(`truncate at ${at} of ${len} bytes`);
      return bytes.slice(0, at);
    }
    case 5: {
      const n = 1 + d.int(4096);
      const tail = new Uint8Array(n);
      for (let i = 0; i < n; i++) tail[i] = d.int(256);
      recipe.push(`append ${n} random bytes`);
      const out = new Uint8Array(len + n);
      out.set(bytes);
      out.set(tail, len);
      return out;
    }
    default: {
      const pos = position(base, len, d, 0.8);
      // A position of the undamaged file may lie past the end of one an earlier step cut short.
      const at = Math.min(pos.at, len);
      const where = pos.where;
      const n = 1 + d.int(8);
      if (d.next() < 0.5) {
        const k = Math.min(n, len - at);
        recipe.push(`lose ${k} bytes at ${at} (${where})`);
        const out = new Uint8Array(len - k);
        out.set(bytes.subarray(0, at));
        out.set(bytes.subarray(at + k), at);
        return out;
      }
      recipe.push(`double ${n} bytes at ${at} (${where})`);
      const out = new Uint8Array(len + n);
      out.set(bytes.subarray(0, at + n));
      out.set(bytes.subarray(at), at + n);
      return out;
    }
  }
}

// ---------------------------------------------------------------------------------------------
// Text damage

const enc = new TextEncoder();

/** Replacement tokens: empty, not numbers, extremes, times with and without zones, long text. */
const CSV_VALUES = [
  '',
  ' ',
  'NaN',
  'nan',
  'NA',
  'null',
  'Infinity',
  '-Infinity',
  '1e309',
  '-1e309',
  '9'.repeat(400),
  '1e-400',
  '-0',
  '0x1F',
  '1_000',
  '1,5',
  '12abc',
  'abc',
  '"',
  '""',
  '"a""b"',
  '"unclosed',
  'x'.repeat(70_000),
  '1e308',
  '-1e308',
  '2147483648',
  '-2147483649',
  '2024-07-15 12:00',
  '2024-07-15T12:00',
  '2024-07-15T12:00Z',
  '2024-07-15T12:00:00+09:00',
  '2024-07-15T12:00:00-0300',
  '2024-07-15',
  '2024-13-45T99:99Z',
  '15/07/2024 12:00',
  'July 15 2024',
  '275760-09-13T00:00:00Z',
  '+275760-09-14T00:00:00Z',
  '1949-12-31T23:00Z',
  '2050-01-01T01:00Z',
  '2024-07-15T24:00Z',
  '1721044800',
  '\u00a0',
  '\t',
];
const YAML_VALUES = [
  '',
  '~',
  'null',
  '.nan',
  '.inf',
  '-.inf',
  '1e309',
  '9'.repeat(400),
  '0x1F',
  '0o17',
  'true',
  'no',
  '"',
  "'",
  '[',
  ']',
  '{',
  '}',
  '{a: [1, {b: }',
  '*undefined',
  '&a',
  '!!binary AAAA',
  '!!js/function "x"',
  '!!str',
  '!!int "x"',
  '!!float',
  '!!map {}',
  '!!seq []',
  '<<: *x',
  '? complex',
  '|',
  '>-',
  '@',
  '`',
  '%YAML 1.1',
  '---',
  '...',
  'x'.repeat(70_000),
  'Etc/GMT+99',
  'Mars/Olympus',
  '../../../../..',
  '/',
  '**',
  '[2020, 2024, 2030]',
  '[2030, 2020]',
  '[-1e309, 1e309]',
  '2020',
  '[]',
  '{}',
  '-1',
  '0.5',
  '1e6',
];
const CSV_CHARS = ['"', ',', '\n', '\r', '\r\n', '\t', '\u0000', '\ufeff', ' ', ';', '\\', '\u00e9', '\ud83d\ude00'];
const YAML_CHARS = [':', ' ', '\t', '\n', '-', '#', '&', '*', '!', '{', '}', '[', ']', '"', "'", '|', '>', '%', '@', '`', ',', '?', '\u0000', '\ufeff', '\r'];
const BAD_UTF8 = [[0xc3, 0x28], [0xff], [0xfe], [0xe2, 0x82], [0xed, 0xa0, 0x80], [0xf8, 0x88, 0x80, 0x80, 0x80]];

function splice(bytes: Uint8Array, at: number, remove: number, insert: Uint8Array): Uint8Array {
  const out = new Uint8Array(bytes.length - remove + insert.length);
  out.set(bytes.subarray(0, at));
  out.set(insert, at);
  out.set(bytes.subarray(at + remove), at + insert.length);
  return out;
}

/** The token (CSV field / YAML scalar) around `at`: [start, end). */
function tokenAt(bytes: Uint8Array, at: number, csv: boolean): [number, number] {
  const stop = (c: number) => c === 0x0a || c === 0x0d || c === 0x2c || (!csv && (c === 0x3a || c === 0x5b || c === 0x5d || c === 0x23));
  let a = at;
  while (a > 0 && !stop(bytes[a - 1])) a--;
  let b = at;
  while (b < bytes.length && !stop(bytes[b])) b++;
  while (a < b && bytes[a] === 0x20) a++;
  return [a, b];
}

function textStep(base: Base, bytes: Uint8Array, d: Draw, recipe: string[]): Uint8Array {
  const csv = base.format === 'point-csv';
  const tokens = (base.map as TextMap).tokens;
  const len = bytes.length;
  if (len === 0) return bytes;
  // replace a token, insert a char, delete a char, flip a bit, truncate, line ops, whole-file, bad UTF-8, format-specific
  const op = d.weighted([28, 14, 8, 10, 8, 10, 8, 4, 10]);
  const text = () => new TextDecoder().decode(bytes);
  switch (op) {
    case 0: {
      const [a, b] = tokenAt(bytes, d.int(len), csv);
      const v = d.pick(csv ? CSV_VALUES : YAML_VALUES);
      recipe.push(
        `replace bytes ${a}-${b} ${JSON.stringify(new TextDecoder().decode(bytes.subarray(a, b)).slice(0, 40))} with ${JSON.stringify(v.length > 40 ? `${v.slice(0, 20)}… (${v.length} characters)` : v)}`,
      );
      return splice(bytes, a, b - a, enc.encode(v));
    }
    case 1: {
      const at = d.next() < 0.7 && tokens.length > 0 ? Math.min(len, d.pick(tokens)) : d.int(len);
      const c = d.pick(csv ? CSV_CHARS : YAML_CHARS);
      recipe.push(`insert ${JSON.stringify(c)} at ${at}`);
      return splice(bytes, at, 0, enc.encode(c));
    }
    case 2: {
      const at = d.next() < 0.7 && tokens.length > 0 ? Math.min(len - 1, d.pick(tokens)) : d.int(len);
      recipe.push(`delete byte ${at} (${JSON.stringify(String.fromCharCode(bytes[at]))})`);
      return splice(bytes, at, 1, new Uint8Array(0));
    }
    case 3: {
      const at = d.int(len);
      const bit = d.int(8);
      bytes[at] ^= 1 << bit;
      recipe.push(`flip bit ${bit} of byte ${at}`);
      return bytes;
    }
    case 4: {
      const pts = truncationPoints(base).filter((p) => p < len);
      const at = pts.length > 0 && d.next() < 0.7 ? pts[d.int(pts.length)] : d.int(len);
      recipe.push(`truncate at ${at} of ${len} bytes`);
      return bytes.slice(0, at);
    }
    case 5: {
      const lines = text().split('\n');
      const i = d.int(lines.length);
      const kind = d.int(3);
      if (kind === 0) {
        recipe.push(`delete line ${i + 1}`);
        lines.splice(i, 1);
      } else if (kind === 1) {
        const n = d.pick([1, 2, 100, 5000]);
        recipe.push(`repeat line ${i + 1} ${n} more times`);
        lines.splice(i, 0, ...Array.from({ length: n }, () => lines[i]));
      } else {
        const j = d.int(lines.length);
        recipe.push(`swap lines ${i + 1} and ${j + 1}`);
        [lines[i], lines[j]] = [lines[j], lines[i]];
      }
      return enc.encode(lines.join('\n'));
    }
    case 6: {
      const kind = d.int(4);
      const t = text();
      if (kind === 0) {
        recipe.push('add a UTF-8 byte order mark');
        return enc.encode(`\ufeff${t}`);
      }
      if (kind === 1) {
        recipe.push('CRLF line ends');
        return enc.encode(t.replace(/\r?\n/g, '\r\n'));
      }
      if (kind === 2) {
        recipe.push('CR-only line ends');
        return enc.encode(t.replace(/\r?\n/g, '\r'));
      }
      recipe.push('no line end at the end of the file');
      return enc.encode(t.replace(/\s+$/, ''));
    }
    case 7: {
      const at = d.int(len);
      const b = d.pick(BAD_UTF8);
      recipe.push(`insert the invalid UTF-8 bytes ${b.map((x) => x.toString(16)).join(' ')} at ${at}`);
      return splice(bytes, at, 0, Uint8Array.from(b));
    }
    default:
      return csv ? csvStep(bytes, d, recipe) : yamlStep(bytes, d, recipe);
  }
}

function csvStep(bytes: Uint8Array, d: Draw, recipe: string[]): Uint8Array {
  const lines = new TextDecoder().decode(bytes).split('\n');
  const i = d.int(lines.length);
  const kind = d.int(4);
  if (kind === 0) {
    recipe.push(`line ${i + 1}: add a field`);
    lines[i] = `${lines[i]},${d.pick(['', '1', 'x', '"a,b"'])}`;
  } else if (kind === 1) {
    recipe.push(`line ${i + 1}: drop the last field`);
    lines[i] = lines[i].replace(/,[^,]*$/, '');
  } else if (kind === 2) {
    recipe.push(`line ${i + 1}: open a quote that is never closed`);
    lines[i] = `"${lines[i]}`;
  } else {
    recipe.push(`line ${i + 1}: a header name repeated`);
    lines[0] = `${lines[0]},${d.pick(lines[0].split(','))}`;
  }
  return enc.encode(lines.join('\n'));
}

function yamlStep(bytes: Uint8Array, d: Draw, recipe: string[]): Uint8Array {
  const t = new TextDecoder().decode(bytes);
  const kind = d.int(5);
  if (kind === 0) {
    // Nested aliases that expand exponentially when resolved.
    const n = d.pick([5, 10, 20]);
    const lines = ['a0: &a0 [x, x, x, x, x, x, x, x, x, x]'];
    for (let k = 1; k <= n; k++) lines.push(`a${k}: &a${k} [${Array.from({ length: 10 }, () => `*a${k - 1}`).join(', ')}]`);
    recipe.push(`append ${n} levels of nested aliases`);
    return enc.encode(`${t}\n${lines.join('\n')}\n`);
  }
  if (kind === 1) {
    const n = d.pick([100, 1000, 20000]);
    recipe.push(`append a value nested ${n} deep`);
    return enc.encode(`${t}\ndeep: ${'['.repeat(n)}${']'.repeat(n)}\n`);
  }
  if (kind === 2) {
    const lines = t.split('\n');
    const i = d.int(lines.length);
    recipe.push(`duplicate line ${i + 1} (a repeated key)`);
    lines.splice(i, 0, lines[i]);
    return enc.encode(lines.join('\n'));
  }
  if (kind === 3) {
    const lines = t.split('\n');
    const i = d.int(lines.length);
    const shift = d.pick(['', ' ', '  ', '\t', '    ']);
    recipe.push(`re-indent line ${i + 1} with ${JSON.stringify(shift)}`);
    lines[i] = shift + lines[i].trimStart();
    return enc.encode(lines.join('\n'));
  }
  recipe.push('append a second YAML document');
  return enc.encode(`${t}\n---\nid: other\n`);
}
