import { describe, expect, it } from 'vitest';
import { BUILTIN_TOPOLOGIES, builtinLeg, POLARITY_STRINGS, type Point } from '@hexsalvage/core';
import { diagramAtlas, expandElements, minRadialExtent, radialExtent } from '@hexsalvage/core/internal';
import { fc, fcParams } from '../support/fc.js';

const caseArb = fc.constantFrom(...BUILTIN_TOPOLOGIES).chain((t) => {
  const ids = expandElements(builtinLeg(t)).map((e) => e.id);
  const fault = fc.tuple(fc.constantFrom('a', 'b', 'c'), fc.constantFrom(...ids), fc.constantFrom('open', 'short')).map(([p, id, m]) => `${p}.${id}:${m}`);
  return fc.record({
    topology: fc.constant(t),
    faults: fc.uniqueArray(fault, { maxLength: 2, selector: (f) => f.split(':')[0] }),
    polarity: fc.constantFrom(...POLARITY_STRINGS),
    levelSteps: fc.constantFrom('commutable' as const, 'adjacent' as const),
    theta: fc.double({ min: 0, max: 2 * Math.PI, noNaN: true }),
  });
});

// An independent measure of e(θ): march along the ray in small steps and stop at the first point
// that no triangle of the tiling covers (barycentric test on the dwell matrices).
function marched(d: { dwell: readonly (readonly (readonly number[])[])[] }, theta: number, step: number): number {
  const covered = (x: number, y: number) => d.dwell.some((m) => m.every((r) => (r[0] as number) * x + (r[1] as number) * y + (r[2] as number) >= -1e-12));
  let r = 0;
  while (r < 3 && covered((r + step) * Math.cos(theta), (r + step) * Math.sin(theta))) r += step;
  return r;
}

describe('extent of the admissible tiling', () => {
  it('agrees with a march along the ray through the triangles (property, step 1e-4)', () => {
    let compared = 0;
    fc.assert(
      fc.property(caseArb, ({ topology, faults, polarity, levelSteps, theta }) => {
        const d = diagramAtlas({ topology, faults, levelSteps }).faulted.get(polarity)!;
        const e = radialExtent(d.geometry, theta).value;
        if (!d.geometry.containsOrigin) {
          expect(e).toBe(0);
          return;
        }
        const step = 1e-4;
        const m = marched(d, theta, step);
        // never above what the triangles cover (the safe side) …
        expect(e).toBeLessThanOrEqual(m + step + 1e-9);
        // … and equal to it, except along a direction where the extent jumps (a ray grazing an outline
        // edge): there e(θ) is the lower one-sided value, the infimum the limit must use
        const ends = d.geometry.edges.flatMap((g) => (g.span ? [g.span[0], g.span[1]] : []));
        const nearEnd = ends.some((x) => Math.abs(Math.atan2(Math.sin(theta - x), Math.cos(theta - x))) < 1e-6);
        if (!nearEnd) expect(Math.abs(e - m)).toBeLessThanOrEqual(step + 1e-9);
        compared++;
      }),
      fcParams(250),
    );
    expect(compared).toBeGreaterThan(50);
  });

  it('takes the exact minimum over an interval: never above a dense sampling, and reached by it', () => {
    fc.assert(
      fc.property(caseArb, fc.double({ min: 0, max: 2 * Math.PI, noNaN: true }), ({ topology, faults, polarity, levelSteps, theta }, width) => {
        const d = diagramAtlas({ topology, faults, levelSteps }).faulted.get(polarity)!;
        const lo = theta;
        const hi = theta + width;
        const exact = minRadialExtent(d.geometry, lo, hi);
        let sampled = Infinity;
        for (let k = 0; k <= 400; k++) sampled = Math.min(sampled, radialExtent(d.geometry, lo + ((hi - lo) * k) / 400).value);
        expect(exact.value).toBeLessThanOrEqual(sampled + 1e-12);
        expect(radialExtent(d.geometry, exact.theta).value).toBeCloseTo(exact.value, 9);
      }),
      fcParams(150),
    );
  });

  it('reaches as far as the union of admissible triangles on every built-in single fault (no tiling falls short)', () => {
    for (const t of BUILTIN_TOPOLOGIES)
      for (const e of expandElements(builtinLeg(t)))
        for (const mode of ['open', 'short']) {
          for (const levelSteps of ['commutable', 'adjacent'] as const) {
            const atlas = diagramAtlas({ topology: t, faults: [`a.${e.id}:${mode}`], levelSteps });
            for (const d of atlas.faulted.values()) {
              expect(d.exactTiling).toBe(true);
              expect(minRadialExtent(d.geometry, 0, 2 * Math.PI).value).toBeCloseTo(d.reach, 12);
            }
          }
        }
  });

  it('handles the degenerate diagrams: no triangle, a single level, the origin on the boundary', () => {
    // outerUpper shorted: phase a has one level only; every polarity's tiling leaves the origin on its boundary
    const atlas = diagramAtlas({ topology: 'npc', faults: ['a.outerUpper:short'] });
    for (const d of atlas.faulted.values()) {
      expect(d.reach).toBe(0);
      expect(d.geometry.containsOrigin).toBe(false);
      for (const [p] of d.vectors.map((v) => [v.alpha, v.beta] as Point)) expect(Number.isFinite(p)).toBe(true);
    }
    // a two-level leg with the upper switch shorted: a single vector per phase a, at most a line
    const two = diagramAtlas({ topology: 'two-level', faults: ['a.upper:short', 'b.lower:short'] });
    for (const d of two.faulted.values()) expect(d.triangles.length === 0 || d.reach === 0).toBe(true);
  });
});
