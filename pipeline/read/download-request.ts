/**
 * Download requests for the climate data store (`heathours request`): exactly the variables,
 * area, years and months an atlas needs, as request bodies of the store's retrieve API, split so
 * that each stays under the store's per-request limit. Pure: the command (pipeline/commands/
 * request.ts) reads the configuration and regions and writes the files; nothing here touches the
 * network.
 *
 * Sources and what is from memory:
 * - The request keys (`product_type`, `variable`, `year`, `month`, `day`, `time`, `area` as
 *   [north, west, south, east], `data_format`, `download_format`) and the dataset names
 *   `reanalysis-era5-single-levels` and `reanalysis-era5-land` are those of the store's API
 *   request forms, from memory (the store's "Show API request" of each dataset shows them).
 * - What counts against the limit is the number of fields: one variable at one hour ("each
 *   timestep of each date of each variable is classed as an individual GRIB field", ECMWF
 *   confluence "CDS - Best Practices"). The limits themselves, 120 000 fields per request for
 *   ERA5 single levels and 12 000 for ERA5-Land, are from memory of the store's "CDS limits"
 *   page and may have changed: `--max-fields` sets another value, and the store refuses a
 *   request over its limit before it is queued.
 * - Grid spacing: ERA5 0.25°, ERA5-Land 0.1° (the products' documentation).
 */
import { z } from 'zod';

export type Product = 'era5' | 'era5-land';

/** Fields (variable × hour) per request the store accepts, from memory (see above) [fields]. */
export const FIELD_LIMIT: Record<Product, number> = { era5: 120_000, 'era5-land': 12_000 };
/** Grid spacing of each product [°]. */
export const GRID_STEP: Record<Product, number> = { era5: 0.25, 'era5-land': 0.1 };
export const DATASET: Record<Product, string> = { era5: 'reanalysis-era5-single-levels', 'era5-land': 'reanalysis-era5-land' };

/**
 * The store's names of the time-varying variables the atlas reads (pipeline/read/dataset.ts
 * SOURCES): the WBGT physics needs all but the direct radiation, which improves the direct
 * fraction where the product has it (ERA5; ERA5-Land does not carry it, from memory).
 */
export const STORE_VARIABLES: Record<Product, Array<{ short: string; name: string }>> = {
  era5: [
    { short: 't2m', name: '2m_temperature' },
    { short: 'd2m', name: '2m_dewpoint_temperature' },
    { short: 'sp', name: 'surface_pressure' },
    { short: 'u10', name: '10m_u_component_of_wind' },
    { short: 'v10', name: '10m_v_component_of_wind' },
    { short: 'ssrd', name: 'surface_solar_radiation_downwards' },
    { short: 'fdir', name: 'total_sky_direct_solar_radiation_at_surface' },
  ],
  'era5-land': [
    { short: 't2m', name: '2m_temperature' },
    { short: 'd2m', name: '2m_dewpoint_temperature' },
    { short: 'sp', name: 'surface_pressure' },
    { short: 'u10', name: '10m_u_component_of_wind' },
    { short: 'v10', name: '10m_v_component_of_wind' },
    { short: 'ssrd', name: 'surface_solar_radiation_downwards' },
  ],
};

/** The body of one retrieve call, as the store's API takes it. */
export const storeRequestSchema = z
  .object({
    product_type: z.array(z.literal('reanalysis')).length(1).optional(),
    variable: z.array(z.string().regex(/^[0-9a-z_]+$/)).min(1),
    year: z.array(z.string().regex(/^\d{4}$/)).min(1),
    month: z.array(z.string().regex(/^(0[1-9]|1[0-2])$/)).min(1),
    day: z.array(z.string().regex(/^(0[1-9]|[12]\d|3[01])$/)).min(1),
    time: z.array(z.string().regex(/^([01]\d|2[0-3]):00$/)).min(1),
    area: z.tuple([z.number(), z.number(), z.number(), z.number()]),
    data_format: z.literal('netcdf'),
    download_format: z.literal('zip'),
  })
  .strict();

/** One request as `requests.json` lists it (documented in README "Download requests"). */
export const downloadRequestSchema = z
  .object({
    /** The store's dataset name. */
    dataset: z.string(),
    request: storeRequestSchema,
    /** File the script saves the answer as (a ZIP archive of NetCDF files, one per stream). */
    target: z.string().regex(/^[\w.-]+\.zip$/),
    /** What it is for: `year 2021, months 01-12`, `land-sea mask`, … */
    purpose: z.string(),
    /** Fields (variable × hour) it asks for, against the limit [fields]. */
    fields: z.number().int().positive(),
    /** Values × 4 bytes (float32, before the store's compression): an upper estimate [bytes]. */
    bytesEstimate: z.number().int().positive(),
    /** Whether the folder already holds it (the target file, or every hour of it in the inputs). */
    present: z.boolean(),
  })
  .strict();

export const requestsFileSchema = z
  .object({
    atlas: z.string(),
    product: z.enum(['era5', 'era5-land']),
    /** Per-request limit used [fields], and where it comes from. */
    fieldLimit: z.number().int().positive(),
    fieldLimitSource: z.string(),
    /** The regions' bounding box [west, south, east, north] [°] and the margin added [°]. */
    regionsBox: z.tuple([z.number(), z.number(), z.number(), z.number()]),
    margin: z.number().nonnegative(),
    /** The requested area on the product grid, [north, west, south, east] [°], and its points. */
    area: z.tuple([z.number(), z.number(), z.number(), z.number()]),
    gridPoints: z.object({ lat: z.number().int().positive(), lon: z.number().int().positive() }),
    requests: z.array(downloadRequestSchema).min(1),
    totalFiles: z.number().int().nonnegative(),
    totalBytesEstimate: z.number().int().nonnegative(),
    /** Requests not yet present. */
    missingFiles: z.number().int().nonnegative(),
  })
  .strict();

export type DownloadRequest = z.infer<typeof downloadRequestSchema>;
export type RequestsFile = z.infer<typeof requestsFileSchema>;

/** Rounds to the grid's decimals (no 23.999999999). */
function tidy(x: number, step: number): number {
  const d = Math.max(0, Math.ceil(-Math.log10(step)) + 1);
  return Number(x.toFixed(d)) + 0;
}

/**
 * The area to request: the box widened by `margin` on every side and snapped outward to the
 * product's grid, [north, west, south, east] [°], latitudes clamped to ±90.
 */
export function snappedArea(box: [number, number, number, number], margin: number, step: number): [number, number, number, number] {
  const [w, s, e, n] = box;
  const north = Math.min(90, Math.ceil((n + margin) / step - 1e-9) * step);
  const south = Math.max(-90, Math.floor((s - margin) / step + 1e-9) * step);
  const west = Math.floor((w - margin) / step + 1e-9) * step;
  const east = Math.ceil((e + margin) / step - 1e-9) * step;
  return [tidy(north, step), tidy(west, step), tidy(south, step), tidy(east, step)];
}

const pad2 = (x: number) => String(x).padStart(2, '0');
const DAYS = Array.from({ length: 31 }, (_, i) => pad2(i + 1));
const TIMES = Array.from({ length: 24 }, (_, i) => `${pad2(i)}:00`);

function hoursInMonths(year: number, m0: number, m1: number): number {
  return (Date.UTC(year, m1, 1) - Date.UTC(year, m0 - 1, 1)) / 3_600_000;
}

export interface PlanRequestsInput {
  atlas: string;
  product: Product;
  years: [number, number];
  regionsBox: [number, number, number, number];
  margin: number;
  landSeaMask: boolean;
  /** Per-request limit [fields]; default {@link FIELD_LIMIT}. */
  fieldLimit?: number;
  /** Whether a request is already there (its target or its hours). */
  isPresent?: (r: Omit<DownloadRequest, 'present'>, months: { year: number; months: number[] } | null) => boolean;
}

/**
 * The requests: per year, runs of whole months whose fields stay under the limit (variables
 * split only if one month is already over it); the hour of the year after the last (its stamp
 * ends the last hour of the last year: hours are named by their end); the land-sea mask once.
 */
export function planRequests(p: PlanRequestsInput): RequestsFile {
  const step = GRID_STEP[p.product];
  const limit = p.fieldLimit ?? FIELD_LIMIT[p.product];
  const area = snappedArea(p.regionsBox, p.margin, step);
  const nLat = Math.round((area[0] - area[2]) / step) + 1;
  const nLon = Math.round((area[3] - area[1]) / step) + 1;
  const points = nLat * nLon;
  const vars = STORE_VARIABLES[p.product];
  const dataset = DATASET[p.product];
  const base = (variable: string[], year: string[], month: string[], day: string[], time: string[]) => ({
    ...(p.product === 'era5' ? { product_type: ['reanalysis' as const] } : {}),
    variable,
    year,
    month,
    day,
    time,
    area,
    data_format: 'netcdf' as const,
    download_format: 'zip' as const,
  });
  const out: DownloadRequest[] = [];
  const push = (r: Omit<DownloadRequest, 'present'>, months: { year: number; months: number[] } | null) =>
    out.push({ ...r, present: p.isPresent ? p.isPresent(r, months) : false });
  const prefix = p.product === 'era5' ? 'era5' : 'era5-land';
  for (let y = p.years[0]; y <= p.years[1]; y++) {
    // Variable groups: all together unless one month is over the limit.
    const perVarMonth = 744;
    const groupSize = Math.max(1, Math.min(vars.length, Math.floor(limit / perVarMonth)));
    const groups: Array<typeof vars> = [];
    for (let i = 0; i < vars.length; i += groupSize) groups.push(vars.slice(i, i + groupSize));
    for (const [gi, g] of groups.entries()) {
      for (let m = 1; m <= 12; ) {
        let m1 = m;
        while (m1 < 12 && g.length * hoursInMonths(y, m, m1 + 1) <= limit) m1++;
        const fields = g.length * hoursInMonths(y, m, m1);
        const months = Array.from({ length: m1 - m + 1 }, (_, i) => m + i);
        const tag = `${y}-${pad2(m)}${m1 > m ? `-${pad2(m1)}` : ''}${groups.length > 1 ? `-v${gi + 1}` : ''}`;
        push(
          {
            dataset,
            request: base(
              g.map((v) => v.name),
              [String(y)],
              months.map(pad2),
              DAYS,
              TIMES,
            ),
            target: `${prefix}-${tag}.zip`,
            purpose: `year ${y}, month${m1 > m ? `s ${pad2(m)}-${pad2(m1)}` : ` ${pad2(m)}`}${groups.length > 1 ? `, variables ${g.map((v) => v.short).join(', ')}` : ''}`,
            fields,
            bytesEstimate: fields * points * 4,
          },
          { year: y, months },
        );
        m = m1 + 1;
      }
    }
  }
  // The last hour of the last year ends at 00:00 on 1 January of the next year.
  const next = p.years[1] + 1;
  push(
    {
      dataset,
      request: base(
        vars.map((v) => v.name),
        [String(next)],
        ['01'],
        ['01'],
        ['00:00'],
      ),
      target: `${prefix}-${next}-01-01T00.zip`,
      purpose: `the last hour of ${p.years[1]} (stamp ${next}-01-01T00:00Z, the end of the hour)`,
      fields: vars.length,
      bytesEstimate: vars.length * points * 4,
    },
    null,
  );
  if (p.landSeaMask) {
    push(
      {
        dataset,
        request: base(['land_sea_mask'], [String(p.years[0])], ['01'], ['01'], ['00:00']),
        target: `${prefix}-land-sea-mask.zip`,
        purpose: 'land-sea mask (invariant: one hour)',
        fields: 1,
        bytesEstimate: points * 4,
      },
      null,
    );
  }
  return {
    atlas: p.atlas,
    product: p.product,
    fieldLimit: limit,
    fieldLimitSource:
      p.fieldLimit !== undefined
        ? 'given with --max-fields'
        : `from memory of the data store's "CDS limits" page (${FIELD_LIMIT.era5} fields per request for ERA5 single levels, ${FIELD_LIMIT['era5-land']} for ERA5-Land); not checked against the store's current limits`,
    regionsBox: p.regionsBox,
    margin: p.margin,
    area,
    gridPoints: { lat: nLat, lon: nLon },
    requests: out,
    totalFiles: out.length,
    totalBytesEstimate: out.reduce((s, r) => s + r.bytesEstimate, 0),
    missingFiles: out.filter((r) => !r.present).length,
  };
}

/** The Python script for the store's official client (cdsapi), run where the user has an account. */
export function downloadScript(file: RequestsFile): string {
  return `#!/usr/bin/env python3
# Downloads the data of atlas "${file.atlas}" from the climate data store with its official
# client: pip install cdsapi, and an account key in ~/.cdsapirc (the store's "API" page says how).
# Written by \`heathours request\`; the requests are in requests.json beside this file.
# ${file.totalFiles} request(s), ${file.missingFiles} not yet present; about ${(file.totalBytesEstimate / 1e9).toFixed(2)} GB before compression (estimate).
# Requests whose file is already here are skipped; run it again after an interruption.
import json
import os

import cdsapi

here = os.path.dirname(os.path.abspath(__file__))
with open(os.path.join(here, "requests.json"), encoding="utf-8") as f:
    requests = json.load(f)["requests"]

client = cdsapi.Client()
for r in requests:
    target = os.path.join(here, r["target"])
    if r["present"] or os.path.exists(target):
        print("present:", r["target"], "-", r["purpose"])
        continue
    print("requesting:", r["target"], "-", r["purpose"], "-", r["fields"], "fields")
    client.retrieve(r["dataset"], r["request"], target + ".part")
    os.replace(target + ".part", target)
`;
}
