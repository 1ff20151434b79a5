/**
 * The legend of a layer as JSON for the manifest: enough for the site to draw a key and for a
 * reader to know what each colour means, without looking at the PNG.
 */

/** One legend entry: a value and the colour drawn for it. */
export interface LegendStop {
  /**
   * continuous: a value whose colour is `color` (linear in between) [units];
   * stepped: the lower edge of a class (inclusive) [units]; categorical: the class code.
   */
  value: number;
  /** `#rrggbb`, exactly the colour in the PNG. */
  color: string;
  label?: string;
}

export interface LegendSpec {
  kind: 'continuous' | 'stepped' | 'categorical';
  title?: string;
  /** Units of the values, e.g. `h`, `degC`, `1`. */
  units: string;
  /** Ramp (d3-scale-chromatic scheme name) or palette name. */
  ramp: string;
  /** True when the ramp runs from its t = 1 end to its t = 0 end. */
  reversed: boolean;
  /** Values drawn at the ramp's ends [units]; null for categorical layers. */
  domain: [number, number] | null;
  /** Entries in ascending value. */
  stops: LegendStop[];
  /** Stepped only: the n + 1 class edges, ascending [units]. */
  breaks?: number[];
  /** Labels in stop order. */
  labels: string[];
  /** Values outside the domain: drawn in the end colours, or (categorical) rejected. */
  outOfDomain: 'clamped' | 'error';
  /** Cells without a value are transparent; `meaning` says why a cell has none. */
  noData: { color: 'transparent'; meaning: string };
}
