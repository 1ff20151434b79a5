/**
 * The map's search box: a region by name, or a place by its coordinates. Pure: text in, what to
 * show out; offline (the regions come with the catalogue, nothing is looked up elsewhere).
 *
 * Coordinates are latitude then longitude, in decimal degrees: "20.5, -145.25", "20.5 -145.25",
 * or with hemispheres "20.5 N 145.25 W" / "20.5°N, 145.25°W" (a hemisphere letter may also put
 * the longitude first: "145.25 W 20.5 N"). A region matches by its name, ignoring case and
 * accents: an exact name first, then the one name that starts with the text, then the one that
 * contains it.
 */
import type { ExplorerRegion } from './catalogue.ts';
import { foldName } from './region-index.ts';

export type SearchResult = { kind: 'region'; id: string; name: string } | { kind: 'point'; lat: number; lon: number } | { kind: 'none'; message: string };

const fold = foldName;

const NUMBER = String.raw`([+\-\u2212]?\d+(?:\.\d+)?)`;
const HEMI = String.raw`\s*°?\s*([NSEWnsew])?`;
const COORDS = new RegExp(String.raw`^${NUMBER}${HEMI}\s*[,;\s]\s*${NUMBER}${HEMI}$`);

/** The coordinates the text gives (or why they are wrong), or null when it is not shaped as coordinates. */
export function parseCoordinates(text: string): SearchResult | null {
  const m = COORDS.exec(text.trim());
  if (!m) return null;
  const num = (s: string) => Number(s.replace('\u2212', '-'));
  const first = { v: num(m[1]), h: m[2]?.toUpperCase() };
  const second = { v: num(m[3]), h: m[4]?.toUpperCase() };
  // Latitude first, unless the letters say the longitude came first ("145.25 W 20.5 N").
  const lonFirst = (first.h !== undefined && 'EW'.includes(first.h)) || (second.h !== undefined && 'NS'.includes(second.h));
  const [la, lo] = lonFirst ? [second, first] : [first, second];
  if ((la.h && !'NS'.includes(la.h)) || (lo.h && !'EW'.includes(lo.h)))
    return { kind: 'none', message: 'Give one latitude (N or S) and one longitude (E or W).' };
  if ((la.h && la.v < 0) || (lo.h && lo.v < 0)) return { kind: 'none', message: 'A coordinate with N, S, E or W takes no minus sign.' };
  const lat = la.h === 'S' ? -la.v : la.v;
  const lon = lo.h === 'W' ? -lo.v : lo.v;
  if (!(lat >= -90 && lat <= 90)) return { kind: 'none', message: `Latitude ${lat} is not between −90 and 90 (° N); write the latitude first.` };
  if (!(lon >= -180 && lon <= 360)) return { kind: 'none', message: `Longitude ${lon} is not between −180 and 360 (° E).` };
  return { kind: 'point', lat, lon };
}

/** What the search text asks for (see the file comment). */
export function searchMap(text: string, regions: readonly ExplorerRegion[]): SearchResult {
  const q = fold(text);
  if (q === '') return { kind: 'none', message: 'Type a region name or a latitude and longitude, e.g. 20.5, −145.25.' };
  const coords = parseCoordinates(text);
  if (coords) return coords;
  const named = regions.map((r) => ({ r, n: fold(r.name) }));
  const pick = (list: typeof named): SearchResult | null => (list.length === 1 ? { kind: 'region', id: list[0].r.id, name: list[0].r.name } : null);
  const exact = named.filter((x) => x.n === q || x.r.id === q);
  if (exact.length > 0) return { kind: 'region', id: exact[0].r.id, name: exact[0].r.name };
  const starts = named.filter((x) => x.n.startsWith(q));
  const found = pick(starts) ?? (starts.length === 0 ? pick(named.filter((x) => x.n.includes(q))) : null);
  if (found) return found;
  const many = starts.length > 1 ? starts : named.filter((x) => x.n.includes(q));
  if (many.length > 1)
    return {
      kind: 'none',
      message: `${many.length} regions match: ${many
        .slice(0, 5)
        .map((x) => x.r.name)
        .join(', ')}${many.length > 5 ? ', …' : ''}. Type more of the name.`,
    };
  return { kind: 'none', message: `No region is named like “${text.trim()}”, and it is not a latitude and longitude.` };
}
