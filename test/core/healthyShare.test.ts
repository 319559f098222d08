import { describe, expect, it } from 'vitest';
import { BUILTIN_TOPOLOGIES, type VectorShell } from '@hexsalvage/core';
import {
  classifyVector,
  diagramAtlas,
  sharedSurvivingVectors,
  shellClassifier,
  survivingVectors,
  vectorShells,
  VECTOR_TOLERANCE,
} from '@hexsalvage/core/internal';
import { diagramScale, levelSetScale } from '../../packages/core/src/geometry/diagramScale.js';
import { fc, fcParams } from '../support/fc.js';
import { diodeClampedLeg } from '../support/legs.js';

// levels a quarter apart, some nudged by less than the tolerance (lengths then meet within it)
const level = fc.tuple(fc.integer({ min: -4, max: 4 }), fc.constantFrom(0, 1e-11, -3e-11)).map(([k, d]) => k / 4 + d);
const levelSet = fc.uniqueArray(level, { minLength: 1, maxLength: 6 });

describe('shells of the healthy diagram', () => {
  it('vectorShells keeps the first length of each shell, as a scan of the shells found so far does (property)', () => {
    fc.assert(
      fc.property(levelSet, (set) => {
        const vectors = survivingVectors([set, set, set]);
        const lengths: number[] = [];
        for (const v of vectors) {
          const r = Math.hypot(v.alpha, v.beta);
          if (!lengths.some((x) => Math.abs(x - r) <= VECTOR_TOLERANCE)) lengths.push(r);
        }
        lengths.sort((x, y) => x - y);
        expect(vectorShells(vectors, set.length).map((s) => s.length)).toEqual(lengths);
      }),
      fcParams(200),
    );
  });

  it('shellClassifier names every vector as classifyVector does, on sorted shells and on shells in any order (property)', () => {
    const probe = fc.tuple(fc.double({ min: -2, max: 2, noNaN: true }), fc.double({ min: -2, max: 2, noNaN: true }));
    fc.assert(
      fc.property(levelSet, fc.array(probe, { maxLength: 8 }), fc.boolean(), (set, extra, shuffle) => {
        const vectors = survivingVectors([set, set, set]);
        let shells: VectorShell[] = vectorShells(vectors, set.length);
        if (shuffle) shells = [...shells].reverse();
        const shellOf = shellClassifier(shells);
        // the vectors themselves, points just inside and just outside the tolerance, and free points
        const probes = [
          ...vectors.map((v) => ({ alpha: v.alpha, beta: v.beta })),
          ...vectors.map((v) => ({ alpha: v.alpha + 0.9 * VECTOR_TOLERANCE, beta: v.beta })),
          ...vectors.map((v) => ({ alpha: v.alpha - 3 * VECTOR_TOLERANCE, beta: v.beta })),
          ...extra.map(([alpha, beta]) => ({ alpha, beta })),
        ];
        for (const p of probes) expect(shellOf(p)).toBe(classifyVector(shells, p));
      }),
      fcParams(200),
    );
  });
});

describe('the healthy vectors are built once per leg', () => {
  it('levelSetScale gives the longest vector the level set makes, as diagramScale finds it: exactly where levels lie apart, within the tolerance where some nearly meet (property)', () => {
    let exact = 0;
    fc.assert(
      fc.property(levelSet, (set) => {
        const s = levelSetScale(set);
        const found = diagramScale(survivingVectors([set, set, set], s));
        const sorted = [...set].sort((x, y) => x - y);
        const apart = sorted.every((x, i) => i === 0 || x - (sorted[i - 1] as number) > 1e-6);
        if (apart) {
          exact++;
          expect(s).toBe(found);
        } else expect(Math.abs(s - found)).toBeLessThanOrEqual(VECTOR_TOLERANCE * s);
      }),
      fcParams(200),
    );
    expect(exact).toBeGreaterThan(20);
    expect(levelSetScale([0])).toBe(1);
    expect(levelSetScale([-1, 0, 1])).toBeCloseTo(4 / 3, 15);
  });

  it('every diagram of a healthy leg uses the atlas set itself, built at the diagram scale (built-in legs and a nine-level leg)', () => {
    for (const topology of [...BUILTIN_TOPOLOGIES, diodeClampedLeg(9)]) {
      const atlas = diagramAtlas({ topology });
      const h = atlas.analysis.healthy.levels['?'];
      expect(sharedSurvivingVectors([h, h, h], diagramScale(atlas.healthyVectors))).toBe(atlas.healthyVectors);
      const d = atlas.healthy.get('???');
      expect(d?.lost).toEqual([]);
      expect(d?.lostTriplets).toBe(0);
      expect(d?.vectors.map((v) => [v.alpha, v.beta, v.levels])).toEqual(atlas.healthyVectors.map((v) => [v.alpha, v.beta, v.levels]));
    }
  });
});
