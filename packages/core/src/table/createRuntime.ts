import { createModulator, WELL_INSIDE } from './createModulator.js';
import { HexsalvageInputError } from '../shared/errors.js';
import { POLARITY_STRINGS, type PolarityString } from '../leg/polarity.js';
import { runtimeProgram, type RuntimeProgram } from './runtimeProgram.js';
import type { SwitchingTable } from './switchingTable.js';
import { requireObject, requireTable } from '../shared/validate.js';

/** How each switching period is built. */
export const SEQUENCE_MODES = ['continuous', 'discontinuous'] as const;
/** `continuous`: the conventional centred sequence (a redundant vertex split); `discontinuous`: one phase clamped per period. */
export type SequenceMode = (typeof SEQUENCE_MODES)[number];

/** Options of {@link createRuntime}. */
export interface RuntimeOptions {
  /** Default `continuous`. */
  readonly sequence?: SequenceMode;
  /** Default `on`: the redundant dwell split holds each period's midpoint charge at the target. */
  readonly balance?: 'on' | 'off';
  /**
   * Target average midpoint current per unit of the midpoint error the caller passes: the target is
   * `−midpointGain × midpointError` (current into the midpoint node). Default 0 (target zero).
   */
  readonly midpointGain?: number;
  /** Duration of each state inserted to chain two periods, as a fraction of the switching period. Default 0.02. */
  readonly chainDwell?: number;
}

/**
 * What one call of the runtime writes: the states applied, in time order, with their durations.
 * Allocate it once with {@link Runtime.output} and reuse it.
 */
export interface RuntimeOutput {
  /** Number of segments written. */
  count: number;
  /** Pattern index of each phase per segment (3 per segment, into the table's `patterns`). */
  readonly patterns: Int32Array;
  /** Level of each phase per segment (3 per segment, units of Vdc/2). */
  readonly levels: Float64Array;
  /** Duration of each segment as a fraction of the call's time (a half or a whole switching period); they sum to 1. */
  readonly duration: Float64Array;
  /** Triangle index in the polarity's `triangles`, −1 when the polarity has none (nothing written). */
  triangle: number;
  /** The reference lay outside the tiling and was brought back to its boundary. */
  clamped: boolean;
  /** Share of the split vertex's dwell in its first realisation (0.5 without balancing), NaN when no vertex is split. */
  split: number;
  /** States inserted to reach the period's first state from the previous one (one phase per step). */
  chainSteps: number;
  /**
   * True when no candidate of the reference's triangle could be reached from the present state by
   * allowed steps: the runtime then holds the present state for the whole call (one segment) and
   * commands no change at all; the reference is not followed (see docs/table.md).
   */
  held: boolean;
}

/** The runtime: the switching table turned into states and durations, period by period. */
export interface Runtime {
  /** Options in force, defaults filled in. */
  readonly options: Required<RuntimeOptions>;
  /** A buffer large enough for any call of this runtime (calls accept only this runtime's buffers). */
  output(): RuntimeOutput;
  /** Forgets the previous state (the next call chooses freely) and starts again with an up half. */
  reset(): void;
  /**
   * One whole centre-aligned switching period from one sample: the first half, then the same states
   * mirrored (the centre state written once).
   *
   * @param alpha - reference α, units of Vdc/2
   * @param beta - reference β
   * @param polarityIndex - index into `POLARITY_STRINGS` of the measured polarity
   * @param ia - measured phase currents (any unit; positive out of the leg)
   * @param ib - phase b current
   * @param ic - phase c current
   * @param midpointError - measured midpoint-voltage error (any unit matching `midpointGain`)
   * @param out - buffer from {@link Runtime.output}
   * @param nextPolarityIndex - the polarity expected at the next update (default: the same): a
   *   phase about to change character is left in a pattern it can leave safely then
   * @returns the triangle index; −1 when the polarity has no triangles (or none can be entered on a
   *   first call), −2 when the reference is not a finite number within ±1e6
   */
  period(
    alpha: number,
    beta: number,
    polarityIndex: number,
    ia: number,
    ib: number,
    ic: number,
    midpointError: number,
    out: RuntimeOutput,
    nextPolarityIndex?: number,
  ): number;
  /**
   * One half of a switching period from its own sample (firmware that updates at the carrier's
   * peak and valley): up halves run the sequence forwards, down halves backwards, alternately.
   * Arguments as for {@link Runtime.period}; durations are fractions of the half.
   */
  half(
    alpha: number,
    beta: number,
    polarityIndex: number,
    ia: number,
    ib: number,
    ic: number,
    midpointError: number,
    out: RuntimeOutput,
    nextPolarityIndex?: number,
  ): number;
  /** The tables the runtime reads (also printed into the C header). */
  readonly program: RuntimeProgram;
}

/**
 * Builds the runtime of a switching table: per switching period it locates the reference, then
 * picks one of the triangle's sequence candidates and the split of its redundant vertex.
 *
 * The choice, in order: a candidate whose first state is the previous period's last state or one
 * allowed step from it (else the one reached by the shortest chain of allowed one-phase steps);
 * the form the mode asks for (`continuous`: a vertex split, seven segments; `discontinuous`: three
 * states, one phase clamped); with balancing, the candidate whose midpoint charge can meet the
 * target; in discontinuous mode, the one clamping the phase with the largest current; no step
 * before one step; then static rank. A phase whose polarity character changes between two periods
 * steps by a `?` move. See docs/table.md.
 *
 * @param table - from `switchingTable`
 * @param options - see {@link RuntimeOptions}
 * @returns the runtime
 * @throws HexsalvageInputError on bad options
 * @example
 * ```ts
 * const rt = createRuntime(switchingTable({ topology: 'npc' }));
 * const out = rt.output();
 * rt.period(0.5, 0.2, rt.program.triFirst.length - 2, 1, -0.5, -0.5, 0, out);
 * ```
 */
export function createRuntime(table: SwitchingTable, options: RuntimeOptions = {}): Runtime {
  requireTable(table, 'createRuntime');
  const opts = runtimeOptions(options);
  const program = runtimeProgram(table);
  const mod = createModulator(table);
  const P = program.patternCount;
  const {
    triFirst,
    candFirst,
    candCount,
    candPos,
    candLevel,
    candLevels,
    candMask,
    candSeq,
    candClamped,
    next,
    enterable,
    polarityChars,
    level,
    pathPattern,
    pick,
    pickLine,
    pickGates,
    pickDist,
  } = program;
  const dwellRows = flatDwell(table);
  const maxSegments = 4 + 3 * P + 4;
  const loc = new Float64Array(4);
  const prev = new Int32Array(3).fill(-1);
  const prevChar = new Int32Array(3).fill(-1);
  const cur = new Int32Array(3);
  const d = new Float64Array(3);
  // the paths of the candidate being weighed and of the best one so far, per phase
  const bestPath = new Int32Array(3);
  const o0 = new Int32Array(3);
  const o1 = new Int32Array(3);
  const at = new Int32Array(3);
  let up = true;
  // what the output buffer holds (so that a period in the same candidate, paths and layout
  // rewrites only the durations)
  let lastOut: RuntimeOutput | null = null;
  let lastC = -1;
  let lastP0 = -1;
  let lastP1 = -1;
  let lastP2 = -1;
  let lastLayout = -1;
  const continuous = opts.sequence === 'continuous';
  const balance = opts.balance === 'on' && program.hasMidpoint;

  // The numbers of one call live in `io`, so that the helpers below take and return integers only:
  // a double passed to or returned from a call the engine does not inline is boxed, which would
  // make garbage every period. Slots: see IA … BETA below.
  const io = new Float64Array(8);
  const gain = opts.midpointGain;
  // the dwell of each state of the chosen candidate; the current into the midpoint per set of
  // phases at the midpoint (bit k: phase k)
  const dur = new Float64Array(4);
  const qm = new Float64Array(8);

  // The choice has a static part, fixed by the context (triangle, previous state and characters,
  // next polarity, direction): which candidates can be entered at all, how (no step, one step, a
  // chain), the form, gate changes and steps; and a dynamic part from the currents and dwell
  // times: the balance miss, the clamped phase and the line-device changes weighed by current. The
  // static part is worked out once per context and kept per triangle and in a bounded map (G0: the
  // candidates with the best unreachable / stuck / chain tier, in the order form, gates, steps,
  // rank); a period then weighs only those, and stops at the first that nothing can beat (miss 0,
  // no line change).
  const stat = new Int32Array(16);
  const staticOf = (c: number, qi: number, nq: number, dir: number, exit: number): void => {
    // stat: 0 unreach, 1 stuck, 2 tier, 3 form, 4 cost, 5 gates, 6-8 paths, 9-11 line changes per phase
    const k = candCount[c] as number;
    let all0 = true;
    let line = 0;
    let gates = 0;
    for (let ph = 0; ph < 3; ph++) {
      const b = (prev[ph] as number) < 0 || prevChar[ph] === polarityChars[3 * qi + ph] ? 0 : 1;
      const a = ((((candSeq[3 * c + ph] as number) * 2 + dir) * 2 + b) * (P + 1) + (prev[ph] as number) + 1) * 3;
      at[ph] = a;
      o0[ph] = pick[a] as number;
      o1[ph] = pick[a + 1] as number;
      if ((o0[ph] as number) < 0) all0 = false;
      else {
        line += pickLine[a] as number;
        gates += pickGates[a] as number;
      }
    }
    let cost = 0;
    let unreach = 0;
    let cLine = Infinity;
    let cGates = Infinity;
    let one = -1;
    if (all0) {
      cLine = line;
      cGates = gates;
    }
    // one phase entered by one step, the others without (where that saves changes, or is the only way)
    for (let ph = 0; ph < 3; ph++) {
      if ((o1[ph] as number) < 0) continue;
      let ok = true;
      let l = 0;
      let gt = 0;
      for (let x = 0; x < 3; x++) {
        const a = at[x] as number;
        if (x === ph) {
          l += pickLine[a + 1] as number;
          gt += pickGates[a + 1] as number;
        } else if ((o0[x] as number) < 0) ok = false;
        else {
          l += pickLine[a] as number;
          gt += pickGates[a] as number;
        }
      }
      if (ok && (l < cLine || (l === cLine && gt < cGates))) {
        cLine = l;
        cGates = gt;
        one = ph;
      }
    }
    for (let ph = 0; ph < 3; ph++) {
      const a = at[ph] as number;
      let o = 0;
      if (one >= 0) o = ph === one ? 1 : 0;
      else if (!all0) o = 2;
      let path = pick[a + o] as number;
      if (path < 0) {
        unreach++;
        path = program.pathFirst[candSeq[3 * c + ph] as number] as number;
        stat[9 + ph] = 0;
      } else stat[9 + ph] = pickLine[a + o] as number;
      stat[6 + ph] = path;
      if (o === 2 && (pick[a + 2] as number) >= 0) cost += pickDist[a + 2] as number;
    }
    if (one >= 0) cost = 1;
    else if (!all0) {
      cGates = 0;
      for (let ph = 0; ph < 3; ph++) if ((pick[(at[ph] as number) + 2] as number) >= 0) cGates += pickGates[(at[ph] as number) + 2] as number;
    }
    // a phase whose character changes at the next boundary must be left where it can enter it
    let stuck = 0;
    const xs = exit < 0 ? k - 1 : exit;
    for (let ph = 0; ph < 3; ph++) {
      const nc = polarityChars[3 * nq + ph] as number;
      if (nc !== polarityChars[3 * qi + ph] && enterable[(ph * 3 + nc) * P + (pathPattern[4 * (stat[6 + ph] as number) + xs] as number)] !== 1) stuck++;
    }
    stat[0] = unreach;
    stat[1] = stuck;
    stat[2] = cost <= 1 ? 0 : cost;
    stat[3] = continuous ? (k === 4 ? 0 : 1) : 0;
    stat[4] = cost;
    stat[5] = cGates;
  };

  // per triangle: the context last seen and its G0, as rows of 12 numbers (candidate, form, cost,
  // gates, three paths, three line-change counts, unreach, pad)
  const ctxKey = new Float64Array(triFirst[POLARITY_STRINGS.length] as number).fill(NaN);
  const ctxRows: (Int32Array | null)[] = new Array(triFirst[POLARITY_STRINGS.length] as number).fill(null);
  const keyable = P < 100;
  // every context met so far (a fundamental period meets the same ones again), bounded
  const memo = new Map<number, Int32Array>();
  const contextOf = (g: number, qi: number, nq: number, dir: number, exit: number): Int32Array => {
    let key = NaN;
    if (keyable) {
      const B = P + 1;
      const code = (prev[0] as number) + 1 + B * ((prev[1] as number) + 1 + B * ((prev[2] as number) + 1));
      const chars = (prevChar[0] as number) + 1 + 4 * ((prevChar[1] as number) + 1 + 4 * ((prevChar[2] as number) + 1));
      key = (((g * B * B * B + code) * 64 + chars) * 25 + nq) * 3 + (exit < 0 ? 2 : dir);
      if (ctxKey[g] === key) return ctxRows[g] as Int32Array;
      const known = memo.get(key);
      if (known !== undefined) {
        ctxKey[g] = key;
        ctxRows[g] = known;
        return known;
      }
    }
    const first = candFirst[g] as number;
    const end = candFirst[g + 1] as number;
    const rows: number[][] = [];
    let bU = Infinity;
    let bX = Infinity;
    let bT = Infinity;
    for (let c = first; c < end; c++) {
      const k = candCount[c] as number;
      if (!continuous && k === 4) continue;
      staticOf(c, qi, nq, dir, exit);
      const u = stat[0] as number;
      const x = stat[1] as number;
      const t = stat[2] as number;
      const order = cmp(u, bU) || cmp(x, bX) || cmp(t, bT);
      if (order > 0) continue;
      if (order < 0) {
        rows.length = 0;
        [bU, bX, bT] = [u, x, t];
      }
      rows.push([
        c,
        stat[3] as number,
        stat[4] as number,
        stat[5] as number,
        stat[6] as number,
        stat[7] as number,
        stat[8] as number,
        stat[9] as number,
        stat[10] as number,
        stat[11] as number,
        u,
        0,
      ]);
    }
    // the order of the early stop: form, gates, steps, rank (candidate index)
    rows.sort(
      (a, b) =>
        (a[1] as number) - (b[1] as number) ||
        (a[3] as number) - (b[3] as number) ||
        (a[2] as number) - (b[2] as number) ||
        (a[0] as number) - (b[0] as number),
    );
    const flat = new Int32Array(12 * rows.length);
    rows.forEach((r, i) => flat.set(r, 12 * i));
    if (keyable) {
      ctxKey[g] = key;
      ctxRows[g] = flat;
      if (memo.size >= MEMO_LIMIT) memo.clear();
      memo.set(key, flat);
    }
    return flat;
  };

  const select = (g: number, qi: number, nq: number, dir: number, exit: number): number => {
    selRows = contextOf(g, qi, nq, dir, exit);
    return choose(selRows);
  };

  // the dynamic part of the choice among a context's rows (see select)
  const choose = (rows: Int32Array): number => {
    const n = rows.length / 12;
    if (n === 0) return -1;
    // a line-frequency device's gate change costs what it commutates: its phase's current
    const wa = Math.abs(io[IA] as number);
    const wb = Math.abs(io[IB] as number);
    const wc = Math.abs(io[IC] as number);
    const big = wa >= wb && wa >= wc ? 0 : wb >= wc ? 1 : 2;
    const target = io[TARGET] as number;
    const tol = io[TOL] as number;
    const formMin = rows[1] as number;
    // One pass. Continuous: the first row of the best form that meets the balance target without
    // a line-device change is taken at once. Otherwise the whole key decides: balance miss, form,
    // clamp, line changes by current, gates, steps, rank.
    let r = -1;
    let bM = 0;
    let bF = 0;
    let bC = 0;
    let bL = 0;
    let bG = 0;
    let bS = 0;
    let bI = 0;
    for (let i = 0; i < n; i++) {
      const o = 12 * i;
      const c = rows[o] as number;
      const form = rows[o + 1] as number;
      const la = rows[o + 7] as number;
      const lb = rows[o + 8] as number;
      const lc = rows[o + 9] as number;
      const line = wa * la + wb * lb + wc * lc;
      // the distance of the target from the charges c can draw over the half (0 inside)
      let miss = 0;
      if (balance) {
        const m = 4 * c;
        const dA = d[candPos[m] as number] as number;
        let lo: number;
        let hi: number;
        if (candCount[c] === 4) {
          const rest =
            (d[candPos[m + 1] as number] as number) * (qm[candMask[m + 1] as number] as number) +
            (d[candPos[m + 2] as number] as number) * (qm[candMask[m + 2] as number] as number);
          const e0 = rest + dA * (qm[candMask[m] as number] as number);
          const e1 = rest + dA * (qm[candMask[m + 3] as number] as number);
          lo = e0 < e1 ? e0 : e1;
          hi = e0 < e1 ? e1 : e0;
        } else {
          lo =
            dA * (qm[candMask[m] as number] as number) +
            (d[candPos[m + 1] as number] as number) * (qm[candMask[m + 1] as number] as number) +
            (d[candPos[m + 2] as number] as number) * (qm[candMask[m + 2] as number] as number);
          hi = lo;
        }
        const raw = target < lo ? lo - target : target > hi ? target - hi : 0;
        miss = raw <= tol ? 0 : raw;
      }
      if (continuous && form === formMin && ((la | lb | lc) === 0 || line === 0) && miss === 0) {
        r = i;
        break;
      }
      const clamp = continuous ? 0 : candClamped[c] === big ? 0 : 1;
      if (r >= 0) {
        const order =
          cmp(miss, bM) || cmp(form, bF) || cmp(clamp, bC) || cmp(line, bL) || cmp(rows[o + 3] as number, bG) || cmp(rows[o + 2] as number, bS) || cmp(c, bI);
        if (order >= 0) continue;
      }
      r = i;
      bM = miss;
      bF = form;
      bC = clamp;
      bL = line;
      bG = rows[o + 3] as number;
      bS = rows[o + 2] as number;
      bI = c;
    }
    const o = 12 * r;
    bestPath[0] = rows[o + 4] as number;
    bestPath[1] = rows[o + 5] as number;
    bestPath[2] = rows[o + 6] as number;
    bestUnreach = rows[o + 10] as number;
    return rows[o] as number;
  };

  // unreachable phases of the last selection (0: the candidate can be entered safely), and the
  // context rows it chose from
  let bestUnreach = 0;
  let selRows: Int32Array = new Int32Array(0);

  // the share of the split vertex's dwell in its first realisation, into io[SPLIT]
  const splitOf = (c: number): void => {
    io[SPLIT] = 0.5;
    if (!balance) return;
    const q0 = qm[candMask[4 * c] as number] as number;
    const q3 = qm[candMask[4 * c + 3] as number] as number;
    const dA = d[candPos[4 * c] as number] as number;
    const den = dA * (q0 - q3);
    if (!(Math.abs(den) > (io[TOL] as number))) return;
    const rest =
      (d[candPos[4 * c + 1] as number] as number) * (qm[candMask[4 * c + 1] as number] as number) +
      (d[candPos[4 * c + 2] as number] as number) * (qm[candMask[4 * c + 2] as number] as number) +
      dA * q3;
    const x = ((io[TARGET] as number) - rest) / den;
    io[SPLIT] = x < 0 ? 0 : x > 1 ? 1 : x;
  };

  const writeState = (out: RuntimeOutput, n: number, c: number, s: number): void => {
    for (let ph = 0; ph < 3; ph++) {
      out.patterns[3 * n + ph] = pathPattern[4 * (bestPath[ph] as number) + s] as number;
      out.levels[3 * n + ph] = candLevels[candLevel[12 * c + 3 * s + ph] as number] as number;
    }
  };

  // level of a phase inside a chain: for its new character, else (a pattern the phase has not left
  // yet, chosen for the old character) for the old one
  const chainLevel = (ph: number, p: number, qi: number): number => {
    const l = level[(ph * 3 + (polarityChars[3 * qi + ph] as number)) * P + p] as number;
    return Number.isNaN(l) && (prevChar[ph] as number) >= 0 ? (level[(ph * 3 + (prevChar[ph] as number)) * P + p] as number) : l;
  };

  // the chain of one-phase steps from the previous state to the entry (phases in order a, b, c);
  // returns the number of states written (the entry itself is not)
  const chain = (slot: number, qi: number, out: RuntimeOutput): number => {
    let n = 0;
    let remaining = 0;
    for (let ph = 0; ph < 3; ph++) {
      cur[ph] = prev[ph] as number;
      const to = pathPattern[4 * (bestPath[ph] as number) + slot] as number;
      if ((cur[ph] as number) < 0) cur[ph] = to;
      else if ((cur[ph] as number) !== to) remaining++;
    }
    for (let ph = 0; ph < 3 && remaining > 0; ph++) {
      const to = pathPattern[4 * (bestPath[ph] as number) + slot] as number;
      if ((cur[ph] as number) === to) continue;
      // the first step enters the phase's new character where it changed, the rest stay inside it
      let e = prevChar[ph] === polarityChars[3 * qi + ph] ? 0 : 1;
      while ((cur[ph] as number) !== to) {
        const row = ((e * 9 + ph * 3 + (polarityChars[3 * qi + ph] as number)) * P + (cur[ph] as number)) * P + to;
        e = 0;
        // select() never returns a candidate an allowed path does not reach
        cur[ph] = next[row] as number;
        if ((cur[ph] as number) === to && --remaining === 0) break;
        for (let x = 0; x < 3; x++) {
          out.patterns[3 * n + x] = cur[x] as number;
          out.levels[3 * n + x] = chainLevel(x, cur[x] as number, qi);
        }
        out.duration[n++] = 0;
      }
    }
    return n;
  };

  // one call; the reference, currents and target are in io
  const run = (qi: number, nq: number, out: RuntimeOutput, dir: number, whole: boolean): number => {
    out.count = 0;
    out.chainSteps = 0;
    out.held = false;
    out.split = NaN;
    const alpha = io[ALPHA] as number;
    const beta = io[BETA] as number;
    const t = mod.modulateInto(alpha, beta, qi, loc);
    out.triangle = t;
    if (t < 0) return t;
    out.clamped = loc[3] === 1;
    d[0] = loc[0] as number;
    d[1] = loc[1] as number;
    d[2] = loc[2] as number;
    const g = (triFirst[qi] as number) + t;
    fastG = -1;
    // the state the call ends in: the first state of a whole period, the last of an up half
    const c = select(g, qi, nq, dir, whole || dir === 1 ? 0 : -1);
    if (c < 0 && (prev[0] as number) < 0) return -1;
    if (c < 0 || bestUnreach > 0) {
      // no safe way into this triangle: the present state is held, nothing switches
      lastC = -1;
      out.held = true;
      for (let ph = 0; ph < 3; ph++) {
        out.patterns[ph] = prev[ph] as number;
        out.levels[ph] = chainLevel(ph, prev[ph] as number, qi);
      }
      out.duration[0] = 1;
      out.count = 1;
      return t;
    }
    const k = candCount[c] as number;
    // the last call's buffer, candidate and paths: a whole period like the last one starts where
    // that one ended (no chain), and in the same layout its states are written already (only the
    // durations change)
    const same = out === lastOut && lastC === c && lastP0 === bestPath[0] && lastP1 === bestPath[1] && lastP2 === bestPath[2];
    // the chain, where the entry is more than one step away: its states take chainDwell each, and
    // the sequence's dwell times are taken at the reference less the chain's volt-seconds
    let n = same && whole && lastLayout === 2 ? 0 : chain(dir === 0 ? 0 : k - 1, qi, out);
    let rest = 1;
    if (n > 0) {
      let tau = whole ? opts.chainDwell : 2 * opts.chainDwell;
      if (n * tau > 0.5) tau = 0.5 / n;
      let va = 0;
      let vb = 0;
      for (let s = 0; s < n; s++) {
        out.duration[s] = tau;
        const la = out.levels[3 * s] as number;
        const lb = out.levels[3 * s + 1] as number;
        const lc = out.levels[3 * s + 2] as number;
        va += tau * ((2 / 3) * (la - (lb + lc) / 2));
        vb += tau * ((lb - lc) / Math.sqrt(3));
      }
      rest = 1 - n * tau;
      adjustedDwell(dwellRows, 9 * g, (alpha - va) / rest, (beta - vb) / rest, d);
      out.chainSteps = n;
    }
    if (k === 4) splitOf(c);
    out.split = k === 4 ? (io[SPLIT] as number) : NaN;
    // the dwell of each state: the split vertex's share at the start, the rest at the end
    for (let s = 0; s < k; s++) {
      const dv = d[candPos[4 * c + s] as number] as number;
      dur[s] = rest * (k !== 4 ? dv : s === 0 ? (io[SPLIT] as number) * dv : s === 3 ? (1 - (io[SPLIT] as number)) * dv : dv);
    }
    const layout = n > 0 ? -1 : whole ? 2 : dir;
    const kept = same && layout >= 0 && lastLayout === layout;
    if (whole) {
      // first half forwards, then mirrored; the centre state once, durations as period fractions
      for (let s = 0; s < k; s++) {
        if (!kept) writeState(out, n, c, s);
        out.duration[n++] = s === k - 1 ? (dur[s] as number) : (dur[s] as number) / 2;
      }
      for (let s = k - 2; s >= 0; s--) {
        if (!kept) writeState(out, n, c, s);
        out.duration[n++] = (dur[s] as number) / 2;
      }
    } else {
      for (let i = 0; i < k; i++) {
        const s = dir === 0 ? i : k - 1 - i;
        if (!kept) writeState(out, n, c, s);
        out.duration[n++] = dur[s] as number;
      }
    }
    out.count = n;
    lastOut = out;
    lastC = layout >= 0 ? c : -1;
    lastP0 = bestPath[0] as number;
    lastP1 = bestPath[1] as number;
    lastP2 = bestPath[2] as number;
    lastLayout = layout;
    const exit = dir === 0 && !whole ? k - 1 : 0;
    let unchanged = true;
    for (let ph = 0; ph < 3; ph++) {
      const p = pathPattern[4 * (bestPath[ph] as number) + exit] as number;
      const ch = polarityChars[3 * qi + ph] as number;
      if (p !== prev[ph] || ch !== prevChar[ph]) unchanged = false;
      prev[ph] = p;
      prevChar[ph] = ch;
    }
    // a whole period without a chain that left the state as it found it: the next period in this
    // triangle meets the same context
    if (layout === 2 && unchanged) setFast(g, qi, nq, t, out);
    return t;
  };

  // The fast path of a whole period. A period that left the state and characters as it found
  // them hands the next period in the same triangle, polarity and next polarity the same context
  // (the same rows); where that period's dynamic choice among those rows comes out the same
  // (candidate and paths), the buffer already holds its states and only the dwell times and the
  // split change. fastG is that triangle (−1: no fast path), the rest what the next period needs.
  let fastG = -1;
  let fastQi = -1;
  let fastNq = -1;
  let fastT = -1;
  let fastRows: Int32Array = new Int32Array(0);
  let fastOut: RuntimeOutput | null = null;
  const setFast = (g: number, qi: number, nq: number, t: number, out: RuntimeOutput): void => {
    fastG = g;
    fastQi = qi;
    fastNq = nq;
    fastT = t;
    fastRows = selRows;
    fastOut = out;
  };

  // The fast path itself (what run() would do there, the same arithmetic in the same order): the
  // reference well inside the triangle (the modulator's own test for its previous triangle), the
  // same choice, then the dwell times. False where a test fails (run() then does it all again).
  // Two pieces repeat others on purpose, each measured on the rotating reference: the well-inside
  // test (locating through the modulator instead: 52 -> 55-61 ns per period) and run()'s
  // whole-period layout of the durations (through run()'s loops: 52 -> 80 ns).
  const quick = (out: RuntimeOutput): boolean => {
    const alpha = io[ALPHA] as number;
    const beta = io[BETA] as number;
    const o = 9 * fastG;
    const r0 = (dwellRows[o] as number) * alpha + (dwellRows[o + 1] as number) * beta + (dwellRows[o + 2] as number);
    const r1 = (dwellRows[o + 3] as number) * alpha + (dwellRows[o + 4] as number) * beta + (dwellRows[o + 5] as number);
    const r2 = (dwellRows[o + 6] as number) * alpha + (dwellRows[o + 7] as number) * beta + (dwellRows[o + 8] as number);
    if (!(r0 >= WELL_INSIDE && r1 >= WELL_INSIDE && r2 >= WELL_INSIDE)) return false;
    const sum = r0 + r1 + r2;
    d[0] = r0 / sum;
    d[1] = r1 / sum;
    d[2] = r2 / sum;
    const c = choose(fastRows);
    if (c !== lastC || bestUnreach > 0 || bestPath[0] !== lastP0 || bestPath[1] !== lastP1 || bestPath[2] !== lastP2) return false;
    const k = candCount[c] as number;
    if (k === 4) splitOf(c);
    const x = io[SPLIT] as number;
    const dA = d[candPos[4 * c] as number] as number;
    const dB = d[candPos[4 * c + 1] as number] as number;
    const dC = d[candPos[4 * c + 2] as number] as number;
    // the sequence forwards then mirrored, the centre state once (as run() writes it)
    const du = out.duration;
    if (k === 4) {
      du[0] = (x * dA) / 2;
      du[1] = dB / 2;
      du[2] = dC / 2;
      du[3] = (1 - x) * dA;
      du[4] = dC / 2;
      du[5] = dB / 2;
      du[6] = (x * dA) / 2;
      out.count = 7;
      out.split = x;
    } else {
      du[0] = dA / 2;
      du[1] = dB / 2;
      du[2] = dC;
      du[3] = dB / 2;
      du[4] = dA / 2;
      out.count = 5;
      out.split = NaN;
    }
    out.chainSteps = 0;
    out.held = false;
    out.triangle = fastT;
    out.clamped = false;
    up = true;
    return true;
  };

  // a call's numbers into io (small enough to be inlined where it is called)
  const take = (alpha: number, beta: number, ia: number, ib: number, ic: number, err: number): void => {
    io[ALPHA] = alpha;
    io[BETA] = beta;
    io[IA] = ia;
    io[IB] = ib;
    io[IC] = ic;
    io[TARGET] = -gain * err;
    io[TOL] = 1e-12 * (Math.abs(ia) + Math.abs(ib) + Math.abs(ic));
    // the current into the midpoint node of a state, per set of phases at the midpoint (bit k:
    // phase k), with the contract's sign; written out (x + 0 is not x when x is −0)
    qm[0] = -(0 + 0 + 0);
    qm[1] = -(ia + 0 + 0);
    qm[2] = -(0 + ib + 0);
    qm[3] = -(ia + ib + 0);
    qm[4] = -(0 + 0 + ic);
    qm[5] = -(ia + 0 + ic);
    qm[6] = -(0 + ib + ic);
    qm[7] = -(ia + ib + ic);
  };

  // buffers this runtime made (a buffer of another runtime may be too small for this one's states)
  const own = new WeakSet<RuntimeOutput>();
  const checkIndex = (qi: number, out: RuntimeOutput) => {
    if (!(Number.isInteger(qi) && qi >= 0 && qi < POLARITY_STRINGS.length))
      throw new HexsalvageInputError('option', 'runtime', 'polarityIndex', `an integer from 0 to ${POLARITY_STRINGS.length - 1}`, qi);
    if (out !== lastOut && !own.has(out)) throw new HexsalvageInputError('option', 'runtime', 'out', "a buffer from this runtime's output()");
  };

  return {
    options: opts,
    program,
    output: () => {
      const o: RuntimeOutput = {
        count: 0,
        patterns: new Int32Array(3 * maxSegments),
        levels: new Float64Array(3 * maxSegments),
        duration: new Float64Array(maxSegments),
        triangle: -1,
        clamped: false,
        split: NaN,
        chainSteps: 0,
        held: false,
      };
      own.add(o);
      return o;
    },
    reset() {
      prev.fill(-1);
      prevChar.fill(-1);
      up = true;
      ctxKey.fill(NaN);
      lastC = -1;
      fastG = -1;
      fastOut = null;
    },
    period(alpha, beta, qi, ia, ib, ic, err, out, nq = qi) {
      take(alpha, beta, ia, ib, ic, err);
      if (fastG >= 0 && qi === fastQi && nq === fastNq && out === fastOut && quick(out)) return fastT;
      checkIndex(qi, out);
      checkIndex(nq, out);
      up = true;
      return run(qi, nq, out, 0, true);
    },
    half(alpha, beta, qi, ia, ib, ic, err, out, nq = qi) {
      checkIndex(qi, out);
      checkIndex(nq, out);
      const dir = up ? 0 : 1;
      up = !up;
      take(alpha, beta, ia, ib, ic, err);
      return run(qi, nq, out, dir, false);
    },
  };
}

// Slots of a runtime's `io` scratch array.
const IA = 0;
const IB = 1;
const IC = 2;
const TARGET = 3;
const TOL = 4;
const SPLIT = 5;
const ALPHA = 6;
const BETA = 7;

// Contexts remembered per runtime; past this the memory starts again (a few MB at most).
const MEMO_LIMIT = 1 << 14;

// -1, 0 or 1 as a is below, equal to or above b
function cmp(a: number, b: number): number {
  return a < b ? -1 : a > b ? 1 : 0;
}

/**
 * Checks runtime options and fills in the defaults.
 *
 * @param options - as given
 * @param input - name of the input for error messages
 * @returns the options with defaults
 * @throws HexsalvageInputError on an unknown mode or an out-of-range number
 * @example
 * ```ts
 * runtimeOptions({ sequence: 'discontinuous' }).balance; // 'on'
 * ```
 */
export function runtimeOptions(options: RuntimeOptions = {}, input = 'options'): Required<RuntimeOptions> {
  requireObject(options, input, 'an options object { sequence?, balance?, midpointGain?, chainDwell? }');
  const sequence = options.sequence ?? 'continuous';
  if (!(SEQUENCE_MODES as readonly unknown[]).includes(sequence))
    throw new HexsalvageInputError('option', input, 'sequence', 'continuous or discontinuous', sequence);
  const balance = options.balance ?? 'on';
  if (balance !== 'on' && balance !== 'off') throw new HexsalvageInputError('option', input, 'balance', 'on or off', balance);
  const midpointGain = options.midpointGain ?? 0;
  if (!(typeof midpointGain === 'number' && Number.isFinite(midpointGain) && midpointGain >= 0 && midpointGain <= 1e12))
    throw new HexsalvageInputError('option', input, 'midpointGain', 'a number from 0 to 1e12', midpointGain);
  const chainDwell = options.chainDwell ?? 0.02;
  if (!(typeof chainDwell === 'number' && Number.isFinite(chainDwell) && chainDwell > 0 && chainDwell <= 0.1))
    throw new HexsalvageInputError('option', input, 'chainDwell', 'a fraction of the switching period above 0, at most 0.1', chainDwell);
  return { sequence: sequence as SequenceMode, balance, midpointGain, chainDwell };
}

// Every polarity's dwell matrices in one array, rows in global triangle order (as the C header).
function flatDwell(table: SwitchingTable): Float64Array {
  const rows: number[] = [];
  for (const p of POLARITY_STRINGS as readonly PolarityString[]) {
    for (const m of table.polarities[p]?.dwell ?? []) for (const r of m) rows.push(r[0], r[1], r[2]);
  }
  return Float64Array.from(rows);
}

// Dwell times of a triangle at a point, negative ones set to 0 and the rest renormalised (the
// chain's volt-seconds moved the point; it may leave the triangle by a little).
function adjustedDwell(rows: Float64Array, o: number, a: number, b: number, d: Float64Array): void {
  const d0 = Math.max(0, (rows[o] as number) * a + (rows[o + 1] as number) * b + (rows[o + 2] as number));
  const d1 = Math.max(0, (rows[o + 3] as number) * a + (rows[o + 4] as number) * b + (rows[o + 5] as number));
  const d2 = Math.max(0, (rows[o + 6] as number) * a + (rows[o + 7] as number) * b + (rows[o + 8] as number));
  const s = d0 + d1 + d2;
  d[0] = s > 0 ? d0 / s : 1 / 3;
  d[1] = s > 0 ? d1 / s : 1 / 3;
  d[2] = s > 0 ? d2 / s : 1 / 3;
}
