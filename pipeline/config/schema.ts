/**
 * The schema of content/atlas.yaml, validated with zod before any data is read. Unknown keys are
 * errors (a misspelt key must not be silently ignored). Paths are relative to the config file.
 */
import { z } from 'zod';
import { workSettingsSchema } from '../work/work-settings.ts';
import { physicsSettingsSchema } from '../physics/settings.ts';
import { scenariosSchema } from '../scenario/settings.ts';

/** Allowed `shards.monthsPerPiece`: the divisors of 12, so groups never straddle a year. */
export const MONTHS_PER_PIECE = [1, 2, 3, 4, 6, 12] as const;
/**
 * Local months per piece of a year: a quarter. Pieces of one tile and year read disjoint hours,
 * so a year of a NetCDF-4 file (whose chunks usually span the whole grid) is inflated once, and
 * the pieces are small enough to keep every core busy to the end.
 */
export const DEFAULT_MONTHS_PER_PIECE = 3;
/**
 * Land cells aimed at per shard tile: enough to amortise a block read, small enough that a tile's
 * partials stay small; the demo's 655 land cells are one tile. Cores are balanced by cutting years
 * into pieces, not by small tiles, and reads are shared by the tiles of a compute group.
 */
export const TARGET_CELLS_PER_TILE = 1024;

const year = z.number().int().min(1940).max(2100);
const yearRange = z.tuple([year, year]).refine(([a, b]) => a <= b, { message: 'the first year must not be after the last' });

/**
 * A list of inputs each named once: a repeated entry is a mistake (the same files twice), and
 * each entry costs a search of the disk when the config is loaded (a list of one pattern
 * repeated 5,000 times took 2.5 s of CPU before this check).
 */
const inputList = z.array(z.string().min(1)).superRefine((list, ctx) => {
  const seen = new Map<string, number>();
  for (const entry of list) seen.set(entry, (seen.get(entry) ?? 0) + 1);
  for (const [entry, n] of seen) {
    if (n > 1) {
      ctx.addIssue({ code: 'custom', message: `"${entry.length > 80 ? `${entry.slice(0, 80)}…` : entry}" is listed ${n} times; name each input once` });
      return;
    }
  }
});

export const datasetSchema = z
  .object({
    /** Glob patterns of the input NetCDF files (ZIP archives of them, `*.zarr` store folders), relative to the config file; each once. */
    files: inputList.default([]),
    /**
     * Zarr stores read in place (pipeline/read/zarr-store.ts): local folders (relative to the
     * config file) or HTTP(S) URLs of a store's root, in the analysis-ready ERA5 layout.
     */
    zarr: inputList.default([]),
    /** Which reanalysis the files come from: decides the accumulation convention. */
    product: z.enum(['era5', 'era5-land']).default('era5'),
    /** Optional land-sea mask: a variable (in the inputs) and the land fraction threshold. */
    landSeaMask: z
      .object({ variable: z.string().default('lsm'), threshold: z.number().min(0).max(1).default(0.5) })
      .strict()
      .optional(),
    /** A free-text licence / attribution line shown on the site. */
    attribution: z.string().optional(),
    /** Whether the data are invented (synthetic); invented data are labelled so everywhere. */
    invented: z.boolean().default(false),
  })
  .strict()
  .refine((d) => d.files.length + d.zarr.length > 0, {
    message: 'name at least one input: NetCDF files (dataset.files) or Zarr stores (dataset.zarr)',
    path: ['files'],
  });

/**
 * The URL path the site is served under: `/` at a host's root, or a sub-folder such as
 * `/atlas/2025/`. Written with or without the final slash; stored with it. Letters, digits and
 * `.-_~` in each part, no `..`.
 */
export const siteBaseSchema = z
  .string()
  .regex(/^\/(?:[A-Za-z0-9_~-][A-Za-z0-9._~-]*\/?)*$/, 'a URL path such as / or /atlas/ (start with /; letters, digits and . - _ ~ in each part)')
  .refine((b) => !b.split('/').some((p) => p === '..' || p === '.'), 'no . or .. parts')
  .transform((b) => (b.endsWith('/') ? b : `${b}/`));

/**
 * The optional workforce weighting (issue 17): a GeoTIFF of people per pixel in EPSG:4326 and a
 * CSV of the shares of those people who do outdoor work of each workload class, per region. The
 * raster's name, year and licence are shown wherever a figure made from it is shown.
 */
export const workforceSchema = z
  .object({
    /** GeoTIFF of people (counts) per pixel, EPSG:4326, relative to the config file. */
    raster: z.string().min(1),
    /** CSV of shares: `region_id`, `workload_class`, `share` (optional `acclimatized_share`, `sun_share`), relative to the config file. */
    shares: z.string().min(1),
    /** The raster's name as its publisher gives it. */
    name: z.string().min(1),
    /** The year the raster describes [calendar year]. */
    year: z.number().int().min(1800).max(2100),
    /** The raster's licence or terms of use, shown with every figure made from it. */
    licence: z.string().min(1),
    /** Whether the raster is invented (the demo's); invented data are labelled so everywhere. */
    invented: z.boolean().default(false),
  })
  .strict();

export type WorkforceConfig = z.infer<typeof workforceSchema>;

export const atlasSchema = z
  .object({
    /** Identifier of the atlas, used in file names: lower case, digits and dashes. */
    id: z.string().regex(/^[a-z0-9][a-z0-9-]*$/, 'use lower-case letters, digits and dashes'),
    title: z.string().min(1),
    description: z.string().optional(),
    dataset: datasetSchema,
    /** First and last year to build [calendar years, UTC]. */
    years: yearRange,
    /** First and last year of the baseline (the normal period). Must lie within `years`. */
    baseline: yearRange,
    /** IANA time zone for work shifts and local hours, e.g. "Asia/Dubai". */
    timeZone: z.string().min(1),
    /** Folder of region GeoJSON files, relative to the config file. */
    regions: z.string().min(1),
    /** Output folder of the built site, relative to the config file. */
    output: z.string().default('../dist'),
    /** How the site is hosted: `base`, the URL path it is served under (default `/`). */
    site: z
      .object({ base: siteBaseSchema.default('/') })
      .strict()
      .default({}),
    /**
     * Whether each region gets its .xlsx workbook (`data/regions/<id>.xlsx`, exceljs): about
     * 0.035 s of CPU per region, 350 s for 10,000 regions, more than the rest of a region's files
     * together (measured in bench/regions-10000.bench.ts). `false` leaves them out; the tidy and
     * wide CSVs carry the same figures.
     */
    regionWorkbooks: z.boolean().default(true),
    /** Modelling choices of the physics: the globe diameter (pipeline/physics/settings.ts). */
    physics: physicsSettingsSchema,
    /** What to evaluate: workload classes, limits, exposures, clothing, shift (pipeline/work/work-settings.ts). */
    work: workSettingsSchema,
    /** Optional: weight hours lost by the people who do outdoor work (person-hours, full-time equivalents). */
    workforce: workforceSchema.optional(),
    /**
     * What-if climates built from the record by the delta change method, each published under
     * `data/scenarios/<id>/` (pipeline/scenario/settings.ts): a uniform warming, or monthly change
     * factors from a NetCDF file. Scenarios are what-ifs, never forecasts.
     */
    scenarios: scenariosSchema,
    /**
     * Folder of the partial cache (pipeline/run/partial-store.ts), relative to the config file;
     * default `.heathours-cache` beside the output folder.
     */
    cache: z.string().min(1).optional(),
    /**
     * Memory the build may use, main thread and workers together, e.g. `4G` (binary units; default
     * 3 G, for a machine of 4 GB). The build cuts its work to fit (pipeline/run/memory-plan.ts);
     * `--memory` overrides it. Results do not depend on it.
     */
    memory: z.string().min(1).optional(),
    /** How the grid is cut into shards (pipeline/run/plan.ts). Results do not depend on it. */
    shards: z
      .object({
        /** Land cells aimed at per spatial tile [cells]. */
        cellsPerTile: z.number().int().min(1).max(1_000_000).default(TARGET_CELLS_PER_TILE),
        /**
         * Land cells aimed at per block of grid rows whose per-cell files (tables, calculator
         * tiles) are published together, and the unit a distributed merge is sliced by [cells].
         */
        cellsPerBlock: z.number().int().min(1).max(1_000_000).default(TARGET_CELLS_PER_TILE),
        /** Local months per piece of a year [months]: a divisor of 12 (pipeline/run/plan.ts). */
        monthsPerPiece: z
          .number()
          .int()
          .refine((n) => (MONTHS_PER_PIECE as readonly number[]).includes(n), {
            message: `must be ${MONTHS_PER_PIECE.slice(0, -1).join(', ')} or ${MONTHS_PER_PIECE[MONTHS_PER_PIECE.length - 1]} (a divisor of 12)`,
          })
          .default(DEFAULT_MONTHS_PER_PIECE),
      })
      .strict()
      .default({}),
  })
  .strict()
  .superRefine((c, ctx) => {
    if (c.baseline[0] < c.years[0] || c.baseline[1] > c.years[1]) {
      ctx.addIssue({
        code: z.ZodIssueCode.custom,
        path: ['baseline'],
        message: `baseline ${c.baseline[0]}-${c.baseline[1]} lies outside years ${c.years[0]}-${c.years[1]}`,
      });
    }
    try {
      new Intl.DateTimeFormat('en', { timeZone: c.timeZone });
    } catch {
      ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['timeZone'], message: `unknown IANA time zone "${c.timeZone}"` });
    }
  });

export type AtlasConfig = z.infer<typeof atlasSchema>;
