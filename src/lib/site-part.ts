/**
 * A site build split between processes (pipeline/run/site-stage.ts, above SITE_PARTS_MIN_REGIONS
 * regions): each Astro process renders one part, `K/N` in the environment variable
 * `HEATHOURS_SITE_PART` (K from 0). Part 0 renders every page and endpoint but the region pages
 * of the other parts; part K > 0 renders the region reports and summaries of its share of the
 * regions ({@link regionPart}), and none of the pages that list or sum many regions
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

/** Regions are dealt out in blocks of this many, by their index in regions.geojson [count]. */
const BLOCK = 64;
/**
 * How much smaller part 0's share of the region pages is than an even share [fraction]: part 0
 * also renders the pages that list or sum every region (home, downloads, the map's values), so
 * with even shares the other parts waited for it. Measured at 1,000 regions in two parts
 * (2026-12-05, load ~1–2): part 0 took 31.6 s and part 1 30.6 s, 3 % more; half of that moved.
 */
const PART0_LIGHTER = 0.03;

/**
 * The part that renders the pages of the region at index `i` of regions.geojson, of `count`
 * parts: in each block of {@link BLOCK} indices part 0 takes the first (a little fewer than
 * 1/count, {@link PART0_LIGHTER}) and the other parts the rest in turn.
 */
export function regionPart(i: number, count: number): number {
  if (count <= 1) return 0;
  const first = Math.floor((BLOCK / count) * (1 - PART0_LIGHTER));
  const q = i % BLOCK;
  return q < first ? 0 : 1 + ((q - first) % (count - 1));
}

/** Whether this process renders the region pages of the region at index `i` of regions.geojson. */
export function rendersRegion(i: number, part: SitePart = sitePart()): boolean {
  return regionPart(i, part.count) === part.index;
}

/** Whether this process renders the pages and endpoints that are not one region's (part 0, or the only part). */
export function rendersShared(part: SitePart = sitePart()): boolean {
  return part.index === 0;
}
