/**
 * The exit status tells what went wrong (pipeline/commands/exit-codes.ts, README "Exit status"):
 * 2 usage or configuration, 3 input data, 1 internal error; every catalogued error is classed.
 * Exit codes 1 and 2 follow common practice for command-line tools (2 for wrong usage, as
 * commander and POSIX utilities such as grep use it); common practice, no source.
 */
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { Command } from 'commander';
import { errorCatalogue } from '../../pipeline/model/errors.ts';
import '../../pipeline/commands/catalogue.ts';
import { DATA_ERRORS, EXIT, USAGE_ERRORS, exitCodeOf } from '../../pipeline/commands/exit-codes.ts';
import { genericHint } from '../../pipeline/commands/errors.ts';

// Three commands that fail in the three ways, in place of the real ones.
vi.mock('../../pipeline/commands/index.ts', async () => {
  const { UsageError } = await import('../../pipeline/model/errors.ts');
  const { NetcdfFileNotFound } = await import('../../pipeline/read/errors.ts');
  return {
    commands: [
      (p: Command) =>
        p.command('bad-usage').action(() => {
          throw UsageError({ message: '--x is wrong', hint: 'pass --x 1' }, { key: '--x' });
        }),
      (p: Command) =>
        p.command('bad-data').action(() => {
          throw NetcdfFileNotFound({ path: '/nowhere/a.nc' }, { file: '/nowhere/a.nc' });
        }),
      (p: Command) =>
        p.command('bug').action(() => {
          throw new TypeError('x is undefined');
        }),
    ],
  };
});

async function runMain(...args: string[]): Promise<{ code: number; stderr: string }> {
  const { main } = await import('../../pipeline/cli.ts');
  let stderr = '';
  const spy = vi.spyOn(process.stderr, 'write').mockImplementation((s: string | Uint8Array) => {
    stderr += String(s);
    return true;
  });
  try {
    await main(['node', 'heathours', ...args]);
  } finally {
    spy.mockRestore();
  }
  const code = Number(process.exitCode ?? 0);
  process.exitCode = 0;
  return { code, stderr };
}

afterEach(() => {
  process.exitCode = 0;
});

describe('exit status', () => {
  it('every catalogued error is classed once, as usage/configuration or as input data, and no class lists an unknown code', () => {
    const codes = errorCatalogue().map((s) => s.code);
    const unclassed = codes.filter((c) => !USAGE_ERRORS.includes(c) && !DATA_ERRORS.includes(c));
    expect(unclassed, 'add these codes to USAGE_ERRORS or DATA_ERRORS in pipeline/commands/exit-codes.ts').toEqual([]);
    expect(USAGE_ERRORS.filter((c) => DATA_ERRORS.includes(c))).toEqual([]);
    expect([...USAGE_ERRORS, ...DATA_ERRORS].filter((c) => !codes.includes(c))).toEqual([]);
    expect(exitCodeOf('ConfigInvalid')).toBe(EXIT.usage);
    expect(exitCodeOf('NetcdfFileTruncated')).toBe(EXIT.data);
  });

  it('a usage error exits with 2, printed with its key and hint', async () => {
    const r = await runMain('bad-usage');
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('error [UsageError]');
    expect(r.stderr).toContain('at: key --x');
    expect(r.stderr).toContain('hint: pass --x 1');
  });

  it('an input-data error exits with 3, naming the file', async () => {
    const r = await runMain('bad-data');
    expect(r.code).toBe(3);
    expect(r.stderr).toContain('error [NetcdfFileNotFound]');
    expect(r.stderr).toContain('at: file /nowhere/a.nc');
  });

  it('an uncatalogued failure is an internal error: exit 1 with its stack and a request to report it', async () => {
    const r = await runMain('bug');
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/^internal error \(a bug in heathours; please report it/);
    expect(r.stderr).toContain('TypeError: x is undefined');
  });

  it('an unknown option or command exits with 2 (usage)', async () => {
    expect((await runMain('bad-usage', '--nope')).code).toBe(2);
    expect((await runMain('no-such-command')).code).toBe(2);
  });

  it('--help lists the exit statuses and exits with 0', async () => {
    let out = '';
    const spy = vi.spyOn(process.stdout, 'write').mockImplementation((s: string | Uint8Array) => {
      out += String(s);
      return true;
    });
    try {
      expect((await runMain('--help')).code).toBe(0);
    } finally {
      spy.mockRestore();
    }
    expect(out).toMatch(/Exit status:\n {2}0 {4}done\n {2}1 {4}internal error/);
    expect(out).toMatch(/\n {2}3 {4}input data/);
    expect(out).toMatch(/\n {2}141 {2}the reader closed standard output/);
  });
});

describe('heathours errors', () => {
  it('shows every hint for any case, the case values as ‹name› (PointMissingColumn, a hint joining a list: LayerRampUnknown)', () => {
    const byCode = new Map(errorCatalogue().map((s) => [s.code, s]));
    expect(genericHint(byCode.get('PointMissingColumn')!.hint)).toBe('add a column named exactly "‹column›" to the header row');
    expect(genericHint(byCode.get('LayerRampUnknown')!.hint)).toBe('use one of: ‹known›');
    for (const s of errorCatalogue()) expect(genericHint(s.hint).length, s.code).toBeGreaterThan(8);
  });
});
