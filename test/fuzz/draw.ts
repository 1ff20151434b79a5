/**
 * Seeded, counter-based random draws for the fuzzer: mutant `index` of a format under `seed` is
 * a pure function of (seed, format, index), so any one mutant can be made again on its own
 * (test/fuzz/regenerate.ts) without running the ones before it. Built on the demo generator's
 * counter-based hash (pipeline/demo/random.ts).
 */
import { hash4 } from '../../pipeline/demo/random.ts';

export class Draw {
  private k = 0;
  constructor(
    private readonly seed: number,
    private readonly stream: number,
    private readonly index: number,
  ) {}

  /** Uniform in [0, 1). */
  next(): number {
    return hash4(this.seed, this.stream, this.index, this.k++) / 4294967296;
  }

  /** Integer in [0, n). */
  int(n: number): number {
    return Math.floor(this.next() * n);
  }

  pick<T>(xs: readonly T[]): T {
    return xs[this.int(xs.length)];
  }

  /** Index chosen with the given weights. */
  weighted(weights: readonly number[]): number {
    const total = weights.reduce((a, b) => a + b, 0);
    let r = this.next() * total;
    for (let i = 0; i < weights.length; i++) {
      r -= weights[i];
      if (r < 0) return i;
    }
    return weights.length - 1;
  }
}
