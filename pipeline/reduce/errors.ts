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
