import type { Point } from './clarke.js';
import { polygonArea } from './hull.js';
import { AREA_TOLERANCE } from '../shared/tolerance.js';

/** One edge of a hull seen from the origin. */
export interface HullEdge {
  /** Hull vertex indices (into the vector list), counter-clockwise. */
  readonly from: number;
  readonly to: number;
  /** Direction of the outward normal, radians in (−π, π]. */
  readonly normalAngle: number;
  /** Distance from the origin to the edge's line (positive when the origin is inside). */
  readonly offset: number;
  /**
   * Directions (radians, `span[0] ≤ span[1]`) along which this edge is where the region ends. Absent
   * on a convex hull, whose boundary along any direction is its nearest edge line; present on the
   * outline of a non-convex union, where an edge only bounds the directions it is seen in first.
   */
  readonly span?: readonly [number, number];
}

/** A hull prepared for radial queries. */
export interface HullGeometry {
  readonly edges: readonly HullEdge[];
  /** True when the hull has area and the origin lies strictly inside it. */
  readonly containsOrigin: boolean;
}

/** The radial extent in one direction, or the minimum of it over an interval. */
export interface RadialValue {
  /** Distance from the origin to the hull boundary along the direction (0 outside or degenerate). */
  readonly value: number;
  /** Direction in radians where `value` is reached. */
  readonly theta: number;
  /** Index into `edges` of the binding edge, `null` when the value is 0 by degeneracy. */
  readonly edge: number | null;
}

/**
 * Prepares a counter-clockwise hull for radial queries.
 *
 * @param points - vector positions
 * @param hull - hull indices from `convexHull`
 * @returns edges with outward normals and offsets, and whether the origin is strictly inside
 * @example
 * ```ts
 * hullGeometry(points, convexHull(points)).containsOrigin;
 * ```
 */
export function hullGeometry(points: readonly Point[], hull: readonly number[], scale = 1): HullGeometry {
  const poly = hull.map((i) => points[i] as Point);
  if (hull.length < 3 || polygonArea(poly) <= AREA_TOLERANCE * scale * scale) return { edges: [], containsOrigin: false };
  const edges: HullEdge[] = hull.map((from, k) => {
    const to = hull[(k + 1) % hull.length] as number;
    const [x0, y0] = points[from] as Point;
    const [x1, y1] = points[to] as Point;
    const len = Math.hypot(x1 - x0, y1 - y0);
    const nx = (y1 - y0) / len;
    const ny = -(x1 - x0) / len;
    return { from, to, normalAngle: Math.atan2(ny, nx), offset: nx * x0 + ny * y0 };
  });
  // Strictly inside: an origin on an edge gives a zero radius in the outward directions, which
  // the contract treats as "not inside".
  const containsOrigin = edges.every((e) => e.offset > Math.sqrt(AREA_TOLERANCE) * scale);
  return { edges, containsOrigin };
}

/**
 * Distance from the origin to the hull boundary along direction θ.
 *
 * @param g - prepared hull
 * @param theta - direction in radians
 * @returns the radial extent r(θ) and the edge it hits (value 0 when the origin is not inside)
 * @example
 * ```ts
 * radialExtent(g, 0).value;
 * ```
 */
export function radialExtent(g: HullGeometry, theta: number): RadialValue {
  if (!g.containsOrigin) return { value: 0, theta, edge: null };
  const i = bindingEdge(g.edges, theta);
  return i < 0 ? { value: Infinity, theta, edge: 0 } : { value: extentOf(g.edges[i] as HullEdge, theta), theta, edge: i };
}

/**
 * Exact minimum of r(θ) over a closed interval of directions.
 *
 * On each edge's angular span r(θ) = h / cos(θ − ψ) is smallest at the normal direction ψ, so the
 * minimum over [θ1, θ2] is among r(θ1), r(θ2) and the offsets of the edges whose normals fall
 * inside the interval. No sampling.
 *
 * @param g - prepared hull
 * @param from - interval start, radians
 * @param to - interval end, radians (`to ≥ from`; spans of 2π or more cover every direction)
 * @param tie - values within this of each other count as equal (default 0): the earliest direction
 *   wins, so rounding noise between equal minima (a regular hexagon's six normals) cannot move it
 * @returns the minimum, the direction where it is reached (earliest on ties) and the edge
 * @example
 * ```ts
 * minRadialExtent(g, 0, 2 * Math.PI).value; // radius of the largest origin-centred inscribed circle
 * ```
 */
export function minRadialExtent(g: HullGeometry, from: number, to: number, tie = 0): RadialValue {
  if (!g.containsOrigin) return { value: 0, theta: from, edge: null };
  const edges = g.edges;
  if (hasSpans(edges)) return minOverSpans(g, from, to, tie);
  // the range's ends, then every edge normal inside the range; ties go to the smaller angle. Plain
  // numbers and indexed loops: a fault atlas asks this thousands of times per leg.
  const first = bindingEdge(edges, from);
  let value = first < 0 ? Infinity : extentOf(edges[first] as HullEdge, from);
  let theta = from;
  let edge = first < 0 ? 0 : first;
  const last = bindingEdge(edges, to);
  const atTo = last < 0 ? Infinity : extentOf(edges[last] as HullEdge, to);
  if (atTo < value - tie) {
    value = atTo;
    theta = to;
    edge = last < 0 ? 0 : last;
  } else value = Math.min(value, atTo);
  for (let i = 0; i < edges.length; i++) {
    const e = edges[i] as HullEdge;
    const k0 = Math.ceil((from - e.normalAngle) / (2 * Math.PI));
    for (let k = k0; e.normalAngle + 2 * Math.PI * k <= to; k++) {
      const t = e.normalAngle + 2 * Math.PI * k;
      if (e.offset < value - tie || (e.offset <= value + tie && t < theta)) {
        theta = t;
        edge = i;
      }
      value = Math.min(value, e.offset);
    }
  }
  return { value, theta, edge };
}

// The index of the edge that binds along θ (the first smallest offset/cos among the edges facing θ
// and, on an outline, whose span holds θ), or -1 when none does.
function bindingEdge(edges: readonly HullEdge[], theta: number): number {
  let best = Infinity;
  let edge = -1;
  for (let i = 0; i < edges.length; i++) {
    const e = edges[i] as HullEdge;
    if (e.span && !inSpan(e.span, theta)) continue;
    const c = Math.cos(theta - e.normalAngle);
    if (c <= 0) continue;
    const r = e.offset / c;
    if (r < best) {
      best = r;
      edge = i;
    }
  }
  return edge;
}

// The extent along θ that an edge gives (the same arithmetic as bindingEdge, so the same bits).
function extentOf(e: HullEdge, theta: number): number {
  return e.offset / Math.cos(theta - e.normalAngle);
}

function hasSpans(edges: readonly HullEdge[]): boolean {
  for (let i = 0; i < edges.length; i++) if ((edges[i] as HullEdge).span) return true;
  return false;
}

// On an outline each edge bounds only its span: the minimum over [from, to] is among the ends of
// each span's overlap with the interval and the edge normals that fall inside such an overlap.
function minOverSpans(g: HullGeometry, from: number, to: number, tie: number): RadialValue {
  let best: RadialValue = { value: Infinity, theta: from, edge: null };
  const consider = (value: number, theta: number, edge: number) => {
    if (value < best.value - tie || (value <= best.value + tie && theta < best.theta)) best = { value: Math.min(value, best.value), theta, edge };
    else if (value < best.value) best = { ...best, value };
  };
  g.edges.forEach((e, i) => {
    const [lo, hi] = e.span as readonly [number, number];
    const turn = 2 * Math.PI;
    // the same 1e-12 slack as radialExtent's span test: at a span end both neighbouring edges
    // count, so a direction where the extent jumps gives the lower side (the infimum)
    for (let k = Math.floor((from - hi) / turn) - 1; lo + k * turn <= to + 1e-12; k++) {
      const a = Math.max(from, lo + k * turn - 1e-12);
      const b = Math.min(to, hi + k * turn + 1e-12);
      if (a > b) continue;
      consider(e.offset / Math.cos(a - e.normalAngle), a, i);
      consider(e.offset / Math.cos(b - e.normalAngle), b, i);
      for (let j = Math.ceil((a - e.normalAngle) / turn); e.normalAngle + j * turn <= b; j++) consider(e.offset, e.normalAngle + j * turn, i);
    }
  });
  return best;
}

function inSpan(span: readonly [number, number], theta: number): boolean {
  const turn = 2 * Math.PI;
  const k = Math.floor((theta - span[0]) / turn);
  const t = theta - k * turn;
  return t <= span[1] + 1e-12 || t >= span[0] + turn - 1e-12;
}
