/** Catalogued errors of the reduce stage (merging partials). */
import { defineError } from '../model/errors.ts';

export const PartialsIncomplete = defineError<{ detail: string }>({
  code: 'PartialsIncomplete',
  title: 'Some shards have no partial',
  message: (p) => p.detail,
  hint: () => 'run the missing shards (heathours build --shard K/N --partials DIR) before merging, or rebuild without --merge',
});

export const PartialsInconsistent = defineError<{ detail: string }>({
  code: 'PartialsInconsistent',
  title: 'Partials do not fit together',
  message: (p) => p.detail,
  hint: () => 'partials must come from the same configuration and code version; delete the stale ones and rerun their shards',
});

export const PartialCorrupt = defineError<{ file: string; detail: string }>({
  code: 'PartialCorrupt',
  title: 'A partial file is damaged',
  message: (p) => `${p.file}: ${p.detail}`,
  hint: () => 'delete the file and run its shard again (a normal build recomputes damaged cache entries by itself)',
});

export const PartialFormatUnknown = defineError<{ file: string; format: number; expected: number }>({
  code: 'PartialFormatUnknown',
  title: 'A partial file has another format version',
  message: (p) => `${p.file} is partial format ${p.format}; this heathours reads format ${p.expected}`,
  hint: () => 'partials must be written and merged by the same heathours version: rerun the shards with this version',
});
