/** Catalogued errors of the map-layer stage (PNG and GeoTIFF layers of gridded figures). */
import { defineError } from '../../model/errors.ts';

export const LayerGridEmpty = defineError<{ axis: 'lat' | 'lon'; length: number }>({
  code: 'LayerGridEmpty',
  title: 'A map layer was asked for a grid with too few rows or columns',
  message: (p) => `the grid has ${p.length} ${p.axis === 'lat' ? 'latitude rows' : 'longitude columns'}; a layer needs at least 2 to know the cell size`,
  hint: () => 'pass the whole regular grid (at least 2 × 2 cells); a layer of a single row or column cannot be placed on the map',
});

export const LayerValuesLength = defineError<{ length: number; ny: number; nx: number }>({
  code: 'LayerValuesLength',
  title: 'The layer values do not match the grid size',
  message: (p) => `values has ${p.length} entries but the grid is ${p.ny} rows × ${p.nx} columns = ${p.ny * p.nx}`,
  hint: () => 'pass one value per cell in row-major order, values[y * nx + x], rows south to north',
});

export const LayerGridIrregular = defineError<{ axis: 'lat' | 'lon'; index: number; step: number; expected: number }>({
  code: 'LayerGridIrregular',
  title: 'The layer grid is not regular or not ascending',
  message: (p) =>
    `${p.axis} step ${p.index}→${p.index + 1} is ${p.step} ° but the mean step is ${p.expected} °` + (p.expected <= 0 ? ' (coordinates must ascend)' : ''),
  hint: (p) =>
    p.axis === 'lat'
      ? 'latitudes must be equally spaced and ascending south to north (pipeline/model/grid.ts); flip descending files in read'
      : 'longitudes must be equally spaced and ascending west to east, continuous across the antimeridian (e.g. 170 … 190)',
});

export const LayerCoordinateInvalid = defineError<{ axis: 'lat' | 'lon'; index: number; value: number }>({
  code: 'LayerCoordinateInvalid',
  title: 'A layer grid coordinate is not a finite number in range',
  message: (p) => `${p.axis}[${p.index}] = ${p.value}`,
  hint: () => 'cell-centre latitudes must lie in [-90, 90] [° N] and longitudes must be finite [° E]',
});

export const LayerDomainInvalid = defineError<{ min: number; max: number }>({
  code: 'LayerDomainInvalid',
  title: 'The colour scale of a layer has an empty or invalid domain',
  message: (p) => `domain [${p.min}, ${p.max}]: min must be finite and less than max`,
  hint: () => 'pass a domain [min, max] with min < max, or pick one from the data with niceDomain()',
});

export const LayerClassesInvalid = defineError<{ classes: number }>({
  code: 'LayerClassesInvalid',
  title: 'The number of colour classes of a stepped layer is invalid',
  message: (p) => `classes = ${p.classes}`,
  hint: () => 'use a whole number of classes from 2 to 20, or leave it out for a continuous ramp',
});

export const LayerRampUnknown = defineError<{ ramp: string; known: string[] }>({
  code: 'LayerRampUnknown',
  title: 'The colour ramp of a layer is not one of ours',
  message: (p) => `no colour ramp named "${p.ramp}"`,
  hint: (p) => `use one of: ${p.known.join(', ')}`,
});

export const LayerCategoriesInvalid = defineError<{ problem: string }>({
  code: 'LayerCategoriesInvalid',
  title: 'The classes of a categorical layer are invalid',
  message: (p) => p.problem,
  hint: () => 'give each class a distinct integer code, a label and a #rrggbb colour',
});

export const LayerNoData = defineError<{ count: number }>({
  code: 'LayerNoData',
  title: 'A colour domain was asked for data with no finite value',
  message: (p) => `all ${p.count} values are NaN (no data)`,
  hint: () => 'pass an explicit domain for an all-empty layer, or check the mask and the months computed',
});

export const LayerNoDataValueInvalid = defineError<{ noData: number; reason: string }>({
  code: 'LayerNoDataValueInvalid',
  title: 'The GeoTIFF no-data value cannot be used',
  message: (p) => `noData = ${p.noData}: ${p.reason}`,
  hint: () => 'leave noData out (NaN marks no data) or pick a value that no cell takes, e.g. -9999',
});
