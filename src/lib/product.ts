/** How the site names and credits each reanalysis product the pipeline reads. */
import type { DatasetInventory } from '../../pipeline/read/inventory-types.ts';

export interface ProductDescription {
  name: string;
  /** Grid spacing of the product as distributed [°]. */
  nativeSpacing: number;
  source: string;
}

/** Plain description of a product (ECMWF documentation: ERA5 0.25°, ERA5-Land 0.1°). */
export function productDescription(product: DatasetInventory['atlas']['product']): ProductDescription {
  return product === 'era5-land'
    ? { name: 'ERA5-Land hourly reanalysis', nativeSpacing: 0.1, source: 'ECMWF, Copernicus Climate Change Service (C3S)' }
    : { name: 'ERA5 hourly reanalysis', nativeSpacing: 0.25, source: 'ECMWF, Copernicus Climate Change Service (C3S)' };
}
