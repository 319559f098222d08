import type { PhasePolarity } from '../leg/legTable.js';
import type { PolarityString } from '../leg/polarity.js';

/** An interval of θ (degrees) over which the measured polarity string is constant. */
export interface PolaritySector {
  readonly fromDeg: number;
  readonly toDeg: number;
  readonly polarity: PolarityString;
}

const PHASE_SHIFT_DEG = [0, 120, 240] as const;

/**
 * Polarity of each phase current at reference angle θ.
 *
 * Phase k carries `cos(θ − φ − k·120°)`; within δ of one of its zero crossings (or exactly on
 * one when δ = 0) the phase reads `?`.
 *
 * @param thetaDeg - reference angle θ in degrees
 * @param loadAngleDeg - load angle φ (currents lag the voltage reference by φ)
 * @param marginDeg - polarity margin δ in degrees
 * @returns the polarity string at θ
 * @example
 * ```ts
 * polarityAt(0, 0, 0); // '+--'
 * ```
 */
export function polarityAt(thetaDeg: number, loadAngleDeg: number, marginDeg: number): PolarityString {
  return PHASE_SHIFT_DEG.map((shift): PhasePolarity => {
    const x = mod360(thetaDeg - loadAngleDeg - shift);
    // distance (deg) from x to the nearest zero crossing of cos, at 90° and 270°
    const toZero = Math.min(Math.abs(x - 90), Math.abs(x - 270));
    if (toZero < marginDeg || toZero === 0) return '?';
    return x < 90 || x > 270 ? '+' : '-';
  }).join('');
}

/**
 * The partition of θ ∈ [0°, 360°) into intervals of constant polarity.
 *
 * Breakpoints are each phase current's zero crossings at φ + 90° + k·60°, widened by ±δ.
 * The interval running through 0° is split there, so every interval lies within [0, 360].
 * Zero-length windows (δ = 0) are not intervals: at a zero crossing both neighbouring sectors
 * apply, and the limit takes the closure of each.
 *
 * @param loadAngleDeg - load angle φ in degrees
 * @param marginDeg - polarity margin δ in degrees, 0 ≤ δ < 60
 * @returns sectors in increasing θ, adjacent ones with different polarity
 * @example
 * ```ts
 * polaritySectors(0, 0).map((s) => s.polarity); // ['+--', '++-', …] six sectors plus the split at 0°
 * ```
 */
export function polaritySectors(loadAngleDeg: number, marginDeg: number): PolaritySector[] {
  const cuts = new Set<number>([0, 360]);
  for (let k = 0; k < 6; k++) {
    const z = loadAngleDeg + 90 + 60 * k;
    for (const c of marginDeg > 0 ? [z - marginDeg, z + marginDeg] : [z]) cuts.add(mod360(c));
  }
  const sorted = [...cuts].sort((x, y) => x - y);
  const out: PolaritySector[] = [];
  for (let i = 0; i + 1 < sorted.length; i++) {
    const fromDeg = sorted[i] as number;
    const toDeg = sorted[i + 1] as number;
    if (toDeg - fromDeg <= 1e-12) continue;
    const polarity = polarityAt((fromDeg + toDeg) / 2, loadAngleDeg, marginDeg);
    const last = out[out.length - 1];
    if (last && last.polarity === polarity) out[out.length - 1] = { ...last, toDeg };
    else out.push({ fromDeg, toDeg, polarity });
  }
  return out;
}

/**
 * Reduces an angle in degrees to [0, 360).
 *
 * @param x - angle in degrees
 * @returns the same direction in [0, 360)
 * @example
 * ```ts
 * mod360(-90); // 270
 * ```
 */
export function mod360(x: number): number {
  const r = x % 360;
  const m = r < 0 ? r + 360 : r;
  return m >= 360 ? 0 : m;
}
