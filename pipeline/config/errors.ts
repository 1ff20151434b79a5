/** Catalogued errors of the configuration stage (content/atlas.yaml and the files it names). */
import { defineError } from '../model/errors.ts';

export const ConfigNotFound = defineError<{ path: string }>({
  code: 'ConfigNotFound',
  title: 'The atlas configuration file does not exist',
  message: (p) => `no configuration file at ${p.path}`,
  hint: () => 'pass --config with the path of an atlas.yaml (content/atlas.yaml is the default), or copy content/atlas.yaml and edit it',
});

export const ConfigSyntax = defineError<{ detail: string }>({
  code: 'ConfigSyntax',
  title: 'The atlas configuration is not valid YAML',
  message: (p) => p.detail,
  hint: () => 'fix the YAML syntax at the line shown (indentation with spaces, a colon after each key)',
});

export const ConfigInvalid = defineError<{ problems: string[] }>({
  code: 'ConfigInvalid',
  title: 'The atlas configuration has invalid or unknown keys',
  message: (p) => p.problems.join('; '),
  hint: () => 'correct the keys named above; content/README.md lists every key with its type and an example',
});

export const ConfigInputMissing = defineError<{ pattern: string; baseDir: string }>({
  code: 'ConfigInputMissing',
  title: 'An input pattern of the configuration matches no file',
  message: (p) => `dataset.files pattern "${p.pattern}" (relative to ${p.baseDir}) matches no file`,
  hint: () => 'check the path; for the demo run `heathours demo-data --out data/demo` first',
});

export const ConfigRegionsMissing = defineError<{ path: string }>({
  code: 'ConfigRegionsMissing',
  title: 'The regions folder of the configuration does not exist',
  message: (p) => `regions folder ${p.path} does not exist or holds no .geojson file`,
  hint: () => 'point `regions` at a folder of GeoJSON files, one region (or a FeatureCollection of regions) per file',
});

export const ConfigWorkforceFileMissing = defineError<{ key: string; path: string; invented: boolean }>({
  code: 'ConfigWorkforceFileMissing',
  title: 'A workforce file named in the configuration does not exist',
  message: (p) => `${p.key} names ${p.path}, which does not exist or is not a file`,
  hint: (p) =>
    p.invented
      ? 'the demo writes its invented population raster with `heathours demo-data --out data/demo`; run it first, or correct the path (relative to atlas.yaml)'
      : 'correct the path (relative to atlas.yaml), or remove the `workforce` section to build without person-hours',
});
