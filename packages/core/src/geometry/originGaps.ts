import type { Point } from './clarke.js';
import { VECTOR_TOLERANCE } from '../shared/tolerance.js';

/**
 * The directions next to the origin that no triangle covers: where a sequence over these triangles
 * cannot make even a small output voltage. Empty when the triangles surround the origin.
 *
 * A triangle with the origin strictly inside covers every direction; one with the origin on an
 * edge covers the half-plane on its side; one with the origin as a vertex covers the wedge between
 * its two other vertices. The gaps are the complement of those wedges on the circle.
 *
 * @param points - vector positions (α, β), units of Vdc/2
 * @param triangles - triangles as index triples into `points`
 * @returns uncovered direction intervals `[from, to]` in degrees, `0 ≤ from < 360`, `from < to`
 *   (an interval may run past 360); `[[0, 360]]` when no triangle touches the origin
 * @example
 * ```ts
 * originGaps([[0, 0], [1, 0], [0, 1]], [[0, 1, 2]]); // [[90, 360]]
 * ```
 */
export function originGaps(points: readonly Point[], triangles: readonly (readonly [number, number, number])[]): [number, number][] {
  const wedges: [number, number][] = [];
  for (const t of triangles) {
    const w = wedgeAtOrigin(t.map((i) => points[i] as Point) as [Point, Point, Point]);
    if (w === 'all') return [];
    if (w) wedges.push(w);
  }
  return complement(wedges);
}

const TWO_PI = 2 * Math.PI;
const deg = (r: number): number => (r * 180) / Math.PI;
const norm = (r: number): number => ((r % TWO_PI) + TWO_PI) % TWO_PI;

// The directions (radians, [start, start + width]) a triangle covers next to the origin.
function wedgeAtOrigin(tri: [Point, Point, Point]): [number, number] | 'all' | null {
  const [a, b, c] = tri;
  const area = (b[0] - a[0]) * (c[1] - a[1]) - (b[1] - a[1]) * (c[0] - a[0]);
  if (Math.abs(area) <= VECTOR_TOLERANCE) return null;
  const ccw = area > 0 ? [a, b, c] : [a, c, b];
  // signed distances of the origin to each edge's line (positive inside)
  const side = ccw.map((p, k) => {
    const q = ccw[(k + 1) % 3] as Point;
    return ((q[0] - p[0]) * -p[1] - (q[1] - p[1]) * -p[0]) / Math.hypot(q[0] - p[0], q[1] - p[1]);
  });
  if (side.some((s) => s < -VECTOR_TOLERANCE)) return null;
  const onEdges = side.map((s) => s <= VECTOR_TOLERANCE);
  const count = onEdges.filter(Boolean).length;
  if (count === 0) return 'all';
  if (count === 1) {
    // on edge k (from vertex k to k+1): the half-plane to the edge's left
    const k = onEdges.indexOf(true);
    const p = ccw[k] as Point;
    const q = ccw[(k + 1) % 3] as Point;
    return [norm(Math.atan2(q[1] - p[1], q[0] - p[0])), Math.PI];
  }
  // at a vertex: the wedge from the next vertex to the one after, counter-clockwise
  const k = ccw.findIndex((p) => Math.hypot(p[0], p[1]) <= VECTOR_TOLERANCE);
  const p = ccw[(k + 1) % 3] as Point;
  const q = ccw[(k + 2) % 3] as Point;
  const start = norm(Math.atan2(p[1], p[0]));
  const width = norm(Math.atan2(q[1], q[0]) - start);
  return [start, width];
}

// The circle less the union of wedges, as degree intervals starting in [0, 360).
function complement(wedges: readonly [number, number][]): [number, number][] {
  if (wedges.length === 0) return [[0, 360]];
  const tol = 1e-9;
  // unroll each wedge onto [0, 4π) so that wedges crossing 0 overlap their neighbours
  const spans = wedges
    .flatMap(
      ([s, w]) =>
        [
          [s, s + w],
          [s + TWO_PI, s + TWO_PI + w],
        ] as [number, number][],
    )
    .sort((x, y) => x[0] - y[0]);
  const merged: [number, number][] = [];
  for (const [s, e] of spans) {
    const last = merged[merged.length - 1];
    if (last && s <= last[1] + tol) last[1] = Math.max(last[1], e);
    else merged.push([s, e]);
  }
  if (merged.some(([s, e]) => e - s >= TWO_PI - tol)) return [];
  const gaps: [number, number][] = [];
  for (let i = 0; i + 1 < merged.length; i++) {
    const from = (merged[i] as [number, number])[1];
    const to = (merged[i + 1] as [number, number])[0];
    if (from < TWO_PI - tol && from >= -tol) gaps.push([deg(from), deg(to)]);
  }
  // a gap that starts before 0 appears once more from its copy: keep the one starting in [0, 360)
  return gaps.map(([f, t]) => [Math.round(f * 1e9) / 1e9, Math.round(t * 1e9) / 1e9] as [number, number]).filter(([f, t]) => t - f > 1e-9);
}
