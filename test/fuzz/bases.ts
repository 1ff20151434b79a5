/**
 * The files the fuzzer damages, one per format, all invented: one year (2021) of the small demo
 * grid in the legacy layout (NetCDF-3 classic, our writer) and in the 2024 layout (NetCDF-4,
 * h5wasm), the classic year turned into a 64-bit-offset file by the netCDF-C tool `nccopy -k
 * 64-bit-offset` (Debian's netcdf-bin), an invented station table for `heathours point`, and the
 * demo atlas configuration (content/atlas.yaml) in a copy of its folder.
 */
import { execFileSync } from 'node:child_process';
import { copyFileSync, cpSync, existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { writeDemoDataset, yearFileName, LSM_FILE } from '../../pipeline/demo/index.ts';
import { mapHdf5 } from './structure-hdf5.ts';
import { mapNetcdf3 } from './structure-netcdf3.ts';
import { mapText, type Base, type FormatId } from './mutate.ts';

const ROOT = fileURLToPath(new URL('../../', import.meta.url));
/** The demo year the NetCDF bases hold. */
export const BASE_YEAR = 2021;

/** Where each format's base and its companions are. */
export interface BasePaths {
  /** The base file of each format. */
  base: Record<FormatId, string>;
  /** The land-sea mask read beside a NetCDF year (legacy mask for NetCDF-3, NetCDF-4 mask for NetCDF-4). */
  lsm: { netcdf3: string; netcdf4: string };
  /** The folder an atlas YAML mutant is written to (its regions, classes and data globs resolve there). */
  yamlDir: string;
}

/**
 * An invented hourly station table (two days at an invented site) in the `heathours point`
 * columns: quoted text with a comma, optional columns, humidity as RH in some rows and as dew
 * point in others. Values are a smooth invented day, not observations.
 */
export function inventedPointCsv(): string {
  const head = 'site,time_utc,avg_minutes,lat,lon,ta_c,rh_pct,td_c,pressure_hpa,wind_ms,wind_height_m,urban,dt_c,solar_wm2,direct_fraction,cos_zenith';
  const rows = [head];
  for (let h = 0; h < 48; h++) {
    const hour = h % 24;
    const ta = 27 + 6 * Math.sin((2 * Math.PI * (hour - 9)) / 24);
    const solar = Math.max(0, 850 * Math.sin((Math.PI * (hour - 6)) / 12));
    const stamp = new Date(Date.UTC(2021, 6, 14, 1 + h)).toISOString().replace('.000', '');
    const rh = h % 3 === 0 ? '' : (60 - 15 * Math.sin((2 * Math.PI * (hour - 9)) / 24)).toFixed(1);
    const td = h % 3 === 0 ? (ta - 8).toFixed(2) : '';
    rows.push(
      [
        h % 2 === 0 ? '"Yard 4, north gate (invented)"' : 'Yard 4 (invented)',
        stamp,
        '60',
        '-12.375',
        '-150.125',
        ta.toFixed(2),
        rh,
        td,
        '1008.5',
        (2 + Math.cos(h)).toFixed(2),
        h % 5 === 0 ? '2' : '10',
        h % 7 === 0 ? '1' : '0',
        '0',
        solar.toFixed(1),
        h % 4 === 0 && solar > 0 ? '0.7' : '',
        '',
      ].join(','),
    );
  }
  return `${rows.join('\n')}\n`;
}

/** Writes the base files under `dir` (kept when already there) and returns their paths. */
export async function prepareBases(dir: string): Promise<BasePaths> {
  const legacy = join(dir, 'legacy');
  const nc4 = join(dir, 'netcdf4');
  const year = yearFileName(BASE_YEAR);
  if (!existsSync(join(legacy, year))) await writeDemoDataset({ outDir: legacy, years: [BASE_YEAR], layout: 'legacy', grid: 'small', quiet: true, jobs: 1 });
  if (!existsSync(join(nc4, year))) await writeDemoDataset({ outDir: nc4, years: [BASE_YEAR], layout: 'netcdf4', grid: 'small', quiet: true, jobs: 1 });
  const cdf2 = join(legacy, year.replace('.nc', '-64bit-offset.nc'));
  if (!existsSync(cdf2)) execFileSync('nccopy', ['-k', '64-bit-offset', join(legacy, year), cdf2]);
  const csv = join(dir, 'point.csv');
  writeFileSync(csv, inventedPointCsv());
  // The demo configuration in a copy of its folder layout: content/{atlas.yaml, regions,
  // workload-classes.yaml} and data/demo/*.nc (empty files: the configuration is only loaded).
  const yamlRoot = join(dir, 'atlas');
  const yamlDir = join(yamlRoot, 'content');
  mkdirSync(join(yamlRoot, 'data', 'demo'), { recursive: true });
  cpSync(join(ROOT, 'content', 'regions'), join(yamlDir, 'regions'), { recursive: true });
  copyFileSync(join(ROOT, 'content', 'workload-classes.yaml'), join(yamlDir, 'workload-classes.yaml'));
  copyFileSync(join(ROOT, 'content', 'atlas.yaml'), join(yamlDir, 'atlas.yaml'));
  writeFileSync(join(yamlRoot, 'data', 'demo', year), '');
  return {
    base: {
      'netcdf3-classic': join(legacy, year),
      'netcdf3-64bit-offset': cdf2,
      netcdf4: join(nc4, year),
      'point-csv': csv,
      'atlas-yaml': join(yamlDir, 'atlas.yaml'),
    },
    lsm: { netcdf3: join(legacy, LSM_FILE), netcdf4: join(nc4, LSM_FILE) },
    yamlDir,
  };
}

/** Reads a base file and maps its structures. */
export function loadBase(format: FormatId, path: string): Base {
  const bytes = new Uint8Array(readFileSync(path));
  switch (format) {
    case 'netcdf3-classic':
    case 'netcdf3-64bit-offset':
      return { format, bytes, map: mapNetcdf3(bytes) };
    case 'netcdf4':
      return { format, bytes, map: mapHdf5(bytes) };
    default:
      return { format, bytes, map: mapText(bytes) };
  }
}
