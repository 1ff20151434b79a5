/**
 * `heathours errors [--json]`: prints the catalogue of errors the tool can report: code, exit
 * status, title and what to do (the hint). A hint that names the case's values shows them as
 * ‹name›.
 */
import type { Command } from 'commander';
import { EXIT_STATUS_HELP, exitCodeOf } from './exit-codes.ts';

/** Parameters standing for any case: each reads as ‹name› (and joins as ‹name› where a list is expected). */
const PLACEHOLDERS = new Proxy(
  {},
  {
    get: (_t, key) => (typeof key === 'string' ? Object.assign(new String(`‹${key}›`), { join: () => `‹${key}›` }) : undefined),
  },
);

/** The hint of an error for any case, with the case's values as ‹name›. */
export function genericHint(hint: (p: never) => string): string {
  const specific = '(specific to each case; printed with the error)';
  try {
    const text = String(hint(PLACEHOLDERS as never));
    return /^‹\w+›$/.test(text) ? specific : text;
  } catch {
    return specific;
  }
}

export function register(program: Command): void {
  program
    .command('errors')
    .description('list every catalogued error: its code, exit status, title and what to do about it (the hint)')
    .option('--json', 'one JSON object per error: code, exit, title, hint')
    .addHelpText('after', `\n${EXIT_STATUS_HELP}`)
    .action(async (opts: { json?: boolean }) => {
      const { errorCatalogue } = await import('../model/errors.ts');
      await import('./catalogue.ts');
      for (const spec of errorCatalogue()) {
        const row = { code: spec.code, exit: exitCodeOf(spec.code), title: spec.title, hint: genericHint(spec.hint) };
        if (opts.json) process.stdout.write(`${JSON.stringify(row)}\n`);
        else process.stdout.write(`${row.code} (exit ${row.exit}): ${row.title}\n    hint: ${row.hint}\n`);
      }
    });
}
