/**
 * `npm run bench`: runs every `bench/*.bench.ts` (each exports `bench: Bench`) and prints a
 * readable table, or with `--json` one JSON object per line:
 * `{"bench": NAME, "value": NUMBER, "unit": UNIT, ...details}`. `--only NAME` runs one figure.
 */
import { readdirSync } from 'node:fs';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { dirname, join } from 'node:path';
import type { Bench, BenchFigure } from './types.ts';

const args = process.argv.slice(2);
const json = args.includes('--json');
const onlyIdx = args.indexOf('--only');
const only = onlyIdx >= 0 ? args[onlyIdx + 1] : undefined;

const here = dirname(fileURLToPath(import.meta.url));
const files = readdirSync(here)
  .filter((f) => f.endsWith('.bench.ts'))
  .sort();
const benches: Bench[] = [];
for (const f of files) {
  const mod = (await import(pathToFileURL(join(here, f)).href)) as { bench: Bench };
  benches.push(mod.bench);
}
const known = benches.flatMap((b) => b.names);
if (only && !known.includes(only)) {
  process.stderr.write(`error: no benchmark named "${only}"; known: ${known.join(', ')}\n`);
  process.exit(2);
}

const results: BenchFigure[] = [];
for (const b of benches) {
  if (only && !b.names.includes(only)) continue;
  for (const fig of await b.run(only)) {
    if (only && fig.bench !== only) continue;
    results.push(fig);
    if (json) process.stdout.write(`${JSON.stringify(fig)}\n`);
    else {
      const { bench, value, unit, ...details } = fig;
      const rest = Object.entries(details)
        .map(([k, v]) => `${k}=${v}`)
        .join(' ');
      process.stdout.write(`${bench.padEnd(24)} ${formatValue(value).padStart(14)} ${unit.padEnd(16)} ${rest}\n`);
    }
  }
}
if (results.length === 0) process.stderr.write('no benchmark ran\n');

function formatValue(v: number): string {
  if (Math.abs(v) >= 1e6) return v.toExponential(3);
  if (Math.abs(v) >= 100) return v.toFixed(0);
  return v.toPrecision(4);
}
