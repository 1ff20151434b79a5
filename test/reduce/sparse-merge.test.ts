/**
 * The merge adds the partial files' sparse histograms into the year without expanding them
 * (pipeline/reduce/merge.ts, pipeline/reduce/sparse-histogram.ts): the year's counts must equal,
 * array for array, those of the dense path (the partials decoded whole), for tiles split by cells,
 * pieces split by time and by month, a merge over a subset of a tile's cells, and sparse and dense
 * pieces of one tile mixed in either order. A damaged sparse histogram is PartialCorrupt naming the
 * file. Inputs are invented (seeded diurnal WBGT with noise and NaN hours).
 */
import { describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { deflateRawSync, inflateRawSync } from 'node:zlib';
import { parse } from 'yaml';
import { accumulateBlock, createPartial, createScratch, type ShardPartial } from '../../pipeline/reduce/accumulator.ts';
import { mergeYear, YearMerger, type SparsePartial, type YearCounts } from '../../pipeline/reduce/merge.ts';
import { HIST_LEN } from '../../pipeline/reduce/layout.ts';
import { denseHistogram, sparseHistogram, sparseHistogramProblem } from '../../pipeline/reduce/sparse-histogram.ts';
import { decodePartial, decodePartialSparse, encodePartial, type PartialMeta } from '../../pipeline/formats/partial-file.ts';
import { localHours, parseWorkloadClasses, resolveWorkSettings, workSettingsSchema } from '../../pipeline/work/index.ts';
import { expectCatalogued } from '../helpers/catalogued.ts';

const classes = parseWorkloadClasses(parse(readFileSync(new URL('../../content/workload-classes.yaml', import.meta.url), 'utf8')));
const work = resolveWorkSettings(workSettingsSchema.parse(undefined), classes);
const HOUR = 3_600_000;
const meta: PartialMeta = { shardId: 't00-y2021', year: 2021, tileIndex: 0, key: 'k'.repeat(64), provenance: {}, report: { cellHours: 0, physics: {} } };

/** Invented hourly WBGT for `nc` cells over `nt` hours from 20 June 2021 (seeded). */
function block(nc: number, nt: number, seed: number) {
  let s = seed >>> 0;
  const rnd = () => (s = (s * 1664525 + 1013904223) >>> 0) / 2 ** 32;
  const start = Date.UTC(2021, 5, 20);
  const time = Float64Array.from({ length: nt }, (_, t) => start + (t + 1) * HOUR);
  const sun = new Float32Array(nt * nc);
  const shade = new Float32Array(nt * nc);
  const air = new Float32Array(nt * nc);
  for (let i = 0; i < nt * nc; i++) {
    const d = Math.sin((((Math.floor(i / nc) + 14) % 24) / 24) * 2 * Math.PI);
    shade[i] = 22 + 6 * d + (i % nc) * 0.7 + 8 * (rnd() - 0.5);
    sun[i] = i % 89 === 0 ? NaN : shade[i] + Math.max(0, 3.5 * d) + rnd();
    air[i] = shade[i] + 4;
  }
  return { time, sun, shade, air };
}

/** Hours [t0, t1) of `b` for `cells` (the first `cells.length` of the block's cells) into a partial holding `months`. */
function piece(
  b: ReturnType<typeof block>,
  nc: number,
  cells: Int32Array,
  c0: number,
  t0: number,
  t1: number,
  months: [number, number] = [0, 12],
): ShardPartial {
  const n = cells.length;
  const p = createPartial(2021, cells, work.evaluations, months);
  const pick = (a: Float32Array) => {
    const out = new Float32Array((t1 - t0) * n);
    for (let t = t0; t < t1; t++) for (let c = 0; c < n; c++) out[(t - t0) * n + c] = a[t * nc + c0 + c];
    return out;
  };
  const local = localHours(b.time.subarray(t0, t1), 'Etc/GMT+10', work.shift);
  accumulateBlock(
    p,
    { nHours: t1 - t0, wbgtSun: pick(b.sun), wbgtShade: pick(b.shade), airTemperature: pick(b.air), local },
    work.evaluations,
    createScratch((t1 - t0) * n, work.evaluations),
  );
  return p;
}

/** The partial through its file: the sparse form the merge reads. */
const sparse = (p: ShardPartial): SparsePartial => decodePartialSparse(encodePartial(p, meta), 'p.hhp').partial;

function mergeWith(cells: Int32Array, parts: ReadonlyArray<ShardPartial | SparsePartial>, subset = false): YearCounts {
  const m = new YearMerger(2021, cells, { subset });
  parts.forEach((p, i) => m.add(p, `piece-${i}`));
  return m.finish();
}

/** Every field of the two years equal: typed arrays byte for byte (type included), the rest deeply. */
function expectSameYear(a: YearCounts, b: YearCounts): void {
  expect(Object.keys(a).sort()).toEqual(Object.keys(b).sort());
  for (const [k, v] of Object.entries(a)) {
    const w = (b as unknown as Record<string, unknown>)[k];
    if (ArrayBuffer.isView(v)) {
      expect((w as object).constructor, k).toBe(v.constructor);
      const x = w as Uint8Array;
      expect(Buffer.from(v.buffer, v.byteOffset, v.byteLength).equals(Buffer.from(x.buffer, x.byteOffset, x.byteLength)), k).toBe(true);
    } else expect(w, k).toEqual(v);
  }
}

describe('merging sparse histograms', () => {
  const nc = 5;
  const nt = 24 * 75;
  const b = block(nc, nt, 11);
  const cells = Int32Array.from({ length: nc }, (_, i) => 100 + i * 3);
  const local = localHours(b.time, 'Etc/GMT+10', work.shift);
  // Local month boundaries (June, July, August, September).
  const cuts = [0];
  for (let t = 1; t < nt; t++) if (local.month[t] !== local.month[t - 1]) cuts.push(t);
  cuts.push(nt);

  it('gives the same year as the dense histograms for tiles split by cells, in either order', () => {
    const a = piece(b, nc, cells.slice(0, 2), 0, 0, nt);
    const c = piece(b, nc, cells.slice(2), 2, 0, nt);
    const dense = mergeYear(2021, cells, [a, c]);
    expect(dense.histogram.some((x) => x > 0)).toBe(true);
    expectSameYear(mergeWith(cells, [sparse(a), sparse(c)]), dense);
    expectSameYear(mergeWith(cells, [sparse(c), sparse(a)]), dense);
  });

  it('gives the same year for pieces split by time and by month, for a subset of the cells, and for sparse and dense pieces of one tile mixed', () => {
    const months = cuts.slice(0, -1).map((t0, i) => {
      const m = local.month[t0] - 1;
      return piece(b, nc, cells, 0, t0, cuts[i + 1], [m, m + 1]);
    });
    expect(months.length).toBe(4);
    const dense = mergeYear(2021, cells, months);
    expectSameYear(mergeWith(cells, months.map(sparse)), dense);
    expectSameYear(mergeWith(cells, [sparse(months[2]), months[0], sparse(months[3]), months[1]]), dense);
    expectSameYear(mergeWith(cells, [months[1], sparse(months[1])]), mergeYear(2021, cells, [months[1], months[1]]));
    // Split by time inside one month: the second piece adds into bins the first one filled.
    const half = Math.floor((cuts[1] + cuts[2]) / 2);
    const split = [piece(b, nc, cells, 0, cuts[1], half, [6, 7]), piece(b, nc, cells, 0, half, cuts[2], [6, 7])];
    expectSameYear(mergeWith(cells, split.map(sparse)), mergeYear(2021, cells, split));
    const some = cells.slice(1, 4);
    expectSameYear(mergeWith(some, months.map(sparse), true), mergeYear(2021, some, months, [], { subset: true }));
  });

  it('the sparse form round-trips, and damaged forms are named: a slot past its bins, an early end, values left over', () => {
    const p = piece(b, nc, cells, 0, 0, nt);
    const slots = p.histogram.length / HIST_LEN;
    const s = sparseHistogram(p.histogram);
    expect(s.length).toBeLessThan(p.histogram.length / 4);
    expect(sparseHistogramProblem(s, slots)).toBeUndefined();
    expect(Buffer.from(denseHistogram(s, slots).buffer).equals(Buffer.from(p.histogram.buffer))).toBe(true);
    const past = Uint16Array.from(s);
    past[0] = HIST_LEN;
    past[1] = 1;
    expect(sparseHistogramProblem(past, slots)).toMatch(/slot 0 runs past its bins/);
    expect(sparseHistogramProblem(s.subarray(0, s.length - 1), slots)).toMatch(/runs past its bins|ends at slot/);
    expect(sparseHistogramProblem(Uint16Array.from([...s, 0, 0]), slots)).toBe('2 histogram values left over');
  });

  it('the sparse form is the same read two bins at a time (aligned) as one at a time (unaligned), and each slot runs exactly from its first to its last non-empty bin', () => {
    let r = 99;
    const rnd = () => (r = (r * 1664525 + 1013904223) >>> 0) / 2 ** 32;
    const slots = 400;
    const h = new Uint16Array(slots * HIST_LEN);
    for (let s = 0; s < slots; s++) {
      if (s % 5 === 0) continue; // empty slots
      const lo = Math.floor(rnd() * HIST_LEN);
      const hi = Math.min(HIST_LEN - 1, lo + Math.floor(rnd() * 9));
      for (let b = lo; b <= hi; b++) if (b === lo || b === hi || rnd() < 0.5) h[s * HIST_LEN + b] = 1 + Math.floor(rnd() * 40);
    }
    h[3 * HIST_LEN] = 7; // first bin of a slot
    h[4 * HIST_LEN - 1] = 9; // last bin of a slot
    const shifted = new Uint16Array(new ArrayBuffer(h.byteLength + 2), 2, h.length);
    shifted.set(h);
    const aligned = sparseHistogram(h);
    expect(Buffer.from(aligned.buffer).equals(Buffer.from(sparseHistogram(shifted).slice().buffer))).toBe(true);
    let q = 0;
    for (let s = 0; s < slots; s++) {
      const slot = h.subarray(s * HIST_LEN, (s + 1) * HIST_LEN);
      const first = slot.findIndex((x) => x !== 0);
      const last = slot.findLastIndex((x) => x !== 0);
      expect([aligned[q], aligned[q + 1]], `slot ${s}`).toEqual(first < 0 ? [0, 0] : [first, last - first + 1]);
      q += 2 + aligned[q + 1];
    }
    expect(q).toBe(aligned.length);
  });

  it('a partial file whose sparse histogram is damaged (checksum intact) is PartialCorrupt naming the file, for the merge and for the dense decoding', () => {
    const bytes = repack(encodePartial(piece(b, nc, cells, 0, 0, 24 * 10), meta), (hist) => {
      hist[0] = HIST_LEN - 1;
      hist[1] = 5;
    });
    expectCatalogued(() => decodePartialSparse(bytes, 'damaged.hhp'), 'PartialCorrupt', /damaged\.hhp.*slot 0 runs past its bins/);
    expectCatalogued(() => decodePartial(bytes, 'damaged.hhp'), 'PartialCorrupt', /damaged\.hhp.*slot 0 runs past its bins/);
  });
});

/**
 * A partial file with its sparse histogram changed by `change` and a new checksum, as a writer
 * with a defect would leave it (layout in pipeline/formats/partial-file.ts).
 */
function repack(bytes: Uint8Array, change: (hist: Uint16Array) => void): Uint8Array {
  const buf = Buffer.from(bytes);
  const hLen = buf.readUInt32LE(8);
  const header = JSON.parse(buf.subarray(12, 12 + hLen).toString('utf8')) as { fields: Array<{ name: string; bytes: number }>; payloadBytes: number };
  const raw = inflateRawSync(buf.subarray(12 + hLen, 12 + hLen + header.payloadBytes));
  let off = 0;
  for (const f of header.fields) {
    if (f.name === 'histogram') change(new Uint16Array(raw.buffer, raw.byteOffset + off, f.bytes / 2));
    off += f.bytes;
  }
  const payload = deflateRawSync(raw, { level: 1 });
  header.payloadBytes = payload.length;
  const head = Buffer.from(JSON.stringify(header), 'utf8');
  const len = Buffer.alloc(4);
  len.writeUInt32LE(head.length);
  const body = Buffer.concat([buf.subarray(0, 8), len, head, payload]);
  return Buffer.concat([body, createHash('sha256').update(body).digest()]);
}
