/** The ArrayBuffers of a partial, to transfer (not copy) it between threads. */
import type { ShardPartial } from '../reduce/accumulator.ts';

export function partialBuffers(p: ShardPartial): ArrayBuffer[] {
  const out = new Set<ArrayBuffer>();
  for (const v of Object.values(p)) {
    if (ArrayBuffer.isView(v) && v.buffer instanceof ArrayBuffer && v !== p.cells) out.add(v.buffer);
  }
  return [...out];
}
