/**
 * Worker entry `site-digest` (pipeline/infra/compiled.ts): gathers one slice of regions per task
 * for the site (src/data/site-digest-make.ts), so the region tables of a large atlas are read
 * side by side, one core each, before Astro renders.
 */
import { serveTasks } from '../infra/worker-side.ts';
import { gatherRegionSlice, type DigestTable } from '../../src/data/site-digest-make.ts';

interface Init {
  dataDir: string;
  digestDir: string;
  tables: DigestTable[];
}

let init: Init | undefined;

serveTasks<Init, string[], Float64Array[]>({
  init: (data) => {
    init = data;
  },
  run: (ids) => gatherRegionSlice(init!.dataDir, init!.digestDir, init!.tables, ids),
  transfer: (values) => values.map((v) => v.buffer as ArrayBuffer),
});
