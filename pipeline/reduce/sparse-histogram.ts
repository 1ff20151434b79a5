/**
 * The sparse form of a partial's WBGT histograms, as the partial file stores them
 * (pipeline/formats/partial-file.ts): per slot of HIST_LEN bins (month of the piece × local hour ×
 * cell × exposure, in that order), the first non-empty bin, the number n of bins from it to the
 * last non-empty one, then those n counts [h]. An empty slot is `0, 0`. Most bins of a slot are
 * empty (a cell sees a few degrees of WBGT in one local hour of one month), so the sparse form is
 * a small part of the dense one, and a merge adds it into the year without expanding it first
 * (pipeline/reduce/merge.ts).
 */
import { HIST_LEN } from './layout.ts';

/** The sparse form of dense histograms `h` (a whole number of slots of HIST_LEN bins). */
export function sparseHistogram(h: Uint16Array): Uint16Array {
  const slots = h.length / HIST_LEN;
  let size = 0;
  const firsts = new Uint16Array(slots);
  const ns = new Uint16Array(slots);
  for (let s = 0; s < slots; s++) {
    const b0 = s * HIST_LEN;
    let first = -1;
    let last = -1;
    for (let b = 0; b < HIST_LEN; b++) {
      if (h[b0 + b] !== 0) {
        if (first < 0) first = b;
        last = b;
      }
    }
    firsts[s] = first < 0 ? 0 : first;
    ns[s] = first < 0 ? 0 : last - first + 1;
    size += 2 + ns[s];
  }
  const out = new Uint16Array(size);
  let p = 0;
  for (let s = 0; s < slots; s++) {
    out[p++] = firsts[s];
    out[p++] = ns[s];
    // Element by element: a subarray per slot (hundreds of thousands) costs more than the copy.
    const b0 = s * HIST_LEN + firsts[s];
    for (let k = 0; k < ns[s]; k++) out[p++] = h[b0 + k];
  }
  return out;
}

/**
 * Why `sparse` is not the sparse form of `slots` slots (a slot past the end, a slot running past
 * its bins, values left over), or undefined when it is. One pass over the slots' heads.
 */
export function sparseHistogramProblem(sparse: Uint16Array, slots: number): string | undefined {
  let p = 0;
  for (let s = 0; s < slots; s++) {
    if (p + 2 > sparse.length) return `histogram ends at slot ${s} of ${slots}`;
    const first = sparse[p];
    const n = sparse[p + 1];
    p += 2;
    if (first + n > HIST_LEN || p + n > sparse.length) return `histogram slot ${s} runs past its bins`;
    p += n;
  }
  if (p !== sparse.length) return `${sparse.length - p} histogram values left over`;
  return undefined;
}

/** The dense histograms of `slots` slots from their sparse form (checked with {@link sparseHistogramProblem} first). */
export function denseHistogram(sparse: Uint16Array, slots: number): Uint16Array {
  const out = new Uint16Array(slots * HIST_LEN);
  let p = 0;
  for (let s = 0; s < slots; s++) {
    const first = sparse[p++];
    const n = sparse[p++];
    const b0 = s * HIST_LEN + first;
    for (let k = 0; k < n; k++) out[b0 + k] = sparse[p++];
  }
  return out;
}
