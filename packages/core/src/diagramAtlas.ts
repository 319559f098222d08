import { analyseLeg, type AnalyseLegOptions, type LegAnalysis } from './analyseLeg.js';
import { vectorShells, type VectorShell } from './classifyVectors.js';
import type { Phase } from './faults.js';
import type { LevelSets } from './legTable.js';
import { POLARITY_STRINGS, type PolarityString } from './polarity.js';
import { polarityDiagram, type PolarityDiagram } from './polarityDiagram.js';
import { survivingVectors, type SpaceVector } from './survivingVectors.js';

/** The diagrams of all 25 polarity strings for a faulted leg and for the same leg healthy. */
export interface DiagramAtlas {
  readonly analysis: LegAnalysis;
  readonly shells: readonly VectorShell[];
  /** Vectors of the healthy leg (identical for every polarity there). */
  readonly healthyVectors: readonly SpaceVector[];
  readonly faulted: ReadonlyMap<PolarityString, PolarityDiagram>;
  readonly healthy: ReadonlyMap<PolarityString, PolarityDiagram>;
}

/**
 * Solves the leg and builds the vector diagram of every polarity string, faulted and healthy.
 *
 * @param options - topology and faults
 * @returns the atlas of diagrams
 * @throws HexsalvageInputError for bad topology or fault input
 * @example
 * ```ts
 * diagramAtlas({ topology: 'npc', faults: ['a.outerUpper'] }).faulted.get('+--')?.radius;
 * ```
 */
export function diagramAtlas(options: AnalyseLegOptions): DiagramAtlas {
  const analysis = analyseLeg(options);
  const h = analysis.healthy.levels;
  // The healthy diagram uses the robust sets; for any well-formed leg they equal the signed ones.
  const healthyVectors = survivingVectors([h['?'], h['?'], h['?']]);
  const levelCount = new Set([...h['+'], ...h['-']]).size;
  const shells = vectorShells(healthyVectors, levelCount);
  // one cache for both maps: the healthy diagram is also what unfaulted level sets give
  const cache = new Map<string, PolarityDiagram>();
  const build = (levels: Readonly<Record<Phase, LevelSets>>) =>
    new Map(POLARITY_STRINGS.map((p) => [p, polarityDiagram(levels, p, healthyVectors, shells, cache)] as const));
  const p = analysis.phases;
  return {
    analysis,
    shells,
    healthyVectors,
    faulted: build({ a: p.a.levels, b: p.b.levels, c: p.c.levels }),
    healthy: build({ a: h, b: h, c: h }),
  };
}
