import { describe, expect, it } from 'vitest';
import { planRemedial, type Point } from '@hexsalvage/core';
import { convexHull, dwellMatrix, hullGeometry, locateReference, minRadialExtent, survivingVectors, triangulate } from '@hexsalvage/core/internal';

const S3 = Math.sqrt(3);
const DEG = Math.PI / 180;

function diagramOf(sets: [number[], number[], number[]]) {
  const v = survivingVectors(sets);
  const pts: Point[] = v.map((x) => [x.alpha, x.beta]);
  const triangles = triangulate(pts);
  return { vectors: v, pts, hull: convexHull(pts).map((i) => pts[i] as Point), triangles, dwell: triangles.map((t) => dwellMatrix(pts, t)) };
}

// dwell time of the vertex at point q for reference m∠θ
function dwellAt(d: ReturnType<typeof diagramOf>, m: number, thetaDeg: number, q: Point): number {
  const r = locateReference(d, m * Math.cos(thetaDeg * DEG), m * Math.sin(thetaDeg * DEG));
  if (!r.ok || r.clamped) throw new Error('reference not inside');
  const k = r.vertices.findIndex((i) => Math.hypot(d.pts[i]![0] - q[0], d.pts[i]![1] - q[1]) < 1e-9);
  return k < 0 ? 0 : (r.dwell[k] as number);
}

describe('planRemedial against space-vector modulation theory', () => {
  it('gives the healthy linear limit 2/√3 for two- and three-level legs', () => {
    // Source: D. G. Holmes and T. A. Lipo, "Pulse Width Modulation for Power Converters",
    // Wiley-IEEE Press 2003, ch. 3/5 (from memory): SVM reaches a peak fundamental phase voltage of
    // Vdc/√3, i.e. m = 2/√3 in units of Vdc/2, the radius of the circle inscribed in the hexagon.
    for (const t of ['two-level', 'npc', 'anpc', 'anpc-hybrid', 'tnpc']) {
      const p = planRemedial({ topology: t, loadAngleDeg: 37 });
      expect(p.mMax).toBeCloseTo(2 / S3, 12);
      expect(p.mMaxHealthy).toBeCloseTo(2 / S3, 12);
      expect(p.deratingRatio).toBeCloseTo(1, 12);
    }
  });

  it('reproduces the two-level sector-1 dwell times', () => {
    // Source: B. Wu, "High-Power Converters and AC Drives", Wiley-IEEE Press 2006, ch. 6 (two-level
    // SVM, from memory): Ta = √3·Ts·Vref/Vd·sin(π/3 − θ), Tb = √3·Ts·Vref/Vd·sin θ, T0 = Ts − Ta − Tb.
    // With m = Vref/(Vd/2): Ta/Ts = (√3/2)·m·sin(60° − θ).
    const d = diagramOf([
      [-1, 1],
      [-1, 1],
      [-1, 1],
    ]);
    const v1: Point = [4 / 3, 0];
    const v2: Point = [2 / 3, 2 / S3];
    for (const [m, th] of [
      [0.3, 10],
      [0.8, 25],
      [1.1, 44],
      [0.5, 59],
    ] as const) {
      const ta = (S3 / 2) * m * Math.sin((60 - th) * DEG);
      const tb = (S3 / 2) * m * Math.sin(th * DEG);
      expect(dwellAt(d, m, th, v1)).toBeCloseTo(ta, 10);
      expect(dwellAt(d, m, th, v2)).toBeCloseTo(tb, 10);
      expect(dwellAt(d, m, th, [0, 0])).toBeCloseTo(1 - ta - tb, 10);
    }
  });

  it('reproduces the three-level NPC nearest-three-vector dwell times of the four regions of sector I', () => {
    // Source: B. Wu, "High-Power Converters and AC Drives", Wiley-IEEE Press 2006, ch. 8 (NPC
    // space-vector modulation, dwell-time table for sector I, from memory), with m_a = √3·Vref/Vd
    // = (√3/2)·m. Vectors: V0 zero, V1/V2 small at 0°/60°, V7 medium at 30°, V13/V14 large at 0°/60°.
    const d = diagramOf([
      [-1, 0, 1],
      [-1, 0, 1],
      [-1, 0, 1],
    ]);
    const V0: Point = [0, 0];
    const V1: Point = [2 / 3, 0];
    const V2: Point = [1 / 3, 1 / S3];
    const V7: Point = [1, 1 / S3];
    const V13: Point = [4 / 3, 0];
    const V14: Point = [2 / 3, 2 / S3];
    const s = (x: number) => Math.sin(x * DEG);
    const regions: { name: string; m: number; th: number; expect: (ma: number, th: number) => [Point, number][] }[] = [
      {
        name: 'region 1',
        m: 0.3,
        th: 20,
        expect: (ma, th) => [
          [V1, 2 * ma * s(60 - th)],
          [V0, 1 - 2 * ma * s(60 + th)],
          [V2, 2 * ma * s(th)],
        ],
      },
      {
        name: 'region 2',
        m: 0.7,
        th: 30,
        expect: (ma, th) => [
          [V1, 1 - 2 * ma * s(th)],
          [V7, 2 * ma * s(60 + th) - 1],
          [V2, 1 - 2 * ma * s(60 - th)],
        ],
      },
      {
        name: 'region 3',
        m: 0.95,
        th: 8,
        expect: (ma, th) => [
          [V1, 2 - 2 * ma * s(60 + th)],
          [V7, 2 * ma * s(th)],
          [V13, 2 * ma * s(60 - th) - 1],
        ],
      },
      {
        name: 'region 4',
        m: 0.95,
        th: 52,
        expect: (ma, th) => [
          [V2, 2 - 2 * ma * s(60 + th)],
          [V7, 2 * ma * s(60 - th)],
          [V14, 2 * ma * s(th) - 1],
        ],
      },
    ];
    for (const r of regions) {
      const ma = (S3 / 2) * r.m;
      for (const [q, t] of r.expect(ma, r.th)) {
        expect(t).toBeGreaterThanOrEqual(0); // the sample point really lies in that region
        expect(dwellAt(d, r.m, r.th, q)).toBeCloseTo(t, 10);
      }
    }
  });

  it('halves the achievable voltage when only the small vectors of a three-level inverter remain', () => {
    // Common practice: the small vectors (with zero) form a two-level hexagon of half the size,
    // whose inscribed circle is (1/2)·(2/√3).
    const small = diagramOf([
      [0, 1],
      [0, 1],
      [0, 1],
    ]);
    for (const v of small.vectors) expect(Math.hypot(v.alpha, v.beta)).toBeLessThanOrEqual(2 / 3 + 1e-12);
    const g = hullGeometry(small.pts, convexHull(small.pts));
    expect(minRadialExtent(g, 0, 2 * Math.PI).value).toBeCloseTo(1 / S3, 12);
  });

  it('gives the four-switch (B4) inverter half the six-switch limit', () => {
    // Source: H. W. van der Broeck and J. D. van Wyk, "A comparative investigation of a three-phase
    // induction machine drive with a component minimized voltage-fed inverter under different
    // control options", IEEE Trans. Industry Applications IA-20(2), 1984 (from memory): with one
    // phase tied to the DC midpoint the four active vectors span a parallelogram whose inscribed
    // circle is half that of the six-switch hexagon.
    // The leg: a two-level leg plus a midpoint tie (a MOSFET without body diode, O ↔ out).
    const leg = {
      name: 'two-level-with-midpoint-tie',
      dcNodes: { P: 1, O: 0, N: -1 },
      output: 'out',
      devices: [
        { id: 'upper', kind: 'igbt', from: 'P', to: 'out', antiparallelDiode: true },
        { id: 'lower', kind: 'igbt', from: 'out', to: 'N', antiparallelDiode: true },
        { id: 'tie', kind: 'mosfet', from: 'O', to: 'out' },
      ],
      patterns: { P: ['upper'], N: ['lower'], O: ['tie'] },
    };
    // phases a, b: two-level (tie unused: open); phase c: tied to the midpoint (its bridge switches gone)
    const faults = ['a.tie', 'b.tie', 'c.upper', 'c.upper.diode', 'c.lower', 'c.lower.diode'];
    const plan = planRemedial({ topology: leg, faults });
    expect(plan.levels.a['?']).toEqual([-1, 1]);
    expect(plan.levels.c['?']).toEqual([0]);
    expect(plan.polarities['+--']?.vectors).toHaveLength(4);
    const six = planRemedial({ topology: 'two-level' });
    for (const pol of ['+-?', '??-', '-+?']) expect(plan.polarities[pol]?.radius).toBeCloseTo(six.polarities[pol]!.radius / 2, 12);
    expect(plan.mMax).toBeCloseTo(six.mMax / 2, 12);
  });
});
