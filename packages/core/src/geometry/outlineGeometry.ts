import type { Point } from './clarke.js';
import type { HullEdge, HullGeometry } from './radialExtent.js';
import type { OutlineEdge } from './triangleUnion.js';
import { rayHit } from './rayHit.js';

/**
 * Prepares the outline of a (possibly non-convex) region for radial queries: the region's extent
 * e(θ) from the origin is the distance to the first outline segment the ray meets.
 *
 * Outline segments do not cross, so the order in which a ray meets them changes only where the ray
 * passes a segment end. Between two consecutive end directions one segment is first; it becomes an
 * edge whose `span` is that range of directions, and e(θ) = offset / cos(θ − normal) there. Where
 * the origin is not strictly inside the region the geometry says so and every extent is 0.
 *
 * @param outline - boundary edges with the region on their left (e.g. from `tilingOutline`)
 * @param originInside - whether the origin is strictly inside the region
 * @returns edges with spans covering all directions, or `containsOrigin: false`
 * @example
 * ```ts
 * minRadialExtent(outlineGeometry(tilingOutline(points, tiles, 1e-9), true), 0, 2 * Math.PI).value;
 * ```
 */
export function outlineGeometry(outline: readonly OutlineEdge[], originInside: boolean): HullGeometry {
  if (!originInside || outline.length < 3) return { edges: [], containsOrigin: false };
  const dirs = [...new Set(outline.flatMap((e) => e.segment.map((p) => Math.atan2(p[1], p[0]))))].sort((a, b) => a - b);
  const cuts = dirs.filter((d, i) => i === 0 || d - (dirs[i - 1] as number) > 1e-12);
  const edges: HullEdge[] = [];
  let open: { seg: number; from: number } | null = null;
  let first: { seg: number; to: number } | null = null;
  for (let i = 0; i < cuts.length; i++) {
    const a = cuts[i] as number;
    const b = i + 1 < cuts.length ? (cuts[i + 1] as number) : (cuts[0] as number) + 2 * Math.PI;
    const seg = firstHit(outline, (a + b) / 2);
    if (seg < 0) return { edges: [], containsOrigin: false };
    if (open && open.seg === seg) continue;
    if (open) edges.push(edgeOf(outline[open.seg] as OutlineEdge, open.from, a));
    else first = { seg, to: a };
    open = { seg, from: a };
  }
  if (open) {
    const end = (cuts[0] as number) + 2 * Math.PI;
    // the last run continues into the first one when both are the same segment
    if (first && edges.length > 0 && edges[0] && first.seg === open.seg)
      edges[0] = edgeOf(outline[open.seg] as OutlineEdge, open.from, (edges[0].span as [number, number])[1] + 2 * Math.PI);
    else edges.push(edgeOf(outline[open.seg] as OutlineEdge, open.from, end));
  }
  return { edges, containsOrigin: true };
}

function edgeOf(e: OutlineEdge, from: number, to: number): HullEdge {
  const [p, q] = e.segment;
  const dx = q[0] - p[0];
  const dy = q[1] - p[1];
  const len = Math.hypot(dx, dy);
  // the region is on the left of p→q, so the outward normal points to the right
  const nx = dy / len;
  const ny = -dx / len;
  return { from: e.from, to: e.to, normalAngle: Math.atan2(ny, nx), offset: nx * p[0] + ny * p[1], span: [from, to] };
}

// Index of the outline segment a ray from the origin along θ meets first (−1: none).
function firstHit(outline: readonly OutlineEdge[], theta: number): number {
  const ux = Math.cos(theta);
  const uy = Math.sin(theta);
  let best = -1;
  let bestT = Infinity;
  const hit = new Float64Array(3);
  outline.forEach((e, i) => {
    const [p, q] = e.segment;
    if (!rayHit(ux, uy, p, q, hit)) return;
    const t = hit[0] as number;
    const s = hit[1] as number;
    if (t > 0 && s >= 0 && s <= 1 && t < bestT) {
      bestT = t;
      best = i;
    }
  });
  return best;
}

/**
 * Whether the origin lies strictly inside a region given by its outline: inside some triangle of the
 * region and on no outline segment.
 *
 * @param outline - the region's outline
 * @param covered - whether the origin is in the closed region
 * @param eps - distance tolerance
 * @returns true when a small disc around the origin lies in the region
 * @example
 * ```ts
 * originStrictlyInside(outline, true, 1e-9);
 * ```
 */
export function originStrictlyInside(outline: readonly OutlineEdge[], covered: boolean, eps: number): boolean {
  if (!covered) return false;
  return outline.every(({ segment: [p, q] }) => distanceToSegment(p, q) > eps);
}

function distanceToSegment(p: Point, q: Point): number {
  const dx = q[0] - p[0];
  const dy = q[1] - p[1];
  const s = Math.min(1, Math.max(0, -(p[0] * dx + p[1] * dy) / (dx * dx + dy * dy)));
  return Math.hypot(p[0] + s * dx, p[1] + s * dy);
}
