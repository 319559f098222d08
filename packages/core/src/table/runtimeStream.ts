import { createRuntime, type RuntimeOptions } from './createRuntime.js';
import { HexsalvageInputError } from '../shared/errors.js';
import { POLARITY_STRINGS, type PolarityString } from '../leg/polarity.js';
import { polarityAt } from '../vectors/polaritySectors.js';
import type { SwitchingTable } from './switchingTable.js';
import { requireNumber, requireObject, requireTable } from '../shared/validate.js';
import { hasMidpoint } from '../netlist/expandElements.js';

/** When the runtime takes a new sample: once per switching period, or at each half (carrier peak and valley). */
export const UPDATE_MODES = ['period', 'half'] as const;
/** One of {@link UPDATE_MODES}. */
export type UpdateMode = (typeof UPDATE_MODES)[number];

/** Options of {@link runtimeStream}. */
export interface RuntimeStreamOptions extends RuntimeOptions {
  /** Modulation index (units of Vdc/2). */
  readonly m: number;
  /** Load angle φ, degrees. Default 0. */
  readonly loadAngleDeg?: number;
  /** Polarity margin δ, degrees. Default 0. */
  readonly polarityMarginDeg?: number;
  /** Switching periods per fundamental period (fsw/f1), an integer from 6 to 20000. Default 120. */
  readonly frequencyRatio?: number;
  /** Default `period`. */
  readonly update?: UpdateMode;
  /**
   * Share of the accumulated midpoint charge the runtime is asked to remove within one update
   * (the closed loop a firmware runs with its measured midpoint voltage). Default 0.5; 0 runs open
   * loop (target zero charge per update).
   */
  readonly midpointFeedback?: number;
}

/** One segment of the stream: a leg state held for `dt`. */
export interface StreamSegment {
  /** Start, fraction of the fundamental period. */
  readonly t: number;
  readonly dt: number;
  readonly levels: readonly [number, number, number];
  readonly patterns: readonly [string, string, string];
  readonly polarity: PolarityString;
}

/** The state a stream starts from (see {@link RuntimeStream.entry}). */
export interface StreamEntry {
  readonly levels: readonly [number, number, number];
  readonly patterns: readonly [string, string, string];
  readonly polarity: PolarityString;
}

/** One fundamental period of the runtime in steady state. */
export interface RuntimeStream {
  /** Every segment applied, in time order (consecutive equal states merged; Σ dt = 1). */
  readonly segments: readonly StreamSegment[];
  /**
   * Steps that change the pattern of two or more phases at once, the step into the first segment
   * from {@link RuntimeStream.entry} included (the wrap-around of a periodic stream).
   */
  readonly multiPhaseSteps: number;
  /** States inserted to chain periods (one phase per step). */
  readonly chainSteps: number;
  /** Updates in which no safe step led into the reference's triangle, so the runtime held its state. */
  readonly heldUpdates: number;
  /** Largest |applied − reference| volt-second average over the updates not clamped (units of Vdc/2). */
  readonly voltSecondErrorMax: number;
  /** Updates whose reference lay outside the tiling and was clamped. */
  readonly clampedUpdates: number;
  /** Average current into the midpoint over the period, per unit of the current peak (sinusoidal currents). */
  readonly midpointAverage: number;
  /** The stream repeats: the state at the period's end is the state the next period starts from. */
  readonly periodic: boolean;
  /**
   * The state the leg is in when the period begins: the previous period's last segment. For a
   * periodic stream it is the stream's own last state; a closed loop that repeats only every few
   * fundamental periods (the balance choosing differently from one to the next) starts from
   * another state, and the step from it into the first segment is the one that happens.
   */
  readonly entry: StreamEntry;
  /**
   * The last state the previous period held for some time ({@link isHeld}): the state a gate drive
   * leaves at the period's start. Equal to {@link RuntimeStream.entry}
   * unless that one was held for no time.
   */
  readonly entryHeld: StreamEntry;
  /** Gate changes per fundamental period per `phase.device` (wrap-around included). */
  readonly gateChanges: Readonly<Record<string, number>>;
}

// The stream runs fundamental periods until it repeats and its midpoint charge over a period is
// below SETTLED (per unit of the current peak times the period), at most MAX_CYCLES.
const MAX_CYCLES = 40;
const SETTLED = 1e-6;

/**
 * Runs the runtime through fundamental periods until it repeats (at most eight) and returns the
 * last one: sinusoidal references `m·(cos θ, sin θ)`, the polarity at each update from the load
 * angle and margin, the measured currents `cos(θ − φ − k·120°)` at the update's centre, and the
 * midpoint error fed back as the charge accumulated by the stream's own states under those
 * sinusoidal currents.
 *
 * @param table - from `switchingTable`
 * @param options - operating point and runtime options
 * @returns the stream and what it does
 * @throws HexsalvageInputError on bad options, or where a polarity has no triangle to modulate
 * @example
 * ```ts
 * runtimeStream(switchingTable({ topology: 'npc' }), { m: 0.9, loadAngleDeg: 20, frequencyRatio: 61 }).multiPhaseSteps; // 0
 * ```
 */
export function runtimeStream(table: SwitchingTable, options: RuntimeStreamOptions): RuntimeStream {
  requireTable(table, 'runtimeStream');
  requireObject(options, 'runtimeStream', 'an options object { m, loadAngleDeg?, polarityMarginDeg?, frequencyRatio?, update?, sequence?, balance? }');
  const m = requireNumber(options.m, 'runtimeStream', 'm', { min: 0, max: 10 });
  const phi = requireNumber(options.loadAngleDeg ?? 0, 'runtimeStream', 'loadAngleDeg', { min: -180, max: 180 });
  const delta = requireNumber(options.polarityMarginDeg ?? 0, 'runtimeStream', 'polarityMarginDeg', { min: 0, max: 60, openMax: true });
  const N = requireNumber(options.frequencyRatio ?? 120, 'runtimeStream', 'frequencyRatio', { min: 6, max: 20000, integer: true });
  const update = options.update ?? 'period';
  if (!(UPDATE_MODES as readonly unknown[]).includes(update)) throw new HexsalvageInputError('option', 'runtimeStream', 'update', 'period or half', update);
  const alpha = requireNumber(options.midpointFeedback ?? 0.5, 'runtimeStream', 'midpointFeedback', { min: 0, max: 1 });
  const halves = update === 'half';
  const U = halves ? 2 * N : N;
  const h = 1 / U;
  // the target current removes a share alpha of the accumulated charge within one update
  const rt = createRuntime(table, { ...options, midpointGain: alpha / h });
  const out = rt.output();
  const phiRad = (phi * Math.PI) / 180;
  const P = table.patterns;
  const midpoint = hasMidpoint(table.levels);
  let charge = 0;
  // one fundamental period from the runtime's present state and the present charge
  const runCycle = () => {
    const segs: Seg[] = [];
    let chainSteps = 0;
    let heldUpdates = 0;
    let clamped = 0;
    let vsErr = 0;
    for (let u = 0; u < U; u++) {
      const t0 = u * h;
      const thetaDeg = (u + 0.5) * 360 * h;
      const th = (thetaDeg * Math.PI) / 180;
      const pol = polarityAt(thetaDeg, phi, delta);
      const qi = POLARITY_STRINGS.indexOf(pol);
      const i0 = Math.cos(th - phiRad);
      const i1 = Math.cos(th - phiRad - (2 * Math.PI) / 3);
      const i2 = Math.cos(th - phiRad - (4 * Math.PI) / 3);
      const ra = m * Math.cos(th);
      const rb = m * Math.sin(th);
      const nq = POLARITY_STRINGS.indexOf(polarityAt((u + 1.5) * 360 * h, phi, delta));
      const t = halves ? rt.half(ra, rb, qi, i0, i1, i2, charge, out, nq) : rt.period(ra, rb, qi, i0, i1, i2, charge, out, nq);
      if (t < 0) throw new HexsalvageInputError('option', 'runtimeStream', 'm', `a reference the table can modulate (polarity ${pol} has no triangle)`, m);
      chainSteps += out.chainSteps;
      if (out.held) heldUpdates++;
      if (out.clamped) clamped++;
      let va = 0;
      let vb = 0;
      let at = t0;
      for (let s = 0; s < out.count; s++) {
        const dt = (out.duration[s] as number) * h;
        const lv: [number, number, number] = [out.levels[3 * s] as number, out.levels[3 * s + 1] as number, out.levels[3 * s + 2] as number];
        va += (out.duration[s] as number) * ((2 / 3) * (lv[0] - (lv[1] + lv[2]) / 2));
        vb += (out.duration[s] as number) * ((lv[1] - lv[2]) / Math.sqrt(3));
        const end = s === out.count - 1 ? t0 + h : at + dt;
        charge += midpointCharge(lv, midpoint, at, end, phiRad);
        segs.push({
          t: at,
          end,
          levels: lv,
          patterns: [out.patterns[3 * s] as number, out.patterns[3 * s + 1] as number, out.patterns[3 * s + 2] as number],
          polarity: pol,
        });
        at = end;
      }
      if (!out.clamped) vsErr = Math.max(vsErr, Math.hypot(va - ra, vb - rb));
    }
    return { segs, chainSteps, heldUpdates, clamped, vsErr };
  };
  // Periodic steady state: the midpoint settles where the closed loop draws no net charge over a
  // period. Saturated periods make that slow (a share of the offset per period), so every third
  // cycle the start charge is extrapolated to the fixed point of the cycle map (Aitken's Δ²).
  let result = runCycle();
  let startCharge = 0;
  let periodic = false;
  const starts: number[] = [];
  let lastEnd = stateKey(result.segs);
  let entry = result.segs[result.segs.length - 1] as Seg;
  let entryHeld = lastHeld(result.segs, N);
  for (let cycle = 1; cycle < MAX_CYCLES; cycle++) {
    starts.push(charge);
    if (starts.length === 3 && alpha > 0) {
      const [a, b, c] = starts as [number, number, number];
      const den = c - 2 * b + a;
      if (Math.abs(den) > 1e-15) charge = c - ((c - b) * (c - b)) / den;
      starts.length = 0;
    }
    startCharge = charge;
    entry = result.segs[result.segs.length - 1] as Seg;
    entryHeld = lastHeld(result.segs, N);
    result = runCycle();
    const endKey = stateKey(result.segs);
    periodic = endKey === lastEnd;
    lastEnd = endKey;
    if (periodic && Math.abs(charge - startCharge) <= SETTLED) break;
  }
  const { segs, chainSteps, heldUpdates, clamped, vsErr } = result;
  const merged = mergeEqual(segs);
  const stepsOf = (a: Seg, b: Seg) =>
    (a.patterns[0] !== b.patterns[0] ? 1 : 0) + (a.patterns[1] !== b.patterns[1] ? 1 : 0) + (a.patterns[2] !== b.patterns[2] ? 1 : 0);
  let multi = 0;
  const gateChanges: Record<string, number> = {};
  const gateSets = table.patternGates.map((g) => new Set(g));
  // every step of the period: from the entry into the first segment, then segment to segment
  for (let i = 0; i < merged.length; i++) {
    const a = i === 0 ? entry : (merged[i - 1] as Seg);
    const b = merged[i] as Seg;
    if (stepsOf(a, b) > 1) multi++;
    for (let k = 0; k < 3; k++) {
      if (a.patterns[k] === b.patterns[k]) continue;
      const ga = gateSets[a.patterns[k] as number] as Set<string>;
      const gb = gateSets[b.patterns[k] as number] as Set<string>;
      for (const g of new Set([...ga, ...gb])) if (ga.has(g) !== gb.has(g)) gateChanges[`${'abc'[k]}.${g}`] = (gateChanges[`${'abc'[k]}.${g}`] ?? 0) + 1;
    }
  }
  return {
    segments: merged.map((s) => ({
      t: s.t,
      dt: s.end - s.t,
      levels: s.levels,
      patterns: s.patterns.map((p) => P[p] as string) as unknown as [string, string, string],
      polarity: s.polarity,
    })),
    multiPhaseSteps: multi,
    chainSteps,
    heldUpdates,
    voltSecondErrorMax: vsErr,
    clampedUpdates: clamped,
    midpointAverage: charge - startCharge,
    periodic,
    entry: entryOf(entry, P),
    entryHeld: entryOf(entryHeld, P),
    gateChanges: Object.fromEntries(Object.entries(gateChanges).sort(([a], [b]) => (a < b ? -1 : 1))),
  };
}

function entryOf(s: Seg, names: readonly string[]): StreamEntry {
  return { levels: s.levels, patterns: s.patterns.map((p) => names[p] as string) as unknown as [string, string, string], polarity: s.polarity };
}

/**
 * Whether a state lasting `dt` (fraction of the fundamental period) is a pulse: held above a
 * billionth of a switching period; below that it is rounding.
 *
 * @param dt - duration, fraction of the fundamental period
 * @param frequencyRatio - switching periods per fundamental period
 * @returns true when the state is held for some time
 * @example
 * ```ts
 * isHeld(1e-3, 120); // true
 * ```
 */
export function isHeld(dt: number, frequencyRatio: number): boolean {
  return dt * frequencyRatio > 1e-9;
}

// The last segment held for some time (see isHeld).
function lastHeld(segs: readonly Seg[], frequencyRatio: number): Seg {
  for (let i = segs.length - 1; i >= 0; i--) if (isHeld((segs[i] as Seg).end - (segs[i] as Seg).t, frequencyRatio)) return segs[i] as Seg;
  return segs[segs.length - 1] as Seg;
}

function stateKey(segs: readonly Seg[]): string {
  return (segs[segs.length - 1] as Seg).patterns.join(',');
}

interface Seg {
  readonly t: number;
  end: number;
  readonly levels: readonly [number, number, number];
  readonly patterns: readonly [number, number, number];
  readonly polarity: PolarityString;
}

// Consecutive segments with the same patterns are one segment (a period's centre state, a period
// ending in the state the next one starts with).
function mergeEqual(segs: readonly Seg[]): Seg[] {
  const out: Seg[] = [];
  for (const s of segs) {
    const last = out[out.length - 1];
    if (last && last.patterns[0] === s.patterns[0] && last.patterns[1] === s.patterns[1] && last.patterns[2] === s.patterns[2] && last.polarity === s.polarity)
      last.end = s.end;
    else out.push({ ...s });
  }
  return out;
}

// ∫ i_mid dt over [a, b] (fractions of the fundamental period) with unit sinusoidal currents:
// i_mid = −Σ over phases at potential 0 of cos(2πt − φ − k·120°).
function midpointCharge(levels: readonly number[], hasMidpoint: boolean, a: number, b: number, phi: number): number {
  if (!hasMidpoint || b <= a) return 0;
  let q = 0;
  for (let k = 0; k < 3; k++) {
    if (levels[k] !== 0) continue;
    const psi = phi + (k * 2 * Math.PI) / 3;
    q -= (Math.sin(2 * Math.PI * b - psi) - Math.sin(2 * Math.PI * a - psi)) / (2 * Math.PI);
  }
  return q;
}
