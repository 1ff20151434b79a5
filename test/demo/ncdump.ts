/** Helpers to run Debian's ncdump (netcdf-bin, the NetCDF reference library's own tool) in tests. */
import { spawnSync } from 'node:child_process';

/** Output of `ncdump ARGS`; throws with ncdump's stderr when it fails to parse the file. */
export function ncdump(...args: string[]): string {
  const r = spawnSync('ncdump', args, { encoding: 'utf8', maxBuffer: 512 * 1024 * 1024 });
  if (r.status !== 0) throw new Error(`ncdump ${args.join(' ')} failed: ${r.stderr}`);
  return r.stdout;
}

/** The numbers listed for `name = … ;` in the data section of an ncdump output. */
export function dataValues(cdl: string, name: string): number[] {
  const data = cdl.slice(cdl.indexOf('\ndata:'));
  const m = new RegExp(`\\n ${name} =([^;]*);`).exec(data);
  if (!m) throw new Error(`no data for ${name}`);
  return m[1]
    .split(',')
    .map((s) => s.trim())
    .filter((s) => s.length > 0)
    .map((s) => (s === '_' ? NaN : Number(s.replace(/[sfLb]$/, ''))));
}

/** The strings listed for `name = "…", … ;` in the data section. */
export function dataStrings(cdl: string, name: string): string[] {
  const data = cdl.slice(cdl.indexOf('\ndata:'));
  const m = new RegExp(`\\n ${name} =([^;]*);`).exec(data);
  if (!m) throw new Error(`no data for ${name}`);
  return [...m[1].matchAll(/"([^"]*)"/g)].map((x) => x[1]);
}
