import { Delaunay } from 'd3-delaunay';
import type { Point } from './clarke.js';
import { AREA_TOLERANCE } from '../shared/tolerance.js';
import { offsetLists } from '../shared/offsetLists.js';

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
  const n = points.length;
  if (n < 3) return [];
  const coords = new Float64Array(2 * n);
  for (let i = 0; i < n; i++) {
    const p = points[i] as Point;
    coords[2 * i] = p[0];
    coords[2 * i + 1] = p[1];
  }
  const d = new Delaunay(coords);
  // Delaunator's triangles without zero-area slivers, each counter-clockwise from its smallest
  // index, as three columns of indices
  const all = d.triangles;
  const cols = [new Int32Array(all.length / 3), new Int32Array(all.length / 3), new Int32Array(all.length / 3)] as const;
  let count = 0;
  for (let t = 0; t < all.length; t += 3) {
    let i = all[t] as number;
    let j = all[t + 1] as number;
    let k = all[t + 2] as number;
    // triangleArea, written out (this runs once per triangle, before the engine optimises anything),
    // on the points given: d3-delaunay jitters its copy of collinear points, whose triangles are slivers
    const a = points[i] as Point;
    const b = points[j] as Point;
    const c = points[k] as Point;
    const area = ((b[0] - a[0]) * (c[1] - a[1]) - (b[1] - a[1]) * (c[0] - a[0])) / 2;
    if (Math.abs(area) <= AREA_TOLERANCE * scale * scale) continue;
    if (area < 0) {
      const x = j;
      j = k;
      k = x;
    }
    // rotated to start at the smallest index (rotateToMin)
    if (j < i && j <= k) {
      const x = i;
      i = j;
      j = k;
      k = x;
    } else if (k < i && k < j) {
      const x = k;
      k = j;
      j = i;
      i = x;
    }
    cols[0][count] = i;
    cols[1][count] = j;
    cols[2][count] = k;
    count++;
  }
  // Sorted by a radix sort on the three indices (stable counting sorts, last index first), not by a
  // comparator: a many-level diagram has thousands of triangles, sorted once before the engine
  // optimises anything, where a comparator call per comparison costs more than the triangulation.
  let order: Int32Array = new Int32Array(count);
  for (let t = 0; t < count; t++) order[t] = t;
  for (let c = 2; c >= 0; c--) order = countingSort(order, cols[c as 0 | 1 | 2], n);
  const out: Triangle[] = new Array(count);
  for (let r = 0; r < count; r++) {
    const t = order[r] as number;
    out[r] = Object.freeze([cols[0][t] as number, cols[1][t] as number, cols[2][t] as number] as const);
  }
  return out;
}

// Stable counting sort of positions by their integer key in [0, size).
function countingSort(order: Int32Array, key: Int32Array, size: number): Int32Array {
  const keys = order.map((t) => key[t] as number);
  const places = new Int32Array(order.length);
  offsetLists(keys, order.length, size, new Int32Array(size + 1), places, new Int32Array(size));
  return places.map((r) => order[r] as number);
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
