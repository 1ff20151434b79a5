/**
 * A site build split between processes (pipeline/run/site-stage.ts, above SITE_PARTS_MIN_REGIONS
 * regions): each Astro process renders one part, `K/N` in the environment variable
 * `HEATHOURS_SITE_PART` (K from 0). Part 0 renders every page and endpoint but the region pages
 * of the other parts; part K > 0 renders the region reports and summaries of the regions whose
 * index i in regions.geojson has i mod N = K, and none of the pages that list or sum many regions
 * (their getStaticPaths return nothing there). The static pages every part renders anyway (Astro
 * builds every static page) are kept from part 0 only, so a part > 0 may skip their data (the home
 * page's ranking of every region); the site stage checks that every other file the parts share
 * (scripts, styles, JSON endpoints) is byte-identical. Unset: one process, every page.
 */

/** The environment variable that names the part of the site this Astro process renders. */
export const SITE_PART_ENV = 'HEATHOURS_SITE_PART';

export interface SitePart {
  /** This part, from 0. */
  index: number;
  /** How many parts the site is built in. */
  count: number;
}

/** The part this process renders: `{ index: 0, count: 1 }` when the variable is unset. */
export function sitePart(env: Record<string, string | undefined> = process.env): SitePart {
  const raw = env[SITE_PART_ENV];
  if (raw === undefined || raw === '') return { index: 0, count: 1 };
  const m = /^(\d+)\/(\d+)$/.exec(raw);
  const index = m ? Number(m[1]) : NaN;
  const count = m ? Number(m[2]) : NaN;
  // Set by the site stage only: a wrong value is a programming error, not a user's input.
  if (!(count >= 1 && index >= 0 && index < count)) throw new RangeError(`${SITE_PART_ENV} must be K/N with 0 <= K < N, not "${raw}"`);
  return { index, count };
}

/** Whether this process renders the region pages of the region at index `i` of regions.geojson. */
export function rendersRegion(i: number, part: SitePart = sitePart()): boolean {
  return i % part.count === part.index;
}

/** Whether this process renders the pages and endpoints that are not one region's (part 0, or the only part). */
export function rendersShared(part: SitePart = sitePart()): boolean {
  return part.index === 0;
}
