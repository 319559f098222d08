import type { Point } from './clarke.js';
import { dwellTimes, type DwellMatrix } from './dwell.js';
import { HexsalvageInputError } from '../shared/errors.js';
import { DWELL_TOLERANCE } from '../shared/tolerance.js';
import { rayHit } from './rayHit.js';

/** An outline segment `[[α0, β0], [α1, β1]]`, the tiling on its left. */
export type OutlineSegment = readonly [readonly [number, number], readonly [number, number]];

/** The parts of a polarity diagram the locator needs (a `PlanPolarity` from a plan fits). */
export interface LocatableDiagram {
  readonly vectors: readonly { readonly alpha: number; readonly beta: number }[];
  readonly hull: readonly (readonly [number, number])[];
  readonly triangles: readonly (readonly [number, number, number])[];
  readonly dwell: readonly DwellMatrix[];
  /** Outline of the tiling where it does not fill the hull; references are then clamped to it. */
  readonly outline?: readonly OutlineSegment[] | null;
}

/** Where a reference vector falls and for how long each vertex is applied. */
export type LocatedReference =
  | {
      readonly ok: true;
      /** Index into `triangles`. */
      readonly triangle: number;
      /** Vector indices of the triangle's vertices. */
      readonly vertices: readonly [number, number, number];
      /** Duty cycles of the vertices, each in [0, 1], summing to 1. */
      readonly dwell: readonly [number, number, number];
      /** True when the reference lay outside the hull and was brought back to its boundary. */
      readonly clamped: boolean;
      /** The reference actually synthesised (equal to the input unless clamped). */
      readonly alpha: number;
      readonly beta: number;
    }
  | { readonly ok: false; readonly reason: 'no-triangles' };

/**
 * Locates a reference vector in the re-triangulated diagram and returns its dwell times.
 *
 * Outside the hull the reference is brought back to the hull boundary along its own direction
 * (the longest reachable point on the ray, or the nearest one where the ray starts outside) and
 * flagged as clamped; where the ray misses the hull altogether the nearest hull point is used.
 *
 * @param d - vectors, hull points, triangles and dwell matrices of one polarity
 * @param alpha - reference α, units of Vdc/2
 * @param beta - reference β
 * @returns triangle, vertices, dwell times and the clamp flag; `{ ok: false }` without triangles
 * @example
 * ```ts
 * locateReference(plan.polarities['+--'], 0.4, 0.1);
 * ```
 */
export function locateReference(d: LocatableDiagram, alpha: number, beta: number): LocatedReference {
  if (!(Math.abs(alpha) <= 1e6 && Math.abs(beta) <= 1e6))
    throw new HexsalvageInputError(
      'option',
      'locateReference',
      'alpha/beta',
      'finite numbers within ±1000000 (units of Vdc/2)',
      Math.abs(alpha) <= 1e6 ? beta : alpha,
    );
  if (d.triangles.length === 0) return { ok: false, reason: 'no-triangles' };
  const direct = findTriangle(d, alpha, beta);
  if (direct) return { ok: true, ...direct, clamped: false, alpha, beta };
  const scratch = new Float64Array(2);
  if (d.outline && d.outline.length > 0) clampToOutline(d.outline, alpha, beta, scratch);
  else clampInto(d.hull, alpha, beta, scratch);
  const ca = scratch[0] as number;
  const cb = scratch[1] as number;
  const found = findTriangle(d, ca, cb) ?? nearestTriangle(d, ca, cb);
  return { ok: true, ...found, clamped: true, alpha: ca, beta: cb };
}

function findTriangle(d: LocatableDiagram, alpha: number, beta: number) {
  for (let t = 0; t < d.triangles.length; t++) {
    const w = dwellTimes(d.dwell[t] as DwellMatrix, alpha, beta);
    if (Math.min(...w) >= -DWELL_TOLERANCE) return { triangle: t, vertices: d.triangles[t] as [number, number, number], dwell: normalise(w) };
  }
  return null;
}

// Rounding can leave a boundary point a hair outside every triangle: take the least-outside one.
function nearestTriangle(d: LocatableDiagram, alpha: number, beta: number) {
  let best = 0;
  let score = -Infinity;
  d.dwell.forEach((m, t) => {
    const s = Math.min(...dwellTimes(m, alpha, beta));
    if (s > score) [best, score] = [t, s];
  });
  return { triangle: best, vertices: d.triangles[best] as [number, number, number], dwell: normalise(dwellTimes(d.dwell[best] as DwellMatrix, alpha, beta)) };
}

function normalise(w: [number, number, number]): [number, number, number] {
  const c = w.map((x) => Math.max(0, x)) as [number, number, number];
  const s = c[0] + c[1] + c[2];
  return c.map((x) => x / s) as [number, number, number];
}

/**
 * Brings a point back to a convex hull along the ray from the origin through it.
 *
 * @param hull - hull corners, counter-clockwise, with area
 * @param p - the point
 * @returns the clamped point (the point itself when inside)
 * @example
 * ```ts
 * clampToHull([[1, 0], [0, 1], [-1, 0], [0, -1]], [2, 0]); // [1, 0]
 * ```
 */
export function clampToHull(hull: readonly (readonly [number, number])[], p: Point): Point {
  const out = new Float64Array(2);
  clampInto(hull, p[0], p[1], out);
  return [out[0] as number, out[1] as number];
}

/**
 * Allocation-free form of {@link clampToHull} for hot loops: writes the clamped point to `out`.
 * The modulator's fast path and {@link locateReference} share it, so they agree bit for bit.
 *
 * @param hull - hull corners, counter-clockwise, with area
 * @param x - point α
 * @param y - point β
 * @param out - receives [α, β]
 * @example
 * ```ts
 * clampInto(hull, 2, 0, scratch);
 * ```
 */
export function clampInto(hull: readonly (readonly [number, number])[], x: number, y: number, out: Float64Array): void {
  // sqrt of a sum of squares rather than hypot: IEEE rounds both the same in every language, so the
  // C header reproduces the clamped point bit for bit (hypot implementations differ in the last bit)
  const len = Math.sqrt(x * x + y * y);
  const n = hull.length;
  if (len > 0) {
    const ux = x / len;
    const uy = y / len;
    let lo = 0;
    let hi = Infinity;
    let empty = false;
    for (let i = 0; i < n; i++) {
      const a = hull[i] as readonly [number, number];
      const b = hull[(i + 1) % n] as readonly [number, number];
      const nx = b[1] - a[1];
      const ny = -(b[0] - a[0]);
      const h = nx * a[0] + ny * a[1];
      const c = nx * ux + ny * uy;
      if (Math.abs(c) < 1e-15) empty ||= h < 0;
      else if (c > 0) hi = Math.min(hi, h / c);
      else lo = Math.max(lo, h / c);
    }
    if (!empty && lo <= hi) {
      const t = Math.min(Math.max(len, lo), hi);
      out[0] = t * ux;
      out[1] = t * uy;
      return;
    }
  }
  nearestOnEdges(n, (i) => [hull[i] as readonly [number, number], hull[(i + 1) % n] as readonly [number, number]], x, y, out);
}

// scratch of the ray–segment test (one call at a time: the library is synchronous)
const HIT = new Float64Array(3);

/**
 * Brings a point back into a tiling that does not fill its hull, along the ray from the origin
 * through it: to the farthest point where the ray leaves the tiling before the point, else to the
 * nearest point where it enters after it, else (the ray misses the tiling) to the nearest outline
 * point. On a convex outline this is what {@link clampInto} does. The modulator's fast path, this
 * locator and the C header share the arithmetic, so they agree bit for bit.
 *
 * @param outline - outline segments, the tiling on their left
 * @param x - point α
 * @param y - point β
 * @param out - receives [α, β]
 * @example
 * ```ts
 * clampToOutline(plan.polarities['+--'].outline!, 2, 0, scratch);
 * ```
 */
export function clampToOutline(outline: readonly OutlineSegment[], x: number, y: number, out: Float64Array): void {
  const len = Math.sqrt(x * x + y * y);
  if (len > 0) {
    const ux = x / len;
    const uy = y / len;
    let exit = -1;
    let entry = Infinity;
    for (let i = 0; i < outline.length; i++) {
      const [p, q] = outline[i] as OutlineSegment;
      if (!rayHit(ux, uy, p, q, HIT)) continue;
      const t = HIT[0] as number;
      const s = HIT[1] as number;
      const den = HIT[2] as number;
      if (t <= 0 || s < 0 || s > 1) continue;
      // the tiling is on the left of p→q: the ray leaves it where it crosses left to right (den > 0)
      if (den > 0 && t <= len && t > exit) exit = t;
      if (den < 0 && t >= len && t < entry) entry = t;
    }
    const t = exit >= 0 ? exit : entry;
    if (t < Infinity) {
      out[0] = t * ux;
      out[1] = t * uy;
      return;
    }
  }
  nearestOnEdges(outline.length, (i) => outline[i] as OutlineSegment, x, y, out);
}

// The nearest point of a set of segments (the fallback of both clamps when the ray misses). Squared
// distances: exact ties, as on a symmetric outline, then break the same way in the C header.
function nearestOnEdges(n: number, edge: (i: number) => OutlineSegment, x: number, y: number, out: Float64Array): void {
  let dist = Infinity;
  for (let i = 0; i < n; i++) {
    const [a, b] = edge(i);
    const ex = b[0] - a[0];
    const ey = b[1] - a[1];
    const s = Math.min(1, Math.max(0, ((x - a[0]) * ex + (y - a[1]) * ey) / (ex * ex + ey * ey)));
    const qx = a[0] + s * ex;
    const qy = a[1] + s * ey;
    const dq = (qx - x) * (qx - x) + (qy - y) * (qy - y);
    if (dq < dist) {
      dist = dq;
      out[0] = qx;
      out[1] = qy;
    }
  }
}
