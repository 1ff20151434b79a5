/**
 * The site's navigation: one entry per page that exists. Later pages (map explorer, region
 * reports, downloads, methods, estimate) add their entry here.
 */

export interface NavEntry {
  /** Path below the site's base, with a trailing slash ('' is the home page). */
  path: string;
  label: string;
}

export const NAV: NavEntry[] = [
  { path: '', label: 'Overview' },
  { path: 'map/', label: 'Map' },
  { path: 'estimate/', label: 'Estimate' },
  { path: 'inventory/', label: 'Data inventory' },
];

/** `path` below Astro's base URL (`import.meta.env.BASE_URL`), e.g. `/inventory/`. */
export function sitePath(base: string, path: string): string {
  return `${base.endsWith('/') ? base : `${base}/`}${path}`;
}
