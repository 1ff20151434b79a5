/**
 * Lists of regions that do not grow a page with the number of regions: up to
 * {@link FULL_LIST_LIMIT} regions the home page and the downloads page list every region (and
 * its files) themselves; above it, regions are listed on pages of at most
 * {@link REGION_PAGE_SIZE}, by the first letter of their name (accents and case ignored; a name
 * not starting with a letter goes under "#"), a letter with more regions cut into numbered parts.
 * The region index pages (`region-index/<key>/`) and the region file pages of the downloads
 * (`downloads/regions/<key>/`) share these keys. Pure.
 */
import { foldName } from '../components/map/explorer/region-index.ts';
import type { RegionSummary } from '../data/regions.ts';

/** Regions a page lists itself at most; more go to the region index and region file pages. */
export const FULL_LIST_LIMIT = 100;
/** Regions per region index page and per region file page at most. */
export const REGION_PAGE_SIZE = 250;

export interface RegionListPage {
  /** Part of the page's path: the letter, and the part number when a letter has several (`b-3`). */
  key: string;
  /** E.g. "B", or "B (part 3 of 40)". */
  label: string;
  regions: RegionSummary[];
}

const initialOf = (name: string) => {
  const c = foldName(name).charAt(0);
  return c >= 'a' && c <= 'z' ? c : '#';
};

/** The pages of `regions` (any order): by letter, names in order within each, parts of at most `size`. */
export function regionListPages(regions: readonly RegionSummary[], size: number = REGION_PAGE_SIZE): RegionListPage[] {
  const byLetter = new Map<string, RegionSummary[]>();
  const sorted = [...regions].sort((a, b) => {
    const fa = foldName(a.name);
    const fb = foldName(b.name);
    return fa < fb ? -1 : fa > fb ? 1 : a.id < b.id ? -1 : a.id > b.id ? 1 : 0;
  });
  for (const r of sorted) {
    const k = initialOf(r.name);
    const list = byLetter.get(k) ?? [];
    list.push(r);
    byLetter.set(k, list);
  }
  const pages: RegionListPage[] = [];
  for (const letter of [...byLetter.keys()].sort()) {
    const list = byLetter.get(letter)!;
    const parts = Math.ceil(list.length / size);
    const slug = letter === '#' ? 'other' : letter;
    for (let p = 0; p < parts; p++) {
      pages.push({
        key: parts === 1 ? slug : `${slug}-${p + 1}`,
        label: `${letter.toUpperCase()}${parts === 1 ? '' : ` (part ${p + 1} of ${parts})`}`,
        regions: list.slice(p * size, (p + 1) * size),
      });
    }
  }
  return pages;
}

/** The region whose file this is (`…/regions/<id>.<ext>` or `…/calculator/<id>.bin`, any folder above, e.g. a scenario's), if `id` is one of `ids`. */
export function regionFileOf(path: string, ids: ReadonlySet<string>): string | undefined {
  const m = path.match(/(?:^|\/)(?:regions|calculator)\/([a-z0-9-]+)(?:\.[a-z0-9]+)+$/);
  return m && ids.has(m[1]) ? m[1] : undefined;
}

/** The per-region files of `artefacts` ({@link regionFileOf}) on each page of `pages`, in the page's order of regions, with their count and total size [bytes]. */
export function regionFilesByPage<A extends { path: string; bytes: number }>(
  pages: readonly RegionListPage[],
  artefacts: readonly A[],
): Array<{ page: RegionListPage; files: Array<{ region: string; artefact: A }>; bytes: number }> {
  const ids = new Set(pages.flatMap((p) => p.regions.map((r) => r.id)));
  const byRegion = new Map<string, A[]>();
  for (const a of artefacts) {
    const id = regionFileOf(a.path, ids);
    if (!id) continue;
    const list = byRegion.get(id) ?? [];
    list.push(a);
    byRegion.set(id, list);
  }
  return pages.map((page) => {
    const files = page.regions.flatMap((r) => (byRegion.get(r.id) ?? []).map((artefact) => ({ region: r.id, artefact })));
    return { page, files, bytes: files.reduce((s, f) => s + f.artefact.bytes, 0) };
  });
}
