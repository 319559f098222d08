import type { Point } from './clarke.js';
import { AREA_TOLERANCE } from '../shared/tolerance.js';

/**
 * Convex hull of a point set (Andrew's monotone chain), counter-clockwise, without collinear points.
 *
 * Degenerate sets are answered as data: no points → `[]`; one distinct point → `[i]`; collinear
 * points → the two extreme points (a hull without area).
 *
 * @param points - points of the α-β plane
 * @returns indices into `points`, counter-clockwise, starting at the lowest-α (then lowest-β) point
 * @example
 * ```ts
 * convexHull([[0, 0], [1, 0], [0.5, 0], [0, 1]]); // [0, 1, 3]
 * ```
 */
export function convexHull(points: readonly Point[], scale = 1): number[] {
  // (no arrays built per comparison or per turn: a many-level diagram has thousands of points)
  const order = points
    .map((_, i) => i)
    .sort((i, j) => {
      const pi = points[i] as Point;
      const pj = points[j] as Point;
      return pi[0] - pj[0] || pi[1] - pj[1];
    });
  if (order.length < 3) return dedupe(order, points, scale);
  const cross = (o: number, a: number, b: number) => {
    const po = points[o] as Point;
    const pa = points[a] as Point;
    const pb = points[b] as Point;
    return (pa[0] - po[0]) * (pb[1] - po[1]) - (pa[1] - po[1]) * (pb[0] - po[0]);
  };
  // A turn smaller than the area tolerance is collinear: it is dropped, so hulls never carry
  // points in the middle of an edge (the contract's "without collinear points").
  const chain = (idx: number[]) => {
    const out: number[] = [];
    for (const i of idx) {
      while (out.length >= 2 && cross(out[out.length - 2] as number, out[out.length - 1] as number, i) <= AREA_TOLERANCE * scale * scale) out.pop();
      out.push(i);
    }
    return out;
  };
  const lower = chain(order);
  const upper = chain([...order].reverse());
  const hull = [...lower.slice(0, -1), ...upper.slice(0, -1)];
  return hull.length < 3 ? dedupe(hull, points) : hull;
}

/**
 * Signed area of a polygon (positive when counter-clockwise).
 *
 * @param polygon - vertices in order
 * @returns the shoelace area in units of (Vdc/2)²
 * @example
 * ```ts
 * polygonArea([[0, 0], [1, 0], [0, 1]]); // 0.5
 * ```
 */
export function polygonArea(polygon: readonly Point[]): number {
  let s = 0;
  for (let i = 0; i < polygon.length; i++) {
    const [x0, y0] = polygon[i] as Point;
    const [x1, y1] = polygon[(i + 1) % polygon.length] as Point;
    s += x0 * y1 - x1 * y0;
  }
  return s / 2;
}

function dedupe(idx: number[], points: readonly Point[], scale = 1): number[] {
  const out: number[] = [];
  for (const i of idx) {
    const p = points[i] as Point;
    if (!out.some((j) => Math.hypot((points[j] as Point)[0] - p[0], (points[j] as Point)[1] - p[1]) <= 1e-12 * scale)) out.push(i);
  }
  return out;
}
