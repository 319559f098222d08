import { describe, expect, it } from 'vitest';
import {
  BUILTIN_TOPOLOGIES,
  builtinLeg,
  HexsalvageInputError,
  parseNetlist,
  planRemedial,
  type BuiltinTopology,
  type FaultMode,
  type LegNetlist,
} from '@hexsalvage/core';
import { expandElements, legTable } from '@hexsalvage/core/internal';
import { fc, fcParams } from '../support/fc.js';
import { mirrorElement, mirrorPattern } from '../support/mirror.js';

const topologyArb = fc.constantFrom(...BUILTIN_TOPOLOGIES);
const withFaults = topologyArb.chain((t) => {
  const ids = expandElements(builtinLeg(t)).map((e) => e.id);
  return fc.tuple(fc.constant(t), fc.subarray(ids), fc.constantFrom(...ids));
});
const openFaults = (ids: readonly string[]) => new Map<string, FaultMode>(ids.map((i) => [i, 'open']));

describe('legTable properties', () => {
  it('never adds a level when a fault is added (built-in legs)', () => {
    fc.assert(
      fc.property(withFaults, ([t, faults, extra]) => {
        const before = legTable(builtinLeg(t), openFaults(faults)).levels;
        const after = legTable(builtinLeg(t), openFaults([...faults, extra])).levels;
        for (const s of ['+', '-', '?'] as const) for (const l of after[s]) expect(before[s]).toContain(l);
      }),
      fcParams(300),
    );
  });

  it('can add a level when a sparse pattern list loses its only path (why the property above is about built-ins)', () => {
    // Only pattern P listed: healthy i>0 gives {P}; with upper open the same pattern gives N.
    const leg: LegNetlist = { ...builtinLeg('two-level'), patterns: { P: ['upper'] } };
    expect(legTable(leg, new Map()).levels['+']).toEqual([1]);
    expect(legTable(leg, openFaults(['upper'])).levels['+']).toEqual([-1]);
  });

  it.each(BUILTIN_TOPOLOGIES)('gives a healthy %s leg robust levels equal to both signed sets', (t) => {
    const l = legTable(builtinLeg(t), new Map()).levels;
    expect(l['?']).toEqual(l['+']);
    expect(l['?']).toEqual(l['-']);
  });

  it('mirrors an upper fault with sign + onto the lower fault with sign -, levels negated', () => {
    const arb = topologyArb.chain((t) => fc.tuple(fc.constant(t), fc.constantFrom(...expandElements(builtinLeg(t)).map((e) => e.id))));
    fc.assert(
      fc.property(arb, ([t, el]) => {
        const a = legTable(builtinLeg(t), openFaults([el]));
        const b = legTable(builtinLeg(t), openFaults([mirrorElement(t as BuiltinTopology, el)]));
        for (const p of a.patterns) {
          const q = b.patterns.find((x) => x.name === mirrorPattern(t as BuiltinTopology, p.name));
          if (p.status !== 'allowed' || q?.status !== 'allowed') throw new Error('unexpected forbidden pattern');
          for (const [s, ms] of [
            ['+', '-'],
            ['-', '+'],
          ] as const) {
            const x = p.bySign[s].level;
            const y = q.bySign[ms].level;
            expect(x === null ? null : -x + 0).toBe(y === null ? null : y + 0);
          }
        }
        expect(a.levels['?'].map((l) => -l + 0).sort((x, y) => x - y)).toEqual([...b.levels['?']]);
      }),
      fcParams(100),
    );
  });

  it('does not depend on the order devices are listed in', () => {
    fc.assert(
      fc.property(withFaults, fc.integer(), ([t, faults], seed) => {
        const leg = builtinLeg(t);
        const shuffled: LegNetlist = { ...leg, devices: shuffle([...leg.devices], seed) };
        const a = legTable(leg, openFaults(faults));
        const b = legTable(shuffled, openFaults(faults));
        expect(b.levels).toEqual(a.levels);
        a.patterns.forEach((p, i) => {
          const q = b.patterns[i];
          expect(q?.status).toBe(p.status);
          if (p.status === 'allowed' && q?.status === 'allowed') {
            for (const s of ['+', '-'] as const) {
              expect(q.bySign[s].level).toBe(p.bySign[s].level);
              expect([...q.bySign[s].path].sort()).toEqual([...p.bySign[s].path].sort());
            }
          }
        });
      }),
      fcParams(200),
    );
  });

  it('never crashes on random netlists: a typed error or a result', () => {
    // Mostly well-formed legs (unique ids, patterns over their own switches) so that the solver
    // is reached, mixed with arbitrary values that must be refused with a typed error.
    const nodes = ['P', 'O', 'N', 'out', 'X', 'Y'];
    const device = fc.record({
      kind: fc.constantFrom('igbt', 'mosfet', 'diode'),
      from: fc.constantFrom(...nodes),
      to: fc.constantFrom(...nodes),
      antiparallelDiode: fc.boolean(),
      rating: fc.option(fc.constantFrom(0.5, 1, 1.5, 2, 3), { nil: undefined }),
    });
    const doc = fc
      .tuple(
        fc.array(device, { minLength: 1, maxLength: 7 }),
        fc.constantFrom({ P: 1, O: 0, N: -1 }, { P: 1, N: -1 }, { P: 2, O: 0.5, N: -1.5 }),
        fc.array(fc.array(fc.nat(6), { maxLength: 4 }), { minLength: 1, maxLength: 4 }),
      )
      .map(([devs, dcNodes, pats]) => {
        const devices = devs.map(({ rating, ...d }, i) => ({
          id: `e${i}`,
          ...d,
          antiparallelDiode: d.kind !== 'diode' && d.antiparallelDiode,
          ...(rating === undefined ? {} : { rating }),
        }));
        const gated = devices.filter((d) => d.kind !== 'diode').map((d) => d.id);
        const patterns = Object.fromEntries(pats.map((idx, k) => [`p${k}`, [...new Set(idx.filter((i) => i < gated.length).map((i) => gated[i]))]]));
        return { name: 'random', dcNodes, output: 'out', devices, patterns };
      });
    let solved = 0;
    fc.assert(
      fc.property(fc.oneof(doc, fc.anything()), (raw) => {
        let leg: LegNetlist;
        try {
          leg = parseNetlist(raw, 'random.json');
        } catch (e) {
          expect(e).toBeInstanceOf(HexsalvageInputError);
          return;
        }
        const t = legTable(leg, new Map());
        expect(t.patterns.length).toBe(Object.keys(leg.patterns).length);
        // the whole planner, under every rule, with a fault: a plan with finite numbers, never a crash
        const element = expandElements(leg)[0]?.id as string;
        for (const levelSteps of ['commutable', 'adjacent', 'any'] as const) {
          const plan = planRemedial({ topology: leg, faults: [`b.${element}:short`], levelSteps, loadAngleDeg: 20 });
          for (const x of [plan.mMax, plan.mMaxHull, plan.mMaxBalanced]) expect(Number.isFinite(x) && x >= 0).toBe(true);
          expect(plan.mMax).toBeLessThanOrEqual(plan.mMaxHull + 1e-12);
        }
        solved++;
      }),
      fcParams(300),
    );
    // the generator must reach the solver, not only the validator
    expect(solved).toBeGreaterThan(5);
  });
});

// Deterministic Fisher–Yates driven by a fast-check integer, so failures replay from the seed.
function shuffle<T>(xs: T[], seed: number): T[] {
  let s = seed >>> 0 || 1;
  for (let i = xs.length - 1; i > 0; i--) {
    s = (s * 1103515245 + 12345) >>> 0;
    const j = s % (i + 1);
    [xs[i], xs[j]] = [xs[j] as T, xs[i] as T];
  }
  return xs;
}
