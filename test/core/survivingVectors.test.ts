import { describe, expect, it } from 'vitest';
import { type LevelTriplet } from '@hexsalvage/core';
import { clarke, indexOfVector, survivingVectors, vectorFinder, VECTOR_TOLERANCE } from '@hexsalvage/core/internal';
import { fc, fcParams } from '../support/fc.js';

// The plain method the grid replaces: scan every group in order, the first within the tolerance
// takes the triplet; then the same ordering. Identical output is required, not just close.
function linear(sets: readonly (readonly number[])[]) {
  const groups: { p: [number, number]; levels: LevelTriplet[] }[] = [];
  for (const la of sets[0]!)
    for (const lb of sets[1]!)
      for (const lc of sets[2]!) {
        const t: LevelTriplet = [la, lb, lc];
        const p = clarke(t) as [number, number];
        const g = groups.find((x) => Math.hypot(x.p[0] - p[0], x.p[1] - p[1]) <= VECTOR_TOLERANCE);
        if (g) g.levels.push(t);
        else groups.push({ p, levels: [t] });
      }
  return groups;
}

describe('survivingVectors', () => {
  it('groups exactly as a linear scan does, on random level sets (property)', () => {
    const level = fc.oneof(
      fc.integer({ min: -4, max: 4 }).map((k) => k / 4),
      fc.double({ min: -1, max: 1, noNaN: true }),
    );
    const set = fc.uniqueArray(level, { minLength: 1, maxLength: 6 });
    fc.assert(
      fc.property(fc.tuple(set, set, set), (sets) => {
        const fast = survivingVectors(sets);
        const slow = linear(sets);
        expect(fast.length).toBe(slow.length);
        const byPoint = new Map(slow.map((g) => [`${g.p[0]},${g.p[1]}`, g.levels.length]));
        for (const v of fast) expect(byPoint.get(`${v.alpha},${v.beta}`)).toBe(v.levels.length);
      }),
      fcParams(300),
    );
  });

  it('gives the vectors of the linear scan in its order (length, then angle, each rounded to the tolerance; first made first), triplets descending, also where points lie within the tolerance of each other (property)', () => {
    // levels a quarter apart, some nudged by less than the tolerance: distinct triplets then give
    // points closer than the tolerance, which must join one vector
    const level = fc.tuple(fc.integer({ min: -4, max: 4 }), fc.constantFrom(0, 1e-11, -3e-11)).map(([k, d]) => k / 4 + d);
    const set = fc.uniqueArray(level, { minLength: 1, maxLength: 6 });
    fc.assert(
      fc.property(fc.tuple(set, set, set), (sets) => {
        const tol = VECTOR_TOLERANCE;
        const key = (p: readonly [number, number]) => {
          const r = Math.hypot(p[0], p[1]);
          return [Math.round(r / tol), Math.round((r <= tol ? 0 : (Math.atan2(p[1], p[0]) + 2 * Math.PI) % (2 * Math.PI)) / tol)] as const;
        };
        const expected = linear(sets)
          .map((g) => ({ g, k: key(g.p) }))
          .sort((x, y) => x.k[0] - y.k[0] || x.k[1] - y.k[1])
          .map(({ g }) => ({ alpha: g.p[0], beta: g.p[1], levels: [...g.levels].sort((x, y) => y[0] - x[0] || y[1] - x[1] || y[2] - x[2]) }));
        expect(survivingVectors(sets)).toEqual(expected);
      }),
      fcParams(300),
    );
  });

  it('finds vectors through its grid exactly as indexOfVector scans for them (property)', () => {
    const level = fc.integer({ min: -4, max: 4 }).map((k) => k / 4);
    fc.assert(
      fc.property(
        fc.uniqueArray(level, { minLength: 1, maxLength: 5 }),
        fc.array(fc.tuple(fc.double({ min: -2, max: 2, noNaN: true }), fc.double({ min: -2, max: 2, noNaN: true })), { maxLength: 10 }),
        (set, extra) => {
          const vectors = survivingVectors([set, set, set]);
          const find = vectorFinder(vectors);
          const probes = [...vectors.map((v) => [v.alpha + 1e-10, v.beta - 1e-10] as [number, number]), ...extra];
          for (const p of probes) expect(find(p)).toBe(indexOfVector(vectors, p));
        },
      ),
      fcParams(200),
    );
  });

  it('merges 21 levels per phase into the 3N² − 3N + 1 distinct vectors of the diagram (common practice)', () => {
    const lv = Array.from({ length: 21 }, (_, i) => -1 + i / 10);
    expect(survivingVectors([lv, lv, lv]).length).toBe(3 * 21 * 21 - 3 * 21 + 1);
  });
});
