/**
 * Recognising ERA5 / ERA5-Land variables by short name, CF standard_name or ECMWF long_name
 * (docs/methods.md §2.1 table; ECMWF parameter database names), and what each becomes: its
 * canonical field (pipeline/model/fields.ts) and the kind of its units.
 */
import { attrText } from './attrs.ts';
import type { CanonicalName } from '../model/fields.ts';
import type { SourceVariable } from './source.ts';
import type { UnitKind } from './units.ts';

/** ERA5 short names the reader knows. */
export type Era5Short = 't2m' | 'd2m' | 'u10' | 'v10' | 'sp' | 'ssrd' | 'fdir' | 'strd' | 'lsm';

export interface Era5Role {
  short: Era5Short;
  /** The canonical field it feeds (u10 and v10 both feed windSpeed10m). */
  canonical: CanonicalName;
  kind: UnitKind;
  /** Plausibility range name (units.ts PLAUSIBLE). */
  plausible: 'temperature' | 'pressure' | 'speed' | 'flux' | 'fraction';
  aliases: string[];
  standardNames: string[];
  longNames: string[];
}

export const ERA5_ROLES: Era5Role[] = [
  {
    short: 't2m',
    canonical: 'airTemperature',
    kind: 'temperature',
    plausible: 'temperature',
    aliases: ['2m_temperature', '2t', 't2', 'var167'],
    standardNames: [],
    longNames: ['2 metre temperature', '2m temperature', '2 m temperature'],
  },
  {
    short: 'd2m',
    canonical: 'dewPointTemperature',
    kind: 'temperature',
    plausible: 'temperature',
    aliases: ['2m_dewpoint_temperature', '2d', 'var168'],
    standardNames: ['dew_point_temperature'],
    longNames: ['2 metre dewpoint temperature', '2m dewpoint temperature', '2 metre dew point temperature'],
  },
  {
    short: 'u10',
    canonical: 'windSpeed10m',
    kind: 'speed',
    plausible: 'speed',
    aliases: ['10m_u_component_of_wind', '10u', 'var165'],
    standardNames: [],
    longNames: ['10 metre u wind component', '10m u component of wind', '10 metre u-component of wind'],
  },
  {
    short: 'v10',
    canonical: 'windSpeed10m',
    kind: 'speed',
    plausible: 'speed',
    aliases: ['10m_v_component_of_wind', '10v', 'var166'],
    standardNames: [],
    longNames: ['10 metre v wind component', '10m v component of wind', '10 metre v-component of wind'],
  },
  {
    short: 'sp',
    canonical: 'surfacePressure',
    kind: 'pressure',
    plausible: 'pressure',
    aliases: ['surface_pressure', 'var134'],
    standardNames: ['surface_air_pressure'],
    longNames: ['surface pressure'],
  },
  {
    short: 'ssrd',
    canonical: 'solarGlobal',
    kind: 'accumulatedEnergy',
    plausible: 'flux',
    aliases: ['surface_solar_radiation_downwards', 'var169'],
    standardNames: ['surface_downwelling_shortwave_flux_in_air'],
    longNames: ['surface solar radiation downwards', 'surface short-wave (solar) radiation downwards'],
  },
  {
    short: 'fdir',
    canonical: 'solarDirect',
    kind: 'accumulatedEnergy',
    plausible: 'flux',
    aliases: ['total_sky_direct_solar_radiation_at_surface', 'var228021'],
    standardNames: ['surface_direct_downwelling_shortwave_flux_in_air'],
    longNames: ['total sky direct solar radiation at surface'],
  },
  {
    short: 'strd',
    canonical: 'thermalDown',
    kind: 'accumulatedEnergy',
    plausible: 'flux',
    aliases: ['surface_thermal_radiation_downwards', 'var175'],
    standardNames: ['surface_downwelling_longwave_flux_in_air'],
    longNames: ['surface thermal radiation downwards', 'surface long-wave (thermal) radiation downwards'],
  },
  {
    short: 'lsm',
    canonical: 'landFraction',
    kind: 'fraction',
    plausible: 'fraction',
    aliases: ['land_sea_mask', 'var172'],
    standardNames: ['land_binary_mask', 'land_area_fraction'],
    longNames: ['land-sea mask', 'land sea mask'],
  },
];

/**
 * Array names of the analysis-ready ERA5 Zarr stores: the data store's request names of the
 * variables (also its `variable` keys in download requests, download-request.ts), kept as aliases above.
 */
export const STORE_NAMES: ReadonlySet<string> = new Set([
  '2m_temperature',
  '2m_dewpoint_temperature',
  '10m_u_component_of_wind',
  '10m_v_component_of_wind',
  'surface_pressure',
  'surface_solar_radiation_downwards',
  'total_sky_direct_solar_radiation_at_surface',
  'surface_thermal_radiation_downwards',
  'land_sea_mask',
]);

const norm = (s: string) =>
  s
    .trim()
    .toLowerCase()
    .replace(/\s+/g, ' ')
    .replace(/\bmeter\b/g, 'metre');

/** Base name of a (possibly group-qualified) variable. */
export function baseName(name: string): string {
  const i = name.lastIndexOf('/');
  return i >= 0 ? name.slice(i + 1) : name;
}

/**
 * The ERA5 role of `v`, if any: by short name first, then standard_name, then long_name.
 * (air_temperature, eastward_wind and northward_wind are not enough on their own: they also name
 * upper-air fields; the short name or the ECMWF long name must say "2 metre" / "10 metre".)
 */
export function recognizeEra5(v: Pick<SourceVariable, 'name' | 'attrs'>): Era5Role | undefined {
  const n = baseName(v.name).toLowerCase();
  for (const r of ERA5_ROLES) if (r.short === n || r.aliases.includes(n)) return r;
  const sn = attrText(v, 'standard_name');
  if (sn) for (const r of ERA5_ROLES) if (r.standardNames.includes(norm(sn))) return r;
  const ln = attrText(v, 'long_name');
  if (ln) for (const r of ERA5_ROLES) if (r.longNames.includes(norm(ln))) return r;
  return undefined;
}
