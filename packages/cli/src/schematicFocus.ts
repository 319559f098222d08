import { type LegAnalysis, type PatternResult, type Phase } from '@hexsalvage/core';
import { conductionEdges, expandElements, outputForSign, reasonInWords } from '@hexsalvage/core/internal';
import type { LegSchematicOptions } from '@hexsalvage/plot';
import { usage } from './inputs/args.js';

/**
 * Chooses what a leg schematic shows: the phase (default the first faulted one), the pattern
 * (default the first one a fault changes) and the current sign (default the one whose level the
 * fault changed, else `+`), with that pattern's conduction path.
 *
 * @param analysis - solved leg
 * @param phaseArg - `--phase`, optional
 * @param patternArg - `--pattern`, optional
 * @param signArg - `--sign`, optional
 * @returns schematic options (with a title)
 * @throws HexsalvageInputError for an unknown phase, pattern or sign
 * @example
 * ```ts
 * legSchematicSvg(analysis.leg, schematicFocus(analysis));
 * ```
 */
export function schematicFocus(analysis: LegAnalysis, phaseArg?: string, patternArg?: string, signArg?: string): LegSchematicOptions {
  const phase = (phaseArg ?? analysis.faults[0]?.phase ?? 'a') as Phase;
  if (!['a', 'b', 'c'].includes(phase)) throw usage('--phase', 'a, b or c', phaseArg);
  const table = analysis.phases[phase];
  const healthyOf = (p: PatternResult) => analysis.healthy.patterns.find((x) => x.name === p.name) as PatternResult;
  const levelOf = (p: PatternResult | undefined, sg: '+' | '-') => (p?.status === 'allowed' ? p.bySign[sg].level : undefined);
  const differs = (p: PatternResult, sg: '+' | '-') => levelOf(p, sg) !== levelOf(healthyOf(p), sg) || p.status !== healthyOf(p).status;
  const pick = patternArg ?? (table.patterns.find((p) => differs(p, '+') || differs(p, '-')) ?? table.patterns[0])?.name;
  const p = table.patterns.find((x) => x.name === pick);
  if (!p) throw usage('--pattern', `one of ${table.patterns.map((x) => x.name).join(', ')}`, patternArg);
  const sign = (signArg ?? (differs(p, '+') || !differs(p, '-') ? '+' : '-')) as '+' | '-';
  if (sign !== '+' && sign !== '-') throw usage('--sign', '+ or -', signArg);
  const mine = analysis.faults.filter((f) => f.phase === phase);
  const failed = mine.filter((f) => f.mode === 'open').map((f) => f.element);
  const shorted = mine.filter((f) => f.mode === 'short').map((f) => f.element);
  const title = `Leg ${analysis.topology}, phase ${phase}${mine.length ? `, failed: ${mine.map((f) => `${f.element} ${f.mode}`).join(', ')}` : ''}`;
  const common = { failed, shorted, pattern: { name: p.name, gates: p.gates }, sign, title };
  if (p.status === 'forbidden') {
    return {
      ...common,
      state: 'shoot-through',
      path: p.shootThrough.path,
      level: null,
      reason: `${p.shootThrough.from}→${p.shootThrough.to} via ${p.shootThrough.path.join(', ')}`,
    };
  }
  const outcome = p.bySign[sign];
  const unsafe = p.unsafe[sign];
  if (outcome.level === null && unsafe !== undefined) {
    // where the current would flow if the pattern were used: the leg without the rating check
    const faults = new Map(mine.map((f) => [f.element, f.mode] as const));
    const raw = outputForSign(analysis.leg, conductionEdges(expandElements(analysis.leg), new Set(p.gates), faults), sign);
    return { ...common, state: 'unsafe', path: raw.path, level: raw.level, reason: reasonInWords(unsafe) };
  }
  return { ...common, state: outcome.level === null ? 'interrupted' : 'path', path: outcome.path, level: outcome.level };
}
