/**
 * `data/niche.json`: per land cell, mean annual temperature over the baseline and the latest year,
 * its niche class, the shift and the distance to the main mode, with the caveat and the labels.
 * Written in pieces: each merge tile makes its cells' entries ({@link nicheCellsJson}), the publish
 * stage wraps them ({@link nicheJsonHead}, {@link NICHE_JSON_TAIL}); the bytes equal
 * `JSON.stringify({ caveat, labels, cells })` of the whole list.
 */
import { cellCentre, type HorizontalGrid } from '../model/grid.ts';
import { NICHE_CAVEAT, NICHE_CLASSES, NICHE_LABELS, type NicheAssessment } from '../climate/index.ts';

const round2 = (v: number) => (Number.isFinite(v) ? Math.round(v * 100) / 100 : null);

/** The entries of some cells, comma-separated JSON objects (no brackets). */
export function nicheCellsJson(
  a: Pick<NicheAssessment, 'baselineMat' | 'latestMat' | 'shift' | 'baselineClass' | 'baselineDistance'>,
  cells: Int32Array,
  grid: HorizontalGrid,
): string {
  return Array.from(cells, (g, c) => {
    const { lat, lon } = cellCentre(grid, g);
    return JSON.stringify({
      cell: g,
      lat,
      lon,
      baselineMat: round2(a.baselineMat[c]),
      latestMat: round2(a.latestMat[c]),
      shift: round2(a.shift[c]),
      baselineClass: Number.isFinite(a.baselineMat[c]) ? NICHE_CLASSES[a.baselineClass[c]] : null,
      distanceToMainMode: round2(a.baselineDistance[c]),
    });
  }).join(',');
}

/** The text before the first cell entry. */
export function nicheJsonHead(): string {
  return `{"caveat":${JSON.stringify(NICHE_CAVEAT)},"labels":${JSON.stringify(NICHE_LABELS)},"cells":[`;
}

/** The text after the last cell entry. */
export const NICHE_JSON_TAIL = ']}';
