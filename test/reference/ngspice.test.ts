import { describe, expect, it } from 'vitest';
import { BUILTIN_TOPOLOGIES, builtinLeg, simulationWaveform, type FaultMode, type LegNetlist, type PhaseFaults } from '@hexsalvage/core';
import { expandElements, gateSetSolver, planFromAtlas, diagramAtlas } from '@hexsalvage/core/internal';
import { HAS_NGSPICE, solveWithNgspice, VOLTS_PER_UNIT, type SpiceCase } from '../support/spice.js';

// Cross-check against a circuit simulator from the Debian archive (ngspice): the leg solver's
// levels, interruptions, shoot-throughs and rating verdicts, and the simulation's conducting paths.
// .ci/run installs ngspice; outside CI these tests skip, saying so, where it is absent.
const run = HAS_NGSPICE || Boolean(process.env.CI);
if (!run) console.log('ngspice cross-check skipped: ngspice is not installed (apt-get install ngspice)');

interface Point {
  topology: string;
  leg: LegNetlist;
  faults: PhaseFaults;
  pattern: string;
  sign: '+' | '-';
}

function points(): Point[] {
  const out: Point[] = [];
  for (const topology of BUILTIN_TOPOLOGIES) {
    const leg = builtinLeg(topology);
    const sets: PhaseFaults[] = [new Map(), ...expandElements(leg).flatMap((e) => (['open', 'short'] as FaultMode[]).map((m) => new Map([[e.id, m]])))];
    for (const faults of sets)
      for (const pattern of Object.keys(leg.patterns)) for (const sign of ['+', '-'] as const) out.push({ topology, leg, faults, pattern, sign });
  }
  return out;
}

describe.runIf(run)(
  'ngspice operating points agree with the leg solver (every built-in leg, healthy and every single open and short fault, every named pattern, both signs)',
  () => {
    it("gives the solver's level, runs away where it says interrupted, shoots through where it says so, and overstresses a rated element exactly where it says unsafe", async () => {
      const pts = points();
      const results = await solveWithNgspice(
        pts.map((p): SpiceCase => ({ leg: p.leg, faults: p.faults, gates: p.leg.patterns[p.pattern]!, current: p.sign === '+' ? 1 : -1 })),
      );
      const solvers = new Map<string, { rated: ReturnType<typeof gateSetSolver>; raw: ReturnType<typeof gateSetSolver> }>();
      let checked = 0;
      pts.forEach((p, i) => {
        const key = `${p.topology}|${[...p.faults].join()}`;
        let s = solvers.get(key);
        if (!s)
          solvers.set(
            key,
            (s = { rated: gateSetSolver(p.leg, p.faults, { ratings: true, paths: true }), raw: gateSetSolver(p.leg, p.faults, { ratings: false }) }),
          );
        const r = results[i]!;
        const label = `${p.topology} ${[...p.faults].map(([e, m]) => `${e}:${m}`).join()} ${p.pattern} ${p.sign}`;
        const o = s.rated(p.leg.patterns[p.pattern]!);
        const top = Math.max(...Object.values(p.leg.dcNodes).map(Math.abs)) * VOLTS_PER_UNIT;
        if (o.status === 'forbidden') {
          // a shoot-through: the DC sources drive far more than the 1 A load current through the leg
          expect(r.sourceMax, label).toBeGreaterThan(50);
          checked++;
          return;
        }
        expect(r.sourceMax, label).toBeLessThan(5);
        const raw = s.raw(p.leg.patterns[p.pattern]!);
        const level = raw.status === 'allowed' ? raw.bySign[p.sign].level : null;
        if (level === null) {
          // interrupted: the current source pushes the output far beyond the rails (100 kΩ beside it)
          expect(Math.abs(r.out), label).toBeGreaterThan(top + 1000);
        } else {
          // a level within a few junction drops (a tenth of a level step)
          expect(Math.abs(r.out - level * VOLTS_PER_UNIT), label).toBeLessThan(10);
          // ratings: the worst rated, unfailed element's voltage against its rating
          let over = -Infinity;
          for (const e of expandElements(p.leg)) {
            if (e.rating === undefined || p.faults.has(e.id)) continue;
            const v = Math.abs((r.nodes.get(e.from) as number) - (r.nodes.get(e.to) as number));
            over = Math.max(over, v - e.rating * VOLTS_PER_UNIT);
          }
          const unsafe = o.status === 'allowed' && o.unsafe[p.sign] !== undefined;
          if (unsafe) expect(over, label).toBeGreaterThan(10);
          else expect(over, label).toBeLessThan(10);
        }
        checked++;
      });
      expect(checked).toBe(pts.length);
      expect(checked).toBeGreaterThan(700);
    });
  },
);

describe.runIf(run)("ngspice element currents agree with the simulation's conducting paths over one switching period", () => {
  it.each([
    ['npc', [] as string[], 0.9],
    ['npc', ['a.outerUpper:open'], 0.5],
    ['tnpc', ['a.neutralToOut:short'], 0.5],
    ['anpc-hybrid', ['a.clampLower:short'], 0.4],
  ])('%s %j: each path element carries the phase current, every other element next to nothing', async (topology, faults, frac) => {
    const atlas = diagramAtlas({ topology, faults });
    const mMax = planFromAtlas(atlas, 20, 3).mMax;
    const f1 = 50;
    const fsw = 2000;
    const ipk = 100;
    const segs = simulationWaveform({
      topology,
      faults,
      m: frac * mMax,
      loadAngleDeg: 20,
      polarityMarginDeg: 3,
      vdc: 2 * VOLTS_PER_UNIT,
      currentPeak: ipk,
      f1,
      fsw,
      deadTime: 2e-6,
    });
    const leg = builtinLeg(topology as never);
    const faultsOf = (k: number) =>
      new Map(
        faults
          .filter((f) => f.startsWith('abc'[k]!))
          .map((f) => {
            const [el, m] = f.slice(2).split(':');
            return [el!, m as FaultMode] as const;
          }),
      ) as PhaseFaults;
    // one switching period around a quarter of the fundamental, every phase of every piece
    const t0 = 0.25 / f1;
    const cases: { seg: (typeof segs)[number]; k: number; i: number }[] = [];
    for (const g of segs) {
      if (g.t0 < t0 || g.t0 >= t0 + 1 / fsw) continue;
      for (let k = 0; k < 3; k++) {
        const i = ipk * Math.cos(2 * Math.PI * f1 * ((g.t0 + g.t1) / 2) - (20 * Math.PI) / 180 - (k * 2 * Math.PI) / 3);
        if (Math.abs(i) > 1) cases.push({ seg: g, k, i });
      }
    }
    expect(cases.length).toBeGreaterThan(6);
    // 1 A of the piece's sign: the 0.1 Ω behind each DC source then costs 0.1 V, not a level
    const res = await solveWithNgspice(cases.map((c) => ({ leg, faults: faultsOf(c.k), gates: c.seg.gates[c.k]!, current: Math.sign(c.i) })));
    cases.forEach((c, j) => {
      const path = c.seg.paths[c.k]!;
      const r = res[j]!;
      expect(Math.abs(r.out - c.seg.phaseVolts[c.k]!), `level ${c.seg.t0}`).toBeLessThan(10);
      for (const e of expandElements(leg)) {
        const amps = Math.abs(r.elements.get(e.id) ?? 0);
        if (path.includes(e.id)) expect(amps, `${e.id} on the path at ${c.seg.t0}`).toBeGreaterThan(0.99);
        else expect(amps, `${e.id} off the path at ${c.seg.t0}`).toBeLessThan(0.01);
      }
    });
  });
});
