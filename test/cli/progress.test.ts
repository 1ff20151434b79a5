/** Progress lines (pipeline/model/progress.ts) say what they count: every count carries its unit. */
import { afterEach, describe, expect, it, vi } from 'vitest';
import { startProgress } from '../../pipeline/model/progress.ts';

const tty = process.stderr.isTTY;
afterEach(() => {
  process.stderr.isTTY = tty;
  vi.restoreAllMocks();
});

function lines(run: () => void): string[] {
  process.stderr.isTTY = false;
  let out = '';
  vi.spyOn(process.stderr, 'write').mockImplementation((s: string | Uint8Array) => {
    out += String(s);
    return true;
  });
  run();
  return out.trim().split('\n');
}

describe('progress lines off a terminal', () => {
  it('count shards in shards by default (the label is the unit), one line per 10 %', () => {
    const got = lines(() => {
      const p = startProgress('shards', 4);
      for (let i = 0; i < 4; i++) p.tick();
      p.done();
    });
    expect(got.map((l) => l.replace(/, [\d.]+ s\)$/, ')'))).toEqual([
      'shards: 25% (1/4 shards)',
      'shards: 50% (2/4 shards)',
      'shards: 75% (3/4 shards)',
      'shards: 100% (4/4 shards)',
    ]);
  });

  it('show a count of bytes in MB when asked (point: MB read), and nothing when quiet', () => {
    const got = lines(() => {
      const p = startProgress('point', 2_000_000, { unit: 'MB read', scale: 1e6 });
      p.tick(1_000_000);
      p.tick(1_000_000);
    });
    expect(got[0]).toMatch(/^point: 50% \(1\.0\/2\.0 MB read, [\d.]+ s\)$/);
    expect(lines(() => startProgress('point', 10, { quiet: true, unit: 'MB read' }).tick(10))).toEqual(['']);
  });
});
