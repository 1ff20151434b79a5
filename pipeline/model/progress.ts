/**
 * Progress on long work. On a terminal, a cli-progress bar; elsewhere (CI, pipes) one plain line
 * every 10 % so logs stay readable; silent when `quiet`.
 */
import cliProgress from 'cli-progress';

export interface Progress {
  tick(n?: number): void;
  done(): void;
}

export function startProgress(label: string, total: number, opts: { quiet?: boolean } = {}): Progress {
  if (opts.quiet || total <= 0) return { tick: () => {}, done: () => {} };
  if (process.stderr.isTTY) {
    const bar = new cliProgress.SingleBar(
      { format: `${label} [{bar}] {percentage}% | {value}/{total} | eta {eta_formatted}`, stream: process.stderr, hideCursor: true },
      cliProgress.Presets.shades_classic,
    );
    bar.start(total, 0);
    return { tick: (n = 1) => bar.increment(n), done: () => bar.stop() };
  }
  let value = 0;
  let nextReport = 0.1;
  const t0 = Date.now();
  return {
    tick(n = 1) {
      value += n;
      if (value / total >= nextReport) {
        process.stderr.write(`${label}: ${Math.round((100 * value) / total)}% (${value}/${total}, ${((Date.now() - t0) / 1000).toFixed(1)} s)\n`);
        while (value / total >= nextReport) nextReport += 0.1;
      }
    },
    done() {},
  };
}
