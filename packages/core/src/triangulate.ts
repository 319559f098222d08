import { Delaunay } from 'd3-delaunay';
import type { Point } from './clarke.js';
import { AREA_TOLERANCE } from './tolerance.js';

/** A triangle as three indices into a vector list, counter-clockwise. */
export type Triangle = readonly [number, number, number];

/**
 * Triangulates surviving vectors for nearest-three-vector modulation (Delaunay, via d3-delaunay).
 *
 * Degenerate cases are answered as data: fewer than three points or all collinear → `[]`.
 * Zero-area slivers (which Delaunator may leave along a hull edge with collinear points) are
 * removed. Cocircular ties (four or more points on one empty circle) are resolved by
 * Delaunator's insertion order over the caller's point order, which is itself deterministic
 * (see `survivingVectors`), so equal input always gives equal triangles. Each triangle is then
 * rotated to start at its smallest index, and the list is sorted lexicographically.
 *
 * @param points - vector positions
 * @returns triangles, each counter-clockwise, tiling the convex hull of `points`
 * @example
 * ```ts
 * triangulate([[0, 0], [1, 0], [0, 1], [1, 1]]).length; // 2
 * ```
 */
export function triangulate(points: readonly Point[], scale = 1): Triangle[] {
  if (points.length < 3) return [];
  const d = Delaunay.from(points as unknown as ArrayLike<[number, number]>);
  const tris = triangleList(points, d.triangles, scale);
  // Sorted by a radix sort on the three indices (counting sorts, last index first, each stable), not
  // by a comparator: a many-level diagram has thousands of triangles, sorted once before the engine
  // optimises anything, where calling a comparator for every comparison costs more than the
  // triangulation itself.
  let order: Int32Array = Int32Array.from(tris.keys());
  for (let digit = 2; digit >= 0; digit--) order = countingSort(order, (t) => (tris[t] as Triangle)[digit] as number, points.length);
  return Array.from(order, (t) => tris[t] as Triangle);
}

// Stable counting sort of positions by an integer key in [0, size).
function countingSort(order: Int32Array, key: (t: number) => number, size: number): Int32Array {
  const start = new Int32Array(size + 1);
  for (let i = 0; i < order.length; i++) {
    const v = key(order[i] as number) + 1;
    start[v] = (start[v] as number) + 1;
  }
  for (let v = 0; v < size; v++) start[v + 1] = (start[v + 1] as number) + (start[v] as number);
  const out = new Int32Array(order.length);
  for (let i = 0; i < order.length; i++) {
    const t = order[i] as number;
    const v = key(t);
    out[start[v] as number] = t;
    start[v] = (start[v] as number) + 1;
  }
  return out;
}

// Delaunator's triangles without zero-area slivers, each counter-clockwise from its smallest index.
function triangleList(points: readonly Point[], indices: Uint32Array, scale: number): Triangle[] {
  const out: Triangle[] = [];
  for (let t = 0; t < indices.length; t += 3) {
    let tri = [indices[t], indices[t + 1], indices[t + 2]] as [number, number, number];
    const area = triangleArea(points, tri);
    if (Math.abs(area) <= AREA_TOLERANCE * scale * scale) continue;
    if (area < 0) tri = [tri[0], tri[2], tri[1]];
    out.push(Object.freeze(rotateToMin(tri)));
  }
  return out;
}

/**
 * Signed area of a triangle of points (positive when counter-clockwise).
 *
 * @param points - vector positions
 * @param tri - three indices into `points`
 * @returns the signed area in units of (Vdc/2)²
 * @example
 * ```ts
 * triangleArea([[0, 0], [1, 0], [0, 1]], [0, 1, 2]); // 0.5
 * ```
 */
export function triangleArea(points: readonly Point[], tri: Triangle): number {
  const a = points[tri[0]] as Point;
  const b = points[tri[1]] as Point;
  const c = points[tri[2]] as Point;
  return ((b[0] - a[0]) * (c[1] - a[1]) - (b[1] - a[1]) * (c[0] - a[0])) / 2;
}

/**
 * A triangle's indices rotated to start at the smallest one (orientation kept), so that equal
 * triangles compare equal.
 *
 * @param t - three indices
 * @returns the same cycle starting at its smallest index
 * @example
 * ```ts
 * rotateToMin([4, 1, 2]); // [1, 2, 4]
 * ```
 */
export function rotateToMin(t: readonly [number, number, number]): Triangle {
  const i = t[0] <= t[1] ? (t[0] <= t[2] ? 0 : 2) : t[1] <= t[2] ? 1 : 2;
  return [t[i], t[(i + 1) % 3], t[(i + 2) % 3]] as Triangle;
}
