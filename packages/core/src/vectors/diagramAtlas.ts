import { analyseLeg, type AnalyseLegOptions, type LegAnalysis } from '../leg/analyseLeg.js';
import { legLevels } from '../netlist/expandElements.js';
import { vectorShells, type VectorShell } from './classifyVectors.js';
import type { LevelMove } from '../leg/commutation.js';
import type { Phase } from '../netlist/faults.js';
import type { LegTable, PhasePolarity } from '../leg/legTable.js';
import { POLARITY_STRINGS, type PolarityString } from '../leg/polarity.js';
import { diagramScale, levelSetScale } from '../geometry/diagramScale.js';
import { offerKey, polarityDiagram, type PhaseOffer, type PolarityDiagram } from './polarityDiagram.js';
import type { LimitRules } from '../leg/rules.js';
import { BoundedCache } from '../shared/boundedCache.js';

// Above this many named patterns a diagram is first tried with the moves between neighbouring
// levels (see polarityDiagram): the full level-move search grows with the square of the patterns.
const STAGED_PATTERNS = 8;

// Polarity diagrams already built, by healthy leg, rule and the three phases' offers.
const DIAGRAMS = new BoundedCache<PolarityDiagram>(2048);
import { sharedSurvivingVectors, type SpaceVector } from './survivingVectors.js';

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
  // the same leg, faults, rules and bypass give the same atlas (a pure function of plain data):
  // remedies and alternatives ask for a few atlases again and again
  const key = atlasKey(options);
  if (key === null) return buildAtlas(options);
  return ATLASES.through(key, () => buildAtlas(options));
}

// Atlases already built, by their options as JSON.
const ATLASES = new BoundedCache<DiagramAtlas>(64);

function atlasKey(o: AnalyseLegOptions): string | null {
  if (typeof o !== 'object' || o === null) return null;
  try {
    return JSON.stringify([o.topology, o.faults ?? [], o.ignoreRatings ?? false, o.levelSteps ?? 'commutable', o.bypass ?? null]);
  } catch {
    return null;
  }
}

function buildAtlas(options: AnalyseLegOptions): DiagramAtlas {
  const analysis = analyseLeg(options);
  const h = analysis.healthy.levels;
  // The healthy diagram uses the robust sets; for any well-formed leg they equal the signed ones.
  // The longest healthy vector sets the scale of every tolerance (a leg written in volts works the
  // same), and the healthy vectors are built at that scale: the healthy diagram's vectors are then
  // the same shared set, not a second one built at another tolerance.
  const scale = levelSetScale(h['?']);
  const healthyVectors = sharedSurvivingVectors([h['?'], h['?'], h['?']], scale);
  const levelCount = new Set([...h['+'], ...h['-']]).size;
  const shells = vectorShells(healthyVectors, levelCount, diagramScale(healthyVectors));
  // Diagrams are shared by every call that meets the same offers under the same healthy leg and
  // rule (the healthy diagram is also what unfaulted level sets give): one bounded cache for all.
  const prefix = `${analysis.rules.levelSteps}|${h['?'].join(',')}|${levelCount}|`;
  // a local map in front: the 50 look-ups of one atlas meet only a handful of distinct diagrams
  const local = new Map<string, PolarityDiagram>();
  const cache = {
    get: (k: string) => {
      let d = local.get(k);
      if (!d) {
        d = DIAGRAMS.get(prefix + k);
        if (d) local.set(k, d);
      }
      return d;
    },
    set: (k: string, d: PolarityDiagram) => {
      local.set(k, d);
      DIAGRAMS.set(prefix + k, d);
    },
  };
  const rules = analysis.rules;
  const dc = legLevels(analysis.leg);
  // The full level moves (and the cache keys made of them) are searched only when a diagram needs
  // them: a diagram whose Delaunay triangles are admissible under the moves between neighbouring
  // levels alone needs no more (see polarityDiagram), and on a many-level leg the full search is
  // most of the work.
  const manyPatterns = Object.keys(analysis.leg.patterns).length > STAGED_PATTERNS;
  const offer = (t: LegTable): PhaseOffer => {
    const withMoves = rules.levelSteps !== 'any';
    let moves: PhaseOffer['moves'] | undefined;
    let keys: PhaseOffer['keys'] | undefined;
    const full = () => (moves ??= phaseMoves(t, rules, dc));
    return {
      levels: t.levels,
      get moves() {
        return full();
      },
      get keys() {
        const o = { levels: t.levels, moves: full() };
        return (keys ??= { '+': offerKey(o, '+', { withMoves }), '-': offerKey(o, '-', { withMoves }), '?': offerKey(o, '?', { withMoves }) });
      },
      // the first stage pays only where the full search is costly (many patterns, many levels); on a
      // small leg the full moves are cheap and the plain path wastes nothing (both give the same)
      ...(withMoves && manyPatterns ? { adjacent: (c: PhasePolarity) => t.commutations.adjacentMoves(c, dc) } : {}),
    };
  };
  const build = (offers: Readonly<Record<Phase, PhaseOffer>>) =>
    new Map(POLARITY_STRINGS.map((p) => [p, polarityDiagram(offers, p, healthyVectors, shells, rules, cache)] as const));
  const p = analysis.phases;
  const healthyOffer = offer(analysis.healthy);
  return {
    analysis,
    shells,
    healthyVectors,
    faulted: build({ a: offer(p.a), b: offer(p.b), c: offer(p.c) }),
    healthy: build({ a: healthyOffer, b: healthyOffer, c: healthyOffer }),
  };
}

/**
 * The level moves a phase may make under the rules: the commutable moves of its table, restricted
 * to neighbouring DC potentials under `adjacent` (none are used under `any`).
 *
 * @param table - the phase's leg table
 * @param rules - the rules
 * @param levels - the leg's DC potentials, ascending
 * @returns moves per polarity character
 * @example
 * ```ts
 * phaseMoves(table, { ratings: true, levelSteps: 'adjacent' }, [-1, 0, 1])['+'];
 * ```
 */
export function phaseMoves(table: LegTable, rules: LimitRules, levels: readonly number[]): Readonly<Record<PhasePolarity, readonly LevelMove[]>> {
  const all = table.commutations.moves;
  if (rules.levelSteps !== 'adjacent') return all;
  const near = (m: LevelMove) => Math.abs(levels.indexOf(m[0]) - levels.indexOf(m[1])) === 1;
  return { '+': all['+'].filter(near), '-': all['-'].filter(near), '?': all['?'].filter(near) };
}
