/**
 * ERA5 short names, units, long names and CF standard names the demo files carry, as the CDS
 * writes them (docs/methods.md §2.1 for names and units; long names and standard names from memory
 * of CDS files), plus the global attributes that label every demo file as invented.
 */
import type { DemoVariable } from './weather.ts';

export interface Era5VariableInfo {
  units: string;
  long_name: string;
  standard_name?: string;
  /** Rounding step of the NetCDF-4 float32 values [units]: 0.016 K, 0.008 m s⁻¹, 1 Pa,
   * 64 J m⁻² (0.018 W m⁻²), far finer than any use of the data needs; trailing zero mantissa
   * bits let deflate compress the float32 values (invented choice). */
  step: number;
}

export const ERA5_VARIABLES: Record<DemoVariable | 'lsm', Era5VariableInfo> = {
  t2m: { units: 'K', long_name: '2 metre temperature', step: 1 / 64 },
  d2m: { units: 'K', long_name: '2 metre dewpoint temperature', step: 1 / 64 },
  u10: { units: 'm s**-1', long_name: '10 metre U wind component', step: 1 / 128 },
  v10: { units: 'm s**-1', long_name: '10 metre V wind component', step: 1 / 128 },
  sp: { units: 'Pa', long_name: 'Surface pressure', standard_name: 'surface_air_pressure', step: 1 },
  ssrd: { units: 'J m**-2', long_name: 'Surface solar radiation downwards', standard_name: 'surface_downwelling_shortwave_flux_in_air', step: 64 },
  fdir: { units: 'J m**-2', long_name: 'Total sky direct solar radiation at surface', step: 64 },
  strd: { units: 'J m**-2', long_name: 'Surface thermal radiation downwards', standard_name: 'surface_downwelling_longwave_flux_in_air', step: 64 },
  lsm: { units: '(0 - 1)', long_name: 'Land-sea mask', standard_name: 'land_binary_mask', step: 1 / 4096 },
};

/** Text that labels a file as invented demo data (global `title`, `source`, `history`). */
export function inventedLabels(opts: { seed: number; what: string }): { title: string; source: string; history: string } {
  return {
    title: `heathours demo: invented synthetic ${opts.what} for the invented territory of Quellmar (not real data)`,
    source: 'invented by heathours demo-data; synthetic values in ERA5 layout, not derived from any real dataset or place',
    history: `heathours demo-data --seed ${opts.seed}: invented demo data (synthetic, deterministic); no real observation or reanalysis was used`,
  };
}
