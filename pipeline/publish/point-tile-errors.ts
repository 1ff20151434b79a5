/**
 * Catalogued errors of the per-cell histogram tiles (point-tile-codec.ts, point-tiles.ts). Pure
 * (no node: imports): the browser calculator decodes the tiles with the same code.
 */
import { defineError } from '../model/errors.ts';

export const PointTileCountTooLarge = defineError<{ cell: number; year: number; slot: string; count: number }>({
  code: 'PointTileCountTooLarge',
  title: 'A per-cell histogram bin holds more hours than a point tile can store',
  message: (p) => `cell ${p.cell}, year ${p.year}, ${p.slot}: ${p.count} hours in one WBGT bin; a point tile stores at most 255 per bin`,
  hint: () =>
    'one month × local hour slot of one year holds at most 31–32 hourly values; a larger count means sub-hourly data or years added together — give the tiles one year of hourly data at a time',
});

export const PointTileCorrupt = defineError<{ path: string; problem: string }>({
  code: 'PointTileCorrupt',
  title: 'A per-cell histogram tile is damaged or of another format',
  message: (p) => `${p.path}: ${p.problem}`,
  hint: () =>
    'the file is truncated, edited, or from a different heathours version; rebuild the atlas (`heathours build`) and publish its data/calculator/cells/ folder whole',
});

export const PointTileYearsIncomplete = defineError<{ expected: number[]; got: number[] }>({
  code: 'PointTileYearsIncomplete',
  title: 'The per-cell histogram tiles were asked to publish years they were not given',
  message: (p) => `years expected ${p.expected.join(', ')}; histograms were added for ${p.got.join(', ') || 'no year'}`,
  hint: () => 'hand every merged year to PointTileStore.addYear before writing (pipeline/run/build-atlas.ts does this as each year completes)',
});

export const PointTileCellsMismatch = defineError<{ year: number; detail: string }>({
  code: 'PointTileCellsMismatch',
  title: 'A year of cell histograms does not hold the land cells of the build',
  message: (p) => `year ${p.year}: ${p.detail}`,
  hint: () => 'pass the merged counts of the whole year (mergeYear over all land cells), with the cells in the order the store was made with',
});
