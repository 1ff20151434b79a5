/**
 * What the replay approximates, and by how much, in words shared by the page, the CLI help and
 * the downloads. The figures are measured by test/schedule/hourly-reference.test.ts (the test
 * fails when the error grows past them).
 */

/** Largest measured difference of the P50 and P90 added working days, day-by-day against hour-by-hour [days]. */
export const MEASURED_ADDED_DAYS_ERROR = 1;
/** Largest measured difference of crew-hours lost, as a share of the hour-by-hour figure [1]. */
export const MEASURED_LOST_SHARE_ERROR = 0.05;

export const APPROXIMATION_NOTE =
  'The atlas publishes, per year, month and local hour, how many hours fell in each 0.25 °C band of WBGT, not the hours in order. ' +
  'The replay therefore gives every working day of a month the expected heat loss of that month and hour of the weather year, ' +
  'not the loss of the actual hot and cool days. Against an hour-by-hour replay of the same weather (measured for grid cells of the ' +
  `invented demo), added working days differed by at most ${MEASURED_ADDED_DAYS_ERROR} day at P50 and P90 and crew-hours lost by at most ` +
  `${Math.round(MEASURED_LOST_SHARE_ERROR * 100)} %. A job running past the last year of the record continues with the first year again.`;
