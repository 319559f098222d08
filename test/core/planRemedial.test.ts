import { describe, expect, it } from 'vitest';
import { deratingCurve, HexsalvageInputError, modulationLimit, planRemedial, POLARITY_STRINGS } from '@hexsalvage/core';
import { diagramAtlas, limitOverLoadAngles, polaritySectors } from '@hexsalvage/core/internal';

describe('polaritySectors', () => {
  it('splits the cycle at the six current zero crossings (plus 0°) without a margin', () => {
    const s = polaritySectors(0, 0);
    expect(s.map((x) => [x.fromDeg, x.toDeg, x.polarity])).toEqual([
      // i_a ∝ cos θ, i_b ∝ cos(θ − 120°), i_c ∝ cos(θ − 240°): crossings at 30°, 90°, …, 330°
      [0, 30, '+--'],
      [30, 90, '++-'],
      [90, 150, '-+-'],
      [150, 210, '-++'],
      [210, 270, '--+'],
      [270, 330, '+-+'],
      [330, 360, '+--'],
    ]);
  });
  it('inserts a ? window of ±δ around each zero crossing', () => {
    const s = polaritySectors(20, 5);
    expect(s).toHaveLength(13); // 6 windows, 6 sectors between them, one of which is split at 0°
    expect(s.filter((x) => x.polarity.includes('?'))).toHaveLength(6);
    expect(s.filter((x) => x.polarity.includes('?')).every((x) => Math.abs(x.toDeg - x.fromDeg - 10) < 1e-9)).toBe(true);
    expect(s.find((x) => x.fromDeg === 105)?.polarity).toBe('?+-'); // phase a crosses zero at φ + 90° = 110°
  });
  it('lets windows of two phases overlap once δ ≥ 30°', () => {
    expect(polaritySectors(0, 40).some((x) => x.polarity.split('?').length === 3)).toBe(true);
  });
});

describe('planRemedial', () => {
  it('holds every key of the contract and all 25 polarity strings', () => {
    const p = planRemedial({ topology: 'npc', faults: ['a.outerUpper'], loadAngleDeg: 20, polarityMarginDeg: 3 });
    for (const k of ['mMax', 'mMaxHealthy', 'deratingRatio', 'limitingAngleDeg', 'sectors', 'polarities']) expect(p).toHaveProperty(k);
    expect(Object.keys(p.polarities).sort()).toEqual([...POLARITY_STRINGS].sort());
    expect(Object.keys(p.polarities)).toHaveLength(25);
    expect(p.sectors[0]?.fromDeg).toBe(0);
    expect(p.sectors[p.sectors.length - 1]?.toDeg).toBe(360);
    for (const s of p.sectors) expect(Object.keys(s)).toEqual(expect.arrayContaining(['fromDeg', 'toDeg', 'polarity', 'vectors', 'triangles']));
    expect(p.limitingAngleDeg).toBeGreaterThanOrEqual(0);
    expect(p.limitingAngleDeg).toBeLessThan(360);
    expect(p.cautions.length).toBeGreaterThan(0);
  });

  it('explains an NPC outer-switch fault: half the voltage, bound by a small–medium edge', () => {
    // With phase a unable to reach P while its current is positive, the hull loses its corner at
    // 0°; the edge from the small vector 0/-1/-1 to the medium vector 0/1/-1 lies 1/√3 from the origin.
    const p = planRemedial({ topology: 'npc', faults: ['a.outerUpper'] });
    expect(p.mMax).toBeCloseTo(1 / Math.sqrt(3), 12);
    expect(p.deratingRatio).toBeCloseTo(0.5, 12);
    expect(p.limitingAngleDeg).toBeCloseTo(30, 9);
    expect(p.bindingEdge?.map((v) => v.class).sort()).toEqual(['medium', 'small']);
  });

  it('reports lost vectors per polarity with their healthy class', () => {
    const p = planRemedial({ topology: 'npc', faults: ['a.outerUpper'] });
    const lost = p.polarities['+--']!.lost;
    expect(lost.map((v) => v.class).sort()).toEqual(['large', 'large', 'medium', 'medium', 'large'].sort());
    expect(p.polarities['---']).toBeUndefined();
    expect(p.polarities['-+-']!.lost).toEqual([]);
  });

  it('counts lost healthy triplets: by hand for one case, and as a direct count of the triplets every fault leaves', () => {
    // npc a.outerUpper open, i_a > 0: phase a cannot give P, so the 9 healthy triplets with a = P are
    // lost (hand count: 3 levels of b × 3 of c)
    expect(planRemedial({ topology: 'npc', faults: ['a.outerUpper'] }).polarities['+--']!.lostTriplets).toBe(9);
    const key = (t: readonly number[]) => t.join(',');
    const healthy = planRemedial({ topology: 'npc' }).polarities['+--']!.vectors.flatMap((v) => v.levels.map(key));
    for (const [topology, fault] of [
      ['npc', 'b.innerLower'],
      ['npc', 'a.clampUpper:short'],
      ['tnpc', 'c.neutralToOut'],
      ['anpc-hybrid', 'a.innerUpper'],
    ] as const) {
      const plan = planRemedial({ topology, faults: [fault] });
      const all = planRemedial({ topology }).polarities['+--']!.vectors.flatMap((v) => v.levels.map(key));
      for (const p of POLARITY_STRINGS) {
        const d = plan.polarities[p];
        if (!d) continue;
        const have = new Set(d.vectors.flatMap((v) => v.levels.map(key)));
        expect(d.lostTriplets, `${topology} ${fault} ${p}`).toBe(all.filter((t) => !have.has(t)).length);
      }
    }
    expect(healthy).toHaveLength(27);
  });

  it.each([
    [{ loadAngleDeg: 181 }, 'loadAngleDeg'],
    [{ loadAngleDeg: Number.NaN }, 'loadAngleDeg'],
    [{ polarityMarginDeg: 60 }, 'polarityMarginDeg'],
    [{ polarityMarginDeg: -1 }, 'polarityMarginDeg'],
  ])('rejects %j', (opt, key) => {
    expect(() => planRemedial({ topology: 'npc', ...opt })).toThrow(HexsalvageInputError);
    expect(() => planRemedial({ topology: 'npc', ...opt })).toThrow(key);
  });

  it('gives 0, not an error, when a fault leaves a polarity with the origin on the hull', () => {
    const p = planRemedial({ topology: 'npc', faults: ['a.innerUpper'] });
    expect(p.mMax).toBe(0);
    expect(p.bindingEdge).toBeNull();
    expect(p.polarities['+--']!.radius).toBe(0);
  });
});

describe('limitOverLoadAngles', () => {
  it('equals the minimum of mMax over the range and names a load angle reaching it', () => {
    const atlas = diagramAtlas({ topology: 'npc', faults: ['a.outerUpper.diode'] });
    const r = limitOverLoadAngles(atlas.faulted, -10, 40, 2);
    let sampled = Infinity;
    for (let phi = -10; phi <= 40; phi += 0.05) sampled = Math.min(sampled, modulationLimit(atlas.faulted, phi, 2).mMax);
    expect(r.mMax).toBeLessThanOrEqual(sampled + 1e-12);
    expect(sampled - r.mMax).toBeLessThan(5e-3);
    expect(modulationLimit(atlas.faulted, r.loadAngleDeg, 2).mMax).toBeCloseTo(r.mMax, 9);
  });
});

describe('deratingCurve', () => {
  const atlas = diagramAtlas({ topology: 'npc', faults: ['a.outerUpper.diode'] });
  const pts = deratingCurve(atlas, { stepDeg: 10 });
  it('covers the grid and adds breakpoints in order', () => {
    expect(pts[0]?.loadAngleDeg).toBe(-90);
    expect(pts[pts.length - 1]?.loadAngleDeg).toBe(90);
    for (let i = 1; i < pts.length; i++) expect(pts[i]!.loadAngleDeg).toBeGreaterThan(pts[i - 1]!.loadAngleDeg);
    expect(pts.filter((p) => p.breakpoint).length).toBeGreaterThan(0);
  });
  it('is symmetric in φ for an outer-diode fault at unity power factor (mirror of the cycle)', () => {
    const at = (phi: number) => pts.find((p) => Math.abs(p.loadAngleDeg - phi) < 1e-9)!.mMax;
    for (const phi of [10, 30, 60, 90]) expect(at(phi)).toBeCloseTo(at(-phi), 10);
  });
  it('has the healthy limit at φ = 0 where the diode never conducts against the voltage', () => {
    expect(pts.find((p) => p.loadAngleDeg === 0)!.mMax).toBeCloseTo(2 / Math.sqrt(3), 12);
  });
});
