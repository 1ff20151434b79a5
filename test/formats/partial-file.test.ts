import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { parse } from 'yaml';
import { accumulateBlock, createPartial, createScratch, type ShardPartial } from '../../pipeline/reduce/accumulator.ts';
import { decodePartial, encodePartial, readPartialHeader, PARTIAL_FORMAT, type PartialMeta } from '../../pipeline/formats/partial-file.ts';
import { localHours, parseWorkloadClasses, resolveWorkSettings, workSettingsSchema } from '../../pipeline/work/index.ts';
import { expectCatalogued } from '../helpers/catalogued.ts';

const classes = parseWorkloadClasses(parse(readFileSync(new URL('../../content/workload-classes.yaml', import.meta.url), 'utf8')));
const work = resolveWorkSettings(workSettingsSchema.parse(undefined), classes);
const HOUR = 3_600_000;

/** A partial filled from invented hourly WBGT (a diurnal cycle plus seeded noise, some NaN hours). */
function inventedPartial(nc = 9, nt = 24 * 50): ShardPartial {
  let s = 12345;
  const rnd = () => (s = (s * 1664525 + 1013904223) >>> 0) / 2 ** 32;
  const start = Date.UTC(2021, 4, 1);
  const time = Float64Array.from({ length: nt }, (_, t) => start + (t + 1) * HOUR);
  const sun = new Float32Array(nt * nc);
  const shade = new Float32Array(nt * nc);
  const air = new Float32Array(nt * nc);
  for (let i = 0; i < nt * nc; i++) {
    const d = Math.sin(((Math.floor(i / nc) % 24) / 24) * 2 * Math.PI);
    shade[i] = 25 + 5 * d + 4 * (rnd() - 0.5);
    sun[i] = i % 101 === 0 ? NaN : shade[i] + Math.max(0, 3 * d);
    air[i] = shade[i] + 4;
  }
  const p = createPartial(
    2021,
    Int32Array.from({ length: nc }, (_, i) => 10 + i * 2),
    work.evaluations,
  );
  const scratch = createScratch(nt * nc, work.evaluations);
  accumulateBlock(
    p,
    { nHours: nt, wbgtSun: sun, wbgtShade: shade, airTemperature: air, local: localHours(time, 'Etc/GMT+10', work.shift) },
    work.evaluations,
    scratch,
  );
  return p;
}

const meta: PartialMeta = {
  shardId: 't00-y2021',
  year: 2021,
  tileIndex: 0,
  key: 'k'.repeat(64),
  provenance: { a: 1 },
  report: { cellHours: 10, physics: { notConverged: 0 } },
};

describe('partial files', () => {
  it('decode to exactly the arrays that were encoded (every field, the sparse histogram included)', () => {
    const p = inventedPartial();
    const bytes = encodePartial(p, meta);
    const back = decodePartial(bytes, 'mem.hhp');
    expect(back.meta).toEqual(meta);
    for (const [k, v] of Object.entries(p)) {
      const w = (back.partial as unknown as Record<string, unknown>)[k];
      if (ArrayBuffer.isView(v)) {
        expect(w?.constructor, k).toBe(v.constructor);
        expect(Buffer.from((w as Uint8Array).buffer).equals(Buffer.from(v.buffer, v.byteOffset, v.byteLength)), k).toBe(true);
      } else expect(w, k).toEqual(v);
    }
    expect(p.histogram.some((x) => x > 0)).toBe(true);
  });

  it('are much smaller than the raw arrays (sparse histogram, then DEFLATE)', () => {
    const p = inventedPartial();
    const raw = Object.values(p).reduce((n, v) => n + (ArrayBuffer.isView(v) ? v.byteLength : 0), 0);
    expect(encodePartial(p, meta).length).toBeLessThan(raw / 10);
  });

  it('a truncated file, a flipped byte, a foreign file and another format version each give a catalogued error naming the file', () => {
    const bytes = encodePartial(inventedPartial(), meta);
    expectCatalogued(() => decodePartial(bytes.subarray(0, bytes.length - 100), 'cut.hhp'), 'PartialCorrupt', /cut\.hhp.*checksum/);
    const flipped = Uint8Array.from(bytes);
    flipped[Math.floor(bytes.length / 2)] ^= 0x40;
    expectCatalogued(() => decodePartial(flipped, 'flip.hhp'), 'PartialCorrupt', /flip\.hhp/);
    expectCatalogued(
      () => readPartialHeader(new TextEncoder().encode('CDF\x01 not a partial at all, but long enough to look at'), 'x.nc'),
      'PartialCorrupt',
      /x\.nc.*does not start/,
    );
    const other = Uint8Array.from(bytes);
    other[6] = PARTIAL_FORMAT + 1;
    expectCatalogued(() => readPartialHeader(other, 'new.hhp'), 'PartialFormatUnknown', /new\.hhp is partial format/);
  });
});
