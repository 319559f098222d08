import { describe, expect, it } from 'vitest';
import {
  BUILTIN_TOPOLOGIES,
  builtinLeg,
  HexsalvageInputError,
  simulatePeriod,
  simulationWaveform,
  type BuiltinTopology,
  type SimulateOptions,
} from '@hexsalvage/core';
import { diagramAtlas, expandElements, planFromAtlas } from '@hexsalvage/core/internal';

// What degraded operation costs: energy booked where a gate change commutates current against a
// voltage, one branch per current (Kirchhoff), failed elements never blamed, no artefact of the
// number of switching periods, full-spectrum THD, dead time.
const base = { vdc: 750, currentPeak: 300, f1: 50 } as const;
const total = (s: ReturnType<typeof simulatePeriod>, pick: (id: string) => boolean) =>
  Object.entries(s.devices)
    .filter(([id]) => pick(id))
    .reduce((n, [, d]) => n + d.switchingLoss, 0);

describe('switching energy where a gate change commutates current against a voltage', () => {
  // the Si devices change state twice per fundamental period, where the phase swaps between the
  // upper and lower zero states near its voltage's zero crossing; what they commutate then is the
  // current at that moment (about the peak times sin φ), so their share grows with the load angle
  // (docs/simulate.md): below 1 % near unity power factor, a few per cent at 25°
  it.each([
    [1, 0],
    [0.9, 5],
    [0.45, 10],
  ])("charges the line-frequency Si IGBTs of a healthy hybrid ANPC at most one per cent of the leg's switching loss (m $0, φ $1°)", (m, phi) => {
    const s = simulatePeriod({ ...base, topology: 'anpc-hybrid', m, loadAngleDeg: phi, fsw: 8000 });
    const line = new Set(
      builtinLeg('anpc-hybrid')
        .devices.filter((d) => d.switching === 'line')
        .map((d) => d.id),
    );
    const all = total(s, () => true);
    const si = total(s, (id) => line.has(id.slice(2).replace(/\.diode$/, '')));
    expect(all).toBeGreaterThan(10);
    expect(si / all).toBeLessThanOrEqual(0.01);
    expect(s.lineDevicesAtPwm).toEqual([]);
  });
  it('charges them about two commutations of the current at the voltage zero crossing per period at 25° (not PWM rate)', () => {
    const s = simulatePeriod({ ...base, topology: 'anpc-hybrid', m: 0.8, loadAngleDeg: 25, fsw: 8000 });
    const line = new Set(
      builtinLeg('anpc-hybrid')
        .devices.filter((d) => d.switching === 'line')
        .map((d) => d.id),
    );
    const si = total(s, (id) => line.has(id.slice(2).replace(/\.diode$/, '')));
    // demo IGBT: E_on + E_off = 42 mJ at 600 V, 300 A; per phase per period at most two swaps each
    // commutating about 300·sin 25° A at 375 V, for the outer and the clamp pair: an upper bound
    const bound = 3 * 2 * 2 * 0.042 * (375 / 600) * ((300 * Math.sin((25 * Math.PI) / 180)) / 300) * base.f1;
    expect(si).toBeGreaterThan(0);
    expect(si).toBeLessThan(bound);
  });

  it("gives the healthy NPC's outer diodes recovery loss and its inner diodes none (their switch stays on: they never block)", () => {
    // common practice: in an NPC leg the outer diodes commutate against the clamp diodes, the inner
    // ones only carry current past their own gated switch
    const s = simulatePeriod({ ...base, topology: 'npc', m: 1, loadAngleDeg: 25, fsw: 8000 });
    for (const ph of ['a', 'b', 'c']) {
      expect(s.devices[`${ph}.innerUpper.diode`]!.switchingLoss).toBe(0);
      expect(s.devices[`${ph}.innerLower.diode`]!.switchingLoss).toBe(0);
      expect(s.devices[`${ph}.outerUpper.diode`]!.switchingLoss).toBeGreaterThan(0);
      expect(s.devices[`${ph}.clampUpper`]!.switchingLoss).toBeGreaterThan(0);
    }
  });

  it('charges nothing where no state changes (m = 0 on an NPC: the leg holds OOO), and energy where two-level zero vectors alternate', () => {
    const s = simulatePeriod({ ...base, topology: 'two-level', m: 0, loadAngleDeg: 30, fsw: 2000 });
    expect(total(s, () => true)).toBeGreaterThan(0);
    const n = simulatePeriod({ ...base, topology: 'npc', m: 0, loadAngleDeg: 30, fsw: 2000, balance: 'off' });
    expect(total(n, () => true)).toBe(0);
  });
});

const SHORTS = BUILTIN_TOPOLOGIES.flatMap((t) => expandElements(builtinLeg(t)).map((e) => [t, `a.${e.id}:short`] as [BuiltinTopology, string]));

describe('failed elements', () => {
  it('never charges a shorted element switching loss nor names it limiting (every built-in single short)', () => {
    let ran = 0;
    for (const [topology, fault] of SHORTS) {
      const plan = planFromAtlas(diagramAtlas({ topology, faults: [fault] }), 20, 3);
      if (plan.mMax === 0) continue;
      const s = simulatePeriod({ ...base, topology, faults: [fault], m: 0.6 * plan.mMax, loadAngleDeg: 20, polarityMarginDeg: 3, fsw: 2000 });
      const id = fault.replace(':short', '');
      expect(s.devices[id]!.failed).toBe('short');
      expect(s.devices[id]!.switchingLoss).toBe(0);
      expect(s.currentDerating.limitingDevice === '' || s.currentDerating.limitingDevice !== id).toBe(true);
      expect(s.hottest.device).not.toBe(id);
      ran++;
    }
    expect(ran).toBeGreaterThan(10);
  });

  it('gives an open element no current and no loss', () => {
    const s = simulatePeriod({ ...base, topology: 'npc', faults: ['a.outerUpper'], m: 0.5, loadAngleDeg: 20, fsw: 2000 });
    expect(s.devices['a.outerUpper']).toMatchObject({ avgCurrent: 0, rmsCurrent: 0, conductionLoss: 0, switchingLoss: 0, failed: 'open' });
  });
});

// Kirchhoff's current law at every node: each piece's path carries the phase current from a DC
// node to the output (or back); summed over elements with their directions, every inner node
// balances and the output node passes the phase current to the load.
const ALL = BUILTIN_TOPOLOGIES.flatMap((t) => [
  [t, []] as [BuiltinTopology, string[]],
  ...expandElements(builtinLeg(t)).flatMap(
    (e) =>
      [
        [t, [`a.${e.id}:open`]],
        [t, [`a.${e.id}:short`]],
      ] as [BuiltinTopology, string[]][],
  ),
]);

describe("Kirchhoff's current law (every built-in leg, healthy and every single fault, a whole period)", () => {
  it('balances every node of every phase in every piece, with one branch per current', () => {
    let pieces = 0;
    for (const [topology, faults] of ALL) {
      const plan = planFromAtlas(diagramAtlas({ topology, faults }), 30, 4);
      if (plan.mMax === 0) continue;
      const opts: SimulateOptions = { ...base, topology, faults, m: 0.7 * plan.mMax, loadAngleDeg: 30, polarityMarginDeg: 4, fsw: 1200 };
      const leg = builtinLeg(topology);
      const el = new Map(expandElements(leg).map((e) => [e.id, e] as const));
      const w = 2 * Math.PI * base.f1;
      for (const g of simulationWaveform(opts)) {
        for (let k = 0; k < 3; k++) {
          const path = g.paths[k]!;
          if (path.length === 0) continue;
          const i = base.currentPeak * Math.cos(w * ((g.t0 + g.t1) / 2) - (30 * Math.PI) / 180 - (k * 2 * Math.PI) / 3);
          const sum = new Map<string, number>();
          const into = (n: string, x: number) => sum.set(n, (sum.get(n) ?? 0) + x);
          // current along the path: from DC to out for i > 0, out to DC for i < 0; magnitude |i|
          path.forEach((id, j) => {
            const e = el.get(id)!;
            const fwd = g.forward[k]![j]!;
            const [a, b] = fwd ? [e.from, e.to] : [e.to, e.from];
            into(a, -Math.abs(i));
            into(b, Math.abs(i));
          });
          // no element twice, no node entered twice: one branch
          expect(new Set(path).size).toBe(path.length);
          for (const [node, x] of sum) {
            if (node in leg.dcNodes) continue;
            if (node === leg.output) expect(x).toBeCloseTo(i > 0 ? Math.abs(i) : -Math.abs(i), 6);
            else expect(Math.abs(x)).toBeLessThan(1e-9);
          }
          pieces++;
        }
      }
    }
    expect(pieces).toBeGreaterThan(10000);
  });
});

describe('no artefact of the number of switching periods', () => {
  it('two-level at fsw/f1 = 21: upper and lower switches carry the same current, no even harmonic, full-spectrum THD', () => {
    const s = simulatePeriod({ vdc: 700, currentPeak: 100, f1: 50, topology: 'two-level', m: 1, loadAngleDeg: 0, fsw: 1050, maxHarmonic: 4000 });
    expect(s.periods).toBe(21);
    const up = s.devices['a.upper']!.avgCurrent;
    const lo = s.devices['a.lower']!.avgCurrent;
    expect(Math.abs(up / lo - 1)).toBeLessThan(0.005);
    const v1 = s.lineVoltage.fundamentalPeak;
    for (const [n, v] of s.lineVoltage.harmonics) if (n % 2 === 0) expect(v).toBeLessThan(1e-9 * v1);
    // THD from the RMS; the listed harmonics up to 4000 account for nearly all of it
    const listed = Math.sqrt(s.lineVoltage.harmonics.slice(1).reduce((k, [, v]) => k + v * v, 0)) / v1;
    expect(s.lineVoltage.thd).toBeGreaterThanOrEqual(listed);
    expect(listed / s.lineVoltage.thd).toBeGreaterThan(0.99);
  });
});

// Conventional centred space-vector modulation written independently: per switching period the
// reference sampled at its centre, min–max zero-sequence injection, each phase's pulse centred
// in the period (D. G. Holmes, T. A. Lipo, Pulse Width Modulation for Power Converters, 2003,
// ch. 6, from memory: centred SVM equals sine-triangle PWM with min–max injection).
function centredSvmWthd(m: number, N: number, H: number): number {
  const an = new Float64Array(H + 1);
  const bn = new Float64Array(H + 1);
  const w = 2 * Math.PI;
  const add = (a: number, b: number, v: number) => {
    for (let n = 1; n <= H; n++) {
      an[n] = an[n]! + (v * (Math.sin(n * w * b) - Math.sin(n * w * a))) / (n * w);
      bn[n] = bn[n]! - (v * (Math.cos(n * w * b) - Math.cos(n * w * a))) / (n * w);
    }
  };
  for (let p = 0; p < N; p++) {
    const th = ((p + 0.5) * w) / N;
    const v = [0, 1, 2].map((k) => m * Math.cos(th - (k * w) / 3));
    const zs = (Math.max(...v) + Math.min(...v)) / 2;
    const duty = v.map((x) => (1 + (x - zs)) / 2); // level +1 for duty, −1 otherwise
    const t0 = p / N;
    const T = 1 / N;
    // edges of phases a and b inside the period, line voltage piecewise constant between them
    const edges = [t0, t0 + T];
    for (const d of [duty[0]!, duty[1]!]) edges.push(t0 + (T * (1 - d)) / 2, t0 + (T * (1 + d)) / 2);
    edges.sort((x, y) => x - y);
    for (let e = 0; e + 1 < edges.length; e++) {
      const a = edges[e]!;
      const b = edges[e + 1]!;
      if (b <= a) continue;
      const mid = (a + b) / 2;
      const on = (d: number) => Math.abs(mid - (t0 + T / 2)) < (T * d) / 2;
      add(a, b, (on(duty[0]!) ? 1 : -1) - (on(duty[1]!) ? 1 : -1));
    }
  }
  const V = Array.from({ length: H + 1 }, (_, n) => 2 * Math.hypot(an[n]!, bn[n]!));
  return Math.sqrt(V.slice(2).reduce((s, x, i) => s + (x / (i + 2)) ** 2, 0)) / V[1]!;
}

describe('the healthy baseline is conventional centred SVM', () => {
  it.each([
    [0.5, 60],
    [0.9, 81],
    [1.1, 40],
  ])('two-level WTHD at m = %d, fsw/f1 = %d within 3 % of an independent centred SVM', (m, N) => {
    const s = simulatePeriod({ vdc: 2, currentPeak: 1, f1: 1, topology: 'two-level', m, loadAngleDeg: 20, fsw: N, update: 'period' });
    const ref = centredSvmWthd(m, N, 4 * N + 2);
    expect(Math.abs(s.lineVoltage.wthd / ref - 1)).toBeLessThan(0.03);
  });

  it('healthy NPC at 300 A and 2.2 mF: a midpoint ripple of tens of volts, an average current of about zero', () => {
    const s = simulatePeriod({ ...base, topology: 'npc', m: 1, loadAngleDeg: 25, fsw: 8000, capacitance: 0.0022 });
    expect(s.midpoint.ripplePkPk!).toBeGreaterThan(1);
    expect(s.midpoint.ripplePkPk!).toBeLessThan(100);
    expect(Math.abs(s.midpoint.averageCurrent!)).toBeLessThan(0.002 * 300);
  });
});

describe('dead time', () => {
  // Textbook dead-time error (N. Mohan, T. Undeland, W. Robbins, Power Electronics, 3rd ed. 2003,
  // ch. 8, from memory): over each switching period the phase loses td·Vdc of volt-seconds against
  // its current, so at unity power factor its fundamental drops by (4/π)·Vdc·td·fsw.
  it.each([1e-6, 3e-6])('lowers a two-level phase fundamental by (4/π)·Vdc·td·fsw at unity power factor (td = %s s)', (td) => {
    const o = { vdc: 600, currentPeak: 100, f1: 50, topology: 'two-level', m: 0.8, loadAngleDeg: 0, fsw: 5000 } as const;
    const v0 = simulatePeriod(o).lineVoltage.fundamentalPeak / Math.sqrt(3);
    const v1 = simulatePeriod({ ...o, deadTime: td }).lineVoltage.fundamentalPeak / Math.sqrt(3);
    const expected = (4 / Math.PI) * 600 * td * 5000;
    expect(Math.abs((v0 - v1) / expected - 1)).toBeLessThan(0.03);
  });
  it('with a fault, the dead-time state is what the faulted leg gives', () => {
    const s = simulationWaveform({
      ...base,
      topology: 'npc',
      faults: ['a.outerUpper.diode'],
      m: 0.5,
      loadAngleDeg: 20,
      polarityMarginDeg: 3,
      fsw: 4000,
      deadTime: 2e-6,
    });
    expect(s.some((g) => g.dead[0])).toBe(true);
  });
  it.each([
    [-1e-6, 'deadTime'],
    [1e-5, 'deadTime'],
    [Number.NaN, 'deadTime'],
  ])('refuses a dead time of %s s at 20 kHz', (td, key) => {
    expect(() => simulatePeriod({ ...base, topology: 'npc', m: 0.5, loadAngleDeg: 0, fsw: 20000, deadTime: td })).toThrow(HexsalvageInputError);
    expect(() => simulatePeriod({ ...base, topology: 'npc', m: 0.5, loadAngleDeg: 0, fsw: 20000, deadTime: td })).toThrow(key);
  });
});
