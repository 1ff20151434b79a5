/**
 * The dataset inventory the pipeline publishes as `data/inventory.json` and the site's data
 * inventory page reads: what the configured dataset holds, where it came from, and its grid.
 * Produced by `pipeline/run` from the reader's inspection of each input file.
 */

export interface InventoryVariable {
  /** Canonical name (pipeline/model/fields.ts), e.g. `airTemperature`. */
  name: string;
  /** Short name in the source files, e.g. `t2m`. */
  source: string;
  /** Canonical units after conversion in `read`, e.g. `degC`. */
  units: string;
  /** Units written in the source files, e.g. `K`. */
  sourceUnits: string;
  long_name: string;
  /** Decoded, converted minimum / maximum / mean over all files [canonical units]. */
  min: number;
  max: number;
  mean: number;
  /** Values that were fill / missing / NaN / outside valid_range. */
  fillCount: number;
}

export interface InventoryFile {
  /** File name (no folder). */
  name: string;
  bytes: number;
  /** SHA-256 of the file's bytes, hex. */
  sha256: string;
  format: 'netcdf3-classic' | 'netcdf3-64bit-offset' | 'netcdf4' | 'zarr';
  /** Which ERA5 layout was recognised. */
  layout: 'era5-legacy' | 'era5-cds-2024' | 'era5-zarr' | 'other';
  /** First and last hour in the file (ISO 8601, UTC, end of hour); '' for a file with no time axis (a static field). */
  timeStart: string;
  timeEnd: string;
  /** Source short names of the variables the file contributes. */
  variables: string[];
}

export interface DatasetInventory {
  atlas: {
    id: string;
    title: string;
    description?: string;
    invented: boolean;
    attribution?: string;
    timeZone: string;
    years: [number, number];
    baseline: [number, number];
    product: 'era5' | 'era5-land';
  };
  grid: {
    /** Cell-centre extremes [° N, ° E]. */
    latMin: number;
    latMax: number;
    lonMin: number;
    lonMax: number;
    nLat: number;
    nLon: number;
    /** Grid spacing [°]. */
    dLat: number;
    dLon: number;
    /** Cells counted as land by the mask (all cells when there is no mask). */
    landCells: number;
  };
  time: { start: string; end: string; hours: number };
  variables: InventoryVariable[];
  files: InventoryFile[];
  /** Build time, ISO 8601 UTC. */
  generated: string;
}
