import { describe, expect, it } from 'vitest';
import {
  BUILTIN_TOPOLOGIES,
  builtinLeg,
  modulationLimit,
  planRemedial,
  polarityAt,
  polarityDocument,
  POLARITY_STRINGS,
  type BuiltinTopology,
} from '@hexsalvage/core';
import { diagramAtlas, expandElements, limitOverLoadAngles, locateReference, radialExtent } from '@hexsalvage/core/internal';
import { fc, fcParams } from '../support/fc.js';
import { mirrorElement } from '../support/mirror.js';

const DEG = Math.PI / 180;
const topo = fc.constantFrom(...BUILTIN_TOPOLOGIES);
const elementOf = (t: BuiltinTopology) => fc.constantFrom(...expandElements(builtinLeg(t)).map((e) => e.id));
const faultOf = (t: BuiltinTopology) => fc.tuple(fc.constantFrom('a', 'b', 'c'), elementOf(t)).map(([p, e]) => `${p}.${e}`);
const angles = fc.record({ phi: fc.double({ min: -180, max: 180, noNaN: true }), delta: fc.double({ min: 0, max: 59.9, noNaN: true }) });
const mMaxOf = (topology: string, faults: string[], phi: number, delta: number) =>
  planRemedial({ topology, faults, loadAngleDeg: phi, polarityMarginDeg: delta }).mMax;

describe('modulationLimit properties', () => {
  it('dwell times are in [0, 1], sum to 1 and rebuild any reference inside the hull', () => {
    const arb = topo.chain((t) =>
      fc.tuple(
        fc.constant(t),
        fc.uniqueArray(faultOf(t), { maxLength: 2 }),
        fc.constantFrom(...POLARITY_STRINGS),
        fc.nat(1000),
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
      ),
    );
    fc.assert(
      fc.property(arb, ([t, faults, pol, k, u, w]) => {
        const d = polarityDocument(diagramAtlas({ topology: t, faults }).faulted.get(pol)!);
        if (d.triangles.length === 0) return;
        // a random point of a random triangle (uniform barycentric weights)
        const tri = d.triangles[k % d.triangles.length]!;
        const [s1, s2] = u + w > 1 ? [1 - u, 1 - w] : [u, w];
        const wts = [1 - s1 - s2, s1, s2];
        const a = tri.reduce((s, i, j) => s + wts[j]! * d.vectors[i]!.alpha, 0);
        const b = tri.reduce((s, i, j) => s + wts[j]! * d.vectors[i]!.beta, 0);
        const r = locateReference(d, a, b);
        if (!r.ok) throw new Error(r.reason);
        expect(r.clamped).toBe(false);
        for (const x of r.dwell) expect(x >= 0 && x <= 1).toBe(true);
        expect(r.dwell[0] + r.dwell[1] + r.dwell[2]).toBeCloseTo(1, 12);
        // to the locator's tolerance: within 1e-9 (barycentric) of an edge a neighbour may claim the
        // point and its slightly negative weight is clipped to 0
        expect(r.vertices.reduce((s, i, j) => s + r.dwell[j]! * d.vectors[i]!.alpha, 0)).toBeCloseTo(a, 8);
        expect(r.vertices.reduce((s, i, j) => s + r.dwell[j]! * d.vectors[i]!.beta, 0)).toBeCloseTo(b, 8);
      }),
      fcParams(300),
    );
  });

  it('a fault never raises mMax above the healthy limit', () => {
    fc.assert(
      fc.property(
        topo.chain((t) => fc.tuple(fc.constant(t), fc.uniqueArray(faultOf(t), { minLength: 1, maxLength: 3 }))),
        angles,
        ([t, faults], { phi, delta }) => {
          const p = planRemedial({ topology: t, faults, loadAngleDeg: phi, polarityMarginDeg: delta });
          expect(p.mMax).toBeLessThanOrEqual(p.mMaxHealthy + 1e-12);
          expect(p.deratingRatio).toBeLessThanOrEqual(1 + 1e-12);
        },
      ),
      fcParams(100),
    );
  });

  it('adding a fault to another never raises mMax', () => {
    fc.assert(
      fc.property(
        topo.chain((t) => fc.tuple(fc.constant(t), fc.uniqueArray(faultOf(t), { minLength: 2, maxLength: 3 }))),
        angles,
        ([t, faults], { phi, delta }) => {
          expect(mMaxOf(t, faults, phi, delta)).toBeLessThanOrEqual(mMaxOf(t, faults.slice(1), phi, delta) + 1e-12);
        },
      ),
      fcParams(100),
    );
  });

  it('a fault in phase b gives the limit of the same fault in phase a at the same φ, the picture turned by +120°', () => {
    // The b-faulted diagram is the a-faulted one rotated by +120° with the polarity string rotated
    // (xyz → zxy), and phase b's current at θ + 120° equals phase a's at θ. So mMax_b(φ) = mMax_a(φ)
    // exactly and every polarity radius carries over.
    fc.assert(
      fc.property(
        topo.chain((t) => fc.tuple(fc.constant(t), elementOf(t))),
        angles,
        ([t, el], { phi, delta }) => {
          const a = diagramAtlas({ topology: t, faults: [`a.${el}`] });
          const b = diagramAtlas({ topology: t, faults: [`b.${el}`] });
          expect(modulationLimit(b.faulted, phi, delta).mMax).toBeCloseTo(modulationLimit(a.faulted, phi, delta).mMax, 10);
          for (const p of POLARITY_STRINGS) {
            const rotated = `${p[2]}${p[0]}${p[1]}`;
            expect(b.faulted.get(rotated)!.radius).toBeCloseTo(a.faulted.get(p)!.radius, 10);
          }
          const la = modulationLimit(a.faulted, phi, delta);
          // the binding point itself turns with the picture: r_b(θ* + 120°) under the rotated polarity
          const p = la.limitingPolarity;
          const polB = `${p[2]}${p[0]}${p[1]}`;
          const rb = radialExtent(b.faulted.get(polB)!.geometry, (la.limitingAngleDeg + 120) * DEG).value;
          expect(rb).toBeCloseTo(la.mMax, 9);
        },
      ),
      fcParams(60),
    );
  });

  it('an upper/lower mirror fault gives the same limit', () => {
    fc.assert(
      fc.property(
        topo.chain((t) => fc.tuple(fc.constant(t), elementOf(t), fc.constantFrom('a', 'b', 'c'))),
        angles,
        ([t, el, ph], { phi, delta }) => {
          const m = mirrorElement(t as BuiltinTopology, el);
          expect(mMaxOf(t, [`${ph}.${m}`], phi, delta)).toBeCloseTo(mMaxOf(t, [`${ph}.${el}`], phi, delta), 10);
        },
      ),
      fcParams(100),
    );
  });

  it('the exact mMax is never above a dense sampling of θ and agrees with it to the sampling resolution', () => {
    fc.assert(
      fc.property(
        topo.chain((t) => fc.tuple(fc.constant(t), fc.uniqueArray(faultOf(t), { maxLength: 2 }))),
        angles,
        ([t, faults], { phi, delta }) => {
          const atlas = diagramAtlas({ topology: t, faults });
          const exact = modulationLimit(atlas.faulted, phi, delta).mMax;
          let sampled = Infinity;
          const step = 0.01; // degrees
          const sample = (th: number) => {
            sampled = Math.min(sampled, radialExtent(atlas.faulted.get(polarityAt(th, phi, delta))!.geometry, th * DEG).value);
          };
          for (let k = 0; k < 360 / step; k++) sample((k + 0.5) * step);
          // a `?` window may be far narrower than the step (δ ≈ 1e-12): sample inside every sector too
          for (const s of modulationLimit(atlas.faulted, phi, delta).sectors)
            for (const f of [0.5, 1e-6, 1 - 1e-6]) sample(s.fromDeg + f * (s.toDeg - s.fromDeg));
          expect(exact).toBeLessThanOrEqual(sampled + 1e-12);
          // resolution: r(θ) moves by less than 2·r·tan(step) between samples near its minimum
          expect(sampled - exact).toBeLessThan(2 * (4 / 3) * Math.tan(step * DEG) + 1e-9);
        },
      ),
      fcParams(40),
    );
  });

  it('the worst case over a load-angle range is exact: never above sampled mMax(φ), close to it, reached at its φ', () => {
    const range = fc
      .tuple(fc.double({ min: -180, max: 180, noNaN: true }), fc.double({ min: 0, max: 120, noNaN: true }))
      .map(([lo, w]) => [lo, Math.min(180, lo + w)] as const);
    fc.assert(
      fc.property(
        topo.chain((t) => fc.tuple(fc.constant(t), fc.uniqueArray(faultOf(t), { maxLength: 2 }))),
        range,
        fc.double({ min: 0, max: 40, noNaN: true }),
        ([t, faults], [lo, hi], delta) => {
          const atlas = diagramAtlas({ topology: t, faults });
          const r = limitOverLoadAngles(atlas.faulted, lo, hi, delta);
          let sampled = Infinity;
          const n = Math.max(1, Math.ceil((hi - lo) / 0.1));
          for (let k = 0; k <= n; k++) sampled = Math.min(sampled, modulationLimit(atlas.faulted, lo + ((hi - lo) * k) / n, delta).mMax);
          expect(r.mMax).toBeLessThanOrEqual(sampled + 1e-12);
          expect(sampled - r.mMax).toBeLessThan(5e-3);
          expect(r.loadAngleDeg).toBeGreaterThanOrEqual(lo);
          expect(r.loadAngleDeg).toBeLessThanOrEqual(hi);
          expect(modulationLimit(atlas.faulted, r.loadAngleDeg, delta).mMax).toBeCloseTo(r.mMax, 9);
        },
      ),
      fcParams(40),
    );
  });
});
