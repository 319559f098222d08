import { clarkeAlpha, clarkeBeta } from './clarke.js';

/**
 * The length scale of a leg's diagrams: the longest healthy vector (4/3 of the link's half span).
 *
 * @param healthy - vectors of the healthy diagram
 * @returns a positive length (1 for an empty diagram)
 * @example
 * ```ts
 * diagramScale(healthyNpcVectors); // 4/3
 * ```
 */
export function diagramScale(healthy: readonly { readonly alpha: number; readonly beta: number }[]): number {
  const r = Math.max(0, ...healthy.map((v) => Math.hypot(v.alpha, v.beta)));
  return r > 0 ? r : 1;
}

/**
 * {@link diagramScale} of the vectors one level set gives every phase, found without building them:
 * the longest vector is a corner of the hexagon (top level in one or two phases, bottom level in
 * the rest), realised by that triplet alone, so it is its own vector's position, and only the eight
 * triplets of the top and bottom levels need a look. Lets the healthy vectors be built once, at the
 * scale every diagram of the leg uses (see diagramAtlas); were a leg's levels within rounding of
 * each other so that the two differed in the last bit, its healthy vectors would merely be built a
 * second time.
 *
 * @param levels - the healthy leg's levels (one phase)
 * @returns the number `diagramScale(survivingVectors([levels, levels, levels], s))` gives
 * @example
 * ```ts
 * levelSetScale([-1, 0, 1]); // 4/3
 * ```
 */
export function levelSetScale(levels: readonly number[]): number {
  const ends = levels.length === 0 ? [] : [Math.min(...levels), Math.max(...levels)];
  let r = 0;
  for (const la of ends)
    for (const lb of ends)
      for (const lc of ends) {
        const x = Math.hypot(clarkeAlpha(la, lb, lc), clarkeBeta(lb, lc));
        if (x > r) r = x;
      }
  return r > 0 ? r : 1;
}
