/**
 * The error catalogue's machinery. Every failure a user can cause (bad file, bad config, bad
 * value) is a {@link HeathoursError} made from a catalogued {@link ErrorSpec}: a stable code, a
 * short title, a message built from parameters, a hint saying what to do, and where it happened
 * (file, variable, key, row). Each stage keeps its own specs in `<stage>/errors.ts` and registers
 * them here, so `heathours` can list every error it may print.
 */

/** Where a failure happened: any of file, variable, key (config path), row (1-based). */
export interface ErrorWhere {
  file?: string;
  variable?: string;
  key?: string;
  row?: number;
}

/** One catalogued error. `P` are the parameters its message and hint are built from. */
export interface ErrorSpec<P> {
  /** Stable identifier, PascalCase, e.g. `MissingVariable`. */
  code: string;
  /** One line, no trailing full stop. */
  title: string;
  message: (p: P) => string;
  hint: (p: P) => string;
}

/** A catalogued failure. `instanceof HeathoursError` tells user errors from bugs. */
export class HeathoursError extends Error {
  readonly code: string;
  readonly title: string;
  readonly hint: string;
  readonly where: ErrorWhere;
  /** Text for `--verbose` (e.g. a library's own diagnostics), not printed by default. */
  readonly details?: string;

  constructor(code: string, title: string, message: string, hint: string, where: ErrorWhere = {}, details?: string) {
    super(message);
    this.name = 'HeathoursError';
    this.code = code;
    this.title = title;
    this.hint = hint;
    this.where = where;
    if (details) this.details = details;
  }

  /** The text the CLI prints: title, message, where, hint; with `verbose`, the details too. */
  format(verbose = false): string {
    const at = formatWhere(this.where);
    return [
      `error [${this.code}] ${this.title}`,
      `  ${this.message}`,
      ...(at ? [`  at: ${at}`] : []),
      `  hint: ${this.hint}`,
      ...(this.details ? [verbose ? `  details:\n${this.details.replace(/^/gm, '    ')}` : '  (run with --verbose for details)'] : []),
    ].join('\n');
  }
}

function formatWhere(w: ErrorWhere): string {
  const parts: string[] = [];
  if (w.file) parts.push(`file ${w.file}`);
  if (w.variable) parts.push(`variable ${w.variable}`);
  if (w.key) parts.push(`key ${w.key}`);
  if (w.row !== undefined) parts.push(`row ${w.row}`);
  return parts.join(', ');
}

const registry = new Map<string, ErrorSpec<never>>();

/**
 * Declares a catalogued error and returns a function that makes it.
 * @example
 *   const MissingVariable = defineError<{ name: string }>({
 *     code: 'MissingVariable', title: 'A required variable is missing',
 *     message: (p) => `no variable ${p.name}`, hint: () => 'add it to the request' });
 *   throw MissingVariable({ name: 't2m' }, { file: 'a.nc' });
 *
 * Marked free of side effects for bundlers (`@__NO_SIDE_EFFECTS__`, honoured by Rollup, which
 * builds the site): a browser bundle keeps only the errors its code can throw. The one effect,
 * the entry in the catalogue, is read only by `heathours errors` and the tests, which run
 * unbundled and import every error module (pipeline/commands/catalogue.ts).
 */
/* @__NO_SIDE_EFFECTS__ */
export function defineError<P>(spec: ErrorSpec<P>): ((p: P, where?: ErrorWhere, details?: string) => HeathoursError) & { code: string } {
  if (registry.has(spec.code)) throw new Error(`error code ${spec.code} is defined twice`);
  registry.set(spec.code, spec as ErrorSpec<never>);
  const make = (p: P, where: ErrorWhere = {}, details?: string) => new HeathoursError(spec.code, spec.title, spec.message(p), spec.hint(p), where, details);
  return Object.assign(make, { code: spec.code });
}

/** Every registered error spec (the catalogue), sorted by code. */
export function errorCatalogue(): ErrorSpec<never>[] {
  return [...registry.values()].sort((a, b) => a.code.localeCompare(b.code));
}

/** Errors of the command line itself. */
export const UsageError = defineError<{ message: string; hint: string }>({
  code: 'UsageError',
  title: 'The command was called with wrong arguments',
  message: (p) => p.message,
  hint: (p) => p.hint,
});
