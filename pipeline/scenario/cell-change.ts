/**
 * The monthly changes of a scenario at a set of atlas cells, and their physical range. Pure.
 *
 * Layout: per month × cell, `temperature[m · nCells + j]` (month m = 0 for January). Units are
 * the canonical changes of pipeline/read/change-file.ts: temperature [K], humidity [percentage
 * points of relative humidity] or [fraction: relative change of specific humidity], solar
 * [fraction: relative change].
 */
import type { HumidityChangeKind } from '../read/change-file.ts';
import { HumidityChangeOutOfRange, SolarChangeOutOfRange, TemperatureChangeOutOfRange } from './errors.ts';

export interface CellChange {
  nCells: number;
  /** Change of air temperature per month × cell [K]. */
  temperature: Float64Array;
  /** What `humidity` holds; with `humidity` null the kind's quantity is kept (RH, or specific humidity). */
  humidityKind: HumidityChangeKind;
  /** Change of relative humidity [percentage points] or relative change of specific humidity [–], per month × cell; null: none. */
  humidity: Float64Array | null;
  /** Relative change of solar radiation per month × cell [–]; null: none. */
  solar: Float64Array | null;
}

/**
 * Ranges a change must lie in (ours: what is physically possible, with the temperature bound a
 * plausibility check that catches absolute temperatures given as changes).
 */
export const CHANGE_LIMITS = {
  /** Largest temperature change in either direction [K]. */
  temperature: 20,
  /** Relative-humidity change [percentage points]: from −100 to +100. */
  humidityPoints: 100,
  /** Relative change of specific humidity and of solar radiation: above −1 (none left), at most +1 (doubled) [–]. */
  relativeLow: -1,
  relativeHigh: 1,
} as const;

/** A uniform warming of `kelvin` at `nCells` cells: relative humidity, pressure, wind and radiation kept. */
export function uniformWarming(nCells: number, kelvin: number): CellChange {
  return { nCells, temperature: new Float64Array(12 * nCells).fill(kelvin), humidityKind: 'relative', humidity: null, solar: null };
}

const r4 = (x: number) => Math.round(x * 1e4) / 1e4;

/**
 * Checks every change against {@link CHANGE_LIMITS}; the first one outside throws a catalogued
 * error naming the file, the cell (its centre) and the month.
 * @param lat, lon centres of the cells [° N, ° E]
 */
export function checkCellChange(c: CellChange, lat: ArrayLike<number>, lon: ArrayLike<number>, file: string): void {
  const n = c.nCells;
  const at = (i: number) => ({ file, lat: r4(lat[i % n]), lon: r4(lon[i % n]), month: Math.floor(i / n) + 1 });
  const L = CHANGE_LIMITS;
  for (let i = 0; i < 12 * n; i++) {
    const t = c.temperature[i];
    if (!(Math.abs(t) <= L.temperature)) throw TemperatureChangeOutOfRange({ ...at(i), value: r4(t), limit: L.temperature }, { file });
  }
  if (c.humidity) {
    for (let i = 0; i < 12 * n; i++) {
      const h = c.humidity[i];
      const ok = c.humidityKind === 'relative' ? Math.abs(h) <= L.humidityPoints : h > L.relativeLow && h <= L.relativeHigh;
      if (!ok) {
        throw HumidityChangeOutOfRange(
          c.humidityKind === 'relative'
            ? { ...at(i), value: r4(h), unit: 'percentage points of relative humidity', range: '−100 … +100 points' }
            : { ...at(i), value: r4(h), unit: '(relative change of specific humidity)', range: 'above −1 and at most +1' },
          { file },
        );
      }
    }
  }
  if (c.solar) {
    for (let i = 0; i < 12 * n; i++) {
      const s = c.solar[i];
      if (!(s > L.relativeLow && s <= L.relativeHigh)) throw SolarChangeOutOfRange({ ...at(i), value: r4(s) }, { file });
    }
  }
}
