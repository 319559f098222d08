import type { LevelTriplet } from '../geometry/clarke.js';
import { POLARITY_CHARS, type PhaseSteps } from './patternSteps.js';
import { parsePolarity, POLARITY_STRINGS } from '../leg/polarity.js';
import type { SwitchingTable } from './switchingTable.js';
import { lexLess, PERMUTATIONS } from './switchingSequence.js';
import { hasMidpoint } from '../netlist/expandElements.js';

/** Largest number of sequence candidates kept per triangle (best static rank; every first and last triplet kept first). */
export const MAX_CANDIDATES = 64;
/** Largest number of pattern paths kept per phase sequence (best static rank first). */
export const MAX_PATHS = 256;
/** Marks "no path" in {@link RuntimeProgram.dist}. */
export const NO_PATH = 0xffff;

/**
 * The runtime's tables, as flat typed arrays that the TypeScript runtime reads and the C header
 * prints one for one.
 *
 * Indices: phase k (0…2), polarity character c (0 `+`, 1 `-`, 2 `?`), pattern p (position among
 * the leg's named patterns, `P` of them). Triangles are numbered globally as in the C header:
 * polarity index q holds rows `triFirst[q] … triFirst[q+1]−1`.
 *
 * A **candidate** is a half-period sequence of level triplets through a triangle's vertices: `A B C`,
 * or `A1 B C A2` where a redundant vertex comes back with another triplet (its dwell split). Each
 * step changes one phase's level. The patterns are not part of the candidate: phases step on their
 * own, so each phase's **sequence** (its levels through the half period under its polarity
 * character) is realised by one of its **paths** (a pattern per state: allowed steps both ways
 * where the level changes, the same pattern where it does not), chosen per period from the
 * previous pattern by the **pick** tables.
 */
export interface RuntimeProgram {
  readonly patternCount: number;
  /** The leg has a DC node at potential 0 (a midpoint): states draw midpoint current. */
  readonly hasMidpoint: boolean;
  /** Per polarity index, the character index of each phase (3 per polarity). */
  readonly polarityChars: Uint8Array;
  /** `level[(k·3 + c)·P + p]`: level of pattern p for the character (NaN: not usable). */
  readonly level: Float64Array;
  /**
   * `allowed[((e·9 + k·3 + c)·P + i)·P + j]`: 1 where phase k may step from pattern i to j under
   * character c; e = 0 inside a stretch of that character, e = 1 at the boundary where the phase's
   * character becomes c (`PhaseSteps.entries`).
   */
  readonly allowed: Uint8Array;
  /**
   * Shortest allowed path i → j of one phase, same index as `allowed` (for e = 1 the first step is
   * an entry, the rest inside c): its length (`NO_PATH` where none) and first hop.
   */
  readonly dist: Uint16Array;
  readonly next: Int32Array;
  /**
   * `enterable[(k·3 + c)·P + p]`: 1 where phase k, left in pattern p, can enter character c at the
   * next boundary (some pattern usable for c is reachable, the first step an entry). The runtime
   * avoids ending a period in a pattern the next period's character could not leave safely.
   */
  readonly enterable: Uint8Array;
  /** Global triangle rows per polarity index (26 entries). */
  readonly triFirst: Int32Array;
  /**
   * Per global triangle, 3 slots: the triangles of the same polarity sharing an edge with it (its
   * edges v0v1, v1v2, v2v0; −1: none). The C runtime tests them when a reference leaves its
   * previous triangle, before it searches (the TypeScript modulator has a grid instead).
   */
  readonly triNext: Int32Array;
  /** Candidates of global triangle g: `candFirst[g] … candFirst[g+1]−1`, best static rank first. */
  readonly candFirst: Int32Array;
  /** Per candidate: number of states in its half period (3, or 4 when a vertex is split). */
  readonly candCount: Uint8Array;
  /** Per candidate, 4 slots: the triangle's vertex position of each state. */
  readonly candPos: Uint8Array;
  /** Per candidate, 12 slots: level of each phase in each state, as an index into `candLevels` (unused slots: the index of 0). */
  readonly candLevel: Uint8Array;
  /** The levels the candidates' states take, ascending (units of Vdc/2). */
  readonly candLevels: Float64Array;
  /** Per candidate, 4 slots: bit k set when phase k sits at the midpoint potential in that state. */
  readonly candMask: Uint8Array;
  /** Per candidate, 3 slots: the sequence of each phase. */
  readonly candSeq: Int32Array;
  /** Per candidate: the phase whose level never changes inside the half (clamped), −1 when none. */
  readonly candClamped: Int8Array;
  /** Per sequence: its paths are `pathFirst[s] … pathFirst[s+1]−1`, best static rank first. */
  readonly pathFirst: Int32Array;
  /** Per path, 4 slots: the pattern of each state (unused slots −1). */
  readonly pathPattern: Int32Array;
  /**
   * Per (sequence s, direction d: 0 up 1 down, boundary b: 0 same character 1 changed, previous
   * pattern p + 1 with 0 = none), three options o: the best path entered without a step (o = 0),
   * with one allowed step (o = 1), and with the fewest steps (o = 2); −1 where there is none.
   * Index `(((s·2 + d)·2 + b)·(P + 1) + p + 1)·3 + o`. `pickLine`, `pickGates` and `pickDist`
   * hold the option's gate changes of line-frequency devices and of all devices per period (the
   * entry step counted once, each step inside twice) and its entry steps.
   */
  readonly pick: Int32Array;
  readonly pickLine: Int32Array;
  readonly pickGates: Int32Array;
  readonly pickDist: Int32Array;
}

interface Ctx {
  readonly P: number;
  readonly level: Float64Array;
  readonly allowed: Uint8Array;
  readonly dist: Uint16Array;
  readonly phases: readonly PhaseSteps[];
  readonly gateDiff: (i: number, j: number) => number;
  readonly lineDiff: (i: number, j: number) => number;
}

interface Path {
  readonly patterns: readonly number[];
  readonly line: number;
  readonly gates: number;
  readonly pref: number;
}

interface SequenceDraft {
  readonly k: number;
  readonly c: number;
  readonly paths: readonly Path[];
}

interface CandidateDraft {
  readonly pos: readonly number[];
  readonly levels: readonly LevelTriplet[];
  readonly seq: readonly number[];
  readonly rank: readonly number[];
}

/**
 * Builds the runtime's tables from a switching table: its triangles, their vertices' level
 * triplets, and each phase's step data.
 *
 * Candidates of a triangle: every vertex order and choice of triplets in which each step changes
 * one phase's level and every phase's level sequence has a path; static rank, best first: fewest
 * gate changes of line-frequency devices, the least common-mode voltage visited, fewest gate
 * changes, most preferred patterns (each of the phases' best paths), then enumeration order.
 *
 * @param table - from `switchingTable`
 * @returns the flat tables
 * @example
 * ```ts
 * runtimeProgram(switchingTable({ topology: 'npc' })).candFirst.length;
 * ```
 */
export function runtimeProgram(table: SwitchingTable): RuntimeProgram {
  const P = table.patterns.length;
  const phases = [table.phaseSteps.a, table.phaseSteps.b, table.phaseSteps.c] as const;
  const level = new Float64Array(9 * P).fill(NaN);
  const allowed = new Uint8Array(18 * P * P);
  phases.forEach((ph, k) =>
    POLARITY_CHARS.forEach((c, ci) => {
      const base = (k * 3 + ci) * P;
      ph.levels[c].forEach((l, p) => {
        if (l !== null) level[base + p] = l;
      });
      for (const [i, j] of ph.steps[c]) allowed[(base + i) * P + j] = 1;
      for (const [i, j] of ph.entries[c]) allowed[(9 * P + base + i) * P + j] = 1;
    }),
  );
  const { dist, next } = shortestSteps(allowed, P);
  const enterable = new Uint8Array(9 * P);
  for (let kc = 0; kc < 9; kc++) {
    for (let p = 0; p < P; p++) {
      for (let q = 0; q < P && enterable[kc * P + p] === 0; q++) {
        if (!Number.isNaN(level[kc * P + q] as number) && (dist[(9 * P + kc * P + p) * P + q] as number) !== NO_PATH) enterable[kc * P + p] = 1;
      }
    }
  }
  const polarityChars = new Uint8Array(3 * POLARITY_STRINGS.length);
  POLARITY_STRINGS.forEach((p, q) =>
    parsePolarity(p).forEach((c, k) => {
      polarityChars[3 * q + k] = POLARITY_CHARS.indexOf(c);
    }),
  );
  const gateSets = table.patternGates.map((g) => new Set(g));
  const line = new Set(table.lineDevices);
  const diff = (i: number, j: number, only?: ReadonlySet<string>) => {
    let n = 0;
    const a = gateSets[i] as Set<string>;
    const b = gateSets[j] as Set<string>;
    for (const g of a) if (!b.has(g) && (!only || only.has(g))) n++;
    for (const g of b) if (!a.has(g) && (!only || only.has(g))) n++;
    return n;
  };
  const ctx: Ctx = { P, level, allowed, dist, phases, gateDiff: (i, j) => diff(i, j), lineDiff: (i, j) => diff(i, j, line) };
  const midpoint = hasMidpoint(table.levels);
  // every level a triplet holds, numbered (the keys of the sequences and of pick())
  const places = new Map<number, number>();
  for (const pol of POLARITY_STRINGS)
    for (const tri of table.polarities[pol]?.tableTriangles ?? [])
      for (const v of tri.vertices) for (const r of v.realisations) for (const l of r.levels) if (!places.has(l)) places.set(l, places.size);
  const sequences: SequenceDraft[] = [];
  // a sequence's key as a number: phase, character, length, then each state's level by its place
  // (a string only past 63 levels)
  const seqIndex = new Map<number | string, number>();
  const sequenceKey = (k: number, c: number, states: readonly LevelTriplet[]): number | string => {
    let key = (k * 3 + c) * 5 + states.length;
    for (const t of states) {
      const at = places.get(t[k] as number) as number;
      if (at >= 63) return `${k}|${c}|${states.map((x) => x[k]).join(',')}`;
      key = key * 64 + at;
    }
    return key;
  };
  // the sequence of phase k (character c) through the states: its index, made on first sight
  const sequenceOf = (k: number, c: number, states: readonly LevelTriplet[]): number => {
    const key = sequenceKey(k, c, states);
    let s = seqIndex.get(key);
    if (s === undefined) {
      s = sequences.length;
      sequences.push({
        k,
        c,
        paths: phasePaths(
          ctx,
          k,
          c,
          states.map((t) => t[k] as number),
        ),
      });
      seqIndex.set(key, s);
    }
    return s;
  };
  const triFirst = new Int32Array(POLARITY_STRINGS.length + 1);
  const store = new CandidateStore(midpoint);
  POLARITY_STRINGS.forEach((pol, q) => {
    const tris = table.polarities[pol]?.tableTriangles ?? [];
    triFirst[q + 1] = (triFirst[q] as number) + tris.length;
    const chars = [0, 1, 2].map((k) => polarityChars[3 * q + k] as number);
    for (const tri of tris)
      store.add(
        triangleCandidates(
          tri.vertices.map((v) => v.realisations.map((r) => r.levels)),
          chars,
          sequenceOf,
          sequences,
          places,
        ),
      );
  });
  return {
    patternCount: P,
    hasMidpoint: midpoint,
    polarityChars,
    level,
    allowed,
    dist,
    next,
    enterable,
    triFirst,
    triNext: triangleNeighbours(table, triFirst),
    ...store.finish(),
    ...flattenSequences(ctx, sequences),
  };
}

// The neighbours of each triangle within its polarity (see RuntimeProgram.triNext).
function triangleNeighbours(table: SwitchingTable, triFirst: Int32Array): Int32Array {
  const next = new Int32Array(3 * (triFirst[POLARITY_STRINGS.length] as number)).fill(-1);
  POLARITY_STRINGS.forEach((pol, q) => {
    const tris = table.polarities[pol]?.triangles ?? [];
    const base = triFirst[q] as number;
    const byEdge = new Map<string, number[]>();
    const edgeKey = (a: number, b: number) => (a < b ? `${a},${b}` : `${b},${a}`);
    tris.forEach((tri, t) => {
      for (let e = 0; e < 3; e++) {
        const key = edgeKey(tri[e] as number, tri[(e + 1) % 3] as number);
        byEdge.set(key, [...(byEdge.get(key) ?? []), t]);
      }
    });
    tris.forEach((tri, t) => {
      for (let e = 0; e < 3; e++) {
        const other = (byEdge.get(edgeKey(tri[e] as number, tri[(e + 1) % 3] as number)) ?? []).find((u) => u !== t);
        if (other !== undefined) next[3 * (base + t) + e] = base + other;
      }
    });
  });
  return next;
}

// Breadth-first shortest paths in each phase's step graph, per character: length and first hop;
// then the paths that start with an entry step (e = 1) and go on inside the character.
function shortestSteps(allowed: Uint8Array, P: number): { dist: Uint16Array; next: Int32Array } {
  const dist = new Uint16Array(18 * P * P).fill(NO_PATH);
  const next = new Int32Array(18 * P * P).fill(-1);
  const queue = new Int32Array(P);
  for (let kc = 0; kc < 9; kc++) {
    const base = kc * P;
    for (let s = 0; s < P; s++) {
      const row = (base + s) * P;
      dist[row + s] = 0;
      next[row + s] = s;
      let head = 0;
      let tail = 0;
      queue[tail++] = s;
      while (head < tail) {
        const x = queue[head++] as number;
        for (let y = 0; y < P; y++) {
          if (allowed[(base + x) * P + y] !== 1 || dist[row + y] !== NO_PATH) continue;
          dist[row + y] = (dist[row + x] as number) + 1;
          next[row + y] = x === s ? y : (next[row + x] as number);
          queue[tail++] = y;
        }
      }
    }
    const entry = 9 * P + base;
    for (let s = 0; s < P; s++) {
      const row = (entry + s) * P;
      for (let t = 0; t < P; t++) {
        if (s === t) {
          dist[row + t] = 0;
          next[row + t] = t;
          continue;
        }
        for (let h = 0; h < P; h++) {
          if (allowed[(entry + s) * P + h] !== 1) continue;
          const rest = dist[(base + h) * P + t] as number;
          if (rest === NO_PATH || rest + 1 >= (dist[row + t] as number)) continue;
          dist[row + t] = rest + 1;
          next[row + t] = h;
        }
      }
    }
  }
  return { dist, next };
}

// Every pattern path of one phase through a level sequence (the same pattern while the level stays,
// an allowed step both ways where it changes), best static rank first, at most MAX_PATHS.
function phasePaths(ctx: Ctx, k: number, c: number, lv: readonly number[]): Path[] {
  const { P, level, allowed } = ctx;
  const base = (k * 3 + c) * P;
  const pref = (ctx.phases[k] as PhaseSteps).preference[POLARITY_CHARS[c] as '+'];
  const giving = (l: number) => {
    const out: number[] = [];
    for (let p = 0; p < P; p++) if (level[base + p] === l) out.push(p);
    return out;
  };
  const paths: Path[] = [];
  const walk = (i: number, acc: number[]) => {
    if (paths.length >= 4 * MAX_PATHS) return;
    if (i === lv.length) {
      let line = 0;
      let gates = 0;
      let pr = 0;
      acc.forEach((p, s) => {
        pr += pref[p] as number;
        if (s > 0) {
          line += 2 * ctx.lineDiff(acc[s - 1] as number, p);
          gates += 2 * ctx.gateDiff(acc[s - 1] as number, p);
        }
      });
      paths.push({ patterns: [...acc], line, gates, pref: pr });
      return;
    }
    if (i > 0 && lv[i] === lv[i - 1]) return walk(i + 1, [...acc, acc[i - 1] as number]);
    for (const p of giving(lv[i] as number)) {
      if (i > 0) {
        const q = acc[i - 1] as number;
        if (allowed[(base + q) * P + p] !== 1 || allowed[(base + p) * P + q] !== 1) continue;
      }
      walk(i + 1, [...acc, p]);
    }
  };
  walk(0, []);
  return paths
    .map((p, i) => ({ p, i }))
    .sort((x, y) => x.p.line - y.p.line || x.p.gates - y.p.gates || x.p.pref - y.p.pref || x.i - y.i)
    .slice(0, MAX_PATHS)
    .map((x) => x.p);
}

// the vertex positions of each order's states with the first vertex split (four states)
const ORDERS4: readonly (readonly number[])[] = PERMUTATIONS.map((p) => [...p, p[0]]);

// The candidates of one triangle (see runtimeProgram). Every vertex order and choice of triplets
// is weighed, but only what pick() can keep is held (a leg of many levels has tens of thousands
// per triangle): the best-ranked MAX_CANDIDATES, and per form the best-ranked of each first and of
// each last triplet. pick() takes its first round from the latter and fills up from the former, so
// it picks the same from these as from all.
function triangleCandidates(
  triplets: readonly (readonly LevelTriplet[])[],
  chars: readonly number[],
  sequenceOf: (k: number, c: number, states: readonly LevelTriplet[]) => number,
  sequences: readonly SequenceDraft[],
  places: ReadonlyMap<number, number>,
): CandidateDraft[] {
  const apart = (x: LevelTriplet, y: LevelTriplet) => (x[0] !== y[0] ? 1 : 0) + (x[1] !== y[1] ? 1 : 0) + (x[2] !== y[2] ? 1 : 0);
  let count = 0;
  let all: CandidateDraft[] | null = null;
  const top: CandidateDraft[] = [];
  const ends = new Map<number, CandidateDraft>();
  const emit = (levels: LevelTriplet[], pos: readonly number[]) => {
    const s0 = sequenceOf(0, chars[0] as number, levels);
    const s1 = sequenceOf(1, chars[1] as number, levels);
    const s2 = sequenceOf(2, chars[2] as number, levels);
    const p0 = (sequences[s0] as SequenceDraft).paths[0];
    const p1 = (sequences[s1] as SequenceDraft).paths[0];
    const p2 = (sequences[s2] as SequenceDraft).paths[0];
    if (!p0 || !p1 || !p2) return;
    const line = 0 + p0.line + p1.line + p2.line;
    const gates = 0 + p0.gates + p1.gates + p2.gates;
    const pref = 0 + p0.pref + p1.pref + p2.pref;
    // the common-mode voltage the states visit (|la + lb + lc| / 3 summed): the small-vector split
    // of the conventional three-level sequence rather than a zero vector's P and N forms
    let cm = 0;
    for (const t of levels) cm += Math.abs((t[0] as number) + (t[1] as number) + (t[2] as number));
    const index = count++;
    // a later candidate comes before a held one only by a smaller static rank (its index is larger)
    const beats = (held: CandidateDraft | undefined) => {
      if (!held) return true;
      const r = held.rank;
      return line !== r[0]
        ? line < (r[0] as number)
        : cm !== r[1]
          ? cm < (r[1] as number)
          : gates !== r[2]
            ? gates < (r[2] as number)
            : pref < (r[3] as number);
    };
    const kf = all ? 0 : endKey(levels, 0, places);
    const kl = all ? 0 : endKey(levels, 1, places);
    const toTop = top.length < MAX_CANDIDATES || beats(top[MAX_CANDIDATES - 1]);
    const toFirst = !all && beats(ends.get(kf));
    const toLast = !all && beats(ends.get(kl));
    if (!all && !toTop && !toFirst && !toLast) return;
    const d: CandidateDraft = { pos, levels, seq: [s0, s1, s2], rank: [line, cm, gates, pref, index] };
    if (all) {
      all.push(d);
      return;
    }
    if (toFirst) ends.set(kf, d);
    if (toLast) ends.set(kl, d);
    if (!toTop) return;
    let at = top.length;
    while (at > 0 && byRank(d, top[at - 1] as CandidateDraft) < 0) at--;
    top.splice(at, 0, d);
    if (top.length > MAX_CANDIDATES) top.pop();
  };
  // Each step changes one phase (`most` = 1). Where no such sequence exists (a Delaunay triangle
  // under levelSteps: any), steps may change more phases: those with the fewest changes are kept,
  // and the runtime counts them as multi-phase steps.
  const enumerate = (most: number) => {
    PERMUTATIONS.forEach((order, o) => {
      const [A, B, C] = order;
      for (const tA of triplets[A] as readonly LevelTriplet[]) {
        for (const tB of triplets[B] as readonly LevelTriplet[]) {
          const ab = apart(tA, tB);
          if (ab < 1 || ab > most) continue;
          for (const tC of triplets[C] as readonly LevelTriplet[]) {
            const bc = apart(tB, tC);
            if (bc < 1 || bc > most) continue;
            emit([tA, tB, tC], order);
            for (const tA2 of triplets[A] as readonly LevelTriplet[]) {
              const ca = apart(tC, tA2);
              if (tA2 !== tA && ca >= 1 && ca <= most) emit([tA, tB, tC, tA2], ORDERS4[o] as readonly number[]);
            }
          }
        }
      }
    });
  };
  enumerate(1);
  if (count > 0) return pick([...new Set([...top, ...ends.values()])], places);
  // the fallback keeps every candidate: the fewest changes are known only at the end
  all = [];
  enumerate(3);
  const changes = (d: CandidateDraft) => d.levels.reduce((n, t, i) => n + (i > 0 ? apart(d.levels[i - 1] as LevelTriplet, t) : 0), 0);
  const fewest = Math.min(...all.map(changes));
  return pick(
    all.filter((d) => changes(d) === fewest),
    places,
  );
}

// Lexicographic order of two candidates' static ranks.
function byRank(x: CandidateDraft, y: CandidateDraft): number {
  for (let i = 0; i < x.rank.length; i++) if (x.rank[i] !== y.rank[i]) return (x.rank[i] as number) - (y.rank[i] as number);
  return 0;
}

// The form and first (end 0) or last (end 1) triplet of a candidate's states: the keys pick()
// spreads over, as one number (a triplet by the places of its levels among the table's levels).
function endKey(levels: readonly LevelTriplet[], end: 0 | 1, places: ReadonlyMap<number, number>): number {
  const t = levels[end === 0 ? 0 : levels.length - 1] as LevelTriplet;
  let key = levels.length * 2 + end;
  for (let k = 0; k < 3; k++) key = key * 4096 + (places.get(t[k] as number) as number);
  return key;
}

// Sorted by rank, at most MAX_CANDIDATES: every distinct first and last triplet of each form first.
function pick(found: readonly CandidateDraft[], places: ReadonlyMap<number, number>): CandidateDraft[] {
  const sorted = [...found].sort(byRank);
  if (sorted.length <= MAX_CANDIDATES) return sorted;
  const chosen = new Set<CandidateDraft>();
  const ends = new Set<number>();
  for (const d of sorted) {
    if (chosen.size >= MAX_CANDIDATES) break;
    const a = endKey(d.levels, 0, places);
    const b = endKey(d.levels, 1, places);
    if (!ends.has(a) || !ends.has(b)) {
      chosen.add(d);
      ends.add(a);
      ends.add(b);
    }
  }
  for (const d of sorted) {
    if (chosen.size >= MAX_CANDIDATES) break;
    chosen.add(d);
  }
  return sorted.filter((d) => chosen.has(d));
}

// The levels of a three-state candidate's unused fourth slot (a zero-filled array's).
const UNUSED: LevelTriplet = [0, 0, 0];

// The candidates as flat arrays, filled triangle by triangle (so that no triangle's drafts outlive
// it); levels are held as the order they were first met and put in ascending order at the end.
class CandidateStore {
  #n = 0;
  #first: number[] = [0];
  #count = new Uint8Array(1024);
  #pos = new Uint8Array(4 * 1024);
  #level = new Uint8Array(12 * 1024);
  #mask = new Uint8Array(4 * 1024);
  #seq = new Int32Array(3 * 1024);
  #clamped = new Int8Array(1024);
  #met = new Map<number, number>();
  #ids = new Map<LevelTriplet, readonly number[]>();
  readonly #hasMidpoint: boolean;

  constructor(hasMidpoint: boolean) {
    this.#hasMidpoint = hasMidpoint;
  }

  // the candidates of the next triangle
  add(list: readonly CandidateDraft[]): void {
    for (const d of list) {
      this.#room();
      const n = this.#n++;
      this.#count[n] = d.levels.length;
      // a three-state candidate's fourth slot holds level 0, as a zero-filled array would
      for (let i = 0; i < 4; i++) {
        const t = d.levels[i];
        const ids = this.#idsOf(t ?? UNUSED);
        let mask = 0;
        if (t) this.#pos[4 * n + i] = d.pos[i] as number;
        for (let k = 0; k < 3; k++) {
          this.#level[12 * n + 3 * i + k] = ids[k] as number;
          if (t && this.#hasMidpoint && t[k] === 0) mask |= 1 << k;
        }
        this.#mask[4 * n + i] = mask;
      }
      for (let k = 0; k < 3; k++) this.#seq[3 * n + k] = d.seq[k] as number;
      let clamped = -1;
      for (let k = 0; k < 3 && clamped < 0; k++) if (d.levels.every((t) => t[k] === (d.levels[0] as LevelTriplet)[k])) clamped = k;
      this.#clamped[n] = clamped;
    }
    this.#first.push(this.#n);
  }

  finish(): Pick<RuntimeProgram, 'candFirst' | 'candCount' | 'candPos' | 'candLevel' | 'candLevels' | 'candMask' | 'candSeq' | 'candClamped'> {
    const n = this.#n;
    const met = [...this.#met.keys()];
    const candLevels = Float64Array.from(n > 0 ? met : []).sort();
    const place = Uint8Array.from(met, (l) => candLevels.indexOf(l));
    const candLevel = this.#level.slice(0, 12 * n);
    for (let i = 0; i < candLevel.length; i++) candLevel[i] = place[candLevel[i] as number] as number;
    return {
      candFirst: Int32Array.from(this.#first),
      candCount: this.#count.slice(0, n),
      candPos: this.#pos.slice(0, 4 * n),
      candLevel,
      candLevels,
      candMask: this.#mask.slice(0, 4 * n),
      candSeq: this.#seq.slice(0, 3 * n),
      candClamped: this.#clamped.slice(0, n),
    };
  }

  // the ids of a triplet's levels (triplets are shared among a triangle's candidates)
  #idsOf(t: LevelTriplet): readonly number[] {
    let ids = this.#ids.get(t);
    if (!ids) {
      ids = [0, 1, 2].map((k) => {
        const l = t[k] as number;
        let id = this.#met.get(l);
        if (id === undefined) this.#met.set(l, (id = this.#met.size));
        // a byte each: a netlist has at most NETLIST_LIMITS.dcNodes (21) levels, checked where it is read
        if (id > 255) throw new Error('runtimeProgram: more than 256 distinct levels');
        return id;
      });
      this.#ids.set(t, ids);
    }
    return ids;
  }

  // twice the room when full
  #room(): void {
    if (this.#n < this.#count.length) return;
    const grow = <T extends Uint8Array | Int32Array | Int8Array>(a: T, make: (size: number) => T): T => {
      const b = make(2 * a.length);
      b.set(a);
      return b;
    };
    this.#count = grow(this.#count, (k) => new Uint8Array(k));
    this.#pos = grow(this.#pos, (k) => new Uint8Array(k));
    this.#level = grow(this.#level, (k) => new Uint8Array(k));
    this.#mask = grow(this.#mask, (k) => new Uint8Array(k));
    this.#seq = grow(this.#seq, (k) => new Int32Array(k));
    this.#clamped = grow(this.#clamped, (k) => new Int8Array(k));
  }
}

// The paths of every sequence and the pick tables (see RuntimeProgram.pick).
function flattenSequences(
  ctx: Ctx,
  sequences: readonly SequenceDraft[],
): Pick<RuntimeProgram, 'pathFirst' | 'pathPattern' | 'pick' | 'pickLine' | 'pickGates' | 'pickDist'> {
  const { P, dist } = ctx;
  const pathFirst = new Int32Array(sequences.length + 1);
  sequences.forEach((s, i) => {
    pathFirst[i + 1] = (pathFirst[i] as number) + s.paths.length;
  });
  const pathPattern = new Int32Array(4 * (pathFirst[sequences.length] as number)).fill(-1);
  sequences.forEach((s, i) =>
    s.paths.forEach((p, j) =>
      p.patterns.forEach((x, t) => {
        pathPattern[4 * ((pathFirst[i] as number) + j) + t] = x;
      }),
    ),
  );
  const size = sequences.length * 2 * 2 * (P + 1) * 3;
  const pick = new Int32Array(size).fill(-1);
  const pickLine = new Int32Array(size);
  const pickGates = new Int32Array(size);
  const pickDist = new Int32Array(size);
  sequences.forEach((s, si) => {
    for (let dir = 0; dir < 2; dir++)
      for (let b = 0; b < 2; b++)
        for (let p0 = -1; p0 < P; p0++) {
          const at = (((si * 2 + dir) * 2 + b) * (P + 1) + p0 + 1) * 3;
          const kc = (b * 9 + s.k * 3 + s.c) * P;
          // options 0, 1 and 2, each the best by its key; paths are in static rank order already
          const best = [-1, -1, -1];
          const keyOf: number[][] = [[], [], []];
          s.paths.forEach((path, j) => {
            const entry = path.patterns[dir === 0 ? 0 : path.patterns.length - 1] as number;
            const d = p0 < 0 ? 0 : (dist[(kc + p0) * P + entry] as number);
            const line = path.line + (p0 >= 0 && d > 0 ? ctx.lineDiff(p0, entry) : 0);
            const gates = path.gates + (p0 >= 0 && d > 0 ? ctx.gateDiff(p0, entry) : 0);
            const consider = (o: number, key: number[]) => {
              const k = keyOf[o] as number[];
              if (best[o] === -1 || lexLess(key, k)) {
                best[o] = j;
                keyOf[o] = key;
              }
            };
            if (d === 0) consider(0, [line, gates]);
            if (d === 1) consider(1, [line, gates]);
            if (d !== NO_PATH) consider(2, [d, line, gates]);
          });
          for (let o = 0; o < 3; o++) {
            if (best[o] === -1) continue;
            const key = keyOf[o] as number[];
            pick[at + o] = (pathFirst[si] as number) + (best[o] as number);
            pickDist[at + o] = o === 0 ? 0 : o === 1 ? 1 : (key[0] as number);
            pickLine[at + o] = o === 2 ? (key[1] as number) : (key[0] as number);
            pickGates[at + o] = o === 2 ? (key[2] as number) : (key[1] as number);
          }
        }
  });
  return { pathFirst, pathPattern, pick, pickLine, pickGates, pickDist };
}
