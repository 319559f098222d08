import type { Point } from '../geometry/clarke.js';
import type { AdmissibleTriangle } from './admissibleTriangles.js';
import { originStrictlyInside, outlineGeometry } from '../geometry/outlineGeometry.js';
import { minRadialExtent, radialExtent, type HullGeometry } from '../geometry/radialExtent.js';
import { convexHull, polygonArea } from '../geometry/hull.js';
import { coveredBy, segmentEntersTriangle, tilingOutline, unionOutline, type OutlineEdge } from '../geometry/triangleUnion.js';
import { triangleArea, triangulate, type Triangle } from '../geometry/triangulate.js';

/** A non-overlapping tiling by admissible triangles and how far it reaches. */
export interface AdmissibleTiling {
  /** The chosen triangles, counter-clockwise, sorted by vertex indices. */
  readonly triangles: readonly Triangle[];
  /** Outline of the tiling (vector indices), the region on the left of each edge. */
  readonly outline: readonly OutlineEdge[];
  /** Radial geometry of the tiling: its extent e(θ) along every direction. */
  readonly geometry: HullGeometry;
  /** min over θ of the extent of the union of all admissible triangles (contract `reach`). */
  readonly reach: number;
  /** True when the tiling reaches as far as the union along every direction. */
  readonly exact: boolean;
  /** How many admissible triangles there were to choose from. */
  readonly candidates: number;
}

const TURN = 2 * Math.PI;

/**
 * Chooses, among the admissible triangles of a polarity, a non-overlapping set that reaches as far
 * as their union along every direction from the origin.
 *
 * 1. Greedy: admissible triangles of the Delaunay triangulation first (on a healthy diagram that is
 *    the usual nearest-three-vector tiling), then the others by increasing area; a triangle is kept
 *    when its interior overlaps none kept before. Small triangles first keep the modulator on the
 *    nearest vectors.
 * 2. Check: if every admissible triangle left out lies inside the kept ones, the tiling covers the
 *    union itself and is exact. Otherwise the union's outline is computed and the two extents are
 *    compared direction by direction.
 * 3. Repair, where the tiling falls short: a left-out triangle that covers the shortfall replaces the
 *    triangles it overlaps, the gaps are refilled greedily, and the change is kept when the extent
 *    grows somewhere and shrinks nowhere. Repeated until nothing improves.
 *
 * Why this terminates with a valid answer: every step keeps the triangles pairwise non-overlapping
 * and admissible, and a repair is accepted only when the extent strictly grows at some compared
 * direction, bounded by the union's; the number of rounds is capped as well. What a tiling cannot
 * reach is reported (`exact: false`), and the limit then uses the tiling, never the union.
 *
 * @param points - vector positions
 * @param admissible - the polarity's admissible triangles
 * @param eps - distance tolerance (relative to the diagram's size)
 * @param delaunay - the Delaunay triangulation of `points`, when the caller has it already
 * @returns the tiling, its outline and geometry, the union's reach and whether the tiling is exact
 * @example
 * ```ts
 * admissibleTiling(points, admissibleTriangles(vectors, moves, points), 1e-9).triangles;
 * ```
 */
export function admissibleTiling(
  points: readonly Point[],
  admissible: readonly AdmissibleTriangle[],
  eps: number,
  delaunay?: readonly Triangle[],
): AdmissibleTiling {
  const all = admissible.map((a) => a.vertices);
  const shapes = all.map((t) => shapeOf(points, t));
  const hullArea = hullAreaOf(points, all);
  const orders = candidateOrders(points, all, shapes, delaunay);
  const order = (k: number): readonly number[] => (orders[k] as () => readonly number[])();
  // Greedy fill; stops early once the kept triangles cover the hull (nothing else can fit).
  const fill = (order: readonly number[], kept: number[]): number[] => {
    const out = [...kept];
    const taken = new Set(out);
    let area = out.reduce((acc, i) => acc + (shapes[i] as Shape).area, 0);
    for (const i of order) {
      if (area >= hullArea - 1e3 * eps) break;
      if (taken.has(i)) continue;
      const si = shapes[i] as Shape;
      if (out.every((j) => !overlaps(si, shapes[j] as Shape, eps))) {
        out.push(i);
        taken.add(i);
        area += si.area;
      }
    }
    return out;
  };
  const tilingOf = (chosen: number[]): TilingState =>
    describe(
      points,
      chosen.map((i) => all[i] as Triangle),
      eps,
    );
  const covers = (chosen: number[], state: TilingState) => {
    const area = chosen.reduce((acc, i) => acc + (shapes[i] as Shape).area, 0);
    if (area >= hullArea - 1e3 * eps) return true;
    const taken = new Set(chosen);
    return all.every((t, i) => taken.has(i) || inside(points, t, state, eps));
  };

  // Each order in turn; the first whose tiling covers every admissible triangle is exact.
  let best: { chosen: number[]; state: TilingState } | null = null;
  for (let k = 0; k < orders.length; k++) {
    const chosen = fill(order(k), []);
    const state = tilingOf(chosen);
    if (covers(chosen, state)) return finish(state, state.geometry, true, all.length);
    best ??= { chosen, state };
  }
  // None covers the union: compare extents with the union's outline, keep the best, then repair.
  const union = unionGeometry(points, all, eps);
  let { chosen, state } = best as { chosen: number[]; state: TilingState };
  for (let k = 1; k < orders.length; k++) {
    const c = fill(order(k), []);
    const st = tilingOf(c);
    if (better(st.geometry, state.geometry, union, eps)) [chosen, state] = [c, st];
  }
  let short = falls(state.geometry, union, eps);
  for (let round = 0; round < 64 && short; round++) {
    let improved = false;
    const taken = new Set(chosen);
    for (let b = 0; b < all.length; b++) {
      if (taken.has(b) || inside(points, all[b] as Triangle, state, eps)) continue;
      const kept = chosen.filter((j) => !overlaps(shapes[b] as Shape, shapes[j] as Shape, eps));
      const trial = fill(order(0), [...kept, b]);
      const st = tilingOf(trial);
      if (!better(st.geometry, state.geometry, union, eps)) continue;
      [chosen, state] = [trial, st];
      improved = true;
      break;
    }
    if (!improved) break;
    short = falls(state.geometry, union, eps);
  }
  return finish(state, union, !short, all.length);
}

/** A triangle prepared for fast overlap tests: corners, unit edge normals and bounding box. */
interface Shape {
  readonly xs: readonly [number, number, number];
  readonly ys: readonly [number, number, number];
  /** Per edge k (corner k → k+1): inward unit normal (nx, ny) and offset c, inside ⇔ n·x − c > 0. */
  readonly nx: readonly [number, number, number];
  readonly ny: readonly [number, number, number];
  readonly c: readonly [number, number, number];
  readonly box: readonly [number, number, number, number];
  readonly area: number;
}

function shapeOf(points: readonly Point[], t: Triangle): Shape {
  const p = t.map((i) => points[i] as Point);
  const xs = p.map((q) => q[0]) as unknown as [number, number, number];
  const ys = p.map((q) => q[1]) as unknown as [number, number, number];
  const nx: number[] = [];
  const ny: number[] = [];
  const c: number[] = [];
  for (let k = 0; k < 3; k++) {
    const ex = xs[(k + 1) % 3]! - xs[k]!;
    const ey = ys[(k + 1) % 3]! - ys[k]!;
    const len = Math.hypot(ex, ey);
    nx.push(-ey / len);
    ny.push(ex / len);
    c.push((-ey * xs[k]! + ex * ys[k]!) / len);
  }
  const area = triangleArea(points, t);
  return { xs, ys, nx: nx as never, ny: ny as never, c: c as never, box: [Math.min(...xs), Math.min(...ys), Math.max(...xs), Math.max(...ys)], area };
}

// Interiors overlap unless an edge line of one separates the other (separating-axis theorem).
function overlaps(a: Shape, b: Shape, eps: number): boolean {
  if (a.box[0] >= b.box[2] - eps || b.box[0] >= a.box[2] - eps || a.box[1] >= b.box[3] - eps || b.box[1] >= a.box[3] - eps) return false;
  return !(separated(a, b, eps) || separated(b, a, eps));
}

function separated(a: Shape, b: Shape, eps: number): boolean {
  for (let k = 0; k < 3; k++) {
    const nx = a.nx[k]!;
    const ny = a.ny[k]!;
    const c = a.c[k]!;
    if (nx * b.xs[0] + ny * b.ys[0] - c <= eps && nx * b.xs[1] + ny * b.ys[1] - c <= eps && nx * b.xs[2] + ny * b.ys[2] - c <= eps) return true;
  }
  return false;
}

function hullAreaOf(points: readonly Point[], triangles: readonly Triangle[]): number {
  const used = [...new Set(triangles.flat())].map((i) => points[i] as Point);
  return polygonArea(convexHull(used).map((i) => used[i] as Point));
}

// Greedy orders, best first: (1) admissible Delaunay triangles, then by area — the nearest-three-
// vector habit; (2) inner first: by the triangle's distance from the origin, then area, so that
// the fan around the origin is settled before any outer triangle can block it; (3) by the distance
// of the farthest corner; (4) by area alone.
// Each order is made only when asked for, and then kept: most diagrams need the first one only.
function candidateOrders(
  points: readonly Point[],
  all: readonly Triangle[],
  shapes: readonly Shape[],
  known?: readonly Triangle[],
): (() => readonly number[])[] {
  const area = shapes.map((s) => s.area);
  const idx = all.map((_, i) => i);
  const by = (key: () => readonly number[]) => {
    let made: number[] | null = null;
    return () => {
      if (made) return made;
      const k = key();
      made = [...idx].sort((i, j) => (k[i] as number) - (k[j] as number) || (area[i] as number) - (area[j] as number) || i - j);
      return made;
    };
  };
  return [
    by(() => {
      const delaunay = new Set((known ?? triangulate(points)).map((t) => t.join(',')));
      return all.map((t) => (delaunay.has(t.join(',')) ? 0 : 1));
    }),
    by(() => all.map((t) => Math.round(distanceToOrigin(points, t) * 1e9))),
    by(() => all.map((t) => Math.max(...t.map((i) => Math.hypot(...(points[i] as Point)))))),
    by(() => area),
  ];
}

// Distance from the origin to a counter-clockwise triangle (0 when it contains the origin).
function distanceToOrigin(points: readonly Point[], t: Triangle): number {
  let insideAll = true;
  let best = Infinity;
  for (let k = 0; k < 3; k++) {
    const p = points[t[k] as number] as Point;
    const q = points[t[(k + 1) % 3] as number] as Point;
    const dx = q[0] - p[0];
    const dy = q[1] - p[1];
    if (dx * -p[1] - dy * -p[0] < 0) insideAll = false;
    const s = Math.min(1, Math.max(0, -(p[0] * dx + p[1] * dy) / (dx * dx + dy * dy)));
    best = Math.min(best, Math.hypot(p[0] + s * dx, p[1] + s * dy));
  }
  return insideAll ? 0 : best;
}

interface TilingState {
  readonly triangles: readonly Triangle[];
  readonly outline: readonly OutlineEdge[];
  readonly geometry: HullGeometry;
}

function describe(points: readonly Point[], triangles: readonly Triangle[], eps: number): TilingState {
  const sorted = [...triangles].sort((x, y) => x[0] - y[0] || x[1] - y[1] || x[2] - y[2]);
  const outline = tilingOutline(points, sorted, eps);
  const origin = originStrictlyInside(outline, coveredBy(points, sorted, [0, 0], eps), eps);
  return { triangles: sorted, outline, geometry: outlineGeometry(outline, origin) };
}

function finish(state: TilingState, union: HullGeometry, exact: boolean, candidates: number): AdmissibleTiling {
  return { triangles: state.triangles, outline: state.outline, geometry: state.geometry, reach: minRadialExtent(union, 0, TURN).value, exact, candidates };
}

// A triangle lies inside the tiling when its centroid is covered and no outline segment enters it.
function inside(points: readonly Point[], t: Triangle, state: TilingState, eps: number): boolean {
  const c = [0, 1, 2].reduce<Point>(
    (acc, k) => {
      const p = points[t[k] as number] as Point;
      return [acc[0] + p[0] / 3, acc[1] + p[1] / 3];
    },
    [0, 0],
  );
  if (!coveredBy(points, state.triangles, c, eps)) return false;
  return state.outline.every((e) => !segmentEntersTriangle(points, t, e.segment, eps));
}

function unionGeometry(points: readonly Point[], triangles: readonly Triangle[], eps: number): HullGeometry {
  const outline = unionOutline(points, triangles, eps).map((segment) => ({ from: -1, to: -1, segment }));
  return outlineGeometry(outline, originStrictlyInside(outline, coveredBy(points, triangles, [0, 0], eps), eps));
}

// Directions where the extents are compared: every span end of either geometry and the midpoints
// between consecutive ones (each extent is one smooth piece between span ends).
function directions(...gs: HullGeometry[]): number[] {
  const ends = gs.flatMap((g) => g.edges).flatMap((e) => (e.span ? [mod(e.span[0]), mod(e.span[1])] : []));
  const sorted = [...new Set(ends)].sort((x, y) => x - y);
  if (sorted.length === 0) return [0, Math.PI / 2, Math.PI, (3 * Math.PI) / 2];
  const out: number[] = [];
  sorted.forEach((x, i) => {
    const y = i + 1 < sorted.length ? (sorted[i + 1] as number) : (sorted[0] as number) + TURN;
    out.push(x, x + (y - x) / 4, (x + y) / 2, x + (3 * (y - x)) / 4);
  });
  return out;
}

// True when the tiling falls short of the union along some compared direction.
function falls(tiling: HullGeometry, union: HullGeometry, eps: number): boolean {
  return directions(tiling, union).some((th) => radialExtent(tiling, th).value < radialExtent(union, th).value - 1e3 * eps);
}

function better(trial: HullGeometry, current: HullGeometry, union: HullGeometry, eps: number): boolean {
  let gain = false;
  for (const th of directions(trial, current, union)) {
    const t = radialExtent(trial, th).value;
    const c = radialExtent(current, th).value;
    if (t < c - 1e3 * eps) return false;
    if (t > c + 1e3 * eps) gain = true;
  }
  return gain;
}

function mod(x: number): number {
  const r = x % TURN;
  return r < 0 ? r + TURN : r;
}
