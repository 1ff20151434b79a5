/**
 * The map explorer's regions in pieces: the catalogue (`/map/explorer.json`) carries only a small
 * index, and the regions' names, boxes, label points and outlines are published in pieces of at
 * most {@link REGION_PIECE_SIZE} regions (`map/regions/<kind>-<k>.json`, src/pages/map/regions/)
 * that the page fetches when it needs them, so the map page's first view does not grow with the
 * number of regions. Three cuts of the same regions:
 *
 * - `name`: sorted by folded name (case and accents ignored, {@link foldName}), each piece
 *   listed with the first name it holds: the search loads the pieces whose names can start with
 *   the text typed;
 * - `id`: sorted by id, each piece listed with its first id: a region named in the URL;
 * - `area`: cut in two at the median label point along the longer side until a piece holds at
 *   most the piece size, each piece listed with the box of its regions and their number: the
 *   outlines and names drawn for the map's view, and the regions near a clicked cell.
 *
 * Orders compare UTF-16 code units (`<`), never the locale, so the build and the browser agree.
 * Plain JSON types and pure functions, shared by the build and the browser.
 */
import type { Feature, MultiPolygon, Polygon } from 'geojson';
import type { ExplorerRegion } from './catalogue.ts';

/** Regions per piece at most. */
export const REGION_PIECE_SIZE = 256;
/** Regions whose outlines and names the map draws at once at most; a view holding more asks to zoom in. */
export const MAX_DRAWN_REGIONS = 1000;

/** A region of a piece: the catalogue's fields and `i`, its place in the order of the layers' values files. */
export interface PieceRegion extends ExplorerRegion {
  i: number;
}

/** A `name` or `id` piece. */
export interface RegionListPiece {
  regions: PieceRegion[];
}

/** An `area` piece: its regions and their outlines (properties `id`, `name`). */
export interface RegionAreaPiece {
  regions: PieceRegion[];
  outlines: { type: 'FeatureCollection'; features: Array<Feature<Polygon | MultiPolygon, { id: string; name: string }>> };
}

export type { RegionIndex } from './catalogue.ts';
import type { RegionIndex } from './catalogue.ts';

/** Combining diacritical marks (U+0300–U+036F), removed after NFD on purpose. */
// biome-ignore lint/suspicious/noMisleadingCharacterClass: a class of combining marks alone, matched one by one
const COMBINING_MARKS = /[\u0300-\u036f]/g;

export const foldName = (s: string) => s.normalize('NFD').replace(COMBINING_MARKS, '').toLowerCase().trim().replace(/\s+/g, ' ');

/** Path below the site's base of a piece. */
export const regionPiecePath = (kind: 'name' | 'id' | 'area', k: number) => `map/regions/${kind}-${k}.json`;

const cmp = (a: string, b: string) => (a < b ? -1 : a > b ? 1 : 0);

function chunks<T>(list: T[], size: number): T[][] {
  const out: T[][] = [];
  for (let k = 0; k < list.length; k += size) out.push(list.slice(k, k + size));
  return out;
}

function unionBox(regions: readonly ExplorerRegion[]): [number, number, number, number] {
  const b: [number, number, number, number] = [Infinity, Infinity, -Infinity, -Infinity];
  for (const r of regions) {
    b[0] = Math.min(b[0], r.bbox[0]);
    b[1] = Math.min(b[1], r.bbox[1]);
    b[2] = Math.max(b[2], r.bbox[2]);
    b[3] = Math.max(b[3], r.bbox[3]);
  }
  return b;
}

/** Cuts at the median label point along the longer side until each group holds at most `size`. */
function areaGroups(regions: PieceRegion[], size: number): PieceRegion[][] {
  if (regions.length <= size) return [regions];
  const xs = regions.map((r) => r.label[0]);
  const ys = regions.map((r) => r.label[1]);
  const axis = Math.max(...xs) - Math.min(...xs) >= Math.max(...ys) - Math.min(...ys) ? 0 : 1;
  const sorted = [...regions].sort((a, b) => a.label[axis] - b.label[axis] || a.i - b.i);
  const half = Math.ceil(sorted.length / 2);
  return [...areaGroups(sorted.slice(0, half), size), ...areaGroups(sorted.slice(half), size)];
}

/**
 * The index and the pieces (path → JSON value) of `regions` (in the order of the values files)
 * with their outlines (`geometry`, same order).
 */
export function regionPieces(
  regions: readonly ExplorerRegion[],
  geometry: ReadonlyArray<Polygon | MultiPolygon>,
  size: number = REGION_PIECE_SIZE,
): { index: RegionIndex; pieces: Map<string, RegionListPiece | RegionAreaPiece> } {
  const all: PieceRegion[] = regions.map((r, i) => ({ ...r, i }));
  const pieces = new Map<string, RegionListPiece | RegionAreaPiece>();
  const byName = chunks(
    [...all].sort((a, b) => cmp(foldName(a.name), foldName(b.name)) || cmp(a.id, b.id)),
    size,
  ).map((list, k) => {
    const path = regionPiecePath('name', k);
    pieces.set(path, { regions: list });
    return { path, from: foldName(list[0].name) };
  });
  const byId = chunks(
    [...all].sort((a, b) => cmp(a.id, b.id)),
    size,
  ).map((list, k) => {
    const path = regionPiecePath('id', k);
    pieces.set(path, { regions: list });
    return { path, from: list[0].id };
  });
  const areas = (all.length === 0 ? [] : areaGroups(all, size)).map((list, k) => {
    const path = regionPiecePath('area', k);
    pieces.set(path, {
      regions: list,
      outlines: {
        type: 'FeatureCollection',
        features: list.map((r) => ({ type: 'Feature', properties: { id: r.id, name: r.name }, geometry: geometry[r.i] })),
      },
    });
    return { path, bbox: unionBox(list), count: list.length };
  });
  return { index: { count: all.length, maxDrawn: MAX_DRAWN_REGIONS, byName, byId, areas }, pieces };
}

/** Name pieces that can hold a name starting with `folded` (a piece runs from its `from` to the next one's, both included: equal names may straddle). */
export function namePiecesFor(index: RegionIndex, folded: string): string[] {
  const end = `${folded}\uffff`;
  return index.byName.filter((p, k) => p.from <= end && (k + 1 === index.byName.length || index.byName[k + 1].from >= folded)).map((p) => p.path);
}

/** The id piece that holds `id` if any region has it (undefined before the first id). */
export function idPieceFor(index: RegionIndex, id: string): string | undefined {
  let found: string | undefined;
  for (const p of index.byId) if (p.from <= id) found = p.path;
  return found;
}

const overlaps = (a: readonly number[], b: readonly number[]) => a[0] <= b[2] && b[0] <= a[2] && a[1] <= b[3] && b[1] <= a[3];

/** Area pieces whose box meets `view` [west, south, east, north], and how many regions they hold. */
export function areaPiecesIn(index: RegionIndex, view: readonly [number, number, number, number]): { paths: string[]; count: number } {
  const hit = index.areas.filter((a) => overlaps(a.bbox, view));
  return { paths: hit.map((a) => a.path), count: hit.reduce((s, a) => s + a.count, 0) };
}

/** Distance in degrees (lon scaled by cos lat) from a point to a box; 0 inside. A lower bound of the km distance to any outline in the box, over 111.195 km per degree. */
export function boxDistanceDegrees(box: readonly number[], [lon, lat]: readonly [number, number]): number {
  const dx = Math.max(box[0] - lon, 0, lon - box[2]) * Math.cos((lat * Math.PI) / 180);
  const dy = Math.max(box[1] - lat, 0, lat - box[3]);
  return Math.hypot(dx, dy);
}
