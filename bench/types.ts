/** What a benchmark returns: one or more figures, each with a unit, its input size and a checksum. */
export interface BenchFigure {
  bench: string;
  value: number;
  unit: string;
  /** Input size, checksum of the results, and anything else worth reading. */
  [detail: string]: string | number | boolean;
}

export interface Bench {
  /** The names of the figures this bench produces (for --only). */
  names: string[];
  /** Runs the benchmark; `only` is the requested name (or undefined for all). */
  run(only?: string): Promise<BenchFigure[]>;
}
