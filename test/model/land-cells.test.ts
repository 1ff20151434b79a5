import { describe, expect, it } from 'vitest';
import {
  cellCentre,
  cellCentres,
  cellIndex,
  cellRow,
  cellRowCol,
  gridCellCount,
  idsInRows,
  isCellOf,
  landCellsOf,
  landInRows,
  rowRange,
  tileCells,
} from '../../pipeline/model/grid.ts';

// A 4-row × 3-column grid (coordinates invented for the test) and its land mask, rows south to north:
//   row 0: sea land land; row 1: all sea; row 2: land sea land; row 3: all land.
const grid = { lat: Float64Array.of(-1.5, -0.5, 0.5, 1.5), lon: Float64Array.of(10, 11, 12) };
const mask = Uint8Array.of(0, 1, 1, 0, 0, 0, 1, 0, 1, 1, 1, 1);

describe('the land cells of a grid', () => {
  it('list the row-major ids of the land cells and count them per row as numpy does (flatnonzero, sum over columns, cumsum)', () => {
    // numpy 2.4.6 (installed on this machine): np.flatnonzero(m) = [1, 2, 6, 8, 9, 10, 11]; m.sum(1) = [2, 0, 2, 3];
    // concatenate([0], cumsum(m.sum(1))) = [0, 2, 2, 4, 7].
    const l = landCellsOf(grid, mask);
    expect([l.ny, l.nx, gridCellCount(l)]).toEqual([4, 3, 12]);
    expect(Array.from(l.ids)).toEqual([1, 2, 6, 8, 9, 10, 11]);
    expect(Array.from(l.perRow)).toEqual([2, 0, 2, 3]);
    expect(Array.from(l.rowStart)).toEqual([0, 2, 2, 4, 7]);
  });

  it('index cells like numpy ravel_multi_index / unravel_index on a (4, 3) shape', () => {
    // numpy: ravel_multi_index((2, 2), (4, 3)) = 8; unravel_index(7, (4, 3)) = (2, 1).
    const l = landCellsOf(grid, mask);
    expect(cellIndex(l, 2, 2)).toBe(8);
    expect(cellRowCol(l, 7)).toEqual({ y: 2, x: 1 });
  });

  it('give the land cells of a band of rows and of a tile (numpy: flatnonzero(m * window) for rows 1…3, columns 1…2 = [8, 10, 11])', () => {
    const l = landCellsOf(grid, mask);
    const [k0, k1] = rowRange(l, 2, 4);
    expect(Array.from(l.ids.subarray(k0, k1))).toEqual([6, 8, 9, 10, 11]);
    expect(rowRange(l, 1, 2)).toEqual([2, 2]);
    expect(Array.from(tileCells(l, { y0: 1, y1: 4, x0: 1, x1: 3 }))).toEqual([8, 10, 11]);
  });

  it('without a mask every cell is land', () => {
    const l = landCellsOf(grid);
    expect(l.ids.length).toBe(12);
    expect(Array.from(l.perRow)).toEqual([3, 3, 3, 3]);
  });

  it('give the row, column and centre of a cell from the grid or its land cells alike (numpy unravel_index([1, 8, 11], (4, 3)) = rows [0, 2, 3], columns [1, 2, 2])', () => {
    const l = landCellsOf(grid, mask);
    for (const g of [grid, l]) {
      expect(cellCentre(g, 7)).toEqual({ row: 2, col: 1, lat: 0.5, lon: 11 });
      expect(cellRow(g, 11)).toBe(3);
      expect(cellRowCol(g, 8)).toEqual({ y: 2, x: 2 });
      expect(gridCellCount(g)).toBe(12);
      const c = cellCentres(g, Int32Array.of(1, 8, 11));
      expect([Array.from(c.lat), Array.from(c.lon)]).toEqual([
        [-1.5, 0.5, 1.5],
        [11, 12, 12],
      ]);
    }
  });

  it('tell an id of the grid from one outside it (integers 0 … 11 only)', () => {
    expect([0, 11].map((id) => isCellOf(grid, id))).toEqual([true, true]);
    expect([-1, 12, 1.5, Number.NaN].map((id) => isCellOf(grid, id))).toEqual([false, false, false, false]);
  });

  it('find the cells of a band of rows in part of the land cells as numpy searchsorted does, and count the land of a band (m[0:3].sum() = 4)', () => {
    // numpy: searchsorted([2, 8, 10, 11], [2 * 3, 3 * 3]) = [1, 2].
    expect(idsInRows(grid, Int32Array.of(2, 8, 10, 11), 2, 3)).toEqual([1, 2]);
    expect(idsInRows(grid, Int32Array.of(2, 8, 10, 11), 0, 4)).toEqual([0, 4]);
    expect(landInRows(landCellsOf(grid, mask), 0, 3)).toBe(4);
  });
});
