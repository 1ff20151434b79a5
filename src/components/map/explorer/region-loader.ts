/**
 * The map page's regions, fetched piece by piece (region-index.ts) as the page needs them: a
 * region named in the URL, the search, the outlines and names of the map's view, and the regions
 * holding or nearest a clicked cell. Each answer is the one the whole list would give
 * (map-search.ts `searchMap`, nearest-region.ts `regionsForPoint`), from the pieces that can
 * change it. `fetchPiece` gets a piece's path below the site's base (the browser fetches it; a
 * test reads the built file). Each piece is fetched once.
 */
import { KM_PER_DEGREE, regionsForPoint, type RegionShape } from './nearest-region.ts';
import { parseCoordinates, searchMap, type SearchResult } from './map-search.ts';
import {
  areaPiecesIn,
  boxDistanceDegrees,
  foldName,
  idPieceFor,
  namePiecesFor,
  type PieceRegion,
  type RegionAreaPiece,
  type RegionIndex,
  type RegionListPiece,
} from './region-index.ts';

export class RegionLoader {
  private readonly pieces = new Map<string, Promise<RegionListPiece | RegionAreaPiece>>();
  /** Every region of the pieces fetched so far, by id. */
  readonly known = new Map<string, PieceRegion>();

  constructor(
    readonly index: RegionIndex,
    private readonly fetchPiece: (path: string) => Promise<unknown>,
  ) {}

  /** How many pieces have been fetched (or asked for). */
  get fetched(): number {
    return this.pieces.size;
  }

  private piece<T extends RegionListPiece | RegionAreaPiece>(path: string): Promise<T> {
    let p = this.pieces.get(path);
    if (!p) {
      p = this.fetchPiece(path).then((v) => {
        const piece = v as RegionListPiece;
        for (const r of piece.regions) this.known.set(r.id, r);
        return piece;
      });
      this.pieces.set(path, p);
    }
    return p as Promise<T>;
  }

  /** Regions of the pieces, each once, in the order of the values files. */
  private async regionsOf(paths: Iterable<string>): Promise<PieceRegion[]> {
    const lists = await Promise.all([...paths].map((p) => this.piece(p)));
    const byId = new Map<string, PieceRegion>();
    for (const l of lists) for (const r of l.regions) byId.set(r.id, r);
    return [...byId.values()].sort((a, b) => a.i - b.i);
  }

  /** The region with this id, if the atlas has one. */
  async byId(id: string): Promise<PieceRegion | undefined> {
    const path = idPieceFor(this.index, id);
    if (!path) return undefined;
    return (await this.piece<RegionListPiece>(path)).regions.find((r) => r.id === id);
  }

  /** What the search text asks for: the answer `searchMap` gives on the whole list of regions. */
  async search(text: string): Promise<SearchResult> {
    const q = foldName(text);
    if (q === '' || parseCoordinates(text)) return searchMap(text, []);
    // Exact names and names starting with the text sit in the name pieces of its range, an exact id in its id piece.
    const paths = new Set(namePiecesFor(this.index, q));
    const idPath = idPieceFor(this.index, q);
    if (idPath) paths.add(idPath);
    const near = await this.regionsOf(paths);
    if (near.some((r) => r.id === q || foldName(r.name).startsWith(q))) return searchMap(text, near);
    // No name starts with it: a name containing it may be anywhere.
    return searchMap(text, await this.regionsOf(this.index.byName.map((p) => p.path)));
  }

  /** The area pieces of the view [west, south, east, north], or how many regions it holds when more than the map draws. */
  async inView(view: readonly [number, number, number, number]): Promise<{ pieces: RegionAreaPiece[]; count: number } | { pieces: null; count: number }> {
    const { paths, count } = areaPiecesIn(this.index, view);
    if (count > this.index.maxDrawn) return { pieces: null, count };
    return { pieces: await Promise.all(paths.map((p) => this.piece<RegionAreaPiece>(p))), count };
  }

  /** The regions holding the point, else the nearest one: `regionsForPoint` over every region, from the area pieces that can hold or be nearest. */
  async forPoint(point: [number, number]): Promise<ReturnType<typeof regionsForPoint>> {
    const order = this.index.areas.map((a) => ({ path: a.path, d: boxDistanceDegrees(a.bbox, point) })).sort((a, b) => a.d - b.d);
    const shapes: Array<RegionShape & { i: number }> = [];
    const add = async (path: string) => {
      const piece = await this.piece<RegionAreaPiece>(path);
      piece.outlines.features.forEach((f, k) => shapes.push({ id: f.properties.id, geometry: f.geometry, i: piece.regions[k].i }));
      shapes.sort((a, b) => a.i - b.i);
    };
    // A region holding the point has its box, hence its piece's box, around it.
    await Promise.all(order.filter((o) => o.d === 0).map((o) => add(o.path)));
    let result = regionsForPoint(shapes, point);
    if (result.holding.length > 0) return result;
    for (const o of order) {
      if (o.d === 0) continue;
      // No outline of a piece is nearer than its box.
      if (result.nearest && o.d * KM_PER_DEGREE > result.nearest.km) break;
      await add(o.path);
      result = regionsForPoint(shapes, point);
    }
    return result;
  }
}
