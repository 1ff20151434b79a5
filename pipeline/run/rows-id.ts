/** Name of a band or block of grid rows [y0, y1) (row 0 the southernmost): `rows-0000-0031`. */
export function rowsId(rows: readonly [number, number]): string {
  return `rows-${String(rows[0]).padStart(4, '0')}-${String(rows[1] - 1).padStart(4, '0')}`;
}
