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
  const out: Triangle[] = [];
  for (let t = 0; t < d.triangles.length; t += 3) {
    let tri = [d.triangles[t], d.triangles[t + 1], d.triangles[t + 2]] as [number, number, number];
    const area = triangleArea(points, tri);
    if (Math.abs(area) <= AREA_TOLERANCE * scale * scale) continue;
    if (area < 0) tri = [tri[0], tri[2], tri[1]];
    out.push(rotateToMin(tri));
  }
  return out.sort((x, y) => x[0] - y[0] || x[1] - y[1] || x[2] - y[2]);
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
