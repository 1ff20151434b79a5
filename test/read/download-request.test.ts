/**
 * `heathours request` on the demo atlas (content/atlas.yaml, invented regions). The expected
 * area was checked by hand: the regions' corners, read with Python's json module straight from
 * content/regions/*.geojson, span 149.2828–142.2259° W and 16.6073–23.3976° N; with the 0.5°
 * margin, 149.7828–141.7259° W and 16.1073–23.8976° N, snapped outward to the 0.25° ERA5 grid:
 * N 24, W −150, S 16, E −141.5, so (24 − 16)/0.25 + 1 = 33 latitudes and (150 − 141.5)/0.25 + 1
 * = 35 longitudes. Fields per year: 7 variables × 8784 h (2020, 2024: leap) or × 8760 h.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync, copyFileSync, mkdirSync, cpSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { writeRequests } from '../../pipeline/commands/request.ts';
import { requestsFileSchema, snappedArea } from '../../pipeline/read/download-request.ts';

const ROOT = new URL('../../', import.meta.url).pathname;
const dir = mkdtempSync(join(tmpdir(), 'hh-request-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
// A copy of content/: its dataset.files (../data/demo/*.nc) then finds no inputs, whether or not
// this clone holds a built demo (which would mark its years present).
cpSync(join(ROOT, 'content'), join(dir, 'content'), { recursive: true });
const ATLAS = join(dir, 'content/atlas.yaml');

describe('download requests for the demo atlas', () => {
  it('area, variables, years and one request per year match the hand-checked expectation; requests.json parses against the schema', async () => {
    const out = join(dir, 'era5');
    const { file } = await writeRequests({ config: ATLAS, out });
    const json = requestsFileSchema.parse(JSON.parse(readFileSync(join(out, 'requests.json'), 'utf8')));
    expect(json).toEqual(file);
    expect(file.regionsBox.map((x) => Math.round(x * 1e4) / 1e4)).toEqual([-149.2828, 16.6073, -142.2259, 23.3976]);
    expect(file.area).toEqual([24, -150, 16, -141.5]);
    expect(file.gridPoints).toEqual({ lat: 33, lon: 35 });
    expect(file.fieldLimit).toBe(120_000);
    expect(file.requests.map((r) => [r.target, r.fields])).toEqual([
      ['era5-2020-01-12.zip', 7 * 8784],
      ['era5-2021-01-12.zip', 7 * 8760],
      ['era5-2022-01-12.zip', 7 * 8760],
      ['era5-2023-01-12.zip', 7 * 8760],
      ['era5-2024-01-12.zip', 7 * 8784],
      ['era5-2025-01-01T00.zip', 7],
      ['era5-land-sea-mask.zip', 1],
    ]);
    const r0 = file.requests[0];
    expect(r0.dataset).toBe('reanalysis-era5-single-levels');
    expect(r0.request.variable).toEqual([
      '2m_temperature',
      '2m_dewpoint_temperature',
      'surface_pressure',
      '10m_u_component_of_wind',
      '10m_v_component_of_wind',
      'surface_solar_radiation_downwards',
      'total_sky_direct_solar_radiation_at_surface',
    ]);
    expect(r0.request.month).toHaveLength(12);
    expect(r0.request.day).toHaveLength(31);
    expect(r0.request.time).toHaveLength(24);
    expect(r0.request.area).toEqual([24, -150, 16, -141.5]);
    expect(r0.bytesEstimate).toBe(7 * 8784 * 33 * 35 * 4);
    expect(file.requests.every((r) => !r.present)).toBe(true);
    expect(file.missingFiles).toBe(7);
    // The script is valid Python (CPython's own compiler, python3 -m py_compile).
    execFileSync('python3', ['-m', 'py_compile', join(out, 'download.py')]);
  });

  it('a lower limit splits years into runs of whole months under it (hand count: 2020 Jan–May 3648 h, Jun–Oct 3672 h, Nov–Dec 1464 h at 7 fields per hour ≤ 30 000)', async () => {
    const { file } = await writeRequests({ config: ATLAS, out: join(dir, 'split'), maxFields: 30_000 });
    const y2020 = file.requests.filter((r) => r.purpose.startsWith('year 2020'));
    expect(y2020.map((r) => [r.target, r.fields])).toEqual([
      ['era5-2020-01-05.zip', 7 * 3648],
      ['era5-2020-06-10.zip', 7 * 3672],
      ['era5-2020-11-12.zip', 7 * 1464],
    ]);
    expect(file.requests.every((r) => r.fields <= 30_000)).toBe(true);
    expect(file.fieldLimitSource).toBe('given with --max-fields');
  });

  it('ERA5-Land: the 0.1° grid (N 23.9, W −149.8, S 16.1, E −141.7: 79 × 82 points), six variables, two months per request under 12 000 fields', async () => {
    const cfgDir = join(dir, 'land');
    mkdirSync(cfgDir);
    cpSync(join(ROOT, 'content/regions'), join(cfgDir, 'regions'), { recursive: true });
    const text = readFileSync(join(ROOT, 'content/atlas.yaml'), 'utf8').replace('product: era5', 'product: era5-land');
    writeFileSync(join(cfgDir, 'atlas.yaml'), text);
    copyFileSync(join(ROOT, 'content/workload-classes.yaml'), join(cfgDir, 'workload-classes.yaml'));
    const { file } = await writeRequests({ config: join(cfgDir, 'atlas.yaml'), out: join(cfgDir, 'dl') });
    expect(file.area).toEqual([23.9, -149.8, 16.1, -141.7]);
    expect(file.gridPoints).toEqual({ lat: 79, lon: 82 });
    expect(file.fieldLimit).toBe(12_000);
    const y2020 = file.requests.filter((r) => r.purpose.startsWith('year 2020'));
    // Jan–Feb 2020: 60 days = 1440 h × 6 = 8640; adding March (2184 h × 6 = 13 104) would pass the limit.
    expect(y2020.map((r) => r.fields)).toEqual([6 * 1440, 6 * 1464, 6 * 1464, 6 * 1488, 6 * 1464, 6 * 1464]);
    expect(y2020[0].dataset).toBe('reanalysis-era5-land');
    expect(y2020[0].request).not.toHaveProperty('product_type');
  });

  it('a request whose file is already in the folder is marked present and counted', async () => {
    const out = join(dir, 'present');
    mkdirSync(out);
    writeFileSync(join(out, 'era5-2021-01-12.zip'), 'x');
    const { file } = await writeRequests({ config: ATLAS, out });
    expect(file.requests.filter((r) => r.present).map((r) => r.target)).toEqual(['era5-2021-01-12.zip']);
    expect(file.missingFiles).toBe(6);
  });

  it('snapping is outward and exact on the grid (no 23.999…)', () => {
    expect(snappedArea([10.01, -0.01, 10.24, 0.26], 0, 0.25)).toEqual([0.5, 10, -0.25, 10.25]);
    expect(snappedArea([10, 0, 10.25, 0.25], 0, 0.25)).toEqual([0.25, 10, 0, 10.25]);
  });
});
