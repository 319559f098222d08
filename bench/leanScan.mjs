// The benchmarks' fair baseline for the modulator: the plan's dwell matrices in flat arrays and the
// same arithmetic, tried triangle by triangle in index order, no grid, no memory, no allocation.
import { POLARITY_STRINGS } from '../packages/core/dist/internal.js';

/**
 * A plain allocation-free scan over a plan's triangles.
 *
 * @param plan - from planRemedial
 * @param out - where the three dwell times go
 * @returns scan(alpha, beta, polarityIndex) → triangle index or -1
 */
export function leanScan(plan, out) {
  const flat = POLARITY_STRINGS.map((p) => Float64Array.from(plan.polarities[p].dwell.flatMap((m) => m.flat())));
  return (a, b, k) => {
    const m = flat[k];
    for (let o = 0; o < m.length; o += 9) {
      const d0 = m[o] * a + m[o + 1] * b + m[o + 2];
      if (d0 < -1e-9) continue;
      const d1 = m[o + 3] * a + m[o + 4] * b + m[o + 5];
      if (d1 < -1e-9) continue;
      const d2 = m[o + 6] * a + m[o + 7] * b + m[o + 8];
      if (d2 < -1e-9) continue;
      const s = Math.max(0, d0) + Math.max(0, d1) + Math.max(0, d2);
      out[0] = Math.max(0, d0) / s;
      out[1] = Math.max(0, d1) / s;
      out[2] = Math.max(0, d2) / s;
      return o / 9;
    }
    return -1;
  };
}
