/**
 * `heathours point`: its options and help; the work (pipeline/commands/point.ts, the physics and
 * work kernels) loads only when the command runs, so other commands start without it.
 */
import type { Command } from 'commander';
import { POINT_HELP } from './point-help.ts';

export function register(program: Command): void {
  program
    .command('point')
    .description('hourly WBGT (sun, open-sky shade and shelter; Liljegren method) and work limits for tabular weather data: one row per hour')
    .requiredOption('--in <file>', 'input CSV, - for standard input (columns: time_utc, lat, lon, ta_c, rh_pct or td_c, pressure_hpa, wind_ms, solar_wm2, ...)')
    .requiredOption('--out <file>', 'output CSV, - for standard output: the input columns plus the computed ones and a status')
    .option('--classes <file>', 'workload classes (YAML like content/workload-classes.yaml); default: the shipped classes')
    .option('--unacclimatized', 'use the limit curve for unacclimatized workers (default: acclimatized)')
    .option('--cav <value>', 'clothing adjustment value added to the WBGT [°C-WBGT], default 0')
    .option(
      '--globe-diameter <m>',
      'diameter of the black globe [m]: 0.15 the standard globe (default), 0.0508 the 2-inch globe of the reference implementation',
    )
    .option('--quiet', 'no progress output')
    .addHelpText('after', POINT_HELP)
    .action(async (opts: { in: string; out: string; quiet?: boolean; classes?: string; unacclimatized?: boolean; cav?: string; globeDiameter?: string }) =>
      (await import('./point.ts')).pointAction(opts),
    );
}
