import { describe, expect, it } from 'vitest';
import { coveredBy, unionOutline, type Segment } from '../../packages/core/src/geometry/triangleUnion.js';
import type { Point } from '../../packages/core/src/geometry/clarke.js';
import type { Triangle } from '../../packages/core/src/geometry/triangulate.js';
import { fc, fcParams } from '../support/fc.js';

// The plain form of unionOutline: every edge (repeats included) against every edge, every probe
// against every triangle. The fast form skips repeated edges and, by bounding boxes, the pairs and
// triangles that cannot change a cut or a coverage answer; the outline must be the same, segment
// for segment and in the same order.
function plainUnionOutline(points: readonly Point[], triangles: readonly Triangle[], eps: number): Segment[] {
  const edges: Segment[] = triangles.flatMap((t) =>
    [0, 1, 2].map((k) => [points[t[k] as number] as Point, points[t[(k + 1) % 3] as number] as Point] as const),
  );
  const out: Segment[] = [];
  const seen = new Set<string>();
  const probe = 1e3 * eps;
  for (const [p, q] of edges) {
    const ex = q[0] - p[0];
    const ey = q[1] - p[1];
    const len = Math.hypot(ex, ey);
    const cuts = [0, 1];
    for (const [r, s] of edges) {
      const fx = s[0] - r[0];
      const fy = s[1] - r[1];
      const len2 = ex * ex + ey * ey;
      const den = ex * fy - ey * fx;
      if (Math.abs(den) > eps * Math.sqrt(len2 * (fx * fx + fy * fy))) {
        const t = ((r[0] - p[0]) * fy - (r[1] - p[1]) * fx) / den;
        const u = ((r[0] - p[0]) * ey - (r[1] - p[1]) * ex) / den;
        if (t > 0 && t < 1 && u >= -eps && u <= 1 + eps) cuts.push(t);
      }
      for (const c of [r, s]) {
        const t = ((c[0] - p[0]) * ex + (c[1] - p[1]) * ey) / len2;
        const d = Math.abs(ex * (c[1] - p[1]) - ey * (c[0] - p[0])) / Math.sqrt(len2);
        if (d <= eps && t > 0 && t < 1) cuts.push(t);
      }
    }
    cuts.sort((x, y) => x - y);
    for (let i = 0; i + 1 < cuts.length; i++) {
      const s0 = cuts[i] as number;
      const s1 = cuts[i + 1] as number;
      if ((s1 - s0) * len <= probe) continue;
      const sm = (s0 + s1) / 2;
      const [mx, my] = [p[0] + sm * ex, p[1] + sm * ey];
      const [nx, ny] = [-ey / len, ex / len];
      const left = coveredBy(points, triangles, [mx + probe * nx, my + probe * ny], eps);
      const right = coveredBy(points, triangles, [mx - probe * nx, my - probe * ny], eps);
      if (left === right) continue;
      const a: Point = [p[0] + s0 * ex, p[1] + s0 * ey];
      const b: Point = [p[0] + s1 * ex, p[1] + s1 * ey];
      const seg: Segment = left ? [a, b] : [b, a];
      const k = seg
        .flat()
        .map((v) => Math.round(v / (probe * 10)))
        .join(',');
      if (seen.has(k)) continue;
      seen.add(k);
      out.push(seg);
    }
  }
  return out;
}

describe('unionOutline', () => {
  // points on a small lattice (shared corners, collinear edges, T-junctions, repeats, slivers),
  // triangles among them made counter-clockwise; seeded property test
  const lattice = Array.from({ length: 25 }, (_, i) => [(i % 5) / 4 - 0.5, Math.floor(i / 5) / 4 - 0.5] as Point);
  const triangle = fc
    .tuple(fc.nat(24), fc.nat(24), fc.nat(24))
    .filter(([a, b, c]) => a !== b && b !== c && a !== c)
    .map(([a, b, c]) => {
      const [p, q, r] = [lattice[a] as Point, lattice[b] as Point, lattice[c] as Point];
      const turn = (q[0] - p[0]) * (r[1] - p[1]) - (q[1] - p[1]) * (r[0] - p[0]);
      return (turn >= 0 ? [a, b, c] : [a, c, b]) as Triangle;
    })
    .filter((t) => {
      const [p, q, r] = t.map((i) => lattice[i] as Point) as [Point, Point, Point];
      return (q[0] - p[0]) * (r[1] - p[1]) - (q[1] - p[1]) * (r[0] - p[0]) > 1e-12;
    });

  it('gives the plain form’s outline, segment for segment (lattice triangles, overlapping)', () => {
    fc.assert(
      fc.property(fc.array(triangle, { minLength: 1, maxLength: 14 }), (tris) => {
        expect(unionOutline(lattice, tris, 1e-9)).toEqual(plainUnionOutline(lattice, tris, 1e-9));
      }),
      fcParams(150),
    );
  });

  it('outlines one triangle by its three edges, and a repeated triangle the same way', () => {
    const one = unionOutline(lattice, [[0, 4, 24]], 1e-9);
    expect(one).toHaveLength(3);
    expect(
      unionOutline(
        lattice,
        [
          [0, 4, 24],
          [0, 4, 24],
        ],
        1e-9,
      ),
    ).toEqual(one);
  });
});
