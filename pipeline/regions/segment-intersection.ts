/**
 * Finds crossing edges in the rings of one polygon, in lon/lat (planar), with a sweep over edges
 * sorted by west end so that only edges whose longitude spans overlap are compared.
 *
 * What counts (in the spirit of the OGC Simple Features validity rules, common practice):
 * - within one ring: any contact between two edges that are not neighbours (a crossing, a corner
 *   touching an edge, a shared corner), and neighbours that fold back over each other;
 * - between two rings: a proper crossing or an overlap of positive length (rings may touch at
 *   single points).
 */

/** A crossing found: ring and edge indices (edge i runs from corner i to corner i + 1), and where. */
export interface EdgeContact {
  ringA: number;
  edgeA: number;
  ringB: number;
  edgeB: number;
  /** A point of contact [° E, ° N]. */
  lon: number;
  lat: number;
}

function orient(ax: number, ay: number, bx: number, by: number, cx: number, cy: number): number {
  const v = (bx - ax) * (cy - ay) - (by - ay) * (cx - ax);
  return v > 0 ? 1 : v < 0 ? -1 : 0;
}

function onSegment(ax: number, ay: number, bx: number, by: number, px: number, py: number): boolean {
  return Math.min(ax, bx) <= px && px <= Math.max(ax, bx) && Math.min(ay, by) <= py && py <= Math.max(ay, by);
}

/**
 * How two segments meet: 0 none, 1 touching at a point (an end on the other, or collinear
 * end-to-end), 2 proper crossing, 3 collinear overlap of positive length. Also a contact point.
 */
export function segmentContact(
  ax: number,
  ay: number,
  bx: number,
  by: number,
  cx: number,
  cy: number,
  dx: number,
  dy: number,
): { kind: 0 | 1 | 2 | 3; x: number; y: number } {
  const o1 = orient(ax, ay, bx, by, cx, cy);
  const o2 = orient(ax, ay, bx, by, dx, dy);
  const o3 = orient(cx, cy, dx, dy, ax, ay);
  const o4 = orient(cx, cy, dx, dy, bx, by);
  if (o1 * o2 < 0 && o3 * o4 < 0) {
    const t = ((cx - ax) * (dy - cy) - (cy - ay) * (dx - cx)) / ((bx - ax) * (dy - cy) - (by - ay) * (dx - cx));
    return { kind: 2, x: ax + t * (bx - ax), y: ay + t * (by - ay) };
  }
  if (o1 === 0 && o2 === 0) {
    // Collinear: project on the longer axis and compare the overlap length.
    const useX = Math.abs(bx - ax) + Math.abs(dx - cx) >= Math.abs(by - ay) + Math.abs(dy - cy);
    const a0 = useX ? Math.min(ax, bx) : Math.min(ay, by);
    const a1 = useX ? Math.max(ax, bx) : Math.max(ay, by);
    const c0 = useX ? Math.min(cx, dx) : Math.min(cy, dy);
    const c1 = useX ? Math.max(cx, dx) : Math.max(cy, dy);
    const lo = Math.max(a0, c0);
    const hi = Math.min(a1, c1);
    if (hi < lo) return { kind: 0, x: 0, y: 0 };
    const pt = onSegment(ax, ay, bx, by, cx, cy) ? [cx, cy] : onSegment(ax, ay, bx, by, dx, dy) ? [dx, dy] : [ax, ay];
    return { kind: hi > lo ? 3 : 1, x: pt[0], y: pt[1] };
  }
  if (o1 === 0 && onSegment(ax, ay, bx, by, cx, cy)) return { kind: 1, x: cx, y: cy };
  if (o2 === 0 && onSegment(ax, ay, bx, by, dx, dy)) return { kind: 1, x: dx, y: dy };
  if (o3 === 0 && onSegment(cx, cy, dx, dy, ax, ay)) return { kind: 1, x: ax, y: ay };
  if (o4 === 0 && onSegment(cx, cy, dx, dy, bx, by)) return { kind: 1, x: bx, y: by };
  return { kind: 0, x: 0, y: 0 };
}

/**
 * The first forbidden contact between edges of the given rings, or undefined when there is none.
 * @param rings Flat open rings [lon, lat, …] [° E, ° N] (region.ts)
 */
export function findEdgeContact(rings: readonly Float64Array[]): EdgeContact | undefined {
  let total = 0;
  for (const r of rings) total += r.length / 2;
  const ringOf = new Int32Array(total);
  const edgeOf = new Int32Array(total);
  const minX = new Float64Array(total);
  let k = 0;
  rings.forEach((r, ri) => {
    const n = r.length / 2;
    for (let i = 0; i < n; i++, k++) {
      const j = (i + 1) % n;
      ringOf[k] = ri;
      edgeOf[k] = i;
      minX[k] = Math.min(r[2 * i], r[2 * j]);
    }
  });
  const order = Array.from({ length: total }, (_, i) => i).sort((a, b) => minX[a] - minX[b]);
  const active: number[] = [];
  const seg = (e: number) => {
    const r = rings[ringOf[e]];
    const n = r.length / 2;
    const i = edgeOf[e];
    const j = (i + 1) % n;
    return [r[2 * i], r[2 * i + 1], r[2 * j], r[2 * j + 1]];
  };
  for (const e of order) {
    const [ax, ay, bx, by] = seg(e);
    const x0 = minX[e];
    let w = 0;
    for (let a = 0; a < active.length; a++) {
      const f = active[a];
      const [cx, cy, dx, dy] = seg(f);
      if (Math.max(cx, dx) < x0) continue; // ends west of this edge: drop from the sweep
      active[w++] = f;
      if (Math.max(ay, by) < Math.min(cy, dy) || Math.max(cy, dy) < Math.min(ay, by)) continue;
      const c = segmentContact(ax, ay, bx, by, cx, cy, dx, dy);
      if (c.kind === 0) continue;
      const sameRing = ringOf[e] === ringOf[f];
      if (sameRing) {
        const n = rings[ringOf[e]].length / 2;
        const i = edgeOf[e];
        const j = edgeOf[f];
        const neighbours = (i + 1) % n === j || (j + 1) % n === i;
        if (neighbours && c.kind !== 3) continue; // sharing their common corner is how rings are built
      } else if (c.kind === 1) {
        continue; // rings may touch at a point
      }
      active.length = w;
      return { ringA: ringOf[f], edgeA: edgeOf[f], ringB: ringOf[e], edgeB: edgeOf[e], lon: c.x, lat: c.y };
    }
    active.length = w;
    active.push(e);
  }
  return undefined;
}
