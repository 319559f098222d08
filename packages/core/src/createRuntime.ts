import { createModulator } from './createModulator.js';
import { HexsalvageInputError } from './errors.js';
import { POLARITY_STRINGS, type PolarityString } from './polarity.js';
import { runtimeProgram, type RuntimeProgram } from './runtimeProgram.js';
import type { SwitchingTable } from './switchingTable.js';
import { requireObject } from './validate.js';

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
  /** A buffer large enough for any call. */
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
   * @returns the triangle index, or −1 when the polarity has no triangles
   */
  period(alpha: number, beta: number, polarityIndex: number, ia: number, ib: number, ic: number, midpointError: number, out: RuntimeOutput, nextPolarityIndex?: number): number;
  /**
   * One half of a switching period from its own sample (firmware that updates at the carrier's
   * peak and valley): up halves run the sequence forwards, down halves backwards, alternately.
   * Arguments as for {@link Runtime.period}; durations are fractions of the half.
   */
  half(alpha: number, beta: number, polarityIndex: number, ia: number, ib: number, ic: number, midpointError: number, out: RuntimeOutput, nextPolarityIndex?: number): number;
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
  requireObject(table, 'createRuntime', 'a switching table (from switchingTable)');
  const opts = runtimeOptions(options);
  const program = runtimeProgram(table);
  const mod = createModulator(table);
  const P = program.patternCount;
  const { triFirst, candFirst, candCount, candPos, candLevel, candMask, candSeq, candClamped, next, enterable, polarityChars, level, pathPattern, pick, pickLine, pickGates, pickDist } = program;
  const dwellRows = flatDwell(table);
  const maxSegments = 4 + 3 * P + 4;
  const loc = new Float64Array(4);
  const prev = new Int32Array(3).fill(-1);
  const prevChar = new Int32Array(3).fill(-1);
  const cur = new Int32Array(3);
  const q = new Float64Array(4);
  const d = new Float64Array(3);
  // the paths of the candidate being weighed and of the best one so far, per phase
  const path = new Int32Array(3);
  const bestPath = new Int32Array(3);
  const o0 = new Int32Array(3);
  const o1 = new Int32Array(3);
  const at = new Int32Array(3);
  const wI = new Float64Array(3);
  let up = true;
  const continuous = opts.sequence === 'continuous';
  const balance = opts.balance === 'on' && program.hasMidpoint;

  // midpoint current of each state of candidate c, into the midpoint node (contract sign)
  const chargesOf = (c: number, k: number, ia: number, ib: number, ic: number) => {
    for (let s = 0; s < k; s++) {
      const mask = candMask[4 * c + s] as number;
      q[s] = -((mask & 1 ? ia : 0) + (mask & 2 ? ib : 0) + (mask & 4 ? ic : 0));
    }
  };

  // distance of the target from the charges candidate c can draw over the half (0 inside)
  const missOf = (c: number, k: number, ia: number, ib: number, ic: number, target: number, tol: number): number => {
    chargesOf(c, k, ia, ib, ic);
    let lo: number;
    let hi: number;
    if (k === 4) {
      const dA = d[candPos[4 * c] as number] as number;
      const rest = (d[candPos[4 * c + 1] as number] as number) * (q[1] as number) + (d[candPos[4 * c + 2] as number] as number) * (q[2] as number);
      const e0 = rest + dA * (q[0] as number);
      const e1 = rest + dA * (q[3] as number);
      lo = e0 < e1 ? e0 : e1;
      hi = e0 < e1 ? e1 : e0;
    } else {
      lo = (d[candPos[4 * c] as number] as number) * (q[0] as number) + (d[candPos[4 * c + 1] as number] as number) * (q[1] as number) + (d[candPos[4 * c + 2] as number] as number) * (q[2] as number);
      hi = lo;
    }
    const miss = target < lo ? lo - target : target > hi ? target - hi : 0;
    return miss <= tol ? 0 : miss;
  };

  const select = (g: number, qi: number, nq: number, dir: number, exit: number, ia: number, ib: number, ic: number, target: number): number => {
    let best = -1;
    // the best key so far: unreachable phases, phases left where the next character cannot be
    // entered, chain tier, balance miss, form, clamp, line-frequency gate changes weighted by their
    // phase's current, all gate changes, entry steps
    let bU = 0;
    let bX = 0;
    let bM = 0;
    let bT = 0;
    let bF = 0;
    let bC = 0;
    let bL = 0;
    let bG = 0;
    let bS = 0;
    const scale = Math.abs(ia) + Math.abs(ib) + Math.abs(ic);
    const tol = 1e-12 * scale;
    const big = Math.abs(ia) >= Math.abs(ib) && Math.abs(ia) >= Math.abs(ic) ? 0 : Math.abs(ib) >= Math.abs(ic) ? 1 : 2;
    // a line-frequency device's gate change costs what it commutates: its phase's current
    wI[0] = Math.abs(ia);
    wI[1] = Math.abs(ib);
    wI[2] = Math.abs(ic);
    const end = candFirst[g + 1] as number;
    for (let c = candFirst[g] as number; c < end; c++) {
      const k = candCount[c] as number;
      if (!continuous && k === 4) continue;
      // each phase's path: entered without a step, or one phase with one step, else the chain
      let all0 = true;
      let line = 0;
      let gates = 0;
      for (let ph = 0; ph < 3; ph++) {
        const b = prev[ph] as number < 0 || prevChar[ph] === polarityChars[3 * qi + ph] ? 0 : 1;
        const a = ((((candSeq[3 * c + ph] as number) * 2 + dir) * 2 + b) * (P + 1) + (prev[ph] as number) + 1) * 3;
        at[ph] = a;
        o0[ph] = pick[a] as number;
        o1[ph] = pick[a + 1] as number;
        if ((o0[ph] as number) < 0) all0 = false;
        else {
          line += (wI[ph] as number) * (pickLine[a] as number);
          gates += pickGates[a] as number;
        }
      }
      let cost = 0;
      let unreach = 0;
      let cLine = Infinity;
      let cGates = Infinity;
      if (all0) {
        cLine = line;
        cGates = gates;
        for (let ph = 0; ph < 3; ph++) path[ph] = o0[ph] as number;
      }
      // one phase entered by one step, the others without (where that saves gate changes, or is the only way)
      let one = -1;
      for (let ph = 0; ph < 3; ph++) {
        if ((o1[ph] as number) < 0) continue;
        let ok = true;
        let l = 0;
        let gt = 0;
        for (let x = 0; x < 3; x++) {
          const a = at[x] as number;
          if (x === ph) {
            l += (wI[x] as number) * (pickLine[a + 1] as number);
            gt += pickGates[a + 1] as number;
          } else if ((o0[x] as number) < 0) ok = false;
          else {
            l += (wI[x] as number) * (pickLine[a] as number);
            gt += pickGates[a] as number;
          }
        }
        if (ok && (l < cLine || (l === cLine && gt < cGates))) {
          cLine = l;
          cGates = gt;
          one = ph;
        }
      }
      if (one >= 0) {
        for (let ph = 0; ph < 3; ph++) path[ph] = ph === one ? (o1[ph] as number) : (o0[ph] as number);
        cost = 1;
      } else if (!all0) {
        // the fewest steps (a chain), phase by phase
        cLine = 0;
        cGates = 0;
        for (let ph = 0; ph < 3; ph++) {
          const a = at[ph] as number;
          path[ph] = pick[a + 2] as number;
          if ((path[ph] as number) < 0) {
            unreach++;
            path[ph] = firstPath(candSeq[3 * c + ph] as number);
            continue;
          }
          cost += pickDist[a + 2] as number;
          cLine += (wI[ph] as number) * (pickLine[a + 2] as number);
          cGates += pickGates[a + 2] as number;
        }
      }
      // a phase whose character changes at the next boundary must be left where it can enter it
      let stuck = 0;
      const xs = exit < 0 ? k - 1 : exit;
      for (let ph = 0; ph < 3; ph++) {
        const nc = polarityChars[3 * nq + ph] as number;
        if (nc !== polarityChars[3 * qi + ph] && enterable[(ph * 3 + nc) * P + (pathPattern[4 * (path[ph] as number) + xs] as number)] !== 1) stuck++;
      }
      const tier = cost <= 1 ? 0 : cost;
      const form = continuous ? (k === 4 ? 0 : 1) : 0;
      const miss = balance ? missOf(c, k, ia, ib, ic, target, tol) : 0;
      const clamp = continuous ? 0 : candClamped[c] === big ? 0 : 1;
      if (best >= 0) {
        const order = cmp(unreach, bU) || cmp(stuck, bX) || cmp(tier, bT) || cmp(miss, bM) || cmp(form, bF) || cmp(clamp, bC) || cmp(cLine, bL) || cmp(cGates, bG) || cmp(cost, bS);
        if (order >= 0) continue;
      }
      best = c;
      bU = unreach;
      bX = stuck;
      bM = miss;
      bT = tier;
      bF = form;
      bC = clamp;
      bL = cLine;
      bG = cGates;
      bS = cost;
      for (let ph = 0; ph < 3; ph++) bestPath[ph] = path[ph] as number;
    }
    bestUnreach = bU;
    return best;
  };
  // unreachable phases of the last selection (0: the candidate can be entered safely)
  let bestUnreach = 0;

  const firstPath = (s: number): number => program.pathFirst[s] as number;

  const splitOf = (c: number, ia: number, ib: number, ic: number, target: number): number => {
    if (!balance) return 0.5;
    chargesOf(c, 4, ia, ib, ic);
    const dA = d[candPos[4 * c] as number] as number;
    const den = dA * ((q[0] as number) - (q[3] as number));
    const scale = Math.abs(ia) + Math.abs(ib) + Math.abs(ic);
    if (!(Math.abs(den) > 1e-12 * scale)) return 0.5;
    const rest = (d[candPos[4 * c + 1] as number] as number) * (q[1] as number) + (d[candPos[4 * c + 2] as number] as number) * (q[2] as number) + dA * (q[3] as number);
    const x = (target - rest) / den;
    return x < 0 ? 0 : x > 1 ? 1 : x;
  };

  const writeState = (out: RuntimeOutput, n: number, c: number, s: number, duration: number) => {
    for (let ph = 0; ph < 3; ph++) {
      out.patterns[3 * n + ph] = pathPattern[4 * (bestPath[ph] as number) + s] as number;
      out.levels[3 * n + ph] = candLevel[12 * c + 3 * s + ph] as number;
    }
    out.duration[n] = duration;
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

  const run = (alpha: number, beta: number, qi: number, nq: number, ia: number, ib: number, ic: number, err: number, out: RuntimeOutput, dir: number, whole: boolean): number => {
    out.count = 0;
    out.chainSteps = 0;
    out.held = false;
    out.split = NaN;
    const t = mod.modulateInto(alpha, beta, qi, loc);
    out.triangle = t;
    if (t < 0) return -1;
    out.clamped = loc[3] === 1;
    d[0] = loc[0] as number;
    d[1] = loc[1] as number;
    d[2] = loc[2] as number;
    const g = (triFirst[qi] as number) + t;
    const target = -opts.midpointGain * err;
    // the state the call ends in: the first state of a whole period, the last of an up half
    const c = select(g, qi, nq, dir, whole || dir === 1 ? 0 : -1, ia, ib, ic, target);
    if (c < 0 && (prev[0] as number) < 0) return -1;
    if (c < 0 || bestUnreach > 0) {
      // no safe way into this triangle: the present state is held, nothing switches
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
    // the chain, where the entry is more than one step away: its states take chainDwell each, and
    // the sequence's dwell times are taken at the reference less the chain's volt-seconds
    let n = chain(dir === 0 ? 0 : k - 1, qi, out);
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
    const x = k === 4 ? splitOf(c, ia, ib, ic, target) : NaN;
    out.split = x;
    const durationOf = (s: number): number => {
      const dv = d[candPos[4 * c + s] as number] as number;
      if (k !== 4) return dv;
      return s === 0 ? x * dv : s === 3 ? (1 - x) * dv : dv;
    };
    if (whole) {
      // first half forwards, then mirrored; the centre state once, durations as period fractions
      for (let s = 0; s < k; s++) writeState(out, n++, c, s, (rest * durationOf(s)) / (s === k - 1 ? 1 : 2));
      for (let s = k - 2; s >= 0; s--) writeState(out, n++, c, s, (rest * durationOf(s)) / 2);
    } else {
      for (let i = 0; i < k; i++) {
        const s = dir === 0 ? i : k - 1 - i;
        writeState(out, n++, c, s, rest * durationOf(s));
      }
    }
    out.count = n;
    const exit = dir === 0 && !whole ? k - 1 : 0;
    for (let ph = 0; ph < 3; ph++) {
      prev[ph] = pathPattern[4 * (bestPath[ph] as number) + exit] as number;
      prevChar[ph] = polarityChars[3 * qi + ph] as number;
    }
    return t;
  };

  const checkIndex = (qi: number, out: RuntimeOutput) => {
    if (!(Number.isInteger(qi) && qi >= 0 && qi < POLARITY_STRINGS.length)) throw new HexsalvageInputError('option', 'runtime', 'polarityIndex', `an integer from 0 to ${POLARITY_STRINGS.length - 1}`, qi);
    if (!out || !(out.duration instanceof Float64Array) || out.duration.length < maxSegments) throw new HexsalvageInputError('option', 'runtime', 'out', 'a buffer from runtime.output()');
  };

  return {
    options: opts,
    program,
    output: () => ({ count: 0, patterns: new Int32Array(3 * maxSegments), levels: new Float64Array(3 * maxSegments), duration: new Float64Array(maxSegments), triangle: -1, clamped: false, split: NaN, chainSteps: 0, held: false }),
    reset() {
      prev.fill(-1);
      prevChar.fill(-1);
      up = true;
    },
    period(alpha, beta, qi, ia, ib, ic, err, out, nq = qi) {
      checkIndex(qi, out);
      checkIndex(nq, out);
      up = true;
      return run(alpha, beta, qi, nq, ia, ib, ic, err, out, 0, true);
    },
    half(alpha, beta, qi, ia, ib, ic, err, out, nq = qi) {
      checkIndex(qi, out);
      checkIndex(nq, out);
      const dir = up ? 0 : 1;
      up = !up;
      return run(alpha, beta, qi, nq, ia, ib, ic, err, out, dir, false);
    },
  };
}

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
  if (!(SEQUENCE_MODES as readonly unknown[]).includes(sequence)) throw new HexsalvageInputError('option', input, 'sequence', 'continuous or discontinuous', sequence);
  const balance = options.balance ?? 'on';
  if (balance !== 'on' && balance !== 'off') throw new HexsalvageInputError('option', input, 'balance', 'on or off', balance);
  const midpointGain = options.midpointGain ?? 0;
  if (!(typeof midpointGain === 'number' && Number.isFinite(midpointGain) && midpointGain >= 0 && midpointGain <= 1e12)) throw new HexsalvageInputError('option', input, 'midpointGain', 'a number from 0 to 1e12', midpointGain);
  const chainDwell = options.chainDwell ?? 0.02;
  if (!(typeof chainDwell === 'number' && Number.isFinite(chainDwell) && chainDwell > 0 && chainDwell <= 0.1)) throw new HexsalvageInputError('option', input, 'chainDwell', 'a fraction of the switching period above 0, at most 0.1', chainDwell);
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
