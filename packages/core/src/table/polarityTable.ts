import { patternCandidates } from '../leg/choosePattern.js';
import { hasMidpoint, legLevels } from '../netlist/expandElements.js';
import type { LevelTriplet } from '../geometry/clarke.js';
import type { DiagramAtlas } from '../vectors/diagramAtlas.js';
import type { DwellMatrix } from '../geometry/dwell.js';
import type { LegTable, PhasePolarity } from '../leg/legTable.js';
import { triangleLocator } from './createModulator.js';
import { midpointCoefficients, midpointSign, type MidpointSign } from '../leg/midpointCurrent.js';
import { parsePolarity, type PolarityString } from '../leg/polarity.js';
import type { ClassifiedVector, PolarityDiagram } from '../vectors/polarityDiagram.js';
import type { Triangle } from '../geometry/triangulate.js';
import { chooseSequence, type LegState, type PhaseState, type StepAllowed, type SwitchingSequence } from './switchingSequence.js';

/** One way of producing a vertex: a level triplet and the pattern of each phase. */
export interface VertexRealisation {
  readonly levels: LevelTriplet;
  readonly phases: LegState;
  /** 0/1 per phase: whose current flows through the DC midpoint. */
  readonly midpoint: readonly [0 | 1, 0 | 1, 0 | 1];
  /** Sign of the midpoint current under this polarity (null where a needed phase reads `?`). */
  readonly midpointSign: MidpointSign;
  /** Common-mode voltage (la + lb + lc)/3, units of Vdc/2. */
  readonly commonMode: number;
}

/** A triangle vertex with its realisations. */
export interface TableVertex {
  /** Index into the polarity's vectors. */
  readonly vector: number;
  readonly alpha: number;
  readonly beta: number;
  readonly class: string;
  readonly realisations: readonly VertexRealisation[];
}

/** Neutral-point control authority of a triangle. */
export type MidpointAuthority = 'full' | 'partial' | 'none';

/** One triangle of the degraded table. */
export interface TableTriangle {
  readonly vertices: readonly [TableVertex, TableVertex, TableVertex];
  readonly dwell: DwellMatrix;
  readonly midpointAuthority: MidpointAuthority;
  /** Authority of the healthy leg's triangle at this triangle's centroid. */
  readonly healthyMidpointAuthority: MidpointAuthority;
  /** True when the fault reduced the authority here. */
  readonly authorityLost: boolean;
  /** `null` only if a vertex has no realisation (never for a consistent leg). */
  readonly sequence: SwitchingSequence | null;
}

/** The degraded table of one polarity string. */
export interface PolarityTable {
  readonly polarity: PolarityString;
  readonly triangles: readonly TableTriangle[];
}

/**
 * Builds the degraded switching-state table of one polarity: realisations, midpoint current,
 * common-mode voltage, midpoint authority and the switching sequence of every triangle.
 *
 * Authority: `full` where some vertex has realisations drawing midpoint current of both signs
 * (redundancy can steer the midpoint either way); `partial` where some realisation draws a
 * definite midpoint current but no vertex offers both signs; `none` otherwise.
 *
 * @param atlas - diagrams and leg tables
 * @param polarity - polarity string
 * @returns the table of that polarity
 * @example
 * ```ts
 * polarityTable(diagramAtlas({ topology: 'npc' }), '+--').triangles.length; // 24
 * ```
 */
export function polarityTable(atlas: DiagramAtlas, polarity: PolarityString): PolarityTable {
  const faulted = buildTriangles(
    atlas,
    atlas.faulted.get(polarity) as PolarityDiagram,
    [atlas.analysis.phases.a, atlas.analysis.phases.b, atlas.analysis.phases.c],
    polarity,
  );
  const healthyDiagram = atlas.healthy.get(polarity) as PolarityDiagram;
  const h = atlas.analysis.healthy;
  // the healthy triangle under each faulted triangle's centroid (the same one a plain search of the
  // healthy triangles finds), then only those healthy triangles are built
  const find = healthyLocator(healthyDiagram);
  const under = faulted.map((t) =>
    find((t.vertices[0].alpha + t.vertices[1].alpha + t.vertices[2].alpha) / 3, (t.vertices[0].beta + t.vertices[1].beta + t.vertices[2].beta) / 3),
  );
  const needed = [...new Set(under.filter((k) => k >= 0))];
  const built = buildTriangles(atlas, healthyDiagram, [h, h, h], polarity, false, needed);
  const authorityOf = new Map(needed.map((k, i) => [k, (built[i] as Draft).midpointAuthority]));
  const triangles = faulted.map((t, i) => {
    const k = under[i] as number;
    const healthyMidpointAuthority = k >= 0 ? (authorityOf.get(k) as MidpointAuthority) : 'none';
    return { ...t, healthyMidpointAuthority, authorityLost: RANK[t.midpointAuthority] < RANK[healthyMidpointAuthority] };
  });
  return { polarity, triangles };
}

const RANK: Record<MidpointAuthority, number> = { none: 0, partial: 1, full: 2 };

// One grid locator per healthy tiling (polarity strings and calls share the tiling's frozen triangle
// list), answering as locateReference does (createModulator's exactness guarantee).
const LOCATORS = new WeakMap<object, (alpha: number, beta: number) => number>();

function healthyLocator(d: PolarityDiagram): (alpha: number, beta: number) => number {
  const known = LOCATORS.get(d.triangles);
  if (known) return known;
  const f = triangleLocator({
    vectors: d.vectors,
    hull: d.hull.map((i) => [d.vectors[i]?.alpha ?? 0, d.vectors[i]?.beta ?? 0] as [number, number]),
    triangles: d.triangles,
    dwell: d.dwell,
  });
  LOCATORS.set(d.triangles, f);
  return f;
}

type Draft = Omit<TableTriangle, 'healthyMidpointAuthority' | 'authorityLost'>;

// `withSequence: false` skips the sequence search where only the midpoint authority is needed;
// `only` builds just those triangles (indices into `d.triangles`), in that order.
function buildTriangles(
  atlas: DiagramAtlas,
  d: PolarityDiagram,
  tables: readonly [LegTable, LegTable, LegTable],
  polarity: PolarityString,
  withSequence = true,
  only?: readonly number[],
): Draft[] {
  const pol = parsePolarity(polarity);
  const leg = atlas.analysis.leg;
  const levels = legLevels(leg);
  const split = hasMidpoint(levels);
  const line = new Set(leg.devices.filter((x) => x.switching === 'line').map((x) => x.id));
  const cache = new Map<string, PhaseState[]>();
  const memo = new Map<string | number, unknown>();
  const candidatesOf = (k: number, level: number): PhaseState[] => {
    const key = `${k}:${level}`;
    let c = cache.get(key);
    if (!c) {
      c = patternCandidates(tables[k] as LegTable, atlas.analysis.healthy, level, pol[k] as PhasePolarity).map((x) => ({
        level,
        pattern: x.pattern,
        gates: x.gates,
      }));
      cache.set(key, c);
    }
    return c;
  };
  const step = sequenceRule(atlas, tables, pol, levels);
  // a vertex belongs to several triangles: realise it once
  const vertices = new Map<number, TableVertex>();
  const vertexOf = (vi: number): TableVertex => {
    const known = vertices.get(vi);
    if (known) return known;
    const v = d.vectors[vi] as ClassifiedVector;
    const realisations = v.levels
      .flatMap((t) => {
        const r = realise(t, candidatesOf);
        return r ? [r] : [];
      })
      .map((phases) => {
        const lv = phases.map((p) => p.level) as unknown as LevelTriplet;
        const midpoint = midpointCoefficients(lv, split);
        return { levels: lv, phases, midpoint, midpointSign: midpointSign(midpoint, pol), commonMode: (lv[0] + lv[1] + lv[2]) / 3 };
      });
    const vertex = { vector: vi, alpha: v.alpha, beta: v.beta, class: v.class, realisations };
    vertices.set(vi, vertex);
    return vertex;
  };
  return (only ?? d.triangles.map((_, i) => i)).map((i) => {
    const tri = d.triangles[i] as Triangle;
    const vertices = tri.map(vertexOf) as unknown as [TableVertex, TableVertex, TableVertex];
    return {
      vertices,
      dwell: d.dwell[i] as DwellMatrix,
      midpointAuthority: authority(vertices),
      sequence: withSequence
        ? chooseSequence(
            vertices.map((v) => v.realisations.map((r) => r.levels)),
            candidatesOf,
            levels,
            line,
            memo,
            step,
          )
        : null,
    };
  });
}

// The sequence rule of the atlas's rules: a level change needs one pattern pair that commutates both
// ways (and neighbouring levels under `adjacent`); a phase keeping its level keeps its pattern or
// changes it by a commutating pair. No rule under `levelSteps: any`.
function sequenceRule(
  atlas: DiagramAtlas,
  tables: readonly [LegTable, LegTable, LegTable],
  pol: readonly PhasePolarity[],
  levels: readonly number[],
): StepAllowed | undefined {
  const rules = atlas.analysis.rules;
  if (rules.levelSteps === 'any') return undefined;
  const index = new Map(Object.keys(atlas.analysis.leg.patterns).map((n, i) => [n, i]));
  return (k, a, b) => {
    if (a.pattern === b.pattern) return true;
    if (rules.levelSteps === 'adjacent' && a.level !== b.level && Math.abs(levels.indexOf(a.level) - levels.indexOf(b.level)) !== 1) return false;
    const commute = (tables[k] as LegTable).commutations.patternsCommute;
    const i = index.get(a.pattern) as number;
    const j = index.get(b.pattern) as number;
    return commute(pol[k] as PhasePolarity, i, j) && commute(pol[k] as PhasePolarity, j, i);
  };
}

// Each phase's preferred pattern for its level: the first candidate (what choosePattern gives).
function realise(t: LevelTriplet, candidatesOf: (k: number, level: number) => PhaseState[]): LegState | null {
  const out: PhaseState[] = [];
  for (let k = 0; k < 3; k++) {
    const c = candidatesOf(k, t[k] as number)[0];
    if (!c) return null;
    out.push(c);
  }
  return out as unknown as LegState;
}

function authority(vertices: readonly TableVertex[]): MidpointAuthority {
  let definite = false;
  for (const v of vertices) {
    const signs = new Set(v.realisations.map((r) => r.midpointSign));
    if (signs.has(1) && signs.has(-1)) return 'full';
    if (signs.has(1) || signs.has(-1)) definite = true;
  }
  return definite ? 'partial' : 'none';
}
