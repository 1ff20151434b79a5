/**
 * `heathours estimate`: its options and help; the work (pipeline/commands/estimate.ts, the
 * schedule and the atlas reader) loads only when the command runs, so other commands start
 * without it.
 */
import type { Command } from 'commander';
import type { EstimateOptions } from './estimate.ts';
import { APPROXIMATION_NOTE } from '../schedule/approximation.ts';

const collect = (v: string, prev: string[] = []) => [...prev, v];

export function register(program: Command): void {
  program
    .command('estimate')
    .description(
      "schedule, cost of heat, start-month and shift comparisons and the crew for a deadline, for one job at one place of a built atlas (the /estimate/ page's code)",
    )
    .requiredOption('--atlas <dir>', 'the built atlas: the output folder of `heathours build` (holding data/) or its data/ folder')
    .option('--region <id>', 'a region of the atlas (default: the place is required)')
    .option('--cell <lat,lon>', 'a point [° N, ° E]: its grid cell, or the nearest land cell when that cell is sea (the distance is shown)')
    .option('--cell-id <n>', 'a grid cell by its row-major id, as in data/atlas-cells.csv')
    .option('--class <id>', 'workload class of the atlas (default: moderate, or the first)')
    .option('--metabolic-rate <W>', 'a work metabolic rate of your own [W] instead of a class')
    .option('--unacclimatized', 'workers new to the heat or returning (the lower limit)')
    .option('--shade', 'work in the shade (default: in the sun)')
    .option('--rest-in-shade', 'breaks in the shade while working in the sun')
    .option('--rest-wbgt <C>', 'breaks at a cooled rest place of this measured WBGT [°C]')
    .option('--clothing <id>', 'clothing ensemble (work-clothes, cloth-coveralls, …)')
    .option('--hood', 'with a hood')
    .option('--cav <C>', 'a clothing adjustment value of your own [°C-WBGT]')
    .option('--limit-model <id>', "curve-2017 or table-1989 (default: the atlas's)")
    .option('--air-movement', 'air movement felt (table-1989)')
    .option('--shift <HH:MM-HH:MM>', "a shift span in local time; repeat for a split shift (default: the atlas's shift)", collect)
    .option('--days <days>', "work days, e.g. mon-sat or mon-fri,sun (default: the atlas's)")
    .option('--compare-shift <spans>', 'another shift pattern to compare, e.g. "05:00-11:00,15:00-19:00" (repeat, up to 3)', collect)
    .option('--crew <n>', 'workers in the crew (default 10)')
    .option('--work-hours <h>', 'quantity of work [crew-hours] (default 20000)')
    .option('--start <YYYY-MM-DD>', 'first day of the job (default: 1 January after the atlas build)')
    .option('--deadline <YYYY-MM-DD>', 'find the smallest crew that finishes by this day in the 90th-percentile year')
    .option('--rate <r>', 'labour rate per crew-hour (default 0)')
    .option('--daily-cost <c>', 'time-related site cost per calendar day (default 0)')
    .option('--currency <x>', 'currency label for the costs, e.g. EUR')
    .option('--holidays <file>', 'non-working dates, one YYYY-MM-DD per line (# comments)')
    .option(
      '--scenario <id>',
      "also replay the job on this scenario of the atlas (repeat for several); a what-if on the record's weather with shifted monthly means, not a forecast",
      collect,
    )
    .option(
      '--scenarios <all|ids>',
      'also replay the job on every scenario of the atlas (`all`) or on these, separated by commas; without --scenario(s) only the record is replayed (the estimate page ticks every scenario by default)',
    )
    .option('--json', "print the estimate as JSON (the page's JSON download)")
    .option('--csv <file>', 'also write the CSV download')
    .option('--xlsx <file>', 'also write a workbook (.xlsx) with the schedule, years, start months, shifts, assumptions and cautions')
    .addHelpText(
      'after',
      `\nHow the figures are made: ${APPROXIMATION_NOTE}\nScreening figures for a bid, not safety advice: local regulations and a competent person decide work/rest and stop-work.\n`,
    )
    .action(async (o: EstimateOptions) => (await import('./estimate.ts')).estimateAction(o));
}
