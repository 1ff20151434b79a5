/**
 * The regions stage's method as the methods page shows it: how region figures are made from the
 * cells a region overlaps (pipeline/model/sources.ts for the descriptor shape).
 */
import type { MethodGroup } from '../model/sources.ts';
import { EARTH_RADIUS_KM } from './spherical-area.ts';

export const REGION_METHODS: MethodGroup = {
  id: 'regions',
  title: 'From cells to regions',
  intro:
    'Region figures are area-weighted means of the figures of the land cells a region overlaps, computed for every year before the statistics across years are taken.',
  methods: [
    {
      id: 'region-mean',
      name: 'Area-weighted region mean',
      summary:
        'Each region polygon is clipped exactly against every grid cell; a cell\u2019s weight is the area of the region inside it, on the sphere, as a share of the region\u2019s covered area. Cells without a value (sea, masked out) are left out and the weight that remains is reported.',
      equation: [
        'w_c = A(region ∩ cell c) / Σ_c A(region ∩ cell c)',
        'region value = Σ_c w_c·x_c / Σ_c w_c over the cells with a value',
        'worst cell = the highest baseline mean of any cell the region overlaps',
      ],
      symbols: [
        { symbol: 'A', meaning: 'area on a sphere of radius R_E', unit: 'km²' },
        { symbol: 'x_c', meaning: 'the figure of cell c', unit: 'unit of the figure' },
      ],
      constants: [
        {
          symbol: 'R_E',
          name: 'radius of the sphere used for areas (mean Earth radius)',
          value: EARTH_RADIUS_KM,
          unit: 'km',
          code: 'pipeline/regions/spherical-area.ts#EARTH_RADIUS_KM',
        },
      ],
      sources: [],
      code: ['pipeline/regions/cell-weights.ts', 'pipeline/regions/region-stats.ts regionFieldStats()'],
      notes: ['Area-weighted means are common practice; the exact clipping and spherical areas are our implementation (pipeline/regions/README.md).'],
    },
  ],
};
