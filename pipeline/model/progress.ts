/**
 * Progress on long work. On a terminal, a cli-progress bar; elsewhere (CI, pipes) one plain line
 * every 10 % so logs stay readable; silent when `quiet`. Counts are shown with their unit
 * (`shards: 40% (4/10 shards, 3.1 s)`); the unit defaults to the label.
 */
import cliProgress from 'cli-progress';

export interface Progress {
  tick(n?: number): void;
  done(): void;
}

export interface ProgressOptions {
  quiet?: boolean;
  /** What is counted, shown after the counts, e.g. `files`, `MB`; default: the label. */
  unit?: string;
  /** Counted units per shown unit, e.g. 1e6 to count bytes and show MB; default 1. */
  scale?: number;
}

export function startProgress(label: string, total: number, opts: ProgressOptions = {}): Progress {
  if (opts.quiet || total <= 0) return { tick: () => {}, done: () => {} };
  const unit = opts.unit ?? label;
  const scale = opts.scale ?? 1;
  const show = (v: number) => (scale === 1 ? String(v) : (v / scale).toFixed(1));
  if (process.stderr.isTTY) {
    const bar = new cliProgress.SingleBar(
      {
        format: `${label} [{bar}] {percentage}% | {shown}/{shownTotal} ${unit} | eta {eta_formatted}`,
        stream: process.stderr,
        hideCursor: true,
      },
      cliProgress.Presets.shades_classic,
    );
    bar.start(total, 0, { shown: show(0), shownTotal: show(total) });
    let value = 0;
    return {
      tick: (n = 1) => {
        value += n;
        bar.increment(n, { shown: show(value) });
      },
      done: () => bar.stop(),
    };
  }
  let value = 0;
  let nextReport = 0.1;
  const t0 = Date.now();
  return {
    tick(n = 1) {
      value += n;
      if (value / total >= nextReport) {
        process.stderr.write(
          `${label}: ${Math.round((100 * value) / total)}% (${show(value)}/${show(total)} ${unit}, ${((Date.now() - t0) / 1000).toFixed(1)} s)\n`,
        );
        while (value / total >= nextReport) nextReport += 0.1;
      }
    },
    done() {},
  };
}
