import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import {
  BUILTIN_TOPOLOGIES,
  builtinLeg,
  evaluateClaim,
  LEVEL_STEP_RULES,
  modulationLimit,
  planRemedial,
  switchingTable,
  type BuiltinTopology,
  type LevelStepRule,
} from '@hexsalvage/core';
import { diagramAtlas, expandElements, limitOverLoadAngles } from '@hexsalvage/core/internal';
import { fc, fcParams } from '../support/fc.js';

const HEALTHY = 2 / Math.sqrt(3);

interface FirstVersionCase {
  topology: BuiltinTopology;
  faults: string[];
  loadAngleDeg: number;
  polarityMarginDeg: number;
  mMax: number;
  mMaxHealthy: number;
  limitingAngleDeg: number;
  limitingPolarity: string;
  radius?: Record<string, number>;
}
// Numbers printed by the first release (planRemedial at commit 587812e) for every built-in single
// fault in both modes, one double fault per leg, four load angles and two margins.
const FIRST = JSON.parse(readFileSync(new URL('../fixtures/first-version-limits.json', import.meta.url), 'utf8')) as { cases: FirstVersionCase[] };

const faultArb = (t: BuiltinTopology, modes: readonly string[]) => {
  const ids = expandElements(builtinLeg(t)).map((e) => e.id);
  return fc.tuple(fc.constantFrom('a', 'b', 'c'), fc.constantFrom(...ids), fc.constantFrom(...modes)).map(([p, id, m]) => `${p}.${id}:${m}`);
};
// `extra` is an open fault: an open element can only take conduction away, so it never adds a safe
// state — unless it breaks the shoot-through path of a shorted element, which is why shorts appear
// only in `faults` and the monotonicity is asserted for open-only fault sets (a short of
// c.neutralToOut.diode plus an open c.outToNeutral.diode on the T-type leg is such a case)
const caseArb = fc.constantFrom(...BUILTIN_TOPOLOGIES).chain((t) =>
  fc.record({
    topology: fc.constant(t),
    faults: fc.uniqueArray(faultArb(t, ['open', 'short']), { maxLength: 2, selector: (f) => f.split(':')[0] }),
    extra: faultArb(t, ['open']),
    phi: fc.double({ min: -180, max: 180, noNaN: true }),
    delta: fc.constantFrom(0, 2, 10),
    levelSteps: fc.constantFrom<LevelStepRule>('commutable', 'adjacent'),
  }),
);

describe('the safe limit (contract, Version 2)', () => {
  it('reproduces the first version exactly with --ignore-ratings --level-steps any', () => {
    expect(FIRST.cases.length).toBeGreaterThan(800);
    for (const c of FIRST.cases) {
      const p = planRemedial({
        topology: c.topology,
        faults: c.faults,
        loadAngleDeg: c.loadAngleDeg,
        polarityMarginDeg: c.polarityMarginDeg,
        ignoreRatings: true,
        levelSteps: 'any',
      });
      expect(p.mMax).toBe(c.mMax);
      expect(p.mMaxHull).toBe(c.mMax);
      expect(p.mMaxHealthy).toBe(c.mMaxHealthy);
      // directions are reported rounded to 1e-9° (the contract's precision): 30, not 29.99999999999999
      expect(Math.abs(p.limitingAngleDeg - c.limitingAngleDeg)).toBeLessThanOrEqual(1e-9);
      expect(p.limitingPolarity).toBe(c.limitingPolarity);
      if (c.radius) for (const [pol, r] of Object.entries(c.radius)) expect(p.polarities[pol]?.radius).toBe(r);
    }
  });

  it('equals the hull limit under --level-steps any (ratings applied to the level sets)', () => {
    for (const c of FIRST.cases.filter((x) => x.polarityMarginDeg === 0 && x.loadAngleDeg === 25)) {
      const p = planRemedial({ topology: c.topology, faults: c.faults, loadAngleDeg: 25, levelSteps: 'any' });
      expect(p.mMax).toBe(p.mMaxHull);
    }
  });

  it.each(BUILTIN_TOPOLOGIES.flatMap((t) => LEVEL_STEP_RULES.map((r) => [t, r] as const)))(
    'keeps a healthy %s leg at 2/√3 under %s',
    (topology, levelSteps) => {
      for (const phi of [-90, -30, 0, 45, 90]) {
        const p = planRemedial({ topology, loadAngleDeg: phi, polarityMarginDeg: 5, levelSteps });
        expect(p.mMax).toBeCloseTo(HEALTHY, 12);
        expect(p.mMaxBalanced).toBe(p.mMax);
      }
    },
  );

  it('never raises mMax by adding a fault, never exceeds the hull limit, adjacent never above commutable (property)', () => {
    fc.assert(
      fc.property(caseArb, ({ topology, faults, extra, phi, delta, levelSteps }) => {
        const base = planRemedial({ topology, faults, loadAngleDeg: phi, polarityMarginDeg: delta, levelSteps });
        expect(base.mMax).toBeLessThanOrEqual(base.mMaxHull + 1e-12);
        expect(base.mMaxBalanced).toBeLessThanOrEqual(base.mMax + 1e-12);
        expect(base.mMax).toBeLessThanOrEqual(base.mMaxHealthy + 1e-12);
        if (levelSteps === 'commutable') {
          const adj = planRemedial({ topology, faults, loadAngleDeg: phi, polarityMarginDeg: delta, levelSteps: 'adjacent' });
          expect(adj.mMax).toBeLessThanOrEqual(base.mMax + 1e-12);
        }
        if (faults.every((f) => f.endsWith(':open')) && !faults.some((f) => f.split(':')[0] === extra.split(':')[0])) {
          const more = planRemedial({ topology, faults: [...faults, extra], loadAngleDeg: phi, polarityMarginDeg: delta, levelSteps });
          expect(more.mMax).toBeLessThanOrEqual(base.mMax + 1e-12);
        }
      }),
      fcParams(120),
    );
  });

  it('can rise when an open fault breaks the shoot-through path of a shorted one (why the property above is for open faults)', () => {
    const shorted = planRemedial({ topology: 'tnpc', faults: ['c.neutralToOut.diode:short'] });
    const both = planRemedial({ topology: 'tnpc', faults: ['c.neutralToOut.diode:short', 'c.outToNeutral.diode:open'] });
    expect(both.mMax).toBeGreaterThan(shorted.mMax);
  });

  it('gives safe answers for the three cases that the first version got wrong', () => {
    // NPC outer switch shorted: X sits at P, state N would put the whole link across innerUpper;
    // phase a can only sit at P, so no balanced voltage at all (common practice).
    const shorted = planRemedial({ topology: 'npc', faults: ['a.outerUpper:short'], loadAngleDeg: 25 });
    expect(shorted.mMax).toBe(0);
    expect(shorted.restrictions.join(' ')).toContain('innerUpper would block 2 × Vdc/2');
    // NPC clamp diode open: a P↔N change with i_a > 0 leaves outerUpper blocking the link, so
    // phase a cannot change level while its current is positive.
    const clamp = planRemedial({ topology: 'npc', faults: ['a.clampUpper'], loadAngleDeg: 25 });
    expect(clamp.mMaxHull).toBeCloseTo(HEALTHY, 12);
    expect(clamp.mMax).toBe(0);
    expect(clamp.restrictions.some((r) => /no safe P↔N change while its current is positive: .*outerUpper would block 2/.test(r))).toBe(true);
    expect(evaluateClaim({ name: 'first-version promise', topology: 'npc', faults: ['a.clampUpper'], m: 1.1, loadAngleDeg: [0, 30] }).holds).toBe(false);
    // NPC inner switch open: pattern P with i > 0 would make the failed switch's diode block 2, so
    // no realisation of the table uses P in phase a while phase a's current is positive.
    const inner = switchingTable({ topology: 'npc', faults: ['a.innerUpper'] });
    let checked = 0;
    for (const [pol, p] of Object.entries(inner.polarities)) {
      if (pol[0] !== '+') continue;
      for (const t of p.tableTriangles)
        for (const v of t.vertices)
          for (const r of v.realisations) {
            expect(r.phases[0].pattern).not.toBe('P');
            checked++;
          }
    }
    expect(checked).toBeGreaterThan(0);
  });

  it('keeps the T-type leg at 2/√3 with a neutral switch open under commutable, not under adjacent', () => {
    // the outer devices are rated for the whole link, so P↔N changes stay safe (contract ratings)
    const c = planRemedial({ topology: 'tnpc', faults: ['a.neutralToOut'], loadAngleDeg: 30 });
    expect(c.mMax).toBeCloseTo(HEALTHY, 12);
    const a = planRemedial({ topology: 'tnpc', faults: ['a.neutralToOut'], loadAngleDeg: 30, levelSteps: 'adjacent' });
    expect(a.mMax).toBeLessThan(c.mMax - 0.1);
  });

  it('decides a load-angle range exactly as the plan does point by point', () => {
    const atlas = diagramAtlas({ topology: 'anpc-hybrid', faults: ['a.innerUpper'] });
    const r = limitOverLoadAngles(atlas.faulted, -40, 40, 3);
    let sampled = Infinity;
    for (let phi = -40; phi <= 40; phi += 0.5) sampled = Math.min(sampled, modulationLimit(atlas.faulted, phi, 3).mMax);
    expect(r.mMax).toBeLessThanOrEqual(sampled + 1e-12);
    expect(r.mMax).toBeCloseTo(modulationLimit(atlas.faulted, r.loadAngleDeg, 3).mMax, 9);
  });
});
