/**
 * A variant of the site's pipeline test data (pipeline-data.ts) built with `work.restLocation:
 * shade`: the same invented inputs, regions and years, so the calculator's rest-in-shade
 * approximation can be measured against the pipeline's own hour-by-hour figures. Built once per
 * digest of the base data, next to it (…/<digest>/out-rest-shade).
 */
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { buildPipelineData } from './pipeline-data.ts';

/** Builds (or reuses) the rest-in-shade variant; returns its data folder (holding `data/`). */
export async function buildRestShadeData(): Promise<{ dataDir: string; baseDataDir: string }> {
  const base = await buildPipelineData();
  const root = dirname(base.configPath);
  const dataDir = join(root, 'out-rest-shade');
  if (!existsSync(join(dataDir, 'data/manifest.json'))) {
    const yaml = readFileSync(base.configPath, 'utf8');
    if (!/\nwork:\n/.test(yaml)) throw new Error(`${base.configPath} has no work: section to extend`);
    const configPath = join(root, 'atlas-rest-shade.yaml');
    writeFileSync(configPath, yaml.replace('\nwork:\n', '\nwork:\n  restLocation: shade\n').replace(/\noutput: .*\n/, '\noutput: out-rest-shade\n'));
    process.env.HEATHOURS_BUILD_TIME ??= '2026-01-01T00:00:00.000Z';
    const { buildAtlas } = await import('../../pipeline/run/build-atlas.ts');
    await buildAtlas({ configPath, outDir: dataDir, jobs: 2, quiet: true, dataOnly: true });
  }
  return { dataDir, baseDataDir: base.dataDir };
}
