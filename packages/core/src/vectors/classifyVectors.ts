import type { SpaceVector } from './survivingVectors.js';
import { VECTOR_TOLERANCE } from '../shared/tolerance.js';

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
  const tol = VECTOR_TOLERANCE * scale;
  // A length opens a shell unless an earlier shell lies within the tolerance. The shells found so
  // far are kept sorted, so only the first one not below r by more than the tolerance needs a look
  // (a many-level leg has hundreds of shells); r goes in at its place when it opens one.
  const lengths: number[] = [];
  for (const v of healthy) {
    const r = Math.hypot(v.alpha, v.beta);
    const i = firstNotBelow(lengths, r, tol);
    if (!(i < lengths.length && Math.abs((lengths[i] as number) - r) <= tol)) lengths.splice(i, 0, r);
  }
  const names =
    levelCount === 3 && lengths.length === 4 ? ['zero', 'small', 'medium', 'large'] : levelCount === 2 && lengths.length === 2 ? ['zero', 'active'] : null;
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

/**
 * {@link classifyVector} for many vectors: on shells sorted by length (as {@link vectorShells}
 * gives them) the first shell within the tolerance is found by bisection; on any other list it
 * scans as `classifyVector` does. Same answer either way.
 *
 * @param shells - the healthy shells
 * @param scale - length scale of the diagram (default 1)
 * @returns a function of a vector giving its shell name or `off-diagram`
 * @example
 * ```ts
 * const shellOf = shellClassifier(shells, scale);
 * vectors.map((v) => shellOf(v));
 * ```
 */
export function shellClassifier(shells: readonly VectorShell[], scale = 1): (v: { alpha: number; beta: number }) => string {
  const sorted = shells.every((s, i) => i === 0 || (shells[i - 1] as VectorShell).length <= s.length);
  if (!sorted) return (v) => classifyVector(shells, v, scale);
  const tol = VECTOR_TOLERANCE * scale;
  const lengths = shells.map((s) => s.length);
  return (v) => {
    const r = Math.hypot(v.alpha, v.beta);
    // every shell before i lies below r by more than the tolerance, so the first within it (the one
    // the scan finds) is shell i or none
    const i = firstNotBelow(lengths, r, tol);
    const s = shells[i];
    return s !== undefined && Math.abs(s.length - r) <= tol ? s.name : 'off-diagram';
  };
}

// The first index of an ascending list whose value is not below r by more than tol (the test is the
// one the scans use, |x − r| > tol with x < r, which is monotone along an ascending list).
function firstNotBelow(lengths: readonly number[], r: number, tol: number): number {
  let lo = 0;
  let hi = lengths.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    const x = lengths[mid] as number;
    if (x < r && Math.abs(x - r) > tol) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}
