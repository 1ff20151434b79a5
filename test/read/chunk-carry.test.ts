/**
 * The last decoded chunk kept for the next block (pipeline/read/chunk-carry.ts), shared by the
 * NetCDF-4 and Zarr readers. A stand-in decoder serves a 10 × 3 array (values invented: 0 … 29,
 * row-major) in chunks of 4 along the first dimension and counts what it decodes; the values each
 * request receives are checked against numpy slicing of the same array (Debian's python3-numpy,
 * /usr/bin/python3: `np.arange(30).reshape(10, 3)[s0:e0, c0:c1]`).
 */
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { ChunkCarry } from '../../pipeline/read/chunk-carry.ts';
import { denseStrides } from '../../pipeline/read/source.ts';

const N0 = 10;
const N1 = 3;
const CHUNK = 4;

/** numpy's slice of the array, flattened. */
function numpySlice(s0: number, e0: number, c0: number, c1: number): number[] {
  const py = `import numpy as np, json; print(json.dumps(np.arange(${N0 * N1}).reshape(${N0}, ${N1})[${s0}:${e0}, ${c0}:${c1}].ravel().tolist()))`;
  const r = spawnSync('/usr/bin/python3', ['-c', py], { encoding: 'utf8' });
  if (r.status !== 0) throw new Error(r.stderr);
  return JSON.parse(r.stdout) as number[];
}

function setup() {
  const carry = new ChunkCarry<string>();
  const decoded: Array<[number, number]> = [];
  const decode = async (start: number[], count: number[]) => {
    decoded.push([start[0], start[0] + count[0]]);
    const data = new Float32Array(count[0] * count[1]);
    for (let i = 0; i < count[0]; i++) for (let j = 0; j < count[1]; j++) data[i * count[1] + j] = (start[0] + i) * N1 + start[1] + j;
    return { data, strides: denseStrides(count) };
  };
  /** Reads rows [s0, e0) of columns [c0, c1) and returns them as the sink puts them together. */
  const read = async (s0: number, e0: number, c0 = 0, c1 = N1) => {
    const out = new Array<number>((e0 - s0) * (c1 - c0)).fill(Number.NaN);
    await carry.read('v', [s0, c0], [e0 - s0, c1 - c0], CHUNK, N0, decode, (data, base, strides, at, n) => {
      for (let i = 0; i < n; i++) for (let j = 0; j < c1 - c0; j++) out[(at + i) * (c1 - c0) + j] = data[base + i * strides[0] + j * strides[1]];
    });
    return out;
  };
  return { carry, decoded, read };
}

describe('the last decoded chunk', () => {
  it('serves consecutive blocks that end inside a chunk, each chunk decoded once, with the values numpy slices', async () => {
    const { decoded, read } = setup();
    expect(await read(0, 3)).toEqual(numpySlice(0, 3, 0, 3));
    expect(await read(3, 6)).toEqual(numpySlice(3, 6, 0, 3));
    expect(await read(6, 10)).toEqual(numpySlice(6, 10, 0, 3));
    // Chunks [0, 4), [4, 8), [8, 10): rows 3 and 6–7 came from the kept chunk.
    expect(decoded).toEqual([
      [0, 4],
      [4, 8],
      [8, 10],
    ]);
  });

  it('is not used for other columns, a block that starts elsewhere, or after clear()', async () => {
    const { carry, decoded, read } = setup();
    await read(0, 3);
    expect(await read(3, 5, 1, 3)).toEqual(numpySlice(3, 5, 1, 3));
    expect(decoded).toEqual([
      [0, 4],
      [0, 8],
    ]);
    expect(await read(1, 2)).toEqual(numpySlice(1, 2, 0, 3));
    expect(decoded.length).toBe(3);
    await read(5, 6);
    carry.clear();
    expect(await read(6, 7)).toEqual(numpySlice(6, 7, 0, 3));
    expect(decoded.slice(3)).toEqual([
      [4, 8],
      [4, 8],
    ]);
  });
});
