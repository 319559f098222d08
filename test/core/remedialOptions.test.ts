import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  analyseLeg,
  BUILTIN_TOPOLOGIES,
  builtinLeg,
  HexsalvageInputError,
  legDocument,
  planRemedial,
  simulatePeriod,
  switchover,
  type CurrentSign,
  type PatternResult,
} from '@hexsalvage/core';
import { expandElements, legTable, usableLevel } from '@hexsalvage/core/internal';
import { loadNetlistFile } from '@hexsalvage/core/node';
import { ROOT, runInProcess } from '../support/cli.js';

// Remedial options (contract, Version 3): ambiguous diagnoses, the bypass, remedies, the switch-over.
const SPLIT = loadNetlistFile(join(ROOT, 'examples/two-level-split-link.json'));
const INV_SQRT3 = 1 / Math.sqrt(3);

describe('ambiguous diagnoses: one plan that holds whichever alternative is true', () => {
  it('NPC a.outerUpper|a.outerUpper.diode: the table worked by hand', () => {
    const d = legDocument(analyseLeg({ topology: 'npc', faults: ['a.outerUpper|a.outerUpper.diode'] })).phases.a;
    // P, i > 0: switch open → the current freewheels from O through clampUpper and innerUpper (O);
    // diode open → the switch conducts (P). They disagree: no level.
    // P, i < 0: switch open → back to P through both upper diodes (P); diode open → the clamp diode
    // blocks towards O and the open diode towards P: interrupted. No level.
    expect(d.patterns.P).toMatchObject({ '+': null, '-': null });
    expect((d.patterns.P as { unsafe: Record<string, string> }).unsafe['+']).toBe('gives O if a.outerUpper:open but P if a.outerUpper.diode:open');
    expect((d.patterns.P as { unsafe: Record<string, string> }).unsafe['-']).toContain('interrupted');
    // O and N do not use the element: unchanged in both configurations
    expect(d.patterns.O).toEqual({ '+': 0, '-': 0 });
    expect(d.patterns.N).toEqual({ '+': -1, '-': -1 });
    expect(d.levels).toEqual({ '+': [-1, 0], '-': [-1, 0], '?': [-1, 0] });
    expect(d.moves['+']).toEqual([
      [-1, 0],
      [0, -1],
    ]);
  });
  it('plan lists the configurations and the limit of each alone', () => {
    const p = planRemedial({ topology: 'npc', faults: ['a.outerUpper|a.outerUpper.diode'], loadAngleDeg: 30 });
    expect(p.alternatives).toEqual([['a.outerUpper:open'], ['a.outerUpper.diode:open']]);
    expect(p.mMaxByAlternative?.[0]).toBeCloseTo(INV_SQRT3, 12);
    expect(p.mMaxByAlternative?.[1]).toBeCloseTo(2 / 3, 12);
    expect(p.mMax).toBeCloseTo(INV_SQRT3, 12);
    expect(p.faults).toEqual(['a.outerUpper:open|a.outerUpper.diode:open']);
  });
  it('a switch or its own diode never gives more than either alone (every built-in leg, several load angles)', () => {
    let cases = 0;
    for (const topology of BUILTIN_TOPOLOGIES) {
      for (const d of builtinLeg(topology).devices.filter((x) => x.antiparallelDiode)) {
        for (const phi of [-60, 0, 25, 90]) {
          const joint = planRemedial({ topology, faults: [`a.${d.id}|a.${d.id}.diode`], loadAngleDeg: phi, remedies: false });
          const a = planRemedial({ topology, faults: [`a.${d.id}`], loadAngleDeg: phi, remedies: false });
          const b = planRemedial({ topology, faults: [`a.${d.id}.diode`], loadAngleDeg: phi, remedies: false });
          expect(joint.mMax).toBeLessThanOrEqual(Math.min(a.mMax, b.mMax) + 1e-12);
          expect(joint.mMaxByAlternative).toEqual([a.mMax, b.mMax]);
          cases++;
        }
      }
    }
    expect(cases).toBeGreaterThan(60);
  });
  it('alternatives in different phases: each phase table holds in every configuration', () => {
    const a = analyseLeg({ topology: 'npc', faults: ['a.outerUpper|b.outerUpper'] });
    expect(a.configurations).toHaveLength(2);
    // phase a is either healthy or faulted: it keeps only what both give
    expect(a.phases.a.levels['+']).toEqual([-1, 0]);
    expect(a.phases.b.levels['+']).toEqual([-1, 0]);
    expect(a.phases.c.levels['+']).toEqual([-1, 0, 1]);
  });
  it.each([
    ["'a.outerUpper|'", ['a.outerUpper|'], /one is empty/],
    ["'|a.outerUpper'", ['|a.outerUpper'], /one is empty/],
    ['the same element twice', ['a.outerUpper|a.outerUpper:short'], /each element at most once/],
    ['an unknown element', ['a.outerUpper|a.nothing'], /a device of leg/],
  ])('bad input: %s → a typed error naming the fault', (_, faults, message) => {
    expect(() => analyseLeg({ topology: 'npc', faults })).toThrow(HexsalvageInputError);
    expect(() => analyseLeg({ topology: 'npc', faults })).toThrow(message);
  });
  it('the CLI prints one line and exits 2 for an empty alternative', async () => {
    const r = await runInProcess(['plan', '--topology', 'npc', '--fault', 'a.outerUpper|']);
    expect(r.code).toBe(2);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
  });
});

describe('the bypass to the DC midpoint', () => {
  it('the four-switch inverter: 1/√3 at every load angle (van der Broeck and van Wyk, 1984; from memory), a rhombus of vectors', () => {
    for (let phi = -180; phi <= 180; phi += 15) {
      const p = planRemedial({ topology: SPLIT, faults: ['a.upper'], bypass: 'a', loadAngleDeg: phi, remedies: false });
      expect(p.mMax).toBeCloseTo(INV_SQRT3, 12);
    }
    const hull = planRemedial({ topology: SPLIT, faults: ['a.upper'], bypass: 'a', remedies: false }).polarities['+--']?.hull ?? [];
    // rhombus (±2/3, 0), (0, ±2/√3): the reachable line-to-line voltages of two legs against the midpoint
    expect(hull).toHaveLength(4);
    for (const [x, y] of hull)
      expect(Math.abs(x) < 1e-12 ? Math.abs(Math.abs(y) - 2 / Math.sqrt(3)) : Math.abs(Math.abs(x) - 2 / 3) + Math.abs(y)).toBeLessThan(1e-12);
  });
  it.each([
    ['npc', 'a.innerUpper'],
    ['anpc', 'a.innerUpper'],
    ['anpc-hybrid', 'a.outerLower:short'],
    ['tnpc', 'a.neutralToOut'],
  ])('a bypassed %s phase (%s) gives the same rhombus', (topology, fault) => {
    for (const phi of [-45, 0, 60])
      expect(planRemedial({ topology, faults: [fault], bypass: 'a', loadAngleDeg: phi, remedies: false }).mMax).toBeCloseTo(INV_SQRT3, 12);
  });
  it('the bypassed phase: level 0 for both signs through the tie, no moves, its own patterns unused', () => {
    const a = analyseLeg({ topology: 'npc', faults: ['a.innerUpper'], bypass: 'a' });
    expect(a.phases.a.levels).toEqual({ '+': [0], '-': [0], '?': [0] });
    expect(a.phases.a.commutations.moves['+']).toEqual([]);
    const tie = a.phases.a.patterns.find((p) => p.name === 'bypass') as Extract<PatternResult, { status: 'allowed' }>;
    expect(tie.gates).toEqual([]);
    expect(tie.bySign['+'].path).toContain('bypass');
    // the other phases never use the tie pattern and keep their healthy levels
    expect(a.phases.b.levels).toEqual(analyseLeg({ topology: 'npc' }).healthy.levels);
  });
  it('the midpoint carries the phase current: ripple 2·Î/(ω·2C) peak to peak (charge of a half sine, textbook integral)', () => {
    const s = simulatePeriod({
      topology: SPLIT,
      faults: ['a.upper'],
      bypass: 'a',
      m: 0.5,
      loadAngleDeg: 20,
      vdc: 700,
      currentPeak: 100,
      f1: 50,
      fsw: 5000,
      capacitance: 0.002,
    });
    const expected = (2 * 100) / (2 * Math.PI * 50 * 2 * 0.002);
    expect(Math.abs((s.midpoint.ripplePkPk as number) - expected) / expected).toBeLessThan(0.01);
  });
  it('refusals: no DC node at 0, an unusable tied state, two phases; a bypass without a fault is noted', async () => {
    expect(() => planRemedial({ topology: 'two-level', faults: ['a.upper'], bypass: 'a' })).toThrow(/split DC link/);
    expect(() => planRemedial({ topology: 'tnpc', faults: ['a.upper:short'], bypass: 'a' })).toThrow(/shoots through/);
    const two = await runInProcess(['plan', '--topology', 'npc', '--bypass', 'a', '--bypass', 'b']);
    expect(two.code).toBe(2);
    expect(two.stderr).toMatch(/--bypass: expected one phase at most/);
    expect(two.stderr.trim().split('\n')).toHaveLength(1);
    const none = await runInProcess(['plan', '--topology', 'two-level', '--fault', 'a.upper', '--bypass', 'a']);
    expect(none.code).toBe(2);
    expect(none.stderr.trim().split('\n')).toHaveLength(1);
    expect(planRemedial({ topology: 'npc', bypass: 'b', remedies: false }).notes.join(' ')).toContain('phase b has no fault');
  });
});

describe('remedies in every plan', () => {
  const ids = (p: { remedies?: readonly { id: string }[] }) => (p.remedies ?? []).map((r) => r.id);
  it('NPC outer switch short: cannot run as it is; clearing the short gives the open-switch limit', () => {
    const p = planRemedial({ topology: 'npc', faults: ['a.outerUpper:short'], loadAngleDeg: 20 });
    expect(p.mMax).toBe(0);
    expect(ids(p)[0]).toBe('clear-shorts');
    expect(ids(p)[ids(p).length - 1]).toBe('as-is');
    expect(p.remedies?.[0]?.mMax).toBeCloseTo(planRemedial({ topology: 'npc', faults: ['a.outerUpper'], loadAngleDeg: 20 }).mMax, 12);
  });
  it('only the remedies that apply: no clear-shorts without a short, no bypass without a DC node at 0', () => {
    expect(ids(planRemedial({ topology: 'npc', faults: ['a.outerUpper'] }))).toEqual(['as-is', 'bypass-a']);
    expect(ids(planRemedial({ topology: 'two-level', faults: ['a.upper'] }))).toEqual(['as-is']);
    expect(ids(planRemedial({ topology: SPLIT, faults: ['a.upper'] }))).toEqual(['bypass-a', 'as-is']);
    expect(ids(planRemedial({ topology: 'tnpc', faults: ['a.upper:short'] }))).not.toContain('bypass-a');
  });
  it('sorted best first by mMax, and each remedy equals the plan of its own configuration', () => {
    for (const f of ['a.innerUpper:short', 'a.clampUpper', 'a.outerLower.diode:short']) {
      const p = planRemedial({ topology: 'npc', faults: [f], loadAngleDeg: 25 });
      const list = p.remedies ?? [];
      for (let i = 1; i < list.length; i++) expect((list[i - 1] as { mMax: number }).mMax).toBeGreaterThanOrEqual((list[i] as { mMax: number }).mMax - 1e-12);
      for (const r of list) {
        const cleared = r.id.startsWith('clear-shorts') ? f.replace(':short', ':open') : f;
        const bypass = r.id.endsWith('bypass-a') ? { bypass: 'a' as const } : {};
        expect(r.mMax).toBe(planRemedial({ topology: 'npc', faults: [cleared], loadAngleDeg: 25, remedies: false, ...bypass }).mMax);
      }
    }
  });
  it('plan text says which remedy would run when the drive cannot', async () => {
    const r = await runInProcess(['plan', '--topology', join(ROOT, 'examples/two-level-split-link.json'), '--fault', 'a.upper']);
    expect(r.stdout).toContain('A remedy that would run: bypass-a (mMax 0.577350)');
    const t = await runInProcess(['plan', '--topology', 'two-level', '--fault', 'a.upper']);
    expect(t.stdout).toContain('No remedy considered here lets the drive run');
    expect(t.stdout).toContain('needs a split DC link');
  });
  it('the atlas gives each fault its best remedy, rotated with its phase, in text and CSV', async () => {
    const j = JSON.parse((await runInProcess(['atlas', '--topology', 'npc', '--json'])).stdout) as {
      entries: { faults: string[]; verdict: string; bestRemedy: { id: string; mMaxMin: number } | null }[];
    };
    const inner = j.entries.find((e) => e.faults.join() === 'a.innerUpper:open');
    expect(inner?.bestRemedy?.id).toBe('bypass-a');
    expect(j.entries.filter((e) => e.verdict === 'full').every((e) => e.bestRemedy === null)).toBe(true);
    const pairs = JSON.parse((await runInProcess(['atlas', '--topology', 'npc', '--modes', 'open', '--pairs', '--json'])).stdout) as typeof j;
    for (const e of pairs.entries) {
      const m = /bypass-([abc])$/.exec(e.bestRemedy?.id ?? '');
      if (m)
        expect(
          e.faults.some((f) => f.startsWith(`${m[1]}.`)),
          e.faults.join(),
        ).toBe(true);
    }
    const csv = (await runInProcess(['atlas', '--topology', 'npc', '--csv'])).stdout.split('\n');
    expect(csv[0]).toContain('best_remedy,best_remedy_m_max_min');
    expect(csv.some((l) => l.includes(',bypass-a,0.577350269,'))).toBe(true);
  });
});

describe('switchover: from the fault to the degraded table', () => {
  it('every pattern of every built-in leg under every single fault: the classes agree with the leg tables', () => {
    let checked = 0;
    for (const topology of BUILTIN_TOPOLOGIES) {
      const leg = builtinLeg(topology);
      for (const el of expandElements(leg).map((e) => e.id)) {
        for (const mode of ['open', 'short'] as const) {
          const s = switchover({ topology, faults: [`a.${el}:${mode}`] });
          const healthy = legTable(leg, new Map());
          const faulted = legTable(leg, new Map([[el, mode]]));
          healthy.patterns.forEach((h, i) => {
            const f = faulted.patterns[i] as PatternResult;
            for (const sign of ['+', '-'] as const) {
              const hl = h.status === 'allowed' ? h.bySign[sign].level : null;
              const fl = f.status === 'allowed' ? f.bySign[sign].level : null;
              const want = fl === hl ? 'same' : fl === null ? 'unsafe' : 'deviates';
              expect(s.patterns.a[h.name]?.[sign], `${topology} ${el}:${mode} ${h.name} ${sign}`).toBe(want);
              expect(s.patterns.b[h.name]?.[sign]).toBe('same');
              checked++;
            }
          });
          // every way out, replayed with the leg's own solver: single gate actions, each state usable
          for (const e of s.exits) {
            if (e.steps === null) {
              expect(e.blockAll).toBeTruthy();
              continue;
            }
            let gates = new Set((healthy.patterns.find((p) => p.name === e.pattern) as PatternResult).gates);
            for (const step of e.steps) {
              const m = /^turn (\S+) (on|off)$/.exec(step) as RegExpExecArray;
              if (m[2] === 'on') gates.add(m[1] as string);
              else gates.delete(m[1] as string);
              expect(usableLevel(faulted.solve([...gates]), e.sign as CurrentSign)).not.toBeNull();
            }
            const target = faulted.patterns.find((p) => p.name === e.to) as PatternResult;
            expect([...gates].sort()).toEqual([...target.gates].sort());
            expect(target.status === 'allowed' && target.bySign[e.sign].level !== null).toBe(true);
            gates = new Set();
          }
        }
      }
    }
    expect(checked).toBeGreaterThan(500);
  });
  it('at an operating point: distortion only for an NPC outer switch open, protection in hardware for a clamp diode open', () => {
    const point = { m: 0.8, loadAngleDeg: 20, f1: 50, fsw: 5000 };
    const mild = switchover({ topology: 'npc', faults: ['a.outerUpper'], ...point });
    expect(mild.run?.urgency).toBe('distortion');
    expect(mild.run?.unsafeStates).toBe(0);
    expect(mild.run?.verdict).toMatch(/^distortion only: .* the diagnosis may take its time$/);
    const hard = switchover({ topology: 'npc', faults: ['a.clampUpper'], ...point });
    expect(hard.run?.urgency).toBe('hardware');
    expect(hard.run?.unsafeStates).toBeGreaterThan(0);
    expect(hard.run?.verdict).toMatch(/protection must act in hardware$/);
    expect(hard.run?.firstUnsafe).toMatchObject({ phase: 'a', pattern: 'O', sign: '+' });
  });
  it('an ambiguous diagnosis is judged by its worst configuration', () => {
    const s = switchover({ topology: 'npc', faults: ['a.outerUpper|a.outerUpper.diode'] });
    expect(s.patterns.a.P).toEqual({ '+': 'deviates', '-': 'unsafe' });
    expect(s.details.a.P?.['-'].reason).toContain('if a.outerUpper.diode:open');
  });
  it('CLI: text and JSON, and one line for an incomplete operating point', async () => {
    const t = await runInProcess(['switchover', '--topology', 'npc', '--fault', 'a.clampUpper', '--m', '0.8', '--f1', '50', '--fsw', '5000']);
    expect(t.code).toBe(0);
    expect(t.stdout).toContain('turn innerUpper off, turn outerLower on → N');
    const j = JSON.parse((await runInProcess(['switchover', '--topology', 'npc', '--fault', 'a.clampUpper', '--json'])).stdout) as {
      patterns: Record<string, Record<string, Record<string, string>>>;
    };
    expect(j.patterns.a?.O).toEqual({ '+': 'unsafe', '-': 'same' });
    const bad = await runInProcess(['switchover', '--topology', 'npc', '--fault', 'a.clampUpper', '--m', '0.8']);
    expect(bad.code).toBe(2);
    expect(bad.stderr.trim().split('\n')).toHaveLength(1);
  });
});
