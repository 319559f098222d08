import { clarke } from './clarke.js';
import { createModulator } from './createModulator.js';
import { HexsalvageInputError } from './errors.js';
import { requireNumber, requireObject } from './validate.js';
import { MIDPOINT_TOLERANCE, midpointProfile, midpointRangeAt } from './midpointBalance.js';
import { PHASES } from './faults.js';
import { polarityAt } from './polaritySectors.js';
import type { VertexRealisation } from './polarityTable.js';
import { gateDifference, type LegState } from './switchingSequence.js';
import type { SwitchingTable } from './switchingTable.js';

/** Options of {@link cycleCheck}. */
export interface CycleCheckOptions {
  /** Modulation index to run at (units of Vdc/2); should not exceed the plan's mMax. */
  readonly m: number;
  /** Load angle φ, degrees. Default 0. */
  readonly loadAngleDeg?: number;
  /** Polarity margin δ, degrees. Default 0. */
  readonly polarityMarginDeg?: number;
  /** Switching periods per fundamental period (fsw/f1), an integer ≥ 6. Default 120. */
  readonly frequencyRatio?: number;
  /** Peak phase current, in the user's unit (A). Default 1. */
  readonly currentAmplitude?: number;
  /** Average midpoint current (fraction of the amplitude) above which the midpoint drifts. Default 0.005. */
  readonly driftThreshold?: number;
}

/** What one fundamental period of modulation does. */
export interface CycleReport {
  readonly periods: number;
  /** Largest |average vector − reference| over the periods not clamped (units of Vdc/2). */
  readonly voltSecondErrorMax: number;
  /** Periods whose reference lay outside the hull and were clamped. */
  readonly clampedPeriods: number;
  /** Average midpoint current over the cycle, in the unit of `currentAmplitude`. */
  readonly midpointCurrent: {
    /** With the table's realisations (the minimum-switching sequence). */
    readonly tablePolicy: number;
    /** With redundant dwell split freely between realisations to bring the cycle average to zero (null: m leaves the tiling). */
    readonly bestPolicy: number | null;
    /** The range of cycle averages the redundancy can reach (the same computation as `mMaxBalanced`). */
    readonly reachable: readonly [number, number] | null;
  };
  /** True when zero average midpoint current is out of reach (m above the plan's `mMaxBalanced`). */
  readonly midpointDrift: boolean;
  /** True when the table's own realisations leave an average midpoint current above the threshold. */
  readonly tablePolicyDrift: boolean;
  /** Gate changes per fundamental period, per `phase.device`. */
  readonly gateChangesPerCycle: Readonly<Record<string, number>>;
}

/**
 * Steps the modulator through one fundamental period and checks what the table does.
 *
 * Each switching period k samples the reference at θ = (k + ½)·360°/N, reads the polarity there,
 * applies the table's triangle and sequence, and checks volt-second balance; the midpoint current
 * of the period is Σ dwell · Σ c_k·i_k with i_k = I·cos(θ − φ − k·120°). The best policy is the
 * usual split of a redundant vertex's dwell between its realisations: every period can then draw
 * any charge between its lowest and highest choice, and the cycle average nearest zero within the
 * summed range is what a midpoint controller can achieve at best.
 *
 * @param table - from `switchingTable`
 * @param options - operating point
 * @returns volt-second error, midpoint current for both policies, drift flag, gate changes
 * @throws HexsalvageInputError on invalid options
 * @example
 * ```ts
 * cycleCheck(switchingTable({ topology: 'npc', faults: ['a.outerUpper'] }), { m: 0.5, loadAngleDeg: 30 });
 * ```
 */
export function cycleCheck(table: SwitchingTable, options: CycleCheckOptions): CycleReport {
  requireObject(options, 'cycleCheck', 'an options object { m, loadAngleDeg?, polarityMarginDeg?, frequencyRatio?, currentAmplitude? }');
  const { m } = options;
  const phi = options.loadAngleDeg ?? 0;
  const delta = options.polarityMarginDeg ?? 0;
  const n = options.frequencyRatio ?? 120;
  const amp = options.currentAmplitude ?? 1;
  const threshold = options.driftThreshold ?? 0.005;
  const bad = (key: string, expected: string, got: unknown) => new HexsalvageInputError('option', 'cycleCheck', key, expected, got);
  if (!(Number.isFinite(m) && m >= 0)) throw bad('m', 'a modulation index ≥ 0', m);
  if (!(Number.isInteger(n) && n >= 6 && n <= 100000)) throw bad('frequencyRatio', 'an integer from 6 to 100000', n);
  if (!(Number.isFinite(amp) && amp > 0 && amp <= 1e9)) throw bad('currentAmplitude', 'a positive current up to 1e9', amp);
  requireNumber(phi, 'cycleCheck', 'loadAngleDeg', { min: -180, max: 180 });
  requireNumber(delta, 'cycleCheck', 'polarityMarginDeg', { min: 0, max: 60, openMax: true });
  if (!(m <= 10)) throw bad('m', 'a modulation index from 0 to 10', m);

  const mod = createModulator(table);
  let err = 0;
  let clamped = 0;
  let qTable = 0;
  const changes: Record<string, number> = {};
  let previousStart: LegState | null = null;
  let firstStart: LegState | null = null;
  for (let k = 0; k < n; k++) {
    const thetaDeg = ((k + 0.5) * 360) / n;
    const th = (thetaDeg * Math.PI) / 180;
    const pol = polarityAt(thetaDeg, phi, delta);
    const entry = table.polarities[pol];
    const r = mod.modulate(m * Math.cos(th), m * Math.sin(th), pol);
    if (!entry || r.triangle < 0) {
      clamped++;
      continue;
    }
    const tri = entry.tableTriangles[r.triangle];
    if (r.clamped) clamped++;
    else {
      const [a, b] = r.vertices.reduce<[number, number]>((acc, t, j) => {
        const [va, vb] = clarke(t);
        return [acc[0] + (r.dwell[j] as number) * va, acc[1] + (r.dwell[j] as number) * vb];
      }, [0, 0]);
      err = Math.max(err, Math.hypot(a - m * Math.cos(th), b - m * Math.sin(th)));
    }
    const i = PHASES.map((_, p) => amp * Math.cos(th - (phi * Math.PI) / 180 - (p * 2 * Math.PI) / 3));
    const np = (rz: VertexRealisation) => rz.midpoint.reduce<number>((s, c, p) => s + c * (i[p] as number), 0);
    if (!tri?.sequence) continue;
    const seq = tri.sequence;
    qTable += tri.vertices.reduce((s, v, j) => s + (r.dwell[j] as number) * np(v.realisations[seq.choice[j] as number] as VertexRealisation), 0);
    for (const [dev, c] of Object.entries(seq.gateChanges)) changes[dev] = (changes[dev] ?? 0) + c;
    const start = seq.states[0];
    if (previousStart) addTransitions(changes, previousStart, start);
    previousStart = start;
    firstStart ??= start;
  }
  if (previousStart && firstStart) addTransitions(changes, previousStart, firstStart);
  const avgTable = qTable / n;
  // Best policy: a redundant vertex's dwell may be split between its realisations, so each period
  // can draw any midpoint charge between its lowest and highest choice. The reachable range of the
  // cycle average is the one `mMaxBalanced` is decided on (same sweep, same tolerance), so the
  // plan and this check always agree; the best is the point of the range nearest zero.
  const range = midpointRangeAt(midpointProfile(table.polarities, m, phi, delta), m);
  const [lo, hi] = range ? [range[0] * amp, range[1] * amp] : [0, 0];
  const avgBest = range ? Math.min(Math.max(0, lo), hi) : null;
  return {
    periods: n,
    voltSecondErrorMax: err,
    clampedPeriods: clamped,
    midpointCurrent: { tablePolicy: avgTable, bestPolicy: avgBest, reachable: range ? [lo, hi] : null },
    midpointDrift: !range || lo > MIDPOINT_TOLERANCE * amp || hi < -MIDPOINT_TOLERANCE * amp,
    tablePolicyDrift: Math.abs(avgTable) > threshold * amp,
    gateChangesPerCycle: Object.fromEntries(Object.entries(changes).sort(([a], [b]) => (a < b ? -1 : 1))),
  };
}

function addTransitions(changes: Record<string, number>, from: LegState, to: LegState): void {
  PHASES.forEach((ph, k) => {
    for (const d of gateDifference(from[k]!.gates, to[k]!.gates)) changes[`${ph}.${d}`] = (changes[`${ph}.${d}`] ?? 0) + 1;
  });
}
