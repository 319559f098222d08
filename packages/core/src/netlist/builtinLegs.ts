import { HexsalvageInputError } from '../shared/errors.js';
import type { DeviceSpec, LegNetlist } from './netlist.js';

/** Ids of the legs hexsalvage ships with. */
export const BUILTIN_TOPOLOGIES = ['two-level', 'npc', 'anpc', 'anpc-hybrid', 'tnpc'] as const;

/** One of {@link BUILTIN_TOPOLOGIES}. */
export type BuiltinTopology = (typeof BUILTIN_TOPOLOGIES)[number];

const THREE_LEVEL = { P: 1, O: 0, N: -1 } as const;

// Ratings (common practice, fixed by the contract): clamped legs rate every device for half the
// link; a two-level leg and the outer switches of a T-type leg block the whole link.
const HALF = { rating: 1 } as const;
const FULL = { rating: 2 } as const;

function igbt(id: string, from: string, to: string, extra: Partial<DeviceSpec> = HALF): DeviceSpec {
  return { id, kind: 'igbt', from, to, antiparallelDiode: true, ...extra };
}

// The NPC switch chain P→X→out→Y→N is shared by the three clamped legs; only the clamp branch
// and the device technology differ. Writing it once keeps the element ids identical by design.
function clampedChain(inner: (id: string, from: string, to: string) => DeviceSpec, outer = igbt): DeviceSpec[] {
  return [outer('outerUpper', 'P', 'X'), inner('innerUpper', 'X', 'out'), inner('innerLower', 'out', 'Y'), outer('outerLower', 'Y', 'N')];
}

const LEGS: Record<BuiltinTopology, LegNetlist> = {
  'two-level': {
    name: 'two-level',
    dcNodes: { P: 1, N: -1 },
    output: 'out',
    devices: [igbt('upper', 'P', 'out', FULL), igbt('lower', 'out', 'N', FULL)],
    patterns: { P: ['upper'], N: ['lower'] },
  },
  npc: {
    name: 'npc',
    dcNodes: THREE_LEVEL,
    output: 'out',
    devices: [
      ...clampedChain(igbt),
      { id: 'clampUpper', kind: 'diode', from: 'O', to: 'X', ...HALF },
      { id: 'clampLower', kind: 'diode', from: 'Y', to: 'O', ...HALF },
    ],
    patterns: {
      P: ['outerUpper', 'innerUpper'],
      O: ['innerUpper', 'innerLower'],
      N: ['innerLower', 'outerLower'],
    },
  },
  anpc: {
    name: 'anpc',
    dcNodes: THREE_LEVEL,
    output: 'out',
    devices: [...clampedChain(igbt), igbt('clampUpper', 'X', 'O'), igbt('clampLower', 'O', 'Y')],
    patterns: {
      P: ['outerUpper', 'innerUpper', 'clampLower'],
      'O-upper': ['clampUpper', 'innerUpper'],
      'O-lower': ['innerLower', 'clampLower'],
      'O-both': ['clampUpper', 'innerUpper', 'innerLower', 'clampLower'],
      N: ['innerLower', 'outerLower', 'clampUpper'],
    },
  },
  'anpc-hybrid': {
    name: 'anpc-hybrid',
    dcNodes: THREE_LEVEL,
    output: 'out',
    devices: (() => {
      const line = { switching: 'line', technology: 'Si IGBT', ...HALF } as const;
      const sic = (id: string, from: string, to: string): DeviceSpec => ({
        id,
        kind: 'mosfet',
        from,
        to,
        antiparallelDiode: true,
        switching: 'pwm',
        technology: 'SiC MOSFET',
        ...HALF,
      });
      return [...clampedChain(sic, (id, from, to) => igbt(id, from, to, line)), igbt('clampUpper', 'X', 'O', line), igbt('clampLower', 'O', 'Y', line)];
    })(),
    patterns: {
      P: ['outerUpper', 'innerUpper', 'clampLower'],
      'O-lower': ['outerUpper', 'innerLower', 'clampLower'],
      'O-upper': ['outerLower', 'innerUpper', 'clampUpper'],
      N: ['outerLower', 'innerLower', 'clampUpper'],
    },
  },
  tnpc: {
    name: 'tnpc',
    dcNodes: THREE_LEVEL,
    output: 'out',
    devices: [igbt('upper', 'P', 'out', FULL), igbt('lower', 'out', 'N', FULL), igbt('neutralToOut', 'O', 'M'), igbt('outToNeutral', 'out', 'M')],
    patterns: {
      P: ['upper', 'neutralToOut'],
      O: ['neutralToOut', 'outToNeutral'],
      N: ['outToNeutral', 'lower'],
    },
  },
};

/**
 * Tells whether a string names a built-in leg.
 *
 * @param id - candidate topology id
 * @returns true for one of {@link BUILTIN_TOPOLOGIES}
 * @example
 * ```ts
 * isBuiltinTopology('npc'); // true
 * ```
 */
export function isBuiltinTopology(id: string): id is BuiltinTopology {
  return (BUILTIN_TOPOLOGIES as readonly string[]).includes(id);
}

/**
 * The netlist of a built-in leg, exactly as fixed by the interface contract.
 *
 * @param id - a built-in topology id
 * @returns the leg netlist (a fresh deep copy, safe to modify)
 * @example
 * ```ts
 * builtinLeg('npc').patterns.O; // ['innerUpper', 'innerLower']
 * ```
 */
export function builtinLeg(id: BuiltinTopology): LegNetlist {
  if (typeof id !== 'string' || !isBuiltinTopology(id))
    throw new HexsalvageInputError('topology', 'builtinLeg', 'id', `one of ${BUILTIN_TOPOLOGIES.join(', ')}`, id);
  return JSON.parse(JSON.stringify(LEGS[id])) as LegNetlist;
}
