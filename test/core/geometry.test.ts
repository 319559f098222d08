import { describe, expect, it } from 'vitest';
import { type Point } from '@hexsalvage/core';
import {
  clampToHull,
  clarke,
  convexHull,
  dwellMatrix,
  dwellTimes,
  hullGeometry,
  locateReference,
  minRadialExtent,
  polygonArea,
  radialExtent,
  survivingVectors,
  triangleArea,
  triangulate,
} from '@hexsalvage/core/internal';

const S3 = Math.sqrt(3);

describe('clarke', () => {
  it('maps the phase-a large vector onto the alpha axis (amplitude-invariant)', () => {
    const [a, b] = clarke([1, -1, -1]);
    expect(a).toBeCloseTo(4 / 3, 12);
    expect(b).toBeCloseTo(0, 12);
  });
  it('ignores a common-mode offset', () => {
    const [a, b] = clarke([0.7, 0.7, 0.7]);
    expect(Math.hypot(a, b)).toBeCloseTo(0, 12);
  });
});

describe('survivingVectors', () => {
  it('merges redundant triplets and orders vectors by length, then angle', () => {
    const v = survivingVectors([
      [-1, 0, 1],
      [-1, 0, 1],
      [-1, 0, 1],
    ]);
    expect(v).toHaveLength(19);
    expect(v[0]?.levels).toHaveLength(3); // zero vector: PPP, OOO, NNN
    expect(v[1]?.levels).toEqual([
      [1, 0, 0],
      [0, -1, -1],
    ]); // small vector at 0°, lexicographically descending
    expect(v[1]?.alpha).toBeCloseTo(2 / 3, 12);
  });
  it('returns nothing when a phase has no level', () => {
    expect(survivingVectors([[-1, 1], [], [-1, 1]])).toEqual([]);
  });
});

describe('convexHull', () => {
  it('drops points in the middle of an edge and runs counter-clockwise', () => {
    const pts: Point[] = [
      [0, 0],
      [1, 0],
      [0.5, 0],
      [1, 1],
      [0, 1],
      [0.5, 0.5],
    ];
    const h = convexHull(pts);
    expect(h).toEqual([0, 1, 3, 4]);
    expect(polygonArea(h.map((i) => pts[i] as Point))).toBeCloseTo(1, 12);
  });
  it('handles the degenerate cases as data', () => {
    expect(convexHull([])).toEqual([]);
    expect(convexHull([[1, 1]])).toEqual([0]);
    expect(
      convexHull([
        [1, 1],
        [1, 1],
        [1, 1],
      ]),
    ).toHaveLength(1);
    expect(
      convexHull([
        [0, 0],
        [1, 1],
        [2, 2],
        [3, 3],
      ]),
    ).toEqual([0, 3]); // collinear: no area
  });
  it('drops the medium vectors from the healthy three-level hexagon', () => {
    const v = survivingVectors([
      [-1, 0, 1],
      [-1, 0, 1],
      [-1, 0, 1],
    ]);
    const h = convexHull(v.map((x) => [x.alpha, x.beta]));
    expect(h).toHaveLength(6);
    for (const i of h) expect(Math.hypot(v[i]!.alpha, v[i]!.beta)).toBeCloseTo(4 / 3, 12);
  });
});

describe('triangulate', () => {
  const areaOf = (pts: Point[]) => triangulate(pts).reduce((s, t) => s + triangleArea(pts, t), 0);

  it('tiles the hull of the healthy three-level diagram with 24 equal triangles', () => {
    const v = survivingVectors([
      [-1, 0, 1],
      [-1, 0, 1],
      [-1, 0, 1],
    ]);
    const pts: Point[] = v.map((x) => [x.alpha, x.beta]);
    const tris = triangulate(pts);
    expect(tris).toHaveLength(24);
    for (const t of tris) expect(triangleArea(pts, t)).toBeCloseTo((S3 / 4) * (2 / 3) ** 2, 12);
    expect(areaOf(pts)).toBeCloseTo(polygonArea(convexHull(pts).map((i) => pts[i] as Point)), 12);
  });
  it('returns no triangle for fewer than three points or collinear points', () => {
    expect(
      triangulate([
        [0, 0],
        [1, 0],
      ]),
    ).toEqual([]);
    expect(
      triangulate([
        [0, 0],
        [1, 0],
        [2, 0],
        [3, 0],
      ]),
    ).toEqual([]);
  });
  it('leaves no zero-area sliver along a hull edge carrying collinear points', () => {
    const pts: Point[] = [
      [0, 0],
      [1, 0],
      [2, 0],
      [3, 0],
      [1.5, 1],
    ];
    const tris = triangulate(pts);
    for (const t of tris) expect(Math.abs(triangleArea(pts, t))).toBeGreaterThan(1e-9);
    expect(areaOf(pts)).toBeCloseTo(1.5, 12);
  });
  it('resolves a cocircular tie deterministically', () => {
    // four corners of a square lie on one circle: either diagonal is Delaunay
    const pts: Point[] = [
      [0, 0],
      [1, 0],
      [1, 1],
      [0, 1],
    ];
    const a = triangulate(pts);
    expect(a).toHaveLength(2);
    expect(triangulate(pts.map((p) => [p[0], p[1]]))).toEqual(a);
    expect(areaOf(pts)).toBeCloseTo(1, 12);
  });
  it('orients every triangle counter-clockwise, starting at its smallest index', () => {
    const pts: Point[] = [
      [0, 0],
      [2, 0],
      [1, 2],
      [1, 0.5],
    ];
    for (const t of triangulate(pts)) {
      expect(triangleArea(pts, t)).toBeGreaterThan(0);
      expect(t[0]).toBe(Math.min(...t));
    }
  });
});

describe('dwellMatrix', () => {
  it('inverts [[α],[β],[1]] so that the vertices rebuild the reference', () => {
    const pts: Point[] = [
      [0, 0],
      [2 / 3, 0],
      [1 / 3, 1 / S3],
    ];
    const m = dwellMatrix(pts, [0, 1, 2]);
    const d = dwellTimes(m, 0.3, 0.1);
    expect(d[0] + d[1] + d[2]).toBeCloseTo(1, 12);
    expect(d[1] * (2 / 3) + d[2] * (1 / 3)).toBeCloseTo(0.3, 12);
    expect(d[2] / S3).toBeCloseTo(0.1, 12);
  });
});

describe('radialExtent and minRadialExtent', () => {
  const square: Point[] = [
    [1, 1],
    [-1, 1],
    [-1, -1],
    [1, -1],
  ];
  const g = hullGeometry(square, convexHull(square));
  it('gives the distance to the boundary along a direction', () => {
    expect(radialExtent(g, 0).value).toBeCloseTo(1, 12);
    expect(radialExtent(g, Math.PI / 4).value).toBeCloseTo(Math.SQRT2, 12);
  });
  it('finds an interior facet normal as the interval minimum', () => {
    const m = minRadialExtent(g, 0.2, 2); // contains the normal at π/2
    expect(m.value).toBeCloseTo(1, 12);
    expect(m.theta).toBeCloseTo(Math.PI / 2, 12);
  });
  it('takes an interval end when no normal falls inside', () => {
    const m = minRadialExtent(g, 0.2, 0.5);
    expect(m.value).toBeCloseTo(1 / Math.cos(0.2), 12);
    expect(m.theta).toBe(0.2);
  });
  it('is zero when the origin is on the hull boundary or outside, or the hull has no area', () => {
    const shifted: Point[] = [
      [0, 0],
      [1, 0],
      [1, 1],
      [0, 1],
    ];
    expect(hullGeometry(shifted, convexHull(shifted)).containsOrigin).toBe(false);
    expect(minRadialExtent(hullGeometry(shifted, convexHull(shifted)), 0, 1).value).toBe(0);
    const line: Point[] = [
      [-1, 0],
      [1, 0],
    ];
    expect(radialExtent(hullGeometry(line, convexHull(line)), 0).value).toBe(0);
  });
});

describe('locateReference', () => {
  const v = survivingVectors([
    [-1, 1],
    [-1, 1],
    [-1, 1],
  ]);
  const pts: Point[] = v.map((x) => [x.alpha, x.beta]);
  const triangles = triangulate(pts);
  const d = { vectors: v, hull: convexHull(pts).map((i) => pts[i] as Point), triangles, dwell: triangles.map((t) => dwellMatrix(pts, t)) };

  it('returns dwell times that rebuild a reference inside the hull', () => {
    const r = locateReference(d, 0.5, 0.2);
    if (!r.ok) throw new Error(r.reason);
    expect(r.clamped).toBe(false);
    const a = r.vertices.reduce((s, i, k) => s + r.dwell[k]! * v[i]!.alpha, 0);
    const b = r.vertices.reduce((s, i, k) => s + r.dwell[k]! * v[i]!.beta, 0);
    expect(a).toBeCloseTo(0.5, 12);
    expect(b).toBeCloseTo(0.2, 12);
  });
  it('brings a reference outside the hull back along its own direction and flags it', () => {
    const r = locateReference(d, 3, 0);
    if (!r.ok) throw new Error(r.reason);
    expect(r.clamped).toBe(true);
    expect(r.alpha).toBeCloseTo(4 / 3, 12);
    expect(r.beta).toBeCloseTo(0, 12);
  });
  it('reports a diagram without triangles as data', () => {
    expect(locateReference({ vectors: [], hull: [], triangles: [], dwell: [] }, 0, 0)).toEqual({ ok: false, reason: 'no-triangles' });
  });
  it('uses the nearest hull point where the ray misses the hull', () => {
    const hull: Point[] = [
      [1, -0.5],
      [2, -0.5],
      [2, 0.5],
      [1, 0.5],
    ];
    expect(clampToHull(hull, [0, 3])).toEqual([1, 0.5]);
    expect(clampToHull(hull, [0.5, 0])).toEqual([1, 0]); // ray enters the hull beyond the point
  });
});
