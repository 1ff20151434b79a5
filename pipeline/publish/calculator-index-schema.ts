/**
 * The schemas of the two calculator indexes this folder publishes, for whoever reads them back
 * (the site's estimate page at build time, `heathours estimate` against a published atlas):
 * `data/calculator/index.json` (histogram-tiles.ts: years, baseline, one entry a region) and
 * `data/calculator/cells/index.json` (point-tiles.ts: the grid and which chunk holds which land
 * cells). Unknown keys pass through, so a newer atlas still reads.
 */
import { z } from 'zod';

const slug = z.string().regex(/^[a-z0-9][a-z0-9-]*$/);
/** A calendar year [a]. */
const year = z.number().int();

export const calculatorIndexSchema = z
  .object({
    version: z.literal(1),
    years: z.array(year).min(1),
    baseline: z.tuple([year, year]),
    regions: z.array(z.object({ id: slug, name: z.string().min(1), path: z.string().min(1) }).passthrough()),
  })
  .passthrough();

export const cellChunkIndexSchema = z
  .object({
    version: z.literal(1),
    years: z.array(year).min(1),
    /** Cell-centre latitude and longitude of row/column 0 [°] and the steps [°]. */
    grid: z.object({
      nLat: z.number().int().positive(),
      nLon: z.number().int().positive(),
      lat0: z.number(),
      dLat: z.number(),
      lon0: z.number(),
      dLon: z.number(),
    }),
    chunks: z.array(z.object({ path: z.string().min(1), firstCell: z.number().int().nonnegative(), lastCell: z.number().int().nonnegative() }).passthrough()),
  })
  .passthrough();
