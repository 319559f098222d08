import type { BuiltinTopology } from '@hexsalvage/core';

// Upper/lower mirror images of each built-in leg: devices and patterns. Negating every potential
// and reversing every current maps the upper half of the leg onto the lower half.
const DEVICES: Record<BuiltinTopology, Record<string, string>> = {
  'two-level': { upper: 'lower' },
  npc: { outerUpper: 'outerLower', innerUpper: 'innerLower', clampUpper: 'clampLower' },
  anpc: { outerUpper: 'outerLower', innerUpper: 'innerLower', clampUpper: 'clampLower' },
  'anpc-hybrid': { outerUpper: 'outerLower', innerUpper: 'innerLower', clampUpper: 'clampLower' },
  // the neutral branch O→M / out→M mirrors onto itself with its two switches exchanged
  tnpc: { upper: 'lower', neutralToOut: 'outToNeutral' },
};
const PATTERNS: Record<BuiltinTopology, Record<string, string>> = {
  'two-level': { P: 'N' },
  npc: { P: 'N', O: 'O' },
  anpc: { P: 'N', 'O-upper': 'O-lower', 'O-both': 'O-both' },
  'anpc-hybrid': { P: 'N', 'O-upper': 'O-lower' },
  tnpc: { P: 'N', O: 'O' },
};

function both(m: Record<string, string>): Record<string, string> {
  return { ...m, ...Object.fromEntries(Object.entries(m).map(([k, v]) => [v, k])) };
}

/** The mirror image of an element id (`x.diode` mirrors to `mirror(x).diode`). */
export function mirrorElement(t: BuiltinTopology, id: string): string {
  const [dev, suffix] = id.split('.');
  const m = both(DEVICES[t])[dev as string];
  if (!m) throw new Error(`no mirror for ${id}`);
  return suffix ? `${m}.${suffix}` : m;
}

/** The mirror image of a pattern name. */
export function mirrorPattern(t: BuiltinTopology, name: string): string {
  const m = both(PATTERNS[t])[name];
  if (!m) throw new Error(`no mirror for pattern ${name}`);
  return m;
}
