import type { Point } from './clarke.js';

/**
 * Where the ray from the origin along the unit vector (ux, uy) meets the line of the segment p→q:
 * writes the distance t along the ray to `out[0]`, the parameter s along p→q to `out[1]` (0 at p, 1
 * at q) and the orientation `den` to `out[2]` (den > 0: p→q crosses the ray from its right to its
 * left). The outline geometry and the outline clamp both use it; the C header's clamp writes the
 * same arithmetic (export/cLocator.ts), and the parity tests hold the two together.
 *
 * @param ux - ray direction, x (unit vector)
 * @param uy - ray direction, y
 * @param p - segment start
 * @param q - segment end
 * @param out - `[t, s, den]`
 * @returns false when the ray and the segment are parallel (|den| < 1e-15): nothing written
 * @example
 * ```ts
 * const out = new Float64Array(3);
 * rayHit(1, 0, [2, -1], [2, 1], out); // true: t = 2, s = 0.5, den = 2
 * ```
 */
export function rayHit(ux: number, uy: number, p: Point | readonly [number, number], q: Point | readonly [number, number], out: Float64Array): boolean {
  const dx = q[0] - p[0];
  const dy = q[1] - p[1];
  const den = ux * dy - uy * dx;
  if (Math.abs(den) < 1e-15) return false;
  out[0] = (p[0] * dy - p[1] * dx) / den;
  out[1] = (p[0] * uy - p[1] * ux) / den;
  out[2] = den;
  return true;
}
