/**
 * `heathours request --config atlas.yaml [--out DIR]`: writes the data-store requests the atlas
 * needs (DIR/requests.json, schema in pipeline/read/download-request.ts) and a short Python
 * script for the store's official client (DIR/download.py). No network: the user runs the
 * script where they have an account.
 */
import { existsSync, readFileSync, readdirSync, statSync } from 'node:fs';
import { mkdir, writeFile } from 'node:fs/promises';
import { dirname, join, resolve } from 'node:path';
import { globSync } from 'tinyglobby';
import { parseConfig } from '../config/load.ts';
import { ConfigNotFound, ConfigRegionsMissing } from '../config/errors.ts';
import { UsageError } from '../model/errors.ts';
import { parseRegionFile } from '../regions/index.ts';
import { downloadScript, planRequests, requestsFileSchema, type RequestsFile } from '../read/download-request.ts';
import { checkCoverage } from '../read/coverage.ts';

export interface RequestOptions {
  config: string;
  out?: string;
  margin?: number;
  maxFields?: number;
}

/** Plans the requests of an atlas and writes requests.json and download.py into the folder; returns what it wrote. */
export async function writeRequests(o: RequestOptions): Promise<{ dir: string; file: RequestsFile }> {
  const cfgPath = resolve(o.config);
  if (!existsSync(cfgPath)) throw ConfigNotFound({ path: cfgPath }, { file: cfgPath });
  const cfg = parseConfig(readFileSync(cfgPath, 'utf8'), cfgPath);
  const baseDir = dirname(cfgPath);
  const regionsDir = resolve(baseDir, cfg.regions);
  const regionFiles =
    existsSync(regionsDir) && statSync(regionsDir).isDirectory()
      ? readdirSync(regionsDir)
          .filter((f) => f.endsWith('.geojson'))
          .sort()
          .map((f) => join(regionsDir, f))
      : [];
  if (regionFiles.length === 0) throw ConfigRegionsMissing({ path: regionsDir }, { file: cfgPath, key: 'regions' });
  const box: [number, number, number, number] = [Infinity, Infinity, -Infinity, -Infinity];
  for (const f of regionFiles) {
    for (const r of parseRegionFile(readFileSync(f, 'utf8'), f)) {
      for (const p of r.polygons) {
        box[0] = Math.min(box[0], p.bbox[0]);
        box[1] = Math.min(box[1], p.bbox[1]);
        box[2] = Math.max(box[2], p.bbox[2]);
        box[3] = Math.max(box[3], p.bbox[3]);
      }
    }
  }
  // The download folder: --out, else the folder of the first dataset.files pattern.
  const firstDir = dirname(resolve(baseDir, cfg.dataset.files[0]));
  if (o.out === undefined && /[*?[\]{}]/.test(firstDir)) {
    throw UsageError({ message: `the folder of dataset.files "${cfg.dataset.files[0]}" is itself a pattern`, hint: 'name the download folder with --out DIR' });
  }
  const dir = resolve(o.out ?? firstDir);
  // What is already there: the inputs the configuration finds, by their coverage.
  const inputs = cfg.dataset.files.flatMap((p) =>
    globSync(p, { cwd: baseDir, absolute: true })
      .map((m) => resolve(m))
      .filter((m) => statSync(m).isFile()),
  );
  const complete = new Set<string>();
  if (inputs.length > 0) {
    const cov = await checkCoverage([...new Set(inputs)].sort(), { years: cfg.years, compareValues: false });
    for (const v of cov.variables) for (const m of v.months) if (m.present === m.expected) complete.add(`${v.variable} ${m.year}-${m.month}`);
  }
  const file = planRequests({
    atlas: cfg.id,
    product: cfg.dataset.product,
    years: cfg.years,
    regionsBox: box,
    margin: o.margin ?? 0.5,
    landSeaMask: cfg.dataset.landSeaMask !== undefined,
    fieldLimit: o.maxFields,
    isPresent: (r, months) => {
      if (existsSync(join(dir, r.target))) return true;
      if (!months) return false;
      const shorts = r.request.variable.map((name) => SHORT_OF[name]);
      return months.months.every((m) => shorts.every((s) => complete.has(`${s} ${months.year}-${m}`)));
    },
  });
  requestsFileSchema.parse(file);
  await mkdir(dir, { recursive: true });
  await writeFile(join(dir, 'requests.json'), `${JSON.stringify(file, null, 1)}\n`);
  await writeFile(join(dir, 'download.py'), downloadScript(file), { mode: 0o755 });
  return { dir, file };
}

const SHORT_OF: Record<string, string> = {
  '2m_temperature': 't2m',
  '2m_dewpoint_temperature': 'd2m',
  surface_pressure: 'sp',
  '10m_u_component_of_wind': 'u10',
  '10m_v_component_of_wind': 'v10',
  surface_solar_radiation_downwards: 'ssrd',
  total_sky_direct_solar_radiation_at_surface: 'fdir',
  land_sea_mask: 'lsm',
};

/** What `heathours request` does once its options are parsed (loaded only when the command runs). */
export async function requestAction(opts: { config: string; out?: string; margin: string; maxFields?: string }): Promise<void> {
  const margin = Number(opts.margin);
  if (!Number.isFinite(margin) || margin < 0 || margin > 10)
    throw UsageError({ message: `--margin ${opts.margin} is not a number of degrees from 0 to 10`, hint: 'e.g. --margin 0.5' });
  let maxFields: number | undefined;
  if (opts.maxFields !== undefined) {
    maxFields = Number(opts.maxFields);
    if (!Number.isInteger(maxFields) || maxFields < 1)
      throw UsageError({ message: `--max-fields ${opts.maxFields} is not a positive whole number`, hint: 'e.g. --max-fields 60000' });
  }
  const { dir, file } = await writeRequests({ config: opts.config, out: opts.out, margin, maxFields });
  const [n, w, s, e] = file.area;
  process.stdout.write(
    `${file.totalFiles} request(s) for atlas "${file.atlas}" (${file.product}), area N ${n} W ${w} S ${s} E ${e} (${file.gridPoints.lat} × ${file.gridPoints.lon} points), ` +
      `at most ${file.fieldLimit} fields each (${file.fieldLimitSource})\n` +
      `about ${(file.totalBytesEstimate / 1e9).toFixed(2)} GB before compression; ${file.totalFiles - file.missingFiles} already present, ${file.missingFiles} to download\n` +
      file.requests.map((r) => `  ${r.present ? 'present ' : 'missing '} ${r.target}: ${r.purpose}, ${r.fields} fields`).join('\n') +
      `\nwrote ${join(dir, 'requests.json')} and ${join(dir, 'download.py')}: run \`python3 ${join(dir, 'download.py')}\` where you have a data-store account\n`,
  );
}
