/**
 * Typed access to `data/inventory.json` (type {@link DatasetInventory}, written by the pipeline):
 * a zod schema that mirrors the interface, checked against it at compile time, and a loader.
 */
import { join } from 'node:path';
import { z } from 'zod';
import type { DatasetInventory } from '../../pipeline/read/inventory-types.ts';
import { siteDataDir } from './data-dir.ts';
import { readValidatedJsonOnce } from './read-json.ts';

const isoInstant = z.string().refine((s) => !Number.isNaN(Date.parse(s)), 'not an ISO 8601 date-time');
const yearRange = z.tuple([z.number().int(), z.number().int()]).refine(([a, b]) => a <= b, 'first year after last year');

export const inventorySchema = z
  .object({
    atlas: z.object({
      id: z.string().min(1),
      title: z.string().min(1),
      description: z.string().optional(),
      invented: z.boolean(),
      attribution: z.string().optional(),
      timeZone: z.string().min(1),
      years: yearRange,
      baseline: yearRange,
      product: z.enum(['era5', 'era5-land']),
    }),
    grid: z.object({
      latMin: z.number().min(-90).max(90),
      latMax: z.number().min(-90).max(90),
      lonMin: z.number().min(-360).max(360),
      lonMax: z.number().min(-360).max(360),
      nLat: z.number().int().positive(),
      nLon: z.number().int().positive(),
      dLat: z.number().positive(),
      dLon: z.number().positive(),
      landCells: z.number().int().nonnegative(),
    }),
    time: z.object({ start: isoInstant, end: isoInstant, hours: z.number().int().nonnegative() }),
    variables: z.array(
      z.object({
        name: z.string().min(1),
        source: z.string(),
        units: z.string(),
        sourceUnits: z.string(),
        long_name: z.string(),
        min: z.number(),
        max: z.number(),
        mean: z.number(),
        fillCount: z.number().int().nonnegative(),
      }),
    ),
    files: z.array(
      z.object({
        name: z.string().min(1),
        bytes: z.number().int().nonnegative(),
        sha256: z.string().regex(/^[0-9a-f]{64}$/, 'not a lower-case hex SHA-256'),
        format: z.enum(['netcdf3-classic', 'netcdf3-64bit-offset', 'netcdf4', 'zarr']),
        layout: z.enum(['era5-legacy', 'era5-cds-2024', 'era5-zarr', 'other']),
        // '' for a file without a time axis (a static field such as the land-sea mask).
        timeStart: isoInstant.or(z.literal('')),
        timeEnd: isoInstant.or(z.literal('')),
        variables: z.array(z.string()),
      }),
    ),
    generated: isoInstant,
  })
  .refine((v) => v.grid.latMin <= v.grid.latMax && v.grid.lonMin <= v.grid.lonMax, {
    message: 'grid minimum above maximum',
    path: ['grid'],
  })
  .refine((v) => v.grid.landCells <= v.grid.nLat * v.grid.nLon, { message: 'more land cells than cells', path: ['grid', 'landCells'] });

// Compile-time proof that the schema and the published interface describe the same thing.
type Parsed = z.infer<typeof inventorySchema>;
const _toInterface = (v: Parsed): DatasetInventory => v;
const _fromInterface = (v: DatasetInventory): Parsed => v;
void _toInterface;
void _fromInterface;

/** Path of the inventory inside a data folder. */
export function inventoryPath(dataDir: string): string {
  return join(dataDir, 'data', 'inventory.json');
}

/** Reads and validates the inventory of `dataDir` (default: the build's data folder). */
export function loadInventory(dataDir: string = siteDataDir()): DatasetInventory {
  // Every page's layout reads it: parsed and checked once (0.4 ms a page otherwise).
  return readValidatedJsonOnce(inventoryPath(dataDir), inventorySchema, 'dataset inventory (data/inventory.json)');
}
