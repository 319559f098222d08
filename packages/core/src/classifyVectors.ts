import type { SpaceVector } from './survivingVectors.js';
import { VECTOR_TOLERANCE } from './tolerance.js';

/** A length shell of the healthy vector diagram and its name. */
export interface VectorShell {
  readonly length: number;
  /** `zero`, `small`, `medium`, `large` (three-level), `zero`/`active` (two-level), else `shell-k`. */
  readonly name: string;
}

/**
 * Names the length shells of a healthy diagram.
 *
 * A diagram of three equally spaced levels has the usual four shells (zero, small, medium,
 * large); a two-level one has zero and active vectors; any other diagram is named by shell
 * number counted outwards from 0.
 *
 * @param healthy - vectors of the healthy leg (all polarities agree there)
 * @param levelCount - number of distinct phase levels of the healthy leg
 * @returns shells sorted by length
 * @example
 * ```ts
 * vectorShells(healthyNpcVectors, 3).map((s) => s.name); // ['zero', 'small', 'medium', 'large']
 * ```
 */
export function vectorShells(healthy: readonly SpaceVector[], levelCount: number, scale = 1): VectorShell[] {
  const lengths: number[] = [];
  for (const v of healthy) {
    const r = Math.hypot(v.alpha, v.beta);
    if (!lengths.some((x) => Math.abs(x - r) <= VECTOR_TOLERANCE * scale)) lengths.push(r);
  }
  lengths.sort((x, y) => x - y);
  const names = levelCount === 3 && lengths.length === 4 ? ['zero', 'small', 'medium', 'large']
    : levelCount === 2 && lengths.length === 2 ? ['zero', 'active'] : null;
  return lengths.map((length, k) => ({ length, name: names?.[k] ?? `shell-${k}` }));
}

/**
 * The shell name of a vector.
 *
 * @param shells - from {@link vectorShells}
 * @param v - a vector (or any point)
 * @returns the shell name, or `off-diagram` when its length is not a healthy shell
 * @example
 * ```ts
 * classifyVector(shells, { alpha: 2 / 3, beta: 0, levels: [] }); // 'small'
 * ```
 */
export function classifyVector(shells: readonly VectorShell[], v: { alpha: number; beta: number }, scale = 1): string {
  const r = Math.hypot(v.alpha, v.beta);
  return shells.find((s) => Math.abs(s.length - r) <= VECTOR_TOLERANCE * scale)?.name ?? 'off-diagram';
}
