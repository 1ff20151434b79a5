/**
 * The whole physics step on a block of hours × cells: geometry (cos zenith, capped solar, direct
 * fraction), 10 m → 2 m wind, then the WBGT kernel. What `build` calls on an {@link HourlyBlock};
 * workers call {@link computeHours} on their share of the hours of the same (shared) arrays.
 *
 * Layout everywhere: time-major `[t * nCells + row * nCols + col]` (pipeline/model/fields.ts).
 */
import type { HourlyBlock } from '../model/fields.ts';
import { geometryBlock, type CosineConvention } from './geometry.ts';
import { wind2mStep } from './wind.ts';
import { wbgtKernel, REFERENCE_GLOBE, type KernelCounts, type KernelChoice } from './kernel.ts';
import { globeFactors } from './liljegren-solve.ts';

type Num = Float32Array | Float64Array;

/** Inputs and outputs of the physics step for one block (all arrays may live on SharedArrayBuffers). */
export interface PhysicsArrays {
  /** End of each hour [ms since 1970 UTC]. */
  time: Float64Array;
  /** Row latitudes [° N] and column longitudes [° E]. */
  lat: Float64Array;
  lon: Float64Array;
  /** Air temperature [°C], dew point [°C], surface pressure [hPa], wind at `windHeight` [m s⁻¹]. */
  airTemperature: Num;
  dewPointTemperature: Num;
  surfacePressure: Num;
  windSpeed: Num;
  /** Global and (optional) direct horizontal solar, hour means [W m⁻²]. */
  solarGlobal: Num;
  solarDirect?: Num;
  /** Per-cell urban flag (length nCells) for the wind exponent set; absent = all rural. */
  urban?: Uint8Array;
  // Outputs, same layout.
  /** Cosine of zenith used [–], direct fraction [–], solar after the cap [W m⁻²], 2 m wind [m s⁻¹]. */
  cosZenith: Num;
  directFraction: Num;
  solar: Num;
  wind2m: Num;
  /** WBGT in sun and shade [°C]. */
  wbgtSun: Num;
  wbgtShade: Num;
  /** Globe and natural wet-bulb temperatures in sun and shade [°C] (optional). */
  globeSun?: Num;
  wetBulbSun?: Num;
  globeShade?: Num;
  wetBulbShade?: Num;
  /** WBGT, globe and natural wet bulb under a shelter at the air temperature [°C] (optional; computed when `wbgtShelter` is given). */
  wbgtShelter?: Num;
  globeShelter?: Num;
  wetBulbShelter?: Num;
  /** Status per cell-hour (pipeline/physics/status.ts); must start zeroed. */
  status: Uint8Array;
}

/**
 * Every input and output array of the physics step for `time.length × lat.length × lon.length`
 * cell-hours, the optional globe and wet-bulb outputs included, allocated by `float` and `byte`
 * (plain typed arrays, or views on SharedArrayBuffers for worker threads). Inputs start at 0.
 */
export function allocatePhysicsArrays(
  time: Float64Array,
  lat: Float64Array,
  lon: Float64Array,
  float: (n: number) => Float32Array = (n) => new Float32Array(n),
  byte: (n: number) => Uint8Array = (n) => new Uint8Array(n),
): PhysicsArrays & Required<Pick<PhysicsArrays, 'globeSun' | 'wetBulbSun' | 'globeShade' | 'wetBulbShade'>> {
  const n = time.length * lat.length * lon.length;
  const f = () => float(n);
  return {
    time,
    lat,
    lon,
    airTemperature: f(),
    dewPointTemperature: f(),
    surfacePressure: f(),
    windSpeed: f(),
    solarGlobal: f(),
    solarDirect: f(),
    cosZenith: f(),
    directFraction: f(),
    solar: f(),
    wind2m: f(),
    wbgtSun: f(),
    wbgtShade: f(),
    globeSun: f(),
    wetBulbSun: f(),
    globeShade: f(),
    wetBulbShade: f(),
    status: byte(n),
  };
}

export interface PhysicsOptions {
  /** Averaging period of the radiation [min], default 60 (ERA5 hourly). */
  periodMinutes?: number;
  /** Cosine convention, default `middle` (see geometry.ts). */
  convention?: CosineConvention;
  /** Height of the wind [m], default 10. */
  windHeight?: number;
  /** Globe diameter [m] (`physics.globeDiameter`); default the reference implementation's 2 in. */
  globeDiameter?: number;
  /** WBGT kernel implementation (kernel.ts `KernelChoice`), default `auto`; `js` for the benchmarks' before figure. */
  kernel?: KernelChoice;
}

/** Counts of one physics run. */
export type PhysicsCounts = KernelCounts & { timeOutOfRange: number };

function sub<T extends Num | Uint8Array>(a: T, from: number, to: number): T {
  return a.subarray(from, to) as T;
}

/** Runs geometry, wind and kernel for hours [t0, t1) of `a`. */
export function computeHours(a: PhysicsArrays, t0: number, t1: number, opts: PhysicsOptions = {}): PhysicsCounts {
  const nCells = a.lat.length * a.lon.length;
  const i0 = t0 * nCells;
  const i1 = t1 * nCells;
  const status = sub(a.status, i0, i1);
  const cosZenith = sub(a.cosZenith, i0, i1);
  const solar = sub(a.solar, i0, i1);
  const g = geometryBlock(
    {
      time: a.time.subarray(t0, t1),
      lat: a.lat,
      lon: a.lon,
      periodMinutes: opts.periodMinutes ?? 60,
      solarGlobal: sub(a.solarGlobal, i0, i1),
      solarDirect: a.solarDirect ? sub(a.solarDirect, i0, i1) : undefined,
      convention: opts.convention,
    },
    { cosZenith, directFraction: sub(a.directFraction, i0, i1), solar, status },
  );
  const wind2m = sub(a.wind2m, i0, i1);
  wind2mStep({ windSpeed: sub(a.windSpeed, i0, i1), cosZenith, solar, height: opts.windHeight ?? 10, urban: a.urban ?? false }, wind2m, i1 - i0, nCells);
  const k = wbgtKernel(
    {
      airTemperature: sub(a.airTemperature, i0, i1),
      dewPointTemperature: sub(a.dewPointTemperature, i0, i1),
      surfacePressure: sub(a.surfacePressure, i0, i1),
      wind2m,
      solar,
      cosZenith,
      directFraction: sub(a.directFraction, i0, i1),
    },
    {
      wbgtSun: sub(a.wbgtSun, i0, i1),
      wbgtShade: sub(a.wbgtShade, i0, i1),
      globeSun: a.globeSun && sub(a.globeSun, i0, i1),
      wetBulbSun: a.wetBulbSun && sub(a.wetBulbSun, i0, i1),
      globeShade: a.globeShade && sub(a.globeShade, i0, i1),
      wetBulbShade: a.wetBulbShade && sub(a.wetBulbShade, i0, i1),
      wbgtShelter: a.wbgtShelter && sub(a.wbgtShelter, i0, i1),
      globeShelter: a.globeShelter && sub(a.globeShelter, i0, i1),
      wetBulbShelter: a.wetBulbShelter && sub(a.wetBulbShelter, i0, i1),
      status,
    },
    i1 - i0,
    0,
    opts.globeDiameter === undefined ? REFERENCE_GLOBE : globeFactors(opts.globeDiameter),
    opts.kernel,
  );
  return { ...k, timeOutOfRange: g.timeOutOfRange };
}

/** Outputs of {@link computeHourlyBlock}, each of length time × cells. */
export interface BlockPhysics {
  cosZenith: Float32Array;
  directFraction: Float32Array;
  solar: Float32Array;
  wind2m: Float32Array;
  wbgtSun: Float32Array;
  wbgtShade: Float32Array;
  globeSun: Float32Array;
  wetBulbSun: Float32Array;
  globeShade: Float32Array;
  wetBulbShade: Float32Array;
  status: Uint8Array;
  counts: PhysicsCounts;
}

/**
 * Physics for one {@link HourlyBlock} from `read` (fields airTemperature, dewPointTemperature,
 * surfacePressure, windSpeed10m, solarGlobal required; solarDirect used when present).
 * @param urban optional per-cell urban flags (length cells) for the wind exponent set
 */
export function computeHourlyBlock(block: HourlyBlock, opts: PhysicsOptions = {}, urban?: Uint8Array): BlockPhysics {
  const f = block.fields;
  const need = ['airTemperature', 'dewPointTemperature', 'surfacePressure', 'windSpeed10m', 'solarGlobal'] as const;
  for (const k of need) if (!f[k]) throw new Error(`computeHourlyBlock: block has no ${k} field (read must provide it)`);
  const n = block.time.length * block.lat.length * block.lon.length;
  const mk = () => new Float32Array(n);
  const out = {
    cosZenith: mk(),
    directFraction: mk(),
    solar: mk(),
    wind2m: mk(),
    wbgtSun: mk(),
    wbgtShade: mk(),
    globeSun: mk(),
    wetBulbSun: mk(),
    globeShade: mk(),
    wetBulbShade: mk(),
    status: new Uint8Array(n),
  };
  const counts = computeHours(
    {
      time: block.time,
      lat: block.lat,
      lon: block.lon,
      airTemperature: f.airTemperature!,
      dewPointTemperature: f.dewPointTemperature!,
      surfacePressure: f.surfacePressure!,
      windSpeed: f.windSpeed10m!,
      solarGlobal: f.solarGlobal!,
      solarDirect: f.solarDirect,
      urban,
      ...out,
    },
    0,
    block.time.length,
    { windHeight: 10, ...opts },
  );
  return { ...out, counts };
}
