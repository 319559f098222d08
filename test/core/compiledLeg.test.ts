import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { BUILTIN_TOPOLOGIES, builtinLeg, HexsalvageInputError, parseNetlist, type FaultMode, type LegNetlist } from '@hexsalvage/core';
import { expandElements } from '@hexsalvage/core/internal';
import { compiledLeg } from '../../packages/core/src/leg/compiledLeg.js';
import { conductionEdges, findShootThrough, outputForSign } from '../../packages/core/src/leg/conduction.js';
import { ratingChecker } from '../../packages/core/src/leg/ratingCheck.js';
import { fc, fcParams } from '../support/fc.js';

// The compiled solver (used for every intermediate gate set of the commutation search) against the
// plain rules it compiles: conductionEdges, findShootThrough and outputForSign. Same shoot-through
// (same path), same level per sign, on every gate set tried.
//
// Also the reason the gate-set solver skips the static voltage check on a leg where no device has a
// rating: there, every state without a shoot-through passes it (checked here on every such state).
const seen = { sets: 0, shootThrough: 0, unratedChecks: 0 };
function agrees(leg: LegNetlist, faults: ReadonlyMap<string, FaultMode>, gateSets: readonly (readonly string[])[]): void {
  const elements = expandElements(leg);
  const fast = compiledLeg(leg, elements, faults);
  const check = elements.some((e) => e.rating !== undefined) ? null : ratingChecker(leg, elements, faults);
  for (const gates of gateSets) {
    const edges = conductionEdges(elements, new Set(gates), faults);
    const st = findShootThrough(leg, edges);
    const got = fast(gates);
    seen.sets++;
    if (st) seen.shootThrough++;
    expect(got.shootThrough, `${leg.name} ${gates.join('+')}`).toEqual(st);
    if (st === null) {
      expect(got.plus, `${leg.name} ${gates.join('+')} +`).toBe(outputForSign(leg, edges, '+').level);
      expect(got.minus, `${leg.name} ${gates.join('+')} -`).toBe(outputForSign(leg, edges, '-').level);
      for (const level of [got.plus, got.minus]) {
        if (check === null || level === null) continue;
        seen.unratedChecks++;
        expect(check(new Set(gates), level).ok, `${leg.name} ${gates.join('+')} at ${level}: unrated leg fails the voltage check`).toBe(true);
      }
    }
  }
}

function subsets(xs: readonly string[]): string[][] {
  return Array.from({ length: 2 ** xs.length }, (_, m) => xs.filter((_, i) => (m >> i) & 1));
}

describe('compiledLeg', () => {
  it('agrees with the plain conduction rules on every gate set of every built-in leg, healthy and with each single fault', () => {
    for (const t of BUILTIN_TOPOLOGIES) {
      const leg = builtinLeg(t);
      const gated = [
        ...new Set(
          expandElements(leg)
            .filter((e) => e.gated)
            .map((e) => e.id),
        ),
      ];
      const all = subsets(gated);
      agrees(leg, new Map(), all);
      for (const e of expandElements(leg)) for (const mode of ['open', 'short'] as const) agrees(leg, new Map([[e.id, mode]]), all);
    }
  });

  it('agrees on the five-level example leg, where several DC nodes can shoot through to several lower ones', () => {
    const leg = parseNetlist(JSON.parse(readFileSync(new URL('../../examples/five-level-leg.json', import.meta.url), 'utf8')), 'five-level-leg.json');
    const gated = [
      ...new Set(
        expandElements(leg)
          .filter((e) => e.gated)
          .map((e) => e.id),
      ),
    ];
    fc.assert(
      fc.property(
        fc.array(fc.subarray(gated), { minLength: 1, maxLength: 40 }),
        fc.subarray(
          expandElements(leg).map((e) => e.id),
          { maxLength: 3 },
        ),
        fc.boolean(),
        (sets, faulted, short) => {
          agrees(leg, new Map(faulted.map((id) => [id, short ? 'short' : 'open'] as const)), sets);
        },
      ),
      fcParams(60),
    );
  });

  it('agrees on random netlists with up to five DC nodes, random faults and random gate sets', () => {
    const device = fc.record({ kind: fc.constantFrom('igbt', 'mosfet', 'diode'), from: fc.nat(40), to: fc.nat(40), antiparallelDiode: fc.boolean() });
    const potentials = fc.uniqueArray(fc.integer({ min: -4, max: 4 }), { minLength: 2, maxLength: 5 });
    const before = { ...seen };
    fc.assert(
      fc.property(
        fc.array(device, { minLength: 2, maxLength: 12 }),
        potentials,
        fc.array(fc.nat(2), { maxLength: 12 }),
        fc.array(fc.array(fc.nat(11)), { minLength: 1, maxLength: 20 }),
        (devs, pots, modes, picks) => {
          // nodes: the DC nodes, the output and two internal ones; the two ends of a device differ and
          // the first device touches the output, so that most netlists pass the parser
          const dcNodes = Object.fromEntries(pots.map((p, k) => [`V${k}`, p]));
          const nodes = [...Object.keys(dcNodes), 'out', 'X', 'Y'];
          const devices = devs.map((d, i) => {
            const from = i === 0 ? 'out' : (nodes[d.from % nodes.length] as string);
            const rest = nodes.filter((n) => n !== from);
            return { id: `e${i}`, kind: d.kind, from, to: rest[d.to % rest.length] as string, antiparallelDiode: d.kind !== 'diode' && d.antiparallelDiode };
          });
          const gated = devices.filter((d) => d.kind !== 'diode').map((d) => d.id);
          let leg: LegNetlist;
          try {
            leg = parseNetlist({ name: 'random', dcNodes, output: 'out', devices, patterns: { p0: gated.slice(0, 1) } }, 'random.json');
          } catch (e) {
            // a netlist the parser refuses (an internal node with one device, say) is not the point
            // here, but it must be refused with a typed error
            expect(e).toBeInstanceOf(HexsalvageInputError);
            return;
          }
          const ids = expandElements(leg).map((e) => e.id);
          const faults = new Map<string, FaultMode>();
          modes.forEach((m, i) => {
            if (m > 0 && ids[i] !== undefined) faults.set(ids[i] as string, m === 1 ? 'open' : 'short');
          });
          agrees(
            leg,
            faults,
            picks.map((p) => [...new Set(p.filter((i) => i < gated.length).map((i) => gated[i] as string))]),
          );
        },
      ),
      fcParams(300),
    );
    // the generator must reach the solver and produce both outcomes, or the property proves nothing
    expect(seen.sets - before.sets).toBeGreaterThan(300);
    expect(seen.shootThrough - before.shootThrough).toBeGreaterThan(30);
    expect(seen.unratedChecks - before.unratedChecks).toBeGreaterThan(150);
  });
});
