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

/** True where a Uint32 holds the Uint16 of the lower address in its low half (every common processor). */
const LITTLE_ENDIAN = new Uint8Array(Uint16Array.of(1).buffer)[0] === 1;

/**
 * The sparse form of dense histograms `h` (a whole number of slots of HIST_LEN bins). The slots'
 * first and last non-empty bins are found two bins at a time through a Uint32 view when `h` is
 * 4-byte aligned (HIST_LEN is even, so every slot starts on a word), one at a time otherwise.
 */
export function sparseHistogram(h: Uint16Array): Uint16Array {
  const slots = h.length / HIST_LEN;
  const firsts = new Uint16Array(slots);
  const ns = new Uint16Array(slots);
  const size = LITTLE_ENDIAN && (h.byteOffset & 3) === 0 && (HIST_LEN & 1) === 0 ? slotBoundsWords(h, slots, firsts, ns) : slotBounds(h, slots, firsts, ns);
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

/** First non-empty bin and bins up to the last non-empty one of each slot; returns the sparse size. */
function slotBounds(h: Uint16Array, slots: number, firsts: Uint16Array, ns: Uint16Array): number {
  let size = 0;
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
  return size;
}

/** {@link slotBounds} two bins per read (little-endian words: bin 2w in the low half of word w). */
function slotBoundsWords(h: Uint16Array, slots: number, firsts: Uint16Array, ns: Uint16Array): number {
  const w = new Uint32Array(h.buffer, h.byteOffset, h.length >> 1);
  const per = HIST_LEN >> 1;
  let size = 0;
  for (let s = 0; s < slots; s++) {
    const w0 = s * per;
    let a = 0;
    while (a < per && w[w0 + a] === 0) a++;
    if (a === per) {
      firsts[s] = 0;
      ns[s] = 0;
      size += 2;
      continue;
    }
    let z = per - 1;
    while (w[w0 + z] === 0) z--;
    const first = 2 * a + ((w[w0 + a] & 0xffff) === 0 ? 1 : 0);
    const last = 2 * z + (w[w0 + z] >>> 16 !== 0 ? 1 : 0);
    firsts[s] = first;
    ns[s] = last - first + 1;
    size += 2 + ns[s];
  }
  return size;
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
