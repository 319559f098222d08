import type { Point } from './clarke.js';
import type { Triangle } from './triangulate.js';

/** A boundary segment of a region, oriented so that the region lies on its left. */
export type Segment = readonly [Point, Point];

/** An outline segment between two vectors: indices into the vector list and their positions. */
export interface OutlineEdge {
  readonly from: number;
  readonly to: number;
  readonly segment: Segment;
}

/**
 * The outline of a set of non-overlapping triangles whose corners are all among `points`: every
 * edge piece that only one triangle has. Edges are first split at any corner lying on them, so a
 * large triangle beside two small ones (a T-junction) is handled.
 *
 * @param points - vector positions
 * @param triangles - non-overlapping, counter-clockwise triangles
 * @param eps - distance below which a point lies on an edge
 * @returns boundary edges (vector indices and segment), the region on their left, in a deterministic order
 * @example
 * ```ts
 * tilingOutline(points, [[0, 1, 2]], 1e-9).length; // 3
 * ```
 */
export function tilingOutline(points: readonly Point[], triangles: readonly Triangle[], eps: number): OutlineEdge[] {
  const corners = [...new Set(triangles.flat())];
  const count = new Map<string, { from: number; to: number; n: number }>();
  for (const t of triangles)
    for (let k = 0; k < 3; k++) {
      const a = t[k] as number;
      const b = t[(k + 1) % 3] as number;
      const pa = points[a] as Point;
      const pb = points[b] as Point;
      const ex = pb[0] - pa[0];
      const ey = pb[1] - pa[1];
      const len2 = ex * ex + ey * ey;
      const inner = corners
        .filter((c) => c !== a && c !== b)
        .map((c) => {
          const pc = points[c] as Point;
          const s = ((pc[0] - pa[0]) * ex + (pc[1] - pa[1]) * ey) / len2;
          const d = Math.abs(ex * (pc[1] - pa[1]) - ey * (pc[0] - pa[0])) / Math.sqrt(len2);
          return { c, s, d };
        })
        .filter((x) => x.d <= eps && x.s > 0 && x.s < 1)
        .sort((x, y) => x.s - y.s)
        .map((x) => x.c);
      const chain = [a, ...inner, b];
      for (let i = 0; i + 1 < chain.length; i++) {
        const u = chain[i] as number;
        const v = chain[i + 1] as number;
        const k2 = u < v ? `${u},${v}` : `${v},${u}`;
        const e = count.get(k2);
        if (e) e.n++;
        else count.set(k2, { from: u, to: v, n: 1 });
      }
    }
  return [...count.values()]
    .filter((e) => e.n === 1)
    .map((e) => ({ from: e.from, to: e.to, segment: [points[e.from] as Point, points[e.to] as Point] as const }));
}

/**
 * The outline of a union of possibly overlapping triangles: every piece of a triangle edge with
 * the union on exactly one side. Each edge is cut wherever another triangle's edge crosses or
 * touches it, and each piece is kept when a point just to its left is covered and one just to its
 * right is not (or the reverse, then flipped). Quadratic in the number of triangles; used to check
 * a tiling against the union it was chosen from.
 *
 * @param points - vector positions
 * @param triangles - counter-clockwise triangles
 * @param eps - length scale of the tolerance
 * @returns boundary segments with the union on their left
 * @example
 * ```ts
 * unionOutline(points, admissible, 1e-9);
 * ```
 */
export function unionOutline(points: readonly Point[], triangles: readonly Triangle[], eps: number): Segment[] {
  // each directed edge once: a repeat (overlapping triangles on the same side of it) gives the
  // same cuts and the same pieces, which the first one has already given
  const directed = new Set<string>();
  const edges: Segment[] = [];
  for (const t of triangles)
    for (let k = 0; k < 3; k++) {
      const a = t[k] as number;
      const b = t[(k + 1) % 3] as number;
      if (directed.has(`${a},${b}`)) continue;
      directed.add(`${a},${b}`);
      edges.push([points[a] as Point, points[b] as Point]);
    }
  // Boxes that skip the pairs and triangles which cannot matter: a cut of p→q by r→s lies within
  // eps·(1 + |rs|) of both (cutParameters' tolerances), a covered point within the triangle grown
  // by eps (coveredBy's); each box holds that region with room to spare, so the result is the same
  // as testing everything.
  const edgeBoxes = edges.map(([r, s]) => grow(boxOf(r, s), 2 * eps * (1 + Math.hypot(s[0] - r[0], s[1] - r[1]))));
  const cover = triangles.map((t) => coverBox(points, t, eps));
  const covered = (x: Point) => triangles.some((t, i) => inBox(cover[i] as Box, x) && inTriangle(points, t, x, eps));
  const out: Segment[] = [];
  const seen = new Set<string>();
  const probe = 1e3 * eps;
  edges.forEach(([p, q], i) => {
    const ex = q[0] - p[0];
    const ey = q[1] - p[1];
    const len = Math.hypot(ex, ey);
    const cuts = [0, 1];
    const own = edgeBoxes[i] as Box;
    edges.forEach(([r, s], j) => {
      if (!boxesMeet(own, edgeBoxes[j] as Box)) return;
      for (const c of cutParameters(p, q, r, s, eps)) cuts.push(c);
    });
    cuts.sort((x, y) => x - y);
    for (let k = 0; k + 1 < cuts.length; k++) {
      const s0 = cuts[k] as number;
      const s1 = cuts[k + 1] as number;
      if ((s1 - s0) * len <= probe) continue;
      const sm = (s0 + s1) / 2;
      const mx = p[0] + sm * ex;
      const my = p[1] + sm * ey;
      const nx = -ey / len;
      const ny = ex / len;
      const left = covered([mx + probe * nx, my + probe * ny]);
      const right = covered([mx - probe * nx, my - probe * ny]);
      if (left === right) continue;
      const a: Point = [p[0] + s0 * ex, p[1] + s0 * ey];
      const b: Point = [p[0] + s1 * ex, p[1] + s1 * ey];
      const seg: Segment = left ? [a, b] : [b, a];
      const key = seg
        .flat()
        .map((v) => Math.round(v / (probe * 10)))
        .join(',');
      if (seen.has(key)) continue;
      seen.add(key);
      out.push(seg);
    }
  });
  return out;
}

/** An axis-aligned box `[xmin, ymin, xmax, ymax]`. */
type Box = readonly [number, number, number, number];

function boxOf(a: Point, b: Point): Box {
  return [Math.min(a[0], b[0]), Math.min(a[1], b[1]), Math.max(a[0], b[0]), Math.max(a[1], b[1])];
}

function grow(b: Box, m: number): Box {
  return [b[0] - m, b[1] - m, b[2] + m, b[3] + m];
}

function boxesMeet(a: Box, b: Box): boolean {
  return a[0] <= b[2] && b[0] <= a[2] && a[1] <= b[3] && b[1] <= a[3];
}

function inBox(b: Box, x: Point): boolean {
  return x[0] >= b[0] && x[0] <= b[2] && x[1] >= b[1] && x[1] <= b[3];
}

function triangleTurn(p: readonly Point[]): number {
  const [a, b, c] = p as [Point, Point, Point];
  return (b[0] - a[0]) * (c[1] - a[1]) - (b[1] - a[1]) * (c[0] - a[0]);
}

// The box of the points coveredBy accepts for one triangle: the triangle with every edge moved out
// by eps, whose corners move by the miter eps·(n₁ + n₂)/(1 + n₁·n₂) (outward unit normals n of the
// two edges); a sliver whose miter is unbounded gets an unbounded box.
function coverBox(points: readonly Point[], t: Triangle, eps: number): Box {
  const p = [0, 1, 2].map((k) => points[t[k] as number] as Point);
  const normals = [0, 1, 2].map((k) => {
    const a = p[k] as Point;
    const b = p[(k + 1) % 3] as Point;
    const l = Math.hypot(b[0] - a[0], b[1] - a[1]) || 1;
    return [(b[1] - a[1]) / l, -(b[0] - a[0]) / l] as const;
  });
  let box: Box = [Infinity, Infinity, -Infinity, -Infinity];
  for (let k = 0; k < 3; k++) {
    const n1 = normals[(k + 2) % 3] as readonly [number, number];
    const n2 = normals[k] as readonly [number, number];
    const d = 1 + n1[0] * n2[0] + n1[1] * n2[1];
    if (d < 1e-9 || triangleTurn(p) <= 0) return [-Infinity, -Infinity, Infinity, Infinity];
    const c = p[k] as Point;
    const m = (2 * eps) / d;
    const x = c[0] + m * (n1[0] + n2[0]);
    const y = c[1] + m * (n1[1] + n2[1]);
    box = [Math.min(box[0], x, c[0]), Math.min(box[1], y, c[1]), Math.max(box[2], x, c[0]), Math.max(box[3], y, c[1])];
  }
  return grow(box, 2 * eps);
}

// Parameters along p→q where segment r→s crosses or touches it (its ends, where they lie on p→q).
function cutParameters(p: Point, q: Point, r: Point, s: Point, eps: number): number[] {
  const ex = q[0] - p[0];
  const ey = q[1] - p[1];
  const fx = s[0] - r[0];
  const fy = s[1] - r[1];
  const len2 = ex * ex + ey * ey;
  const out: number[] = [];
  const den = ex * fy - ey * fx;
  if (Math.abs(den) > eps * Math.sqrt(len2 * (fx * fx + fy * fy))) {
    const t = ((r[0] - p[0]) * fy - (r[1] - p[1]) * fx) / den;
    const u = ((r[0] - p[0]) * ey - (r[1] - p[1]) * ex) / den;
    if (t > 0 && t < 1 && u >= -eps && u <= 1 + eps) out.push(t);
  }
  for (const c of [r, s]) {
    const t = ((c[0] - p[0]) * ex + (c[1] - p[1]) * ey) / len2;
    const d = Math.abs(ex * (c[1] - p[1]) - ey * (c[0] - p[0])) / Math.sqrt(len2);
    if (d <= eps && t > 0 && t < 1) out.push(t);
  }
  return out;
}

/**
 * Whether a point lies in one of the triangles (closed, with tolerance).
 *
 * @param points - vector positions
 * @param triangles - counter-clockwise triangles
 * @param x - the point
 * @param eps - distance tolerance
 * @returns true when some triangle contains it
 * @example
 * ```ts
 * coveredBy(points, [[0, 1, 2]], [0.1, 0.1], 1e-9);
 * ```
 */
export function coveredBy(points: readonly Point[], triangles: readonly Triangle[], x: Point, eps: number): boolean {
  return triangles.some((t) => inTriangle(points, t, x, eps));
}

// One triangle of coveredBy: the point on the inner side of every edge, within eps.
function inTriangle(points: readonly Point[], t: Triangle, x: Point, eps: number): boolean {
  for (let k = 0; k < 3; k++) {
    const p = points[t[k] as number] as Point;
    const q = points[t[(k + 1) % 3] as number] as Point;
    const ex = q[0] - p[0];
    const ey = q[1] - p[1];
    if ((ex * (x[1] - p[1]) - ey * (x[0] - p[0])) / Math.hypot(ex, ey) < -eps) return false;
  }
  return true;
}

/**
 * Whether a segment passes through the interior of a triangle (more than touching its boundary).
 *
 * @param points - vector positions
 * @param t - counter-clockwise triangle
 * @param seg - the segment
 * @param eps - distance tolerance
 * @returns true when a stretch of the segment longer than `eps` lies strictly inside
 * @example
 * ```ts
 * segmentEntersTriangle(points, [0, 1, 2], [[0, 0], [1, 1]], 1e-9);
 * ```
 */
export function segmentEntersTriangle(points: readonly Point[], t: Triangle, seg: Segment, eps: number): boolean {
  const [a, b] = seg;
  const dx = b[0] - a[0];
  const dy = b[1] - a[1];
  const len = Math.hypot(dx, dy);
  let lo = 0;
  let hi = 1;
  for (let k = 0; k < 3; k++) {
    const p = points[t[k] as number] as Point;
    const q = points[t[(k + 1) % 3] as number] as Point;
    const ex = q[0] - p[0];
    const ey = q[1] - p[1];
    const el = Math.hypot(ex, ey);
    // inside (shrunk by eps): (e × (x − p))/|e| > eps, linear in the segment parameter
    const f0 = (ex * (a[1] - p[1]) - ey * (a[0] - p[0])) / el - eps;
    const f1 = (ex * dy - ey * dx) / el;
    if (Math.abs(f1) < 1e-300) {
      if (f0 <= 0) return false;
      continue;
    }
    const s = -f0 / f1;
    if (f1 > 0) lo = Math.max(lo, s);
    else hi = Math.min(hi, s);
  }
  return (hi - lo) * len > eps;
}
