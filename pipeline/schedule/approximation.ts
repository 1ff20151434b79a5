/**
 * What the replay approximates, and by how much, in words shared by the page, the CLI help and
 * the downloads. The bounds are measured by test/schedule/hourly-reference.test.ts (which fails
 * when an error grows past them) on grid cells of the invented small test atlas: a 20,000
 * crew-hour job (20 workers, 07:00–17:00 Monday–Saturday: 100 working days without heat) started
 * on the first of each month, moderate acclimatized and heavy unacclimatized work in the sun.
 */

/**
 * Largest differences measured, day-by-day against hour-by-hour, with the standard 150 mm globe
 * (measured: 4.00 days at P50, 5.60 at P90, 7.27 % of the job, 16.3 % where heat takes ≥ 1,000
 * crew-hours; with the earlier 50.8 mm globe they were within 3, 5, 6.5 % and 10 %).
 */
export const MEASURED = {
  /** Added working days, median year [days]. */
  addedDaysP50: 4,
  /** Added working days, 90th-percentile year [days]. */
  addedDaysP90: 6,
  /** Crew-hours lost, as a share of the job's crew-hours [1]. */
  lostShareOfJob: 0.075,
  /** Crew-hours lost where heat takes 1,000 crew-hours or more, as a share of them [1]. */
  lostShareWhenLarge: 0.17,
} as const;

export const APPROXIMATION_NOTE =
  'The atlas publishes, per year, month and local hour, how many hours fell in each 0.25 °C band of WBGT, not the hours in order. ' +
  'The replay therefore gives every working day of a month the expected heat loss of that month and hour in the weather year, ' +
  'not the loss of the actual hot and cool days. Against an hour-by-hour replay of the same weather for grid cells of the invented ' +
  `demo (a job of 100 working days started in each month), the working days added by heat differed by up to ${MEASURED.addedDaysP50} days ` +
  `in the median year and ${MEASURED.addedDaysP90} in the 90th-percentile year, and crew-hours lost by up to ${100 * MEASURED.lostShareOfJob} % ` +
  `of the job's crew-hours (${100 * MEASURED.lostShareWhenLarge} % of the hours lost where heat takes many). ` +
  'A job running past the last year of the record continues with the first year again.';
