/**
 * The weather years a job is replayed on: for each year of the record whose every month is
 * complete (the climate stage's rule, MONTHLY_COMPLETENESS: at most 240 missing hours), the
 * expected share of a worked hour lost to rest breaks and the expected share above the limit,
 * per month × local hour (slot-figures.ts divided by the slot's hours). A year with an incomplete
 * month, or a month × hour slot without hours, is left out and reported.
 */
import { MONTHLY_COMPLETENESS, yearCounts } from '../climate/completeness.ts';
import { daysInMonth } from './calendar.ts';
import { ScheduleNoWeatherYears } from './errors.ts';
import { SLOT_HOURS, SLOT_MONTHS, YEAR_SLOTS, slotFigures, type SlotSettings } from './slot-figures.ts';

/** One replayable year: rates per worked hour, `[m * 24 + h]` [h per h]. */
export interface WeatherYear {
  year: number;
  /** Expected hours lost to rest breaks per hour worked [0–1]. */
  lostRate: Float64Array;
  /** Expected share of a worked hour above the limit [0–1]. */
  aboveRate: Float64Array;
}

/** The replayable years and the years left out, with the reason. */
export interface WeatherYears {
  usable: WeatherYear[];
  skipped: Array<{ year: number; reason: string }>;
}

/**
 * Rates of each year of `years` from its histogram (`histograms[i]` for `years[i]`, tile layout).
 * Catalogued errors: ScheduleNoWeatherYears (no year usable), LimitOutsideHistogram (pipeline/work).
 */
export function weatherYears(histograms: readonly Float64Array[], years: readonly number[], s: SlotSettings): WeatherYears {
  const usable: WeatherYear[] = [];
  const skipped: WeatherYears['skipped'] = [];
  years.forEach((year, i) => {
    const f = slotFigures(histograms[i], s);
    for (let m = 0; m < SLOT_MONTHS; m++) {
      let valid = 0;
      for (let h = 0; h < SLOT_HOURS; h++) valid += f.valid[m * SLOT_HOURS + h];
      const expected = 24 * daysInMonth(year, m + 1);
      // Region tiles hold area-weighted hours (fractions): whole hours, at most the month's.
      if (!yearCounts(Math.min(expected, Math.round(valid)), expected, MONTHLY_COMPLETENESS)) {
        skipped.push({ year, reason: `month ${m + 1} lacks ${Math.round(expected - valid)} of ${expected} hours` });
        return;
      }
    }
    const lostRate = new Float64Array(YEAR_SLOTS);
    const aboveRate = new Float64Array(YEAR_SLOTS);
    for (let k = 0; k < YEAR_SLOTS; k++) {
      const h = f.hours[k];
      if (!(h > 0)) {
        skipped.push({ year, reason: `month ${Math.floor(k / SLOT_HOURS) + 1}, local hour ${k % SLOT_HOURS} holds no hours` });
        return;
      }
      lostRate[k] = Math.min(1, f.lost[k] / h);
      aboveRate[k] = Math.min(1, f.above[k] / h);
    }
    usable.push({ year, lostRate, aboveRate });
  });
  if (usable.length === 0) {
    throw ScheduleNoWeatherYears({ problem: `none of the years ${years.join(', ')} is complete: ${skipped.map((s) => `${s.year} (${s.reason})`).join('; ')}` });
  }
  return { usable, skipped };
}
