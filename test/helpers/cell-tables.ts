/**
 * The per-cell tables of a data folder (`data/cell-tables/<band>.csv`, one per merge band of grid
 * rows) as one CSV text: the first file's header, then every file's rows, bands in row order.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';

/** @param dataDir the `data` folder */
export function readCellTables(dataDir: string): string {
  const dir = join(dataDir, 'cell-tables');
  const files = readdirSync(dir)
    .filter((f) => f.endsWith('.csv'))
    .sort();
  if (files.length === 0) throw new Error(`no per-cell tables in ${dir}`);
  return files
    .map((f, i) => {
      const text = readFileSync(join(dir, f), 'utf8');
      return i === 0 ? text : text.slice(text.indexOf('\n') + 1);
    })
    .join('');
}
