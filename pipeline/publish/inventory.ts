/** Builds the dataset inventory (`data/inventory.json`) from the configuration and the open dataset. */
import type { AtlasConfig } from '../config/schema.ts';
import type { Dataset } from '../read/index.ts';
import type { DatasetInventory, InventoryVariable } from '../read/inventory-types.ts';

const HOUR_MS = 3_600_000;

/**
 * @param variables per canonical variable statistics (Dataset.summary())
 * @param generated build time, ISO 8601 UTC
 */
export function makeInventory(config: AtlasConfig, ds: Dataset, variables: InventoryVariable[], generated: string): DatasetInventory {
  const { lat, lon } = ds.grid;
  const step = (a: Float64Array) => (a.length > 1 ? (a[a.length - 1] - a[0]) / (a.length - 1) : NaN);
  const iso = (ms: number) => new Date(ms).toISOString().replace('.000Z', 'Z');
  return {
    atlas: {
      id: config.id,
      title: config.title,
      description: config.description,
      invented: config.dataset.invented,
      attribution: config.dataset.attribution,
      timeZone: config.timeZone,
      years: config.years,
      baseline: config.baseline,
      product: config.dataset.product,
    },
    grid: {
      latMin: lat[0],
      latMax: lat[lat.length - 1],
      lonMin: lon[0],
      lonMax: lon[lon.length - 1],
      nLat: lat.length,
      nLon: lon.length,
      dLat: step(lat),
      dLon: step(lon),
      landCells: ds.landCells,
    },
    time: { start: iso(ds.time.start), end: iso(ds.time.start + (ds.time.count - 1) * HOUR_MS), hours: ds.time.count },
    variables,
    files: ds.files,
    generated,
  };
}
