/**
 * The C functions that turn measured signs into a polarity index and locate a reference among the
 * header's triangles: the same search as the TypeScript modulator's plain form (first triangle in
 * index order containing the point; otherwise clamped to the tiling's outline or the hull, then the
 * least-outside triangle), so that firmware and the library give the same triangle and dwell times.
 * The clamp's ray–segment test comes from geometry/rayHit.ts, where the TypeScript one lives.
 */

import { cRayHit } from '../geometry/rayHit.js';

/**
 * `<prefix>_polarity_index(sa, sb, sc)`: measured current signs to a polarity index.
 *
 * @param px - the identifier prefix
 * @returns C source
 * @example
 * ```ts
 * cPolarityIndex('hs');
 * ```
 */
export function cPolarityIndex(px: string): string {
  return `/* Polarity index from the measured current signs: +1 (out of the leg), -1 (into it), 0 (unknown).
 * Returns -1 for +++ and --- (impossible with a three-wire load). */
static inline int ${px}_polarity_index(int sa, int sb, int sc)
{
  int s[3], i, k = 0;
  s[0] = sa; s[1] = sb; s[2] = sc;
  if (sa == sb && sb == sc && sa != 0) return -1;
  for (i = 0; i < 3; i++) k = 3 * k + (s[i] > 0 ? 0 : s[i] < 0 ? 1 : 2);
  /* +++ (0) is skipped, and --- (13) too */
  return k - 1 - (k > 13 ? 1 : 0);
}`;
}

/**
 * `<prefix>_locate(p, alpha, beta, dwell, clamped)` with its helpers (the inside test, clamping to
 * the outline and to the hull).
 *
 * @param px - the identifier prefix
 * @param PX - the prefix in capitals (macros)
 * @returns C source
 * @example
 * ```ts
 * cLocate('hs', 'HS');
 * ```
 */
export function cLocate(px: string, PX: string): string {
  return `/* Dwell times from the three barycentric values: negatives set to 0, then normalised. Plain
 * comparisons, not fmax: a library call gcc does not inline; a NaN becomes 0 as with fmax, and
 * -0 becomes +0. */
static inline void ${px}_normalise_(double d0, double d1, double d2, double d[3])
{
  double s;
  d0 = d0 > 0.0 ? d0 : 0.0; d1 = d1 > 0.0 ? d1 : 0.0; d2 = d2 > 0.0 ? d2 : 0.0;
  s = d0 + d1 + d2;
  d[0] = d0 / s; d[1] = d1 / s; d[2] = d2 / s;
}

static inline int ${px}_inside_(int t, double a, double b, double d[3])
{
  /* plain comparisons, not fmin: a library call where NaN rules keep the compiler from inlining
   * it, and the search makes this test for every triangle it passes (a NaN is ignored by the
   * test, as fmin ignores it) */
  const ${px}_real *m = ${px}_dwell[t];
  double d0 = m[0] * a + m[1] * b + m[2], d1, d2;
  if (d0 < -${PX}_DWELL_TOLERANCE) return 0;
  d1 = m[3] * a + m[4] * b + m[5];
  if (d1 < -${PX}_DWELL_TOLERANCE) return 0;
  d2 = m[6] * a + m[7] * b + m[8];
  if (d2 < -${PX}_DWELL_TOLERANCE) return 0;
  ${px}_normalise_(d0, d1, d2, d);
  return 1;
}

${cRayHit(px)}

static inline void ${px}_clamp_outline_(int p, double x, double y, double *ox, double *oy)
{
  int first = ${px}_outline_first[p], n = ${px}_outline_first[p + 1] - first, i;
  double len = sqrt(x * x + y * y), dist = INFINITY;
  if (len > 0) {
    double ux = x / len, uy = y / len, exit = -1, entry = INFINITY, t;
    for (i = 0; i < n; i++) {
      double hit[3], s, den;
      if (!${px}_ray_hit_(ux, uy, ${px}_outline[first + i], hit)) continue;
      t = hit[0]; s = hit[1]; den = hit[2];
      if (t <= 0 || s < 0 || s > 1) continue;
      if (den > 0 && t <= len && t > exit) exit = t;
      if (den < 0 && t >= len && t < entry) entry = t;
    }
    t = exit >= 0 ? exit : entry;
    if (t < INFINITY) { *ox = t * ux; *oy = t * uy; return; }
  }
  for (i = 0; i < n; i++) {
    const ${px}_real *g = ${px}_outline[first + i];
    double ex = g[2] - g[0], ey = g[3] - g[1];
    double s = fmin(1.0, fmax(0.0, ((x - g[0]) * ex + (y - g[1]) * ey) / (ex * ex + ey * ey)));
    double qx = g[0] + s * ex, qy = g[1] + s * ey, dq = (qx - x) * (qx - x) + (qy - y) * (qy - y);
    if (dq < dist) { dist = dq; *ox = qx; *oy = qy; }
  }
}

static inline void ${px}_clamp_(int p, double x, double y, double *ox, double *oy)
{
  int first = ${px}_hull_first[p], n = ${px}_hull_first[p + 1] - first, i, empty = 0;
  double len = sqrt(x * x + y * y), dist = INFINITY;
  if (${px}_outline_first[p + 1] > ${px}_outline_first[p]) { ${px}_clamp_outline_(p, x, y, ox, oy); return; }
  if (len > 0) {
    double ux = x / len, uy = y / len, lo = 0, hi = INFINITY;
    for (i = 0; i < n; i++) {
      const ${px}_real *a = ${px}_hull[first + i], *b = ${px}_hull[first + (i + 1) % n];
      double nx = b[1] - a[1], ny = -(b[0] - a[0]);
      double h = nx * a[0] + ny * a[1], c = nx * ux + ny * uy;
      if (fabs(c) < 1e-15) { if (h < 0) empty = 1; }
      else if (c > 0) hi = fmin(hi, h / c);
      else lo = fmax(lo, h / c);
    }
    if (!empty && lo <= hi) {
      double t = fmin(fmax(len, lo), hi);
      *ox = t * ux; *oy = t * uy;
      return;
    }
  }
  for (i = 0; i < n; i++) {
    const ${px}_real *a = ${px}_hull[first + i], *b = ${px}_hull[first + (i + 1) % n];
    double ex = b[0] - a[0], ey = b[1] - a[1];
    double s = fmin(1.0, fmax(0.0, ((x - a[0]) * ex + (y - a[1]) * ey) / (ex * ex + ey * ey)));
    double qx = a[0] + s * ex, qy = a[1] + s * ey, dq = (qx - x) * (qx - x) + (qy - y) * (qy - y);
    if (dq < dist) { dist = dq; *ox = qx; *oy = qy; }
  }
}

/* Locates reference (alpha, beta) for polarity index p. Writes the vertices' duty cycles to
 * dwell[3] (vertex order of the triangle) and 1/0 to *clamped. Returns the global triangle row
 * (index into the per-triangle arrays), or -1 when polarity p has no triangles. */
static inline int ${px}_locate(int p, double alpha, double beta, double dwell[3], int *clamped)
{
  int t, first, last, best;
  double a = alpha, b = beta, score = -INFINITY;
  if (p < 0 || p >= ${PX}_POLARITY_COUNT) return -1;
  first = ${px}_tri_first[p]; last = ${px}_tri_first[p + 1];
  if (first == last) return -1;
  *clamped = 0;
  for (t = first; t < last; t++) if (${px}_inside_(t, a, b, dwell)) return t;
  *clamped = 1;
  ${px}_clamp_(p, alpha, beta, &a, &b);
  for (t = first; t < last; t++) if (${px}_inside_(t, a, b, dwell)) return t;
  best = first;
  for (t = first; t < last; t++) {
    const ${px}_real *m = ${px}_dwell[t];
    double s = fmin(m[0] * a + m[1] * b + m[2], fmin(m[3] * a + m[4] * b + m[5], m[6] * a + m[7] * b + m[8]));
    if (s > score) { score = s; best = t; }
  }
  {
    const ${px}_real *m = ${px}_dwell[best];
    ${px}_normalise_(m[0] * a + m[1] * b + m[2], m[3] * a + m[4] * b + m[5], m[6] * a + m[7] * b + m[8], dwell);
  }
  return best;
}`;
}
