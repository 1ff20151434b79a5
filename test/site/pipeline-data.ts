/**
 * A data folder made by the real pipeline for the site's page tests: the invented small demo
 * (8 × 10 cells at 1°, 2021–2023, one legacy and two NetCDF-4 years) built with `buildAtlas`
 * (data only) — with `withScenario`, a separate folder with one scenario (a uniform warming of
 * 2 K) for the region report's scenario tests — with the demo's five districts plus one region whose name and properties are HTML
 * and script (test/fixtures/site-regions/odd-name.geojson), for the escaping tests.
 *
 * Built once per digest of what it depends on (pipeline/, content/workload-classes.yaml,
 * content/regions/, the odd region, this file) under test-artifacts/site-data/<digest>/, shared
 * by test files and runs (a lock folder keeps parallel files from building twice). Pass the
 * returned `dataDir` to `buildTestSite`.
 */
import { createHash } from 'node:crypto';
import { cpSync, existsSync, mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { mkdir, rm, stat } from 'node:fs/promises';
import { join, relative } from 'node:path';
import { PROJECT_ROOT } from './browser.ts';

const DATA_BUILDS = join(PROJECT_ROOT, 'test-artifacts/site-data');
const ODD_REGIONS = join(PROJECT_ROOT, 'test/fixtures/site-regions');

/** Years and baseline of the test atlas [year]. */
export const PIPELINE_DATA_YEARS = [2021, 2023] as const; // three years: the demo writer takes each year
export const PIPELINE_DATA_BASELINE = [2021, 2022] as const;
/** The workforce raster the test atlas names (the demo's invented population, content/workforce-shares.csv shares). */
export const PIPELINE_DATA_WORKFORCE = {
  name: 'Invented population of Quellmar (site test)',
  year: 2024,
  licence: 'Invented for the demo by heathours demo-data; no licence applies',
} as const;
/** The test atlas's one scenario: a uniform warming (invented for the tests). */
export const PIPELINE_DATA_SCENARIO = { id: 'warm-2k', name: 'Uniform warming of 2 K (test)', warming: 2 } as const;

function listFiles(dir: string): string[] {
  if (!existsSync(dir)) return [];
  const out: string[] = [];
  for (const e of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, e.name);
    if (e.isDirectory()) out.push(...listFiles(p));
    else out.push(p);
  }
  return out.sort();
}

function inputsDigest(withScenario: boolean): string {
  const h = createHash('sha256');
  if (withScenario) h.update('with-scenario\0');
  const files = [
    ...listFiles(join(PROJECT_ROOT, 'pipeline')),
    join(PROJECT_ROOT, 'content/workload-classes.yaml'),
    join(PROJECT_ROOT, 'content/workforce-shares.csv'),
    ...listFiles(join(PROJECT_ROOT, 'content/regions')),
    ...listFiles(ODD_REGIONS),
    join(PROJECT_ROOT, 'test/site/pipeline-data.ts'),
  ];
  for (const f of files) h.update(relative(PROJECT_ROOT, f)).update('\0').update(readFileSync(f)).update('\0');
  return h.digest('hex').slice(0, 16);
}

async function withLock<T>(lockDir: string, work: () => Promise<T>): Promise<T> {
  const deadline = Date.now() + 600_000;
  for (;;) {
    try {
      await mkdir(lockDir);
      break;
    } catch {
      const age = await stat(lockDir).then(
        (s) => Date.now() - s.mtimeMs,
        () => 0,
      );
      if (age > 600_000) await rm(lockDir, { recursive: true, force: true });
      if (Date.now() > deadline) throw new Error(`timed out waiting for the pipeline data lock ${lockDir}`);
      await new Promise((r) => setTimeout(r, 250));
    }
  }
  try {
    return await work();
  } finally {
    await rm(lockDir, { recursive: true, force: true });
  }
}

export interface PipelineData {
  /** Folder holding `data/` (manifest, tables, layers, tiles): pass it to `buildTestSite`. */
  dataDir: string;
  /** The warnings the build logged, one per line. */
  warningsPath: string;
  /** The atlas configuration the data were built from. */
  configPath: string;
  reused: boolean;
}

/** Builds (or reuses) the pipeline-made test data folder; see the file comment. `withScenario`: the variant with one scenario. */
export async function buildPipelineData(opts: { withScenario?: boolean } = {}): Promise<PipelineData> {
  const withScenario = opts.withScenario === true;
  const digest = inputsDigest(withScenario);
  const root = join(DATA_BUILDS, digest);
  const dataDir = join(root, 'out');
  const configPath = join(root, 'atlas.yaml');
  mkdirSync(DATA_BUILDS, { recursive: true });
  return withLock(join(DATA_BUILDS, `${digest}.lock`), async () => {
    const warningsPath = join(root, 'build-warnings.txt');
    if (existsSync(join(dataDir, 'data/manifest.json')) && existsSync(warningsPath)) return { dataDir, configPath, warningsPath, reused: true };
    await rm(root, { recursive: true, force: true });
    mkdirSync(join(root, 'regions'), { recursive: true });
    for (const f of [...listFiles(join(PROJECT_ROOT, 'content/regions')), ...listFiles(ODD_REGIONS)]) {
      if (f.endsWith('.geojson'))
        cpSync(f, join(root, 'regions', relative(f.endsWith('odd-name.geojson') ? ODD_REGIONS : join(PROJECT_ROOT, 'content/regions'), f)));
    }
    const { writeDemoDataset } = await import('../../pipeline/demo/index.ts');
    const { POPULATION_FILE } = await import('../../pipeline/demo/population.ts');
    const { buildAtlas } = await import('../../pipeline/run/build-atlas.ts');
    const [y0, y1] = PIPELINE_DATA_YEARS;
    await writeDemoDataset({ outDir: join(root, 'inputs'), years: [y0, y0 + 1, y1], layout: 'mixed', grid: 'small', quiet: true });
    writeFileSync(
      configPath,
      `id: site-test
title: Site test atlas (invented data)
description: The invented small demo, built by the pipeline for the site's page tests.
dataset:
  files: [inputs/*.nc]
  landSeaMask: { variable: lsm, threshold: 0.5 }
  invented: true
  attribution: Invented data made by heathours demo-data.
years: [${y0}, ${y1}]
baseline: [${PIPELINE_DATA_BASELINE[0]}, ${PIPELINE_DATA_BASELINE[1]}]
timeZone: Etc/GMT+10
regions: regions
output: out
work:
  classesFile: ${join(PROJECT_ROOT, 'content/workload-classes.yaml')}
workforce:
  raster: inputs/${POPULATION_FILE}
  shares: ${join(PROJECT_ROOT, 'content/workforce-shares.csv')}
  name: ${PIPELINE_DATA_WORKFORCE.name}
  year: ${PIPELINE_DATA_WORKFORCE.year}
  licence: ${PIPELINE_DATA_WORKFORCE.licence}
  invented: true
${withScenario ? `scenarios:\n  - { id: ${PIPELINE_DATA_SCENARIO.id}, name: ${PIPELINE_DATA_SCENARIO.name}, warming: ${PIPELINE_DATA_SCENARIO.warming} }\n` : ''}`,
    );
    process.env.HEATHOURS_BUILD_TIME ??= '2026-01-01T00:00:00.000Z';
    // The build's warnings are kept beside the data (build-warnings.txt) for the tests that check them.
    const warnings: string[] = [];
    const logger = { info: () => {}, warn: (m: string) => void warnings.push(m) };
    await buildAtlas({ configPath, outDir: dataDir, jobs: 2, quiet: true, dataOnly: true, cache: false, logger });
    writeFileSync(join(root, 'build-warnings.txt'), warnings.map((w) => `${w}\n`).join(''));
    return { dataDir, configPath, warningsPath, reused: false };
  });
}
