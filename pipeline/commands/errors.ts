/** `heathours errors`: prints the catalogue of errors the tool can report, with their hints. */
import type { Command } from 'commander';
import { errorCatalogue } from '../model/errors.ts';
import '../model/catalogue.ts';

export function register(program: Command): void {
  program
    .command('errors')
    .description('list every catalogued error with its code, title and what to do about it')
    .option('--json', 'one JSON object per error')
    .action((opts: { json?: boolean }) => {
      for (const spec of errorCatalogue()) {
        if (opts.json) process.stdout.write(`${JSON.stringify({ code: spec.code, title: spec.title })}\n`);
        else process.stdout.write(`${spec.code.padEnd(28)} ${spec.title}\n`);
      }
    });
}
