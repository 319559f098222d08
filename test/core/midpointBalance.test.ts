import { describe, expect, it } from 'vitest';
import { BUILTIN_TOPOLOGIES, builtinLeg, modulationLimit, polarityAt, type PolarityDiagram } from '@hexsalvage/core';
import { diagramAtlas, expandElements, MIDPOINT_SAMPLES, MIDPOINT_TOLERANCE, balancedLimit, midpointProfile, midpointRangeAt } from '@hexsalvage/core/internal';
import { fc, fcParams } from '../support/fc.js';

// An independent evaluation of the reachable range at one m: for every sample direction, find the
// triangle holding the reference by its barycentric coordinates and take each vertex's lowest and
// highest midpoint current — no sweep, no events, no piecewise-linear bookkeeping.
function direct(diagrams: ReadonlyMap<string, PolarityDiagram>, m: number, phiDeg: number, deltaDeg: number): [number, number] | null {
  let lo = 0;
  let hi = 0;
  const phi = (phiDeg * Math.PI) / 180;
  for (let k = 0; k < MIDPOINT_SAMPLES; k++) {
    const th = ((k + 0.5) * 2 * Math.PI) / MIDPOINT_SAMPLES;
    const d = diagrams.get(polarityAt(((k + 0.5) * 360) / MIDPOINT_SAMPLES, phiDeg, deltaDeg))!;
    const x = m * Math.cos(th);
    const y = m * Math.sin(th);
    const t = d.dwell.findIndex((M) => M.every((r) => r[0] * x + r[1] * y + r[2] >= -1e-12));
    if (t < 0) return null;
    const w = d.dwell[t]!.map((r) => r[0] * x + r[1] * y + r[2]);
    const i = [0, 1, 2].map((p) => Math.cos(th - phi - (p * 2 * Math.PI) / 3));
    d.triangles[t]!.forEach((v, j) => {
      const q = d.vectors[v]!.levels.map((r) => r.reduce((s, l, p) => s + (l === 0 ? i[p]! : 0), 0));
      lo += w[j]! * Math.min(...q);
      hi += w[j]! * Math.max(...q);
    });
  }
  return [lo / MIDPOINT_SAMPLES, hi / MIDPOINT_SAMPLES];
}

const caseArb = fc.constantFrom('npc' as const, 'anpc' as const, 'anpc-hybrid' as const, 'tnpc' as const).chain((t) =>
  fc.record({
    topology: fc.constant(t),
    fault: fc.constantFrom(...expandElements(builtinLeg(t)).map((e) => `a.${e.id}`)),
    levelSteps: fc.constantFrom('commutable' as const, 'any' as const),
    phi: fc.double({ min: -90, max: 90, noNaN: true }),
    u: fc.double({ min: 0, max: 0.999, noNaN: true }),
  }),
);

describe('mMaxBalanced and the midpoint sweep', () => {
  it('gives the same reachable range as a direct evaluation, direction by direction (property, 1e-9)', () => {
    fc.assert(
      fc.property(caseArb, ({ topology, fault, levelSteps, phi, u }) => {
        const atlas = diagramAtlas({ topology, faults: [fault], levelSteps });
        const mMax = modulationLimit(atlas.faulted, phi, 0).mMax;
        if (mMax === 0) return;
        const m = u * mMax;
        const a = midpointRangeAt(midpointProfile(atlas.faulted, mMax, phi, 0), m);
        const b = direct(atlas.faulted, m, phi, 0);
        expect(a).not.toBeNull();
        expect(b).not.toBeNull();
        expect(a![0]).toBeCloseTo(b![0], 9);
        expect(a![1]).toBeCloseTo(b![1], 9);
      }),
      fcParams(120),
    );
  });

  it('is where zero leaves the reachable range: balanced just below, not just above', () => {
    let seen = 0;
    for (const t of BUILTIN_TOPOLOGIES)
      for (const e of expandElements(builtinLeg(t)))
        for (const phi of [0, 25, 80]) {
          const atlas = diagramAtlas({ topology: t, faults: [`a.${e.id}`], levelSteps: 'any' });
          const mMax = modulationLimit(atlas.faulted, phi, 0).mMax;
          if (mMax === 0) continue;
          const p = midpointProfile(atlas.faulted, mMax, phi, 0);
          const mb = balancedLimit(p);
          const ok = (m: number) => {
            const r = direct(atlas.faulted, m, phi, 0);
            return r !== null && r[0] <= MIDPOINT_TOLERANCE && r[1] >= -MIDPOINT_TOLERANCE;
          };
          for (const f of [0.25, 0.5, 0.9, 0.999]) expect(ok(f * mb)).toBe(true);
          if (mb < mMax - 1e-6) {
            expect(ok(Math.min(mb + 1e-4, mMax * (1 - 1e-9)))).toBe(false);
            seen++;
          }
        }
    expect(seen).toBeGreaterThan(3);
  });
});
