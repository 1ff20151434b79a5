/**
 * Catalogued errors of the site stage: the data folder the pages read, the Astro build, and the
 * preview server. Registered in pipeline/commands/catalogue.ts.
 */
import { defineError } from '../../pipeline/model/errors.ts';

export const SiteDataDirUnset = defineError<Record<string, never>>({
  code: 'SiteDataDirUnset',
  title: 'The site was built without a data folder',
  message: () => 'the environment variable HEATHOURS_DATA_DIR is not set, so the pages have nothing to read',
  hint: () => 'build the site with `heathours build` (it calls buildSite), or set HEATHOURS_DATA_DIR to a folder holding data/manifest.json',
});

export const SiteDataMissing = defineError<{ path: string; what: string }>({
  code: 'SiteDataMissing',
  title: 'A file the site reads is missing from the data folder',
  message: (p) => `no ${p.what} at ${p.path}`,
  hint: () => 'run the pipeline first (`heathours build`); it writes data/manifest.json, data/inventory.json and data/regions.geojson before the site is built',
});

export const SiteDataUnreadable = defineError<{ path: string; detail: string }>({
  code: 'SiteDataUnreadable',
  title: 'A file the site reads is not valid JSON',
  message: (p) => `${p.path} could not be parsed: ${p.detail}`,
  hint: () => 'the file is probably truncated or hand-edited; rebuild it with `heathours build`',
});

export const SiteDataInvalid = defineError<{ path: string; problems: string[] }>({
  code: 'SiteDataInvalid',
  title: 'A file the site reads does not match its schema',
  message: (p) => `${p.path}: ${p.problems.join('; ')}`,
  hint: () => 'the data folder was written by a different version of heathours or edited by hand; rebuild it with `heathours build`',
});

export const SiteBuildFailed = defineError<{ detail: string }>({
  code: 'SiteBuildFailed',
  title: 'The Astro build of the site failed',
  message: (p) => p.detail,
  hint: () => 'the previous site folder was left as it was; fix the problem named above and build again',
});

export const PreviewDirMissing = defineError<{ dir: string }>({
  code: 'PreviewDirMissing',
  title: 'There is no built site to preview',
  message: (p) => `no built site at ${p.dir} (no index.html there)`,
  hint: () => 'build the site first with `heathours build`, or pass --dir with the folder the build wrote',
});

export const PreviewPortBusy = defineError<{ port: number; detail: string }>({
  code: 'PreviewPortBusy',
  title: 'The preview server could not listen on its port',
  message: (p) => `127.0.0.1:${p.port}: ${p.detail}`,
  hint: () => 'another program (maybe an earlier preview) uses the port; stop it or pass --port with another number (0 picks a free one)',
});

export const SiteOutputUnwritable = defineError<{ path: string; detail: string }>({
  code: 'SiteOutputUnwritable',
  title: 'The site cannot be written to its output folder',
  message: (p) => `${p.path}: ${p.detail}`,
  hint: () => 'pass --out (or `output` in atlas.yaml) with a folder you can write to; a file of the same name must be moved away first',
});
