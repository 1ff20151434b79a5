/**
 * Ranking regions by annual shift hours lost for one evaluation (class × acclimatization ×
 * exposure): most hours first; regions without a value last; equal values by name. Pure; the
 * home page's script (src/scripts/ranking.ts) sorts the same way in the browser.
 */

export interface Rankable {
  id: string;
  name: string;
}

/** Compares two values [h] for the ranking: larger first, NaN last. */
export function compareForRanking(a: number, b: number): number {
  const fa = Number.isFinite(a);
  const fb = Number.isFinite(b);
  if (fa && fb) return b - a;
  if (fa) return -1;
  if (fb) return 1;
  return 0;
}

/** The items in ranking order of `value(item)`. */
export function rankBy<T extends Rankable>(items: readonly T[], value: (item: T) => number): T[] {
  return [...items].sort((x, y) => compareForRanking(value(x), value(y)) || x.name.localeCompare(y.name) || x.id.localeCompare(y.id));
}
