import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { builtinLeg, HexsalvageInputError, parseNetlist } from '@hexsalvage/core';
import { hasMidpoint, legLevels, legTable } from '@hexsalvage/core/internal';

const FIVE = JSON.parse(readFileSync(new URL('../../examples/five-level-leg.json', import.meta.url), 'utf8')) as Record<string, unknown>;

function errorOf(doc: unknown): HexsalvageInputError {
  try {
    parseNetlist(doc, 'leg.json');
  } catch (e) {
    if (e instanceof HexsalvageInputError) return e;
    throw e;
  }
  throw new Error('expected a HexsalvageInputError');
}

// a copy of the NPC netlist as plain JSON data, to be broken in one place per case
type NetlistJson = { [key: string]: unknown; devices: Record<string, unknown>[] };
const base = () => JSON.parse(JSON.stringify(builtinLeg('npc'))) as NetlistJson;
const dev = (d: NetlistJson, i: number): Record<string, unknown> => d.devices[i] as Record<string, unknown>;

describe('parseNetlist', () => {
  it('accepts every built-in leg written out as a file', () => {
    for (const id of ['two-level', 'npc', 'anpc', 'anpc-hybrid', 'tnpc'] as const) {
      expect(parseNetlist(JSON.parse(JSON.stringify(builtinLeg(id))), `${id}.json`)).toEqual(builtinLeg(id));
    }
  });

  it.each([
    ['a non-object document', () => [], '(document)'],
    ['an unknown top-level key', () => ({ ...base(), colour: 'red' }), 'colour'],
    ['a missing name', () => ({ ...base(), name: '' }), 'name'],
    ['a DC node without a potential', () => ({ ...base(), dcNodes: { P: 1, O: null, N: -1 } }), 'dcNodes.O'],
    ['a single DC node', () => ({ ...base(), dcNodes: { P: 1 } }), 'dcNodes'],
    ['an output equal to a DC node', () => ({ ...base(), output: 'O' }), 'output'],
    ['an output no device touches', () => ({ ...base(), output: 'load' }), 'output'],
    [
      'an unknown node',
      () => {
        const d = base();
        dev(d, 1).to = 'oot';
        return d;
      },
      'devices[1].to',
    ],
    [
      'a device id used twice',
      () => {
        const d = base();
        dev(d, 1).id = 'outerUpper';
        return d;
      },
      'devices[1].id',
    ],
    [
      'a diode id clashing with a generated antiparallel diode',
      () => {
        const d = base();
        dev(d, 4).id = 'outerUpper.diode';
        return d;
      },
      'devices[4].id',
    ],
    [
      'a wrong kind',
      () => {
        const d = base();
        dev(d, 0).kind = 'thyristor';
        return d;
      },
      'devices[0].kind',
    ],
    [
      'a wrong type for from',
      () => {
        const d = base();
        dev(d, 0).from = 3;
        return d;
      },
      'devices[0].from',
    ],
    [
      'an antiparallel diode on a diode',
      () => {
        const d = base();
        dev(d, 4).antiparallelDiode = true;
        return d;
      },
      'devices[4].antiparallelDiode',
    ],
    [
      'a bad switching class',
      () => {
        const d = base();
        dev(d, 0).switching = 'fast';
        return d;
      },
      'devices[0].switching',
    ],
    ['a pattern naming an unknown switch', () => ({ ...base(), patterns: { P: ['outerUper'] } }), 'patterns.P[0]'],
    ['a pattern naming a diode', () => ({ ...base(), patterns: { P: ['clampUpper'] } }), 'patterns.P[0]'],
    ['a pattern naming a switch twice', () => ({ ...base(), patterns: { P: ['outerUpper', 'outerUpper'] } }), 'patterns.P[1]'],
    ['no patterns', () => ({ ...base(), patterns: {} }), 'patterns'],
    ['a __proto__ key', () => JSON.parse('{"name":"x","__proto__":{"polluted":1}}'), '__proto__'],
    [
      'a nested constructor key',
      () => {
        const d = base();
        (dev(d, 0) as { constructor: unknown }).constructor = 1;
        return d;
      },
      'devices[0].constructor',
    ],
  ])('rejects %s, naming the key', (_what, make, key) => {
    const e = errorOf(make());
    expect(e.code).toBe('netlist');
    expect(e.input).toBe('leg.json');
    expect(e.key).toBe(key);
    expect(e.message.startsWith(`leg.json: ${key}: expected `)).toBe(true);
    expect(e.message).not.toContain('\n');
  });

  it('solves a five-level diode-clamped leg of any number of DC nodes', () => {
    const leg = parseNetlist(FIVE, 'five-level-leg.json');
    const healthy = legTable(leg, new Map());
    expect(healthy.levels['?']).toEqual([-1, -0.5, 0, 0.5, 1]);
    // s1 open: L4 with i>0 falls back to the P1 clamp diode dA1 (0.5); with i<0 the s1 diode still returns to P2
    const faulted = legTable(leg, new Map([['s1', 'open']]));
    const l4 = faulted.patterns.find((p) => p.name === 'L4');
    expect(l4).toMatchObject({ status: 'allowed', bySign: { '+': { level: 0.5 }, '-': { level: 1 } } });
    expect(faulted.levels['+']).toEqual([-1, -0.5, 0, 0.5]);
    expect(faulted.levels['-']).toEqual([-1, -0.5, 0, 0.5, 1]);
  });
});

describe('hasMidpoint', () => {
  it('is true for a node at 0 between others, false without one or with 0 at an end (common practice: a split DC link)', () => {
    expect(hasMidpoint(legLevels(builtinLeg('npc')))).toBe(true);
    expect(hasMidpoint(legLevels(builtinLeg('two-level')))).toBe(false);
    expect(hasMidpoint([-1, -0.5, 0, 0.5, 1])).toBe(true);
    expect(hasMidpoint([0, 0.5, 1])).toBe(false);
    expect(hasMidpoint([-1, 0])).toBe(false);
  });
});
