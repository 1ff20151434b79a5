/**
 * The map's regions in pieces (src/components/map/explorer/region-index.ts) and the page's
 * loader (region-loader.ts), on 2,000 invented rectangles (bench/rectangle-regions.ts) renamed
 * with invented names that share starts, carry accents and repeat: every region is in each cut
 * once; a piece holds at most 256; the index stays small; and each answer of the loader (search,
 * the regions holding or nearest a point, the regions of a view) is the one the whole list gives
 * through the page's own pure functions (`searchMap`, `regionsForPoint`) while fetching only a
 * few pieces.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import type { Feature, MultiPolygon, Polygon } from 'geojson';
import { rectangleRegions } from '../../bench/rectangle-regions.ts';
import { labelPoint } from '../../src/lib/label-point.ts';
import { REGION_PIECE_SIZE, foldName, regionPieces, type RegionAreaPiece, type RegionListPiece } from '../../src/components/map/explorer/region-index.ts';
import { RegionLoader } from '../../src/components/map/explorer/region-loader.ts';
import { searchMap } from '../../src/components/map/explorer/map-search.ts';
import { regionsForPoint } from '../../src/components/map/explorer/nearest-region.ts';
import type { ExplorerRegion } from '../../src/components/map/explorer/catalogue.ts';

const N = 2000;
/** The name with its accents removed (NFD, then the combining marks U+0300–U+036F dropped, one code point at a time). */
const withoutAccents = (name: string) => [...name.normalize('NFD')].filter((c) => c < '\u0300' || c > '\u036f').join('');
// Invented names: a few shared starts (so some prefixes span pieces), accents, and repeats.
const STARTS = ['Ála', 'Alo', 'Bere', 'Bérin', 'Cova', 'Dunmar', 'Esk', 'Fjall', 'Gor', 'Haven'];
const SUFFIXES = ['dale', 'moor', 'wick', 'ford', 'by', 'stead', 'holm'];
const nameOf = (k: number) => (k % 97 === 0 ? 'Twin Fields' : `${STARTS[k % STARTS.length]}${SUFFIXES[(k * 7) % SUFFIXES.length]} ${k}`);

let features: Array<Feature<Polygon | MultiPolygon, { id: string; name: string }>>;
let regions: ExplorerRegion[];
let made: ReturnType<typeof regionPieces>;
const loader = () => new RegionLoader(made.index, async (path) => JSON.parse(JSON.stringify(made.pieces.get(path) ?? null)));

beforeAll(() => {
  features = JSON.parse(rectangleRegions(N, 16, 5)).features;
  features.forEach((f, k) => (f.properties.name = nameOf(k)));
  regions = features.map((f) => {
    const ring = (f.geometry as Polygon).coordinates[0];
    const xs = ring.map((c) => c[0]);
    const ys = ring.map((c) => c[1]);
    return {
      id: f.properties.id,
      name: f.properties.name,
      bbox: [Math.min(...xs), Math.min(...ys), Math.max(...xs), Math.max(...ys)],
      label: labelPoint(f.geometry),
    };
  });
  made = regionPieces(
    regions,
    features.map((f) => f.geometry),
  );
});

describe('regions in pieces (region-index.ts)', () => {
  it('puts every region once in each cut (by name, by id, by area), at most 256 a piece, each with its place in the values order', () => {
    for (const kind of ['name', 'id', 'area']) {
      const pieces = [...made.pieces].filter(([p]) => p.startsWith(`map/regions/${kind}-`)).map(([, v]) => v as RegionListPiece);
      if (kind === 'area') expect(pieces.length).toBeGreaterThanOrEqual(Math.ceil(N / REGION_PIECE_SIZE));
      else expect(pieces.length, kind).toBe(Math.ceil(N / REGION_PIECE_SIZE));
      for (const p of pieces) expect(p.regions.length).toBeLessThanOrEqual(REGION_PIECE_SIZE);
      const all = pieces.flatMap((p) => p.regions);
      expect(all.map((r) => r.i).sort((a, b) => a - b)).toEqual(regions.map((_, i) => i));
      for (const r of all) expect(r.id).toBe(regions[r.i].id);
    }
    const names = made.index.byName.flatMap((p) => (made.pieces.get(p.path) as RegionListPiece).regions.map((r) => foldName(r.name)));
    expect(names).toEqual([...names].sort((a, b) => (a < b ? -1 : a > b ? 1 : 0)));
  });

  it('gives each area piece the box of its regions and their outlines, and keeps the index to a few kB', () => {
    for (const a of made.index.areas) {
      const piece = made.pieces.get(a.path) as RegionAreaPiece;
      expect(piece.outlines.features.map((f) => f.properties.id)).toEqual(piece.regions.map((r) => r.id));
      expect(a.count).toBe(piece.regions.length);
      for (const r of piece.regions) {
        expect(r.bbox[0]).toBeGreaterThanOrEqual(a.bbox[0]);
        expect(r.bbox[1]).toBeGreaterThanOrEqual(a.bbox[1]);
        expect(r.bbox[2]).toBeLessThanOrEqual(a.bbox[2]);
        expect(r.bbox[3]).toBeLessThanOrEqual(a.bbox[3]);
      }
    }
    expect(JSON.stringify(made.index).length).toBeLessThan(4000);
  });
});

describe('the map page region loader (region-loader.ts)', () => {
  it('answers every search as searchMap does on the whole list, fetching at most 3 pieces for a name, an id or a start of a name', async () => {
    const texts = new Set<string>();
    for (let k = 0; k < N; k += 37) {
      const r = regions[k];
      texts.add(r.name).add(r.id).add(r.name.toUpperCase()).add(foldName(r.name).slice(0, 6)).add(withoutAccents(r.name));
    }
    for (const t of ['Twin Fields', 'a', 'be', 'bér', 'Haven', ' dale 1', 'moor 19', 'zzz', '', '20.5, -145.25', '95 N 10 E', 'r00001', 'r99999']) texts.add(t);
    for (const text of texts) {
      const l = loader();
      expect(await l.search(text), text).toEqual(searchMap(text, regions));
      const r = searchMap(text, regions);
      const bounded = r.kind === 'region' && (foldName(r.name) === foldName(text) || r.id === foldName(text));
      if (bounded) expect(l.fetched, text).toBeLessThanOrEqual(3);
    }
  });

  it('finds the regions holding a point, or the nearest, as regionsForPoint does on every outline, fetching few area pieces for a point in a region', async () => {
    const shapes = features.map((f) => ({ id: f.properties.id, geometry: f.geometry }));
    let seed = 12345;
    const rnd = () => (seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31;
    const [w, s, e, n] = made.index.areas.reduce(
      (b, a) => [Math.min(b[0], a.bbox[0]), Math.min(b[1], a.bbox[1]), Math.max(b[2], a.bbox[2]), Math.max(b[3], a.bbox[3])],
      [Infinity, Infinity, -Infinity, -Infinity],
    );
    let inside = 0;
    // Points over the regions' extent and up to 3° beyond it, and the label point of every 50th region (inside it).
    const points: Array<[number, number]> = [
      ...Array.from({ length: 60 }, (): [number, number] => [w - 3 + rnd() * (e - w + 6), s - 3 + rnd() * (n - s + 6)]),
      ...regions.filter((_, i) => i % 50 === 0).map((r) => r.label),
    ];
    for (const p of points) {
      const l = loader();
      const got = await l.forPoint(p);
      const want = regionsForPoint(shapes, p);
      expect(got.holding, String(p)).toEqual(want.holding);
      expect(got.nearest?.id, String(p)).toBe(want.nearest?.id);
      if (want.nearest) expect(got.nearest!.km).toBeCloseTo(want.nearest.km, 9);
      // A point inside a region needs only the pieces whose boxes hold it.
      if (want.holding.length > 0) inside++;
      if (want.holding.length > 0) expect(l.fetched, String(p)).toBeLessThanOrEqual(3);
    }
    expect(inside).toBeGreaterThanOrEqual(N / 50);
  });

  it('draws the regions of a small view (every region whose box meets it is in the pieces fetched) and none of a view holding more than the map draws', async () => {
    const l = loader();
    const whole = await l.inView([-180, -85, 180, 85]);
    expect(whole.pieces).toBeNull();
    expect(whole.count).toBe(N);
    expect(l.fetched).toBe(0);
    const r = regions[777];
    const view: [number, number, number, number] = [r.bbox[0] - 0.2, r.bbox[1] - 0.2, r.bbox[2] + 0.2, r.bbox[3] + 0.2];
    const small = await l.inView(view);
    expect(small.pieces).not.toBeNull();
    const drawn = new Set(small.pieces!.flatMap((p) => p.regions.map((x) => x.id)));
    const meets = regions.filter((x) => x.bbox[0] <= view[2] && view[0] <= x.bbox[2] && x.bbox[1] <= view[3] && view[1] <= x.bbox[3]);
    expect(meets.length).toBeGreaterThan(1);
    for (const x of meets) expect(drawn.has(x.id), x.id).toBe(true);
    expect(small.count).toBeLessThanOrEqual(made.index.maxDrawn);
  });

  it('finds a region by id in one piece, and nothing for an id before the first', async () => {
    const l = loader();
    expect((await l.byId(regions[1234].id))?.name).toBe(regions[1234].name);
    expect(l.fetched).toBe(1);
    expect(await l.byId('a-before-every-id')).toBeUndefined();
  });
});
