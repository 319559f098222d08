import { describe, expect, it } from 'vitest';
import {
  BUILTIN_TOPOLOGIES,
  builtinLeg,
  planRemedial,
  HexsalvageInputError,
  simulatePeriod,
  simulationWaveform,
  type DeviceParameterSet,
} from '@hexsalvage/core';
import { conductionLoss, expandElements, DEMO_DEVICES, eventEnergy, parseDeviceParameters } from '@hexsalvage/core/internal';
import { fc, fcParams } from '../support/fc.js';

const op = { vdc: 750, currentPeak: 150, f1: 50, fsw: 3000 } as const;

describe('simulatePeriod: currents', () => {
  it('Kirchhoff: in every piece each phase current flows along one chain of elements from a DC node at the phase level to the output', () => {
    for (const [topology, faults, m] of [
      ['npc', [], 0.9],
      ['npc', ['a.outerUpper'], 0.5],
      ['anpc-hybrid', ['a.innerUpper'], 0.4],
      ['tnpc', ['b.neutralToOut'], 0.5],
    ] as const) {
      const leg = builtinLeg(topology);
      const dev = new Map(
        leg.devices.flatMap(
          (d) =>
            [
              [d.id, [d.from, d.to]],
              [`${d.id}.diode`, [d.to, d.from]],
            ] as [string, string[]][],
        ),
      );
      const seg = simulationWaveform({ ...op, topology, faults: [...faults], m, loadAngleDeg: 20, polarityMarginDeg: 5 });
      expect(seg.length).toBeGreaterThan(5 * 60);
      for (const g of seg) {
        g.paths.forEach((path, k) => {
          expect(path.length, `${topology} phase ${k} at ${g.t0}`).toBeGreaterThan(0);
          // the chain's end nodes: one DC node at the phase's level, and the output
          const count = new Map<string, number>();
          for (const id of path) for (const nd of dev.get(id) as string[]) count.set(nd, (count.get(nd) ?? 0) + 1);
          const ends = [...count]
            .filter(([, c]) => c === 1)
            .map(([nd]) => nd)
            .sort();
          expect(ends).toHaveLength(2);
          expect(ends).toContain(leg.output);
          const dcEnd = ends.find((nd) => nd !== leg.output) as string;
          expect(leg.dcNodes[dcEnd], `${path.join(',')}`).toBeCloseTo(g.phaseVolts[k]! / (op.vdc / 2), 12);
        });
      }
    }
  });

  it('an open-failed element carries no current; every element of every phase is listed', () => {
    const s = simulatePeriod({ ...op, topology: 'npc', faults: ['a.outerUpper', 'b.innerUpper.diode'], m: 0.3, loadAngleDeg: 10, polarityMarginDeg: 5 });
    expect(s.devices['a.outerUpper']!.avgCurrent).toBe(0);
    expect(s.devices['a.outerUpper']!.rmsCurrent).toBe(0);
    expect(s.devices['b.innerUpper.diode']!.avgCurrent).toBe(0);
    expect(s.devices['c.outerUpper']!.avgCurrent).toBeGreaterThan(0);
    expect(Object.keys(s.devices)).toHaveLength(3 * 10);
  });

  it('reports the midpoint of a three-level leg and none for a two-level leg; ripple needs the capacitance', () => {
    const three = simulatePeriod({ ...op, topology: 'npc', m: 0.6, loadAngleDeg: 30, capacitance: 0.002 });
    expect(three.midpoint.chargePkPkAs).toBeGreaterThan(0);
    expect(three.midpoint.ripplePkPk).toBeCloseTo((three.midpoint.chargePkPkAs as number) / (2 * 0.002), 9);
    expect(simulatePeriod({ ...op, topology: 'npc', m: 0.6, loadAngleDeg: 30 }).midpoint.ripplePkPk).toBeNull();
    expect(simulatePeriod({ ...op, topology: 'two-level', m: 0.6, loadAngleDeg: 30, capacitance: 0.002 }).midpoint).toEqual({
      ripplePkPk: null,
      chargePkPkAs: null,
      averageCurrent: null,
    });
  });

  it('halves the midpoint ripple when the capacitance doubles (the swing is charge / (2C))', () => {
    const at = (capacitance: number) =>
      simulatePeriod({ ...op, topology: 'tnpc', faults: ['a.neutralToOut'], m: 0.5, loadAngleDeg: 40, capacitance, polarityMarginDeg: 5 }).midpoint
        .ripplePkPk as number;
    expect(at(0.002)).toBeGreaterThan(0);
    expect(at(0.004)).toBeCloseTo(at(0.002) / 2, 9);
  });

  it('runs on every built-in leg, healthy and faulted, and on a netlist object', () => {
    for (const t of BUILTIN_TOPOLOGIES) {
      const e = expandElements(builtinLeg(t))[0]!.id;
      for (const faults of [[], [`b.${e}`], [`b.${e}:short`]]) {
        const mMax = planRemedial({ topology: t, faults, loadAngleDeg: 15, polarityMarginDeg: 5 }).mMax;
        if (mMax === 0) {
          expect(() => simulatePeriod({ ...op, topology: t, faults, m: 0.1, loadAngleDeg: 15, polarityMarginDeg: 5 })).toThrow(/cannot run in this state/);
          continue;
        }
        const s = simulatePeriod({ ...op, topology: t, faults, m: 0.9 * mMax, loadAngleDeg: 15, polarityMarginDeg: 5 });
        expect(s.lineVoltage.fundamentalPeak).toBeGreaterThan(0);
        expect(Object.keys(s.devices).length).toBe(3 * expandElements(builtinLeg(t)).length);
      }
    }
    const leg = JSON.parse(JSON.stringify(builtinLeg('npc')));
    expect(simulatePeriod({ ...op, topology: leg, m: 0.5, loadAngleDeg: 0 }).topology).toBe(leg.name);
  });

  it('refuses an m above the limit, and says plainly when the drive cannot run', () => {
    expect(() => simulatePeriod({ ...op, topology: 'npc', faults: ['a.outerUpper'], m: 0.9, loadAngleDeg: 0 })).toThrow(/at most mMax = 0.577350/);
    expect(() => simulatePeriod({ ...op, topology: 'npc', faults: ['a.innerUpper'], m: 0.1, loadAngleDeg: 0 })).toThrow(/cannot run in this state/);
    expect(() => simulatePeriod({ ...op, topology: 'npc', m: 0.5, loadAngleDeg: 0, fsw: 100 })).toThrow(HexsalvageInputError);
  });
});

describe('loss model', () => {
  const igbt = { part: 'igbt' as const, p: { v0: 0.8, r: 0.004, eOn: 0.02, eOff: 0.03, vRef: 600, iRef: 300 }, rth: undefined };
  it('matches a hand calculation at constant current (common practice: P = v0·Iavg + r·Irms²; MOSFET rOn·Irms²)', () => {
    // 100 A dc: 0.8 V × 100 A + 4 mΩ × (100 A)² = 80 W + 40 W
    expect(conductionLoss(igbt, 100, 100)).toBeCloseTo(120, 12);
    expect(conductionLoss({ part: 'mosfet', p: { rOn: 0.01, eOn: 0, eOff: 0, vRef: 1, iRef: 1 }, rth: undefined }, 50, 50)).toBeCloseTo(25, 12);
    // 20 mJ at 600 V, 300 A scales to 375 V, 150 A: 20 mJ × 0.625 × 0.5
    expect(eventEnergy(0.02, 600, 300, 375, 150)).toBeCloseTo(0.00625, 15);
  });

  it('scales switching energy linearly with voltage and current (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1, max: 1500, noNaN: true }),
        fc.double({ min: 1, max: 1000, noNaN: true }),
        fc.double({ min: 0.1, max: 10, noNaN: true }),
        (v, i, k) => {
          const e = eventEnergy(0.02, 600, 300, v, i);
          expect(eventEnergy(0.02, 600, 300, k * v, i)).toBeCloseTo(k * e, 9);
          expect(eventEnergy(0.02, 600, 300, v, k * i)).toBeCloseTo(k * e, 9);
        },
      ),
      fcParams(200),
    );
  });

  it('in a simulation, losses scale with the current as the model says: switching and v0 terms linearly, resistive terms with its square', () => {
    const resistive: DeviceParameterSet = {
      name: 'resistive only',
      devices: {
        '*': { switch: { v0: 0, r: 0.01, eOn: 0.01, eOff: 0.01, vRef: 600, iRef: 300 }, diode: { v0: 0, r: 0.01, eRec: 0.01, vRef: 600, iRef: 300 } },
      },
    };
    const at = (currentPeak: number) =>
      simulatePeriod({ ...op, currentPeak, topology: 'npc', faults: ['a.outerUpper'], m: 0.5, loadAngleDeg: 25, devices: resistive, polarityMarginDeg: 5 });
    const one = at(100);
    const two = at(200);
    for (const [id, d] of Object.entries(one.devices)) {
      expect(two.devices[id]!.conductionLoss).toBeCloseTo(4 * d.conductionLoss, 6);
      expect(two.devices[id]!.switchingLoss).toBeCloseTo(2 * d.switchingLoss, 6);
    }
  });

  it('derates the current so that no element of the faulted leg loses more than the hottest healthy one', () => {
    const s = simulatePeriod({ ...op, topology: 'anpc-hybrid', faults: ['a.innerUpper'], m: 0.45, loadAngleDeg: 25, polarityMarginDeg: 3, currentPeak: 180 });
    expect(s.currentDerating.factor).toBeGreaterThan(0);
    expect(s.currentDerating.factor).toBeLessThan(1);
    // at the derated current the limiting element sits exactly at the healthy maximum, none above
    const d = simulatePeriod({
      ...op,
      topology: 'anpc-hybrid',
      faults: ['a.innerUpper'],
      m: 0.45,
      loadAngleDeg: 25,
      polarityMarginDeg: 3,
      currentPeak: 180 * s.currentDerating.factor,
    });
    const worst = Math.max(...Object.values(d.devices).map((x) => x.conductionLoss + x.switchingLoss));
    expect(worst).toBeCloseTo(s.healthy.hottest.loss, 6);
  });

  it('reads a device-parameter file and refuses a bad one naming the key', () => {
    const set = parseDeviceParameters({ name: 'x', devices: { igbt: { switch: { v0: 1, r: 0.01, eOn: 0.01, eOff: 0.01, vRef: 600, iRef: 300 } } } }, 'x.json');
    expect(set.devices.igbt?.switch?.v0).toBe(1);
    expect(() => parseDeviceParameters({ name: 'x', devices: { igbt: { switch: { v0: -1, eOn: 0, eOff: 0, vRef: 1, iRef: 1 } } } }, 'x.json')).toThrow(
      'devices.igbt.switch.v0',
    );
    expect(() => parseDeviceParameters({ name: 'x', devices: { igbt: { cooler: 1 } } }, 'x.json')).toThrow('devices.igbt.cooler');
    expect(DEMO_DEVICES.name).toMatch(/invented/);
  });
});
