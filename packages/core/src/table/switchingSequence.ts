import type { LevelTriplet } from '../geometry/clarke.js';
import { PHASES, type Phase } from '../netlist/faults.js';

/** One phase's state inside a leg state. */
export interface PhaseState {
  readonly level: number;
  readonly pattern: string;
  readonly gates: readonly string[];
}

/** A leg state of all three phases. */
export type LegState = readonly [PhaseState, PhaseState, PhaseState];

/** A phase stepping over a level inside the sequence. */
export interface LevelJump {
  readonly phase: Phase;
  readonly from: number;
  readonly to: number;
}

/** The centre-aligned, symmetric sequence chosen for one triangle. */
export interface SwitchingSequence {
  /** Vertex positions (0…2 into the triangle) from the period start to its centre; mirrored after. */
  readonly order: readonly [number, number, number];
  /** Realisation (triplet) index chosen for each vertex position. */
  readonly choice: readonly [number, number, number];
  /** The leg states s1, s2, s3 applied from the start to the centre of the period. */
  readonly states: readonly [LegState, LegState, LegState];
  /** Gate changes per switching period, per `phase.device`, only devices that change. */
  readonly gateChanges: Readonly<Record<string, number>>;
  readonly totalGateChanges: number;
  /** Steps between non-adjacent levels (e.g. P straight to N). */
  readonly levelJumps: readonly LevelJump[];
  /** Devices marked `switching: line` that change state inside the period, as `phase.device`. */
  readonly lineDevicesSwitching: readonly string[];
}

/** Candidate patterns of phase k (0…2) for a level, best first. */
export type PatternCandidatesOf = (phase: number, level: number) => readonly PhaseState[];

/**
 * The sequence rule: whether phase k may go from state `a` to state `b` in
 * one step of a sequence and back again. Absent: every step is allowed (`levelSteps: any`).
 */
export type StepAllowed = (phase: number, a: PhaseState, b: PhaseState) => boolean;

/**
 * Chooses the order, the triplet of each vertex and each phase's pattern for a centre-aligned,
 * symmetric period s1 → s2 → s3 → s2 → s1.
 *
 * Every vertex order and triplet combination is tried. Gate changes add up phase by phase, so for
 * each candidate each phase's three patterns are chosen on their own among the patterns giving its
 * levels. Ranking: gate changes of line-frequency devices first (a hybrid leg must keep them at
 * line rate where it can), then total gate changes per period, then level jumps, then pattern
 * preference, then enumeration order. Each transition counts twice (into and out of the centre).
 *
 * @param triplets - per vertex position, its realising level triplets
 * @param candidates - pattern candidates per phase and level, best first
 * @param levels - the leg's DC potentials sorted ascending (for level-jump detection)
 * @param lineDevices - device ids marked `switching: line`
 * @param memo - cache of per-phase solutions; share one across the triangles of one polarity
 *   (same candidates) to solve each phase/level combination once
 * @param step - the sequence rule; with it consecutive states differ in exactly one phase, by a step
 *   it allows (the same pattern pair both ways), and the other phases keep their pattern
 * @returns the chosen sequence, or `null` when a vertex cannot be realised (a level not among
 *   `levels`, no pattern for a level, or no order that obeys the rule)
 * @example
 * ```ts
 * chooseSequence([[[0, 0, 0]], [[1, 0, 0]], [[1, 1, 0]]], candidates, [-1, 0, 1], new Set())?.order;
 * ```
 */
export function chooseSequence(
  triplets: readonly (readonly LevelTriplet[])[],
  candidates: PatternCandidatesOf,
  levels: readonly number[],
  lineDevices: ReadonlySet<string>,
  memo: Map<string | number, unknown> = new Map(),
  step?: StepAllowed,
): SwitchingSequence | null {
  if (triplets.length !== 3 || triplets.some((r) => r.length === 0)) return null;
  // the same three levels of one phase recur across orders, triplets and triangles: solve each once,
  // keyed by an integer made of the levels' positions in the leg (no string in the innermost loop)
  const L = levels.length + 1;
  const phasePath = (k: number, i0: number, i1: number, i2: number): PhasePath | null => {
    const key = ((k * L + i0 + 1) * L + i1 + 1) * L + i2 + 1;
    let p = memo.get(key) as PhasePath | null | undefined;
    if (p === undefined) {
      const lv = [i0, i1, i2].map((i) => levels[i] as number);
      p = bestPhasePath(PHASES[k] as Phase, lv, (l) => candidates(k, l), lineDevices, step && ((x, y) => step(k, x, y)));
      memo.set(key, p);
    }
    return p;
  };
  // each realisation as the positions of its three levels in the leg, found once per vertex (a
  // level the leg does not have cannot be realised)
  const at = triplets.map((list) => {
    const ix = new Int32Array(3 * list.length);
    list.forEach((t, c) => {
      for (let k = 0; k < 3; k++) ix[3 * c + k] = levels.indexOf(t[k] as number);
    });
    return ix;
  });
  if (at.some((ix) => ix.includes(-1))) return null;
  // one phase changes between the realisations at offsets a and b (of the two position arrays)
  const apart = (x: Int32Array, a: number, y: Int32Array, b: number) =>
    (x[a] !== y[b] ? 1 : 0) + (x[a + 1] !== y[b + 1] ? 1 : 0) + (x[a + 2] !== y[b + 2] ? 1 : 0) === 1;
  // The search visits every order and triplet combination (thousands per triangle on a many-level
  // leg) and keeps the first of the lowest rank: the rank is compared as four numbers and the
  // sequence is built only when a combination beats the best so far.
  let best: SwitchingSequence | null = null;
  let bestLine = 0;
  let bestTotal = 0;
  let bestJumps = 0;
  let bestPref = 0;
  for (const order of PERMUTATIONS) {
    const r0 = triplets[order[0]] as readonly LevelTriplet[];
    const r1 = triplets[order[1]] as readonly LevelTriplet[];
    const r2 = triplets[order[2]] as readonly LevelTriplet[];
    const x0 = at[order[0]] as Int32Array;
    const x1 = at[order[1]] as Int32Array;
    const x2 = at[order[2]] as Int32Array;
    for (let c0 = 0; c0 < r0.length; c0++)
      for (let c1 = 0; c1 < r1.length; c1++) {
        const a0 = 3 * c0;
        const a1 = 3 * c1;
        // under the sequence rule the first step must change one phase: tested before the third
        // vertex's realisations are gone through (the order of the search is unchanged)
        if (step && !apart(x0, a0, x1, a1)) continue;
        for (let c2 = 0; c2 < r2.length; c2++) {
          const a2 = 3 * c2;
          if (step && !apart(x1, a1, x2, a2)) continue;
          const pa = phasePath(0, x0[a0] as number, x1[a1] as number, x2[a2] as number);
          if (pa === null) continue;
          const pb = phasePath(1, x0[a0 + 1] as number, x1[a1 + 1] as number, x2[a2 + 1] as number);
          if (pb === null) continue;
          const pc = phasePath(2, x0[a0 + 2] as number, x1[a1 + 2] as number, x2[a2 + 2] as number);
          if (pc === null) continue;
          const t0 = r0[c0] as LevelTriplet;
          const t1 = r1[c1] as LevelTriplet;
          const t2 = r2[c2] as LevelTriplet;
          const line = pa.line + pb.line + pc.line;
          const total = pa.total + pb.total + pc.total;
          let jumps = 0;
          for (let k = 0; k < 3; k++) {
            if (Math.abs((x1[a1 + k] as number) - (x0[a0 + k] as number)) > 1) jumps++;
            if (Math.abs((x2[a2 + k] as number) - (x1[a1 + k] as number)) > 1) jumps++;
          }
          const pref = pa.pref + pb.pref + pc.pref;
          if (
            best !== null &&
            !(
              line < bestLine ||
              (line === bestLine && (total < bestTotal || (total === bestTotal && (jumps < bestJumps || (jumps === bestJumps && pref < bestPref)))))
            )
          )
            continue;
          [bestLine, bestTotal, bestJumps, bestPref] = [line, total, jumps, pref];
          const t = [t0, t1, t2] as const;
          const paths = [pa, pb, pc];
          const levelJumps: LevelJump[] = [];
          PHASES.forEach((ph, k) => {
            for (let s = 0; s < 2; s++) {
              const [a, b] = [t[s]![k] as number, t[s + 1]![k] as number];
              if (Math.abs(levels.indexOf(b) - levels.indexOf(a)) > 1) levelJumps.push({ phase: ph, from: a, to: b });
            }
          });
          const choice = [0, 0, 0] as [number, number, number];
          [choice[order[0]], choice[order[1]], choice[order[2]]] = [c0, c1, c2];
          const states = [0, 1, 2].map((s) => paths.map((p) => p.states[s]) as unknown as LegState) as unknown as [LegState, LegState, LegState];
          const changes = paths.flatMap((p) => Object.entries(p.changes)).sort(([a], [b]) => (a < b ? -1 : 1));
          best = {
            order,
            choice,
            states,
            gateChanges: Object.fromEntries(changes),
            totalGateChanges: total,
            levelJumps,
            lineDevicesSwitching: paths.flatMap((p) => p.lineSwitching),
          };
        }
      }
  }
  return best;
}

interface PhasePath {
  readonly states: readonly PhaseState[];
  readonly changes: Record<string, number>;
  readonly total: number;
  readonly line: number;
  readonly pref: number;
  readonly lineSwitching: string[];
}

function bestPhasePath(
  ph: Phase,
  lv: readonly number[],
  cands: (level: number) => readonly PhaseState[],
  lineDevices: ReadonlySet<string>,
  step?: (a: PhaseState, b: PhaseState) => boolean,
): PhasePath | null {
  const [x, y, z] = lv.map(cands) as [readonly PhaseState[], readonly PhaseState[], readonly PhaseState[]];
  let best: PhasePath | null = null;
  for (let i = 0; i < x.length; i++)
    for (let j = 0; j < y.length; j++)
      for (let k = 0; k < z.length; k++) {
        const st = [x[i], y[j], z[k]] as PhaseState[];
        if (step && !(step(st[0]!, st[1]!) && step(st[1]!, st[2]!))) continue;
        const changes: Record<string, number> = {};
        for (const [a, b] of [
          [st[0], st[1]],
          [st[1], st[2]],
        ] as [PhaseState, PhaseState][]) {
          for (const d of gateDifference(a.gates, b.gates)) changes[`${ph}.${d}`] = (changes[`${ph}.${d}`] ?? 0) + 2;
        }
        const lineSwitching = Object.keys(changes).filter((key) => lineDevices.has(key.slice(ph.length + 1)));
        const path = {
          states: st,
          changes,
          total: sum(Object.values(changes)),
          line: sum(lineSwitching.map((key) => changes[key] as number)),
          pref: i + j + k,
          lineSwitching,
        };
        if (!best || lexLess([path.line, path.total, path.pref], [best.line, best.total, best.pref])) best = path;
      }
  return best;
}

/**
 * Devices whose gate differs between two gate sets.
 *
 * @param a - gate set
 * @param b - gate set
 * @returns ids in a or b but not both, in order of appearance
 * @example
 * ```ts
 * gateDifference(['s1', 's2'], ['s2', 's3']); // ['s1', 's3']
 * ```
 */
export function gateDifference(a: readonly string[], b: readonly string[]): string[] {
  return [...a.filter((g) => !b.includes(g)), ...b.filter((g) => !a.includes(g))];
}

/** The six orders of a triangle's three vertices (positions 0, 1, 2). */
export const PERMUTATIONS: readonly (readonly [number, number, number])[] = [
  [0, 1, 2],
  [0, 2, 1],
  [1, 0, 2],
  [1, 2, 0],
  [2, 0, 1],
  [2, 1, 0],
];

function sum(xs: readonly number[]): number {
  return xs.reduce((a, b) => a + b, 0);
}

/**
 * Lexicographic order of two keys of the same length.
 *
 * @param a - a key
 * @param b - another
 * @returns true when a comes strictly before b
 * @example
 * ```ts
 * lexLess([1, 2], [1, 3]); // true
 * ```
 */
export function lexLess(a: readonly number[], b: readonly number[]): boolean {
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return (a[i] as number) < (b[i] as number);
  return false;
}
