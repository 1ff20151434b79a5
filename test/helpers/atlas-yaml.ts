/**
 * The atlas configuration the build tests write: the small invented demo grid, the project's
 * regions and workload classes, one time zone. Each test names its atlas and changes only what it
 * tests; the text is the same, byte for byte, wherever the options are the same (the
 * configuration's digest is published, and some tests compare published bytes).
 */
import { join } from 'node:path';

const ROOT = new URL('../../', import.meta.url).pathname;

export interface TestAtlasOptions {
  id: string;
  title: string;
  /** Years built and the baseline (default: the years) [year]. */
  years: readonly [number, number];
  baseline?: readonly [number, number];
  /** The dataset's `files` pattern (default `inputs/*.nc`). */
  files?: string;
  /** Lines that replace the `files:` line of the dataset (e.g. a Zarr store's `store:`), indented two spaces. */
  datasetInputs?: string;
  /** Regions folder (default the project's content/regions). */
  regions?: string;
  /** Output folder (default `out`). */
  output?: string;
  /** A `shards:` line's value, e.g. `{ cellsPerTile: 16, cellsPerBlock: 12 }`. */
  shards?: string;
  /** Workload classes file (default the project's). */
  classesFile?: string;
}

/** The configuration text, ending with the workload classes line and a newline; append more keys after it. */
export function testAtlasYaml(o: TestAtlasOptions): string {
  const [b0, b1] = o.baseline ?? o.years;
  return `id: ${o.id}
title: ${o.title}
dataset:
${o.datasetInputs ?? `  files: [${o.files ?? 'inputs/*.nc'}]`}
  landSeaMask: { variable: lsm, threshold: 0.5 }
  invented: true
years: [${o.years[0]}, ${o.years[1]}]
baseline: [${b0}, ${b1}]
timeZone: Etc/GMT+10
regions: ${o.regions ?? join(ROOT, 'content/regions')}
output: ${o.output ?? 'out'}
${o.shards ? `shards: ${o.shards}\n` : ''}work:
  classesFile: ${o.classesFile ?? join(ROOT, 'content/workload-classes.yaml')}
`;
}
