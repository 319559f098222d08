import { describe, expect, it } from 'vitest';
import { BUILTIN_TOPOLOGIES, builtinLeg, parsePolarity, POLARITY_STRINGS, type Point } from '@hexsalvage/core';
import { admissibleChain, diagramAtlas, expandElements, phaseMoves, polygonArea, triangleArea, triangulate } from '@hexsalvage/core/internal';
import { fc, fcParams } from '../support/fc.js';

const caseArb = fc.constantFrom(...BUILTIN_TOPOLOGIES).chain((t) => {
  const ids = expandElements(builtinLeg(t)).map((e) => e.id);
  const fault = fc.tuple(fc.constantFrom('a', 'b', 'c'), fc.constantFrom(...ids)).map(([p, id]) => `${p}.${id}`);
  return fc.tuple(
    fc.constant(t),
    fc.uniqueArray(fault, { maxLength: 3 }),
    fc.constantFrom(...POLARITY_STRINGS),
    fc.array(fc.tuple(fc.double({ min: 0, max: 1, noNaN: true }), fc.double({ min: 0, max: 1, noNaN: true })), { minLength: 20, maxLength: 20 }),
  );
});

describe('triangulate properties', () => {
  it('lists each Delaunay triangle once, counter-clockwise from its smallest index, sorted lexicographically, frozen (property, random and grid point sets)', () => {
    const coord = fc.oneof(
      fc.integer({ min: -3, max: 3 }).map((k) => k / 3),
      fc.double({ min: -1, max: 1, noNaN: true }),
    );
    // points at least 1e-6 apart, as vectors are (survivingVectors merges closer ones)
    const apart = (pts: readonly (readonly [number, number])[]) =>
      pts.every((p, i) => pts.every((q, j) => j <= i || Math.hypot(p[0] - q[0], p[1] - q[1]) > 1e-6));
    fc.assert(
      fc.property(fc.uniqueArray(fc.tuple(coord, coord), { minLength: 3, maxLength: 40, selector: (p) => `${p[0]},${p[1]}` }).filter(apart), (pts) => {
        const tris = triangulate(pts);
        for (const t of tris) {
          expect(Object.isFrozen(t)).toBe(true);
          expect(t[0]).toBeLessThan(Math.min(t[1], t[2]));
          expect(triangleArea(pts, t)).toBeGreaterThan(0);
        }
        // the order a comparator sort gives, and no triangle twice
        const sorted = [...tris].sort((x, y) => x[0] - y[0] || x[1] - y[1] || x[2] - y[2]);
        expect(tris).toEqual(sorted);
        expect(new Set(tris.map((t) => t.join(','))).size).toBe(tris.length);
      }),
      fcParams(300),
    );
  });

  it('tiles the hull exactly under --level-steps any (first version): areas add up, no gap, no overlap', () => {
    fc.assert(
      fc.property(caseArb, ([t, faults, pol, samples]) => {
        const d = diagramAtlas({ topology: t, faults, levelSteps: 'any' }).faulted.get(pol)!;
        const pts: Point[] = d.vectors.map((v) => [v.alpha, v.beta]);
        const hull = d.hull.map((i) => pts[i] as Point);
        if (d.triangles.length === 0) {
          expect(Math.abs(hull.length >= 3 ? polygonArea(hull) : 0)).toBeLessThan(1e-12);
          return;
        }
        for (const tri of d.triangles) expect(triangleArea(pts, tri)).toBeGreaterThan(1e-12);
        const sum = d.triangles.reduce((s, tri) => s + triangleArea(pts, tri), 0);
        expect(sum).toBeCloseTo(polygonArea(hull), 10);
        // random points of the hull's bounding box: inside the hull ⇔ covered, and by one triangle
        // only (points within 1e-9 of an edge are skipped: there two triangles legitimately meet)
        const xs = hull.map((p) => p[0]);
        const ys = hull.map((p) => p[1]);
        for (const [u, w] of samples) {
          const x = Math.min(...xs) + u * (Math.max(...xs) - Math.min(...xs));
          const y = Math.min(...ys) + w * (Math.max(...ys) - Math.min(...ys));
          const bary = d.dwell.map((m) => m.map((r) => r[0] * x + r[1] * y + r[2]));
          if (bary.some((b) => b.some((v) => Math.abs(v) < 1e-9))) continue;
          const covering = bary.filter((b) => b.every((v) => v > 0)).length;
          const inHull = hull.every((a, i) => {
            const b = hull[(i + 1) % hull.length] as Point;
            return (b[0] - a[0]) * (y - a[1]) - (b[1] - a[1]) * (x - a[0]) > 0;
          });
          expect(covering).toBe(inHull ? 1 : 0);
        }
      }),
      fcParams(200),
    );
  });

  const rules = fc.constantFrom('commutable' as const, 'adjacent' as const);
  it('reports only admissible triangles, never overlapping, inside the hull (Version 2)', () => {
    fc.assert(
      fc.property(caseArb, rules, fc.boolean(), ([t, faults, pol, samples], levelSteps, ignoreRatings) => {
        const atlas = diagramAtlas({ topology: t, faults, levelSteps, ignoreRatings });
        const d = atlas.faulted.get(pol)!;
        const pts: Point[] = d.vectors.map((v) => [v.alpha, v.beta]);
        const hull = d.hull.map((i) => pts[i] as Point);
        const levels = [...new Set(Object.values(atlas.analysis.leg.dcNodes))].sort((x, y) => x - y);
        const chars = parsePolarity(pol);
        const moves = (['a', 'b', 'c'] as const).map((ph, k) => phaseMoves(atlas.analysis.phases[ph], atlas.analysis.rules, levels)[chars[k]!]) as never;
        for (const tri of d.triangles) {
          expect(triangleArea(pts, tri)).toBeGreaterThan(1e-12);
          expect(admissibleChain(d.vectors, tri, moves)).not.toBeNull();
        }
        const sum = d.triangles.reduce((s, tri) => s + triangleArea(pts, tri), 0);
        expect(sum).toBeLessThanOrEqual((hull.length >= 3 ? polygonArea(hull) : 0) + 1e-9);
        const xs = hull.map((p) => p[0]);
        const ys = hull.map((p) => p[1]);
        for (const [u, w] of samples) {
          const x = Math.min(...xs, 0) + u * (Math.max(...xs, 0) - Math.min(...xs, 0));
          const y = Math.min(...ys, 0) + w * (Math.max(...ys, 0) - Math.min(...ys, 0));
          const bary = d.dwell.map((m) => m.map((r) => r[0] * x + r[1] * y + r[2]));
          if (bary.some((b) => b.some((v) => Math.abs(v) < 1e-9))) continue;
          expect(bary.filter((b) => b.every((v) => v > 0)).length).toBeLessThanOrEqual(1);
        }
      }),
      fcParams(200),
    );
  });
});
