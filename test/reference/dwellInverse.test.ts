import { readFileSync } from 'node:fs';
import { inverse, Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { BUILTIN_TOPOLOGIES, planRemedial, type Point } from '@hexsalvage/core';
import { dwellMatrix } from '@hexsalvage/core/internal';
import { fc, fcParams } from '../support/fc.js';

// Reference library from the npm registry: ml-matrix 6.15.1 (mljs), `inverse` = LU decomposition
// with partial pivoting (the JAMA algorithm) solved against the identity. hexsalvage writes the
// same operations out for 3×3 so as not to load the library at run time; the two must agree in
// every bit, not merely within a tolerance, since golden files and exports print full precision.
function libraryInverse(p: readonly Point[]): number[][] {
  const a = new Matrix([p.map((q) => q[0]), p.map((q) => q[1]), [1, 1, 1]]);
  return inverse(a)
    .to2DArray()
    .map((row) => row.map((x) => (Object.is(x, -0) ? 0 : x)));
}

const bits = (m: readonly (readonly number[])[]) => m.flat().map((x) => (Object.is(x, -0) ? '-0' : x.toString(16)));

describe('dwellMatrix against ml-matrix inverse (reference library)', () => {
  it('agrees bit for bit on every triangle of every built-in leg, healthy and faulted, and the five-level example', () => {
    const topologies: Parameters<typeof planRemedial>[0]['topology'][] = [...BUILTIN_TOPOLOGIES];
    topologies.push(JSON.parse(readFileSync(new URL('../../examples/five-level-leg.json', import.meta.url), 'utf8')));
    let checked = 0;
    for (const topology of topologies) {
      for (const faults of typeof topology === 'string' ? [[], ['a.innerUpper'], ['b.outerLower:short']] : [[]]) {
        let plan;
        try {
          plan = planRemedial({ topology, faults });
        } catch {
          continue; // the two-level leg has no inner or outer switch
        }
        for (const pol of Object.values(plan.polarities)) {
          const pts = pol.vectors.map((v) => [v.alpha, v.beta] as Point);
          pol.triangles.forEach((t) => {
            expect(bits(dwellMatrix(pts, t))).toEqual(bits(libraryInverse(t.map((i) => pts[i] as Point))));
            checked++;
          });
        }
      }
    }
    expect(checked).toBeGreaterThan(1000);
  });

  it('agrees bit for bit on random non-degenerate triangles (property)', () => {
    const coord = fc.double({ min: -3, max: 3, noNaN: true, noDefaultInfinity: true });
    const point = fc.tuple(coord, coord);
    fc.assert(
      fc.property(point, point, point, (p0, p1, p2) => {
        const area = (p1[0] - p0[0]) * (p2[1] - p0[1]) - (p2[0] - p0[0]) * (p1[1] - p0[1]);
        fc.pre(Math.abs(area) > 1e-6);
        const pts: Point[] = [p0, p1, p2];
        expect(bits(dwellMatrix(pts, [0, 1, 2]))).toEqual(bits(libraryInverse(pts)));
      }),
      fcParams(500),
    );
  });

  it('refuses a degenerate (collinear) triangle as the library does', () => {
    const pts: Point[] = [
      [0, 0],
      [1, 1],
      [2, 2],
    ];
    expect(() => libraryInverse(pts)).toThrow(/singular/);
    expect(() => dwellMatrix(pts, [0, 1, 2])).toThrow(/singular/);
  });
});
