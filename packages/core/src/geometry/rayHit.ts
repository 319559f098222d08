import type { Point } from './clarke.js';

/**
 * Where the ray from the origin along the unit vector (ux, uy) meets the line of the segment p→q:
 * writes the distance t along the ray to `out[0]`, the parameter s along p→q to `out[1]` (0 at p, 1
 * at q) and the orientation `den` to `out[2]` (den > 0: p→q crosses the ray from its right to its
 * left). The outline geometry and the outline clamp both use it, and the C header gets the same
 * arithmetic from {@link cRayHit} beside it (the parity tests hold the two together).
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

/**
 * {@link rayHit} in C for the generated header: `<prefix>_ray_hit_(ux, uy, g, hit)` with the segment
 * `g = {x0, y0, x1, y1}` and `hit = {t, s, den}`; 0 when parallel. Written here, beside the
 * TypeScript, so that the two stay one formula.
 *
 * @param px - the identifier prefix of the header
 * @returns C source
 * @example
 * ```ts
 * cRayHit('hs');
 * ```
 */
export function cRayHit(px: string): string {
  return `static inline int ${px}_ray_hit_(double ux, double uy, const ${px}_real *g, double hit[3])
{
  double dx = g[2] - g[0], dy = g[3] - g[1], den = ux * dy - uy * dx;
  if (fabs(den) < 1e-15) return 0;
  hit[0] = (g[0] * dy - g[1] * dx) / den;
  hit[1] = (g[0] * uy - g[1] * ux) / den;
  hit[2] = den;
  return 1;
}`;
}
