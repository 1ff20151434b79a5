/**
 * The `heathours` command line. Each command lives in `pipeline/commands/<name>.ts` and registers
 * itself through `commands/index.ts`. A catalogued {@link HeathoursError} is printed with its hint
 * and exits with status 2; anything else is a bug and exits with status 1 and its stack.
 */
import { Command, CommanderError } from 'commander';
import { HeathoursError } from './model/errors.ts';
import { commands } from './commands/index.ts';
import { CODE_VERSION } from './model/version.ts';

export function makeProgram(): Command {
  const program = new Command('heathours')
    .description('Build an atlas of working hours lost to heat stress from ERA5 / ERA5-Land reanalysis NetCDF files.')
    .version(CODE_VERSION)
    .option('--verbose', 'with an error, also print its details (e.g. the HDF5 library\'s own diagnostics)')
    .showHelpAfterError('(run with --help for usage)')
    .exitOverride();
  for (const register of commands) register(program);
  return program;
}

export async function main(argv: string[]): Promise<void> {
  const program = makeProgram();
  try {
    await program.parseAsync(argv);
  } catch (e) {
    if (e instanceof CommanderError) {
      process.exitCode = e.exitCode === 0 ? 0 : 2;
      return;
    }
    if (e instanceof HeathoursError) {
      process.stderr.write(`${e.format(program.opts().verbose === true || argv.includes('--verbose'))}\n`);
      process.exitCode = 2;
      return;
    }
    process.stderr.write(`internal error (a bug in heathours; please report it with the command you ran):\n${(e as Error)?.stack ?? String(e)}\n`);
    process.exitCode = 1;
  }
}
