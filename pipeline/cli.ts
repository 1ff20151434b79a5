/**
 * The `heathours` command line. Each command lives in `pipeline/commands/<name>.ts` and registers
 * itself through `commands/index.ts`; a command imports what it works with only when it runs, so
 * `--help` and the light commands start at once. The exit status tells what went wrong
 * (commands/exit-codes.ts): a catalogued {@link HeathoursError} is printed with its hint and exits
 * with 2 (usage or configuration) or 3 (input data); anything else is a bug and exits with 1 and
 * its stack; a reader that closes standard output stops the command quietly (141).
 */
import { Command, CommanderError } from 'commander';
import { HeathoursError } from './model/errors.ts';
import { commands } from './commands/index.ts';
import { CODE_VERSION } from './model/version.ts';
import { EXIT, EXIT_STATUS_HELP, exitCodeOf } from './commands/exit-codes.ts';

export function makeProgram(): Command {
  const program = new Command('heathours')
    .description('Build an atlas of working hours lost to heat stress from ERA5 / ERA5-Land reanalysis NetCDF files.')
    .version(CODE_VERSION, '-v, --version', 'print the version')
    .helpOption('-h, --help', 'show help (`heathours COMMAND --help` for a command)')
    .option('--verbose', "with an error, also print its details (e.g. the HDF5 library's own diagnostics)")
    .showHelpAfterError('(run with --help for usage)')
    .addHelpText('after', `\n${EXIT_STATUS_HELP}\n\n\`heathours errors\` lists every error with its exit status and what to do.`)
    .exitOverride();
  for (const register of commands) register(program);
  return program;
}

/**
 * A reader that closes the pipe (`heathours errors | head`) makes the next write fail with EPIPE:
 * stop quietly with 141, as a shell reports a process ended by SIGPIPE, instead of a stack trace.
 */
function stopQuietlyOnClosedPipe(stream: NodeJS.WriteStream): void {
  stream.on('error', (e: NodeJS.ErrnoException) => {
    if (e.code === 'EPIPE') process.exit(EXIT.closedPipe);
    process.stderr.write(`internal error: writing to ${stream === process.stdout ? 'standard output' : 'standard error'} failed: ${e.message}\n`);
    process.exit(EXIT.internal);
  });
}

export async function main(argv: string[]): Promise<void> {
  stopQuietlyOnClosedPipe(process.stdout);
  stopQuietlyOnClosedPipe(process.stderr);
  const program = makeProgram();
  try {
    await program.parseAsync(argv);
  } catch (e) {
    if (e instanceof CommanderError) {
      process.exitCode = e.exitCode === 0 ? EXIT.ok : EXIT.usage;
      return;
    }
    if (e instanceof HeathoursError) {
      process.stderr.write(`${e.format(program.opts().verbose === true || argv.includes('--verbose'))}\n`);
      process.exitCode = exitCodeOf(e.code);
      return;
    }
    process.stderr.write(`internal error (a bug in heathours; please report it with the command you ran):\n${(e as Error)?.stack ?? String(e)}\n`);
    process.exitCode = EXIT.internal;
  }
}
