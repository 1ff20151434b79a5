/**
 * Licence and attribution of the input data, for the methods page and the footer: invented data
 * are said to be invented; ERA5 and ERA5-Land carry the Copernicus Climate Change Service credit.
 *
 * The Copernicus wording below is written FROM MEMORY of the notice the Copernicus licence asks
 * users to give ("Contains modified Copernicus Climate Change Service information …" and the
 * disclaimer on the European Commission and ECMWF), and the dataset citations and DOIs are from
 * memory too; they are not copied from the licence text. Check them against the current licence
 * and the dataset pages of the Climate Data Store before publishing real data.
 */
import type { DatasetInventory } from '../../pipeline/read/inventory-types.ts';

export interface DataAttribution {
  /** Plain-words licence status. */
  licence: string;
  /** The sentences that must accompany the data and anything derived from them. */
  credit: string[];
  /** How to cite the dataset. */
  citation?: string;
  /** What of this text is from memory and must be checked. */
  caveat?: string;
}

/**
 * The attribution of an atlas's inputs. `year` is the year the (modified) data are published [year].
 * `configured` is the atlas config's own attribution line, shown as given.
 */
export function dataAttribution(atlas: Pick<DatasetInventory['atlas'], 'invented' | 'product' | 'attribution'>, year: number): DataAttribution {
  const configured = atlas.attribution ? [atlas.attribution] : [];
  if (atlas.invented) {
    return {
      licence:
        'The input data are invented: synthetic weather for a fictional territory, made by heathours demo-data. No real place or climate is described, and no third-party data licence applies.',
      credit: ['Invented data, for demonstration only.', ...configured],
    };
  }
  const landOnly = atlas.product === 'era5-land';
  return {
    licence:
      'The input data are reanalysis data of the Copernicus Climate Change Service (C3S), produced by ECMWF and distributed through the Climate Data Store under the licence of Copernicus products, which allows use and redistribution with attribution.',
    credit: [
      `Contains modified Copernicus Climate Change Service information ${year}. Neither the European Commission nor ECMWF is responsible for any use that may be made of the Copernicus information or data it contains.`,
      ...configured,
    ],
    citation: landOnly
      ? 'Muñoz Sabater, J. (2019): ERA5-Land hourly data from 1950 to present. Copernicus Climate Change Service (C3S) Climate Data Store (CDS). doi:10.24381/cds.e2161bac'
      : 'Hersbach, H. et al. (2023): ERA5 hourly data on single levels from 1940 to present. Copernicus Climate Change Service (C3S) Climate Data Store (CDS). doi:10.24381/cds.adbb2d47',
    caveat:
      'The credit line and the citation are written from memory of the Copernicus licence and the dataset pages; check them against the current licence and dataset page before relying on them.',
  };
}
