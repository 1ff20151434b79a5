/**
 * The opt-in sheltered exposure (`work.exposures: [sun, shade, shelter]`) built end to end on the
 * invented small demo, against three outside yardsticks: the files the code published before the
 * exposure existed (test/fixtures/shelter/README.md), the physics of long-wave radiation (a black
 * shelter at the air temperature radiates more than the open sky wherever the sky's emissivity is
 * below 1, so the sheltered WBGT is not below the open-sky shade's there, docs/methods.md §6.1), and `heathours point`'s wbgt_shelter_c for the same inputs.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cpSync, mkdtempSync, rmSync, readFileSync, readdirSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative } from 'node:path';
import { createHash } from 'node:crypto';
import { writeDemoDataset } from '../../pipeline/demo/index.ts';
import { buildAtlas } from '../../pipeline/run/build-atlas.ts';
import { openDataset } from '../../pipeline/read/index.ts';
import { computeTask } from '../../pipeline/run/compute-task.ts';
import { runPoint } from '../../pipeline/commands/point.ts';
import { parseWorkSettings, parseWorkloadClasses, resolveWorkSettings } from '../../pipeline/work/index.ts';
import { D_GLOBE_STANDARD } from '../../pipeline/physics/constants.ts';
import { CENTI, MONTHS } from '../../pipeline/reduce/layout.ts';
import type { ShardPartial } from '../../pipeline/reduce/accumulator.ts';
import { parse } from 'yaml';
import { testAtlasYaml } from '../helpers/atlas-yaml.ts';

const ROOT = new URL('../../', import.meta.url).pathname;
const FIXTURE = join(ROOT, 'test/fixtures/shelter/small-default-digests.txt');
let dir = '';

function atlasYaml(extra: string): string {
  return `${testAtlasYaml({ id: 'small', title: 'Small test atlas (invented data)', years: [2022, 2023], regions: 'regions', classesFile: 'workload-classes.yaml' })}${extra}`;
}

/** `path sha256` of every file under `out`, sorted by path. */
function digests(out: string): string[] {
  const files: string[] = [];
  const walk = (d: string) => {
    for (const f of readdirSync(d)) {
      const p = join(d, f);
      if (statSync(p).isDirectory()) walk(p);
      else files.push(p);
    }
  };
  walk(out);
  return files.sort().map((f) => `${relative(out, f)} ${createHash('sha256').update(readFileSync(f)).digest('hex')}`);
}

function parseCsv(text: string): Record<string, string>[] {
  const [head, ...rows] = text.trim().split(/\r?\n/);
  const cols = head.split(',');
  return rows.map((r) => Object.fromEntries(r.split(',').map((v, i) => [cols[i], v])));
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'hh-shelter-'));
  // The published files name the build time: fixed, as for the recorded digests.
  process.env.HEATHOURS_BUILD_TIME = '2026-01-01T00:00:00.000Z';
  await writeDemoDataset({ outDir: join(dir, 'inputs'), years: [2022, 2023], layout: 'mixed', grid: 'small', quiet: true });
  cpSync(join(ROOT, 'content/regions'), join(dir, 'regions'), { recursive: true });
  cpSync(join(ROOT, 'content/workload-classes.yaml'), join(dir, 'workload-classes.yaml'));
  writeFileSync(join(dir, 'default.yaml'), atlasYaml(''));
  writeFileSync(join(dir, 'shelter.yaml'), atlasYaml('  exposures: [sun, shade, shelter]\n'));
  await buildAtlas({ configPath: join(dir, 'default.yaml'), outDir: join(dir, 'out-default'), jobs: 1, quiet: true, dataOnly: true, cache: false });
  await buildAtlas({ configPath: join(dir, 'shelter.yaml'), outDir: join(dir, 'out-shelter'), jobs: 1, quiet: true, dataOnly: true, cache: false });
}, 300_000);

afterAll(() => {
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe('the sheltered exposure built on the invented small demo', () => {
  it('without the shelter, every published file is byte for byte what the code before the sheltered exposure published (2,098 files, recorded digests: the 2,034 of then, the manifest re-recorded and 64 trend-p-year files added since)', () => {
    const want = readFileSync(FIXTURE, 'utf8').trim().split('\n');
    const got = digests(join(dir, 'out-default'));
    expect(got.length).toBe(want.length);
    expect(got).toEqual(want);
    expect(got.some((l) => l.includes('shelter'))).toBe(false);
  });

  it('with the shelter, the hours above the limit under a shelter are at least those in the open-sky shade in every region, month, class, acclimatization and statistic, and more somewhere', () => {
    const data = join(dir, 'out-shelter/data/regions');
    let compared = 0;
    let more = 0;
    for (const f of readdirSync(data).filter((x) => x.endsWith('.csv') && !x.endsWith('.wide.csv'))) {
      const rows = parseCsv(readFileSync(join(data, f), 'utf8')).filter(
        (r) => r.figure.startsWith('hours-above-limit') || r.figure === 'hours-lost-shift' || r.figure === 'wbgt-mean' || r.figure === 'wbgt-max',
      );
      const byKey = new Map(rows.map((r) => [[r.period, r.figure, r.workload_class, r.acclimatization, r.method, r.statistic, r.exposure].join('|'), r.value]));
      for (const r of rows) {
        if (r.exposure !== 'shelter' || r.value === '') continue;
        const shade = byKey.get([r.period, r.figure, r.workload_class, r.acclimatization, r.method, r.statistic, 'shade'].join('|'));
        expect(shade, `${f} ${r.period} ${r.figure} has a shade row`).toBeDefined();
        if (shade === '') continue;
        expect(Number(r.value), `${f} ${r.period} ${r.figure} ${r.workload_class} ${r.acclimatization} ${r.statistic}`).toBeGreaterThanOrEqual(Number(shade));
        compared++;
        if (Number(r.value) > Number(shade)) more++;
      }
    }
    expect(compared).toBeGreaterThan(1000);
    expect(more).toBeGreaterThan(100);
  });

  it('with the shelter, the data dictionary, manifest and region tables name the exposure and its model (Lemke & Kjellstrom 2012)', () => {
    const data = join(dir, 'out-shelter/data');
    const dict = readFileSync(join(data, 'data-dictionary.csv'), 'utf8');
    expect(dict).toMatch(
      /exposure,shelter,"Working under a shelter \(a roof or canopy, the shelter a black surface at the air temperature, after Lemke & Kjellstrom 2012\)"/,
    );
    const manifest = JSON.parse(readFileSync(join(data, 'manifest.json'), 'utf8')) as { work: { exposures: string[] } };
    expect(manifest.work.exposures).toEqual(['sun', 'shade', 'shelter']);
    const table = readFileSync(join(data, 'regions/sollent-coast.csv'), 'utf8');
    expect(table).toContain(',capacity-loss-shift,,,shelter,kjellstrom-300w,mean,');
  });

  it("the shelter WBGT the build counts for a cell-hour is heathours point's wbgt_shelter_c for the same inputs (a land cell, every hour of local July 2022)", async () => {
    const inputs = readdirSync(join(dir, 'inputs'))
      .filter((f) => f.endsWith('.nc'))
      .map((f) => join(dir, 'inputs', f));
    const ds = await openDataset(inputs, { product: 'era5', landSeaMask: { variable: 'lsm', threshold: 0.5 } } as never);
    try {
      const nLon = ds.grid.lon.length;
      const cell = ds.landMask!.findIndex((v) => v === 1);
      const y = Math.floor(cell / nLon);
      // Local July 2022 in Etc/GMT+10 (UTC−10): the hours ending 2022-07-01 11:00 UTC … 2022-08-01 10:00 UTC.
      const h0 = (Date.UTC(2022, 6, 1, 11) - ds.time.start) / 3_600_000;
      const nt = 31 * 24;
      const classes = parseWorkloadClasses(parse(readFileSync(join(ROOT, 'content/workload-classes.yaml'), 'utf8')));
      const work = resolveWorkSettings(parseWorkSettings({ exposures: ['sun', 'shade', 'shelter'] }), classes);
      let partial: ShardPartial | undefined;
      await computeTask(
        ds,
        {
          id: 'g-test',
          blockHours: nt,
          shards: [
            {
              id: 't-test',
              tileIndex: 0,
              tile: { y0: y, y1: y + 1, x0: 0, x1: nLon },
              year: 2022,
              utcYear: 2022,
              hours: [h0, h0 + nt],
              months: [6, 7],
              cells: Int32Array.of(cell),
            },
          ],
        },
        {
          evaluations: work.evaluations,
          timeZone: 'Etc/GMT+10',
          shift: work.shift,
          physics: { globeDiameter: D_GLOBE_STANDARD },
          grid: ds.grid,
          scenarios: [],
        },
        (_s, r) => {
          partial = r.partial;
        },
      );
      // The same hours as a point CSV: the decoded inputs, written with every digit of their float32 value.
      const block = await ds.readBlock(h0, nt, { y0: y, y1: y + 1, x0: cell % nLon, x1: (cell % nLon) + 1 });
      const f = block.fields;
      const lines = ['time_utc,lat,lon,ta_c,td_c,pressure_hpa,wind_ms,solar_wm2'];
      for (let t = 0; t < nt; t++) {
        lines.push(
          [
            new Date(block.time[t]).toISOString(),
            ds.grid.lat[y],
            ds.grid.lon[cell % nLon],
            f.airTemperature![t],
            f.dewPointTemperature![t],
            f.surfacePressure![t],
            f.windSpeed10m![t],
            f.solarGlobal![t],
          ].join(','),
        );
      }
      writeFileSync(join(dir, 'point-in.csv'), `${lines.join('\n')}\n`);
      await runPoint(join(dir, 'point-in.csv'), join(dir, 'point-out.csv'), { quiet: true });
      const rows = parseCsv(readFileSync(join(dir, 'point-out.csv'), 'utf8'));
      expect(rows).toHaveLength(nt);
      let sum = 0;
      let max = -Infinity;
      // Hours whose value lies within 0.0002 °C of a half centi-degree: there point's 4 decimals and
      // the build's float32 may round to neighbouring centi-degrees.
      let edge = 0;
      for (const r of rows) {
        expect(r.status).toBe('ok');
        const x = Number(r.wbgt_shelter_c) * CENTI;
        const v = Math.round(x);
        if (Math.abs(x - Math.floor(x) - 0.5) <= 0.02) edge++;
        sum += v;
        max = Math.max(max, v);
      }
      const p = partial!;
      const cm = 0 * MONTHS + 6;
      expect(p.exposures).toEqual(['sun', 'shade', 'shelter']);
      expect(p.validHours[cm]).toBe(nt);
      // Point writes 4 decimals, the build rounds its float32 to centi-degrees: the highest hour agrees
      // to the centi-degree, the month's sum to one centi-degree per hour at a rounding edge.
      expect(Math.abs(p.wbgtMax[cm * 3 + 2] - max)).toBeLessThanOrEqual(1);
      expect(Math.abs(p.wbgtSum[cm * 3 + 2] - sum)).toBeLessThanOrEqual(edge);
      console.log(
        `shelter WBGT, local July 2022: build sum ${p.wbgtSum[cm * 3 + 2]} max ${p.wbgtMax[cm * 3 + 2]}, point sum ${sum} max ${max} [centi-°C], ${edge} hours at a rounding edge`,
      );
      // And the shelter is warmer than the open-sky shade in every hour's sum.
      expect(p.wbgtSum[cm * 3 + 2]).toBeGreaterThan(p.wbgtSum[cm * 3 + 1]);
    } finally {
      await ds.close();
    }
  });
});
