import type { LevelTriplet } from '../geometry/clarke.js';
import type { DwellMatrix } from '../geometry/dwell.js';
import type { PolarityString } from '../leg/polarity.js';
import { polaritySectors, type PolaritySector } from '../vectors/polaritySectors.js';

/** What the midpoint sweep reads of a polarity's tiling (a diagram, a plan or a table polarity fits). */
export interface MidpointTiling {
  readonly vectors: readonly { readonly alpha: number; readonly beta: number; readonly levels: readonly LevelTriplet[] }[];
  readonly triangles: readonly (readonly [number, number, number])[];
  readonly dwell: readonly DwellMatrix[];
}

type PolarityDiagram = MidpointTiling;

/** Tilings by polarity string: a `Map` (diagram atlas) or a record (plan or table polarities). */
export type MidpointSource = ReadonlyMap<PolarityString, MidpointTiling> | Readonly<Record<PolarityString, MidpointTiling>>;

function tilingOf(src: MidpointSource, p: PolarityString): MidpointTiling {
  const d = src instanceof Map ? src.get(p) : Object.prototype.hasOwnProperty.call(src, p) ? (src as Record<string, MidpointTiling>)[p] : undefined;
  if (!d) throw new Error(`no tiling for polarity ${p}`);
  return d;
}

/** Samples of θ per fundamental period (every 1°). */
export const MIDPOINT_SAMPLES = 360;
/** |average midpoint current| (per unit of the current amplitude) still counted as zero. */
export const MIDPOINT_TOLERANCE = 1e-6;

/**
 * The average midpoint current that the choice among redundant realisations can reach over one
 * fundamental period, as a function of the modulation index m on [0, mTop].
 *
 * How it is computed: θ is sampled at {@link MIDPOINT_SAMPLES} equal steps (midpoint rule). At each
 * θ the reference m·(cos θ, sin θ) lies in one triangle of the polarity's tiling; inside it the dwell
 * of vertex j is affine in m, d_j = a_j·m + b_j, and the vertex may draw the midpoint current
 * Σ c_k·i_k of any of its realisations (c_k = 1 for a phase at the midpoint potential), or split its
 * dwell between them. So along the ray the lowest and highest reachable charge are piecewise linear
 * in m, with breaks where the ray crosses a triangle edge. Summing the rays gives the period
 * averages `low(m)` and `high(m)` exactly as piecewise-linear functions (for the sampled θ).
 */
export interface MidpointProfile {
  /** Upper end of the m range covered. */
  readonly mTop: number;
  /** Smallest m where some ray leaves the tiling (`Infinity` when none below mTop). */
  readonly gapAt: number;
  /** Break points of `low`/`high` in m, ascending, starting at 0. */
  readonly breaks: readonly number[];
  /** Per segment k (between breaks k and k+1): low(m) = lowSlope·m + lowConst, likewise high. */
  readonly lowSlope: readonly number[];
  readonly lowConst: readonly number[];
  readonly highSlope: readonly number[];
  readonly highConst: readonly number[];
}

/**
 * Builds the {@link MidpointProfile} of a set of diagrams at a load angle and margin.
 *
 * @param diagrams - tiling per polarity string (diagram atlas map, plan or table polarities)
 * @param mTop - largest m of interest (normally mMax)
 * @param loadAngleDeg - load angle φ (currents of unit amplitude lag the reference by φ)
 * @param marginDeg - polarity margin δ (which polarity's tiling is in force)
 * @returns the profile
 * @example
 * ```ts
 * midpointRangeAt(midpointProfile(atlas.faulted, plan.mMax, 25, 0), 0.8);
 * ```
 */
export function midpointProfile(diagrams: MidpointSource, mTop: number, loadAngleDeg: number, marginDeg: number): MidpointProfile {
  const phi = (loadAngleDeg * Math.PI) / 180;
  // polarity strings that share a tiling share its triangle list: prepare each tiling once
  const prepared = new Map<readonly unknown[], Prepared>();
  const sectors = polaritySectors(loadAngleDeg, marginDeg);
  let sector = 0;
  // events: start (+) and end (−) of each ray piece, in flat arrays (no garbage in the hot loop)
  const events = new RayEvents(4 * MIDPOINT_SAMPLES);
  const push = (r: number, ls: number, lc: number, hs: number, hc: number) => events.push(r, ls, lc, hs, hc);
  // pieces that start at 0 need no event: their sums are the first segment's
  const base = new Float64Array(4);
  // the pieces of the current ray: r0, r1 and the four coefficients
  const piece: number[][] = [];
  const q = new Float64Array(8);
  const r0s: number[] = [];
  const r1s: number[] = [];
  const span = new Float64Array(2);
  let gapAt = Infinity;
  for (let k = 0; k < MIDPOINT_SAMPLES; k++) {
    const theta = ((k + 0.5) * 2 * Math.PI) / MIDPOINT_SAMPLES;
    const deg = ((k + 0.5) * 360) / MIDPOINT_SAMPLES;
    // samples run in increasing θ, so the sector in force only moves forward
    while (sector + 1 < sectors.length && deg >= (sectors[sector] as PolaritySector).toDeg) sector++;
    const d = tilingOf(diagrams, (sectors[sector] as PolaritySector).polarity);
    let pd = prepared.get(d.triangles);
    if (!pd) {
      // a tiling's preparation does not depend on the operating point: kept beside its (immutable)
      // triangle list for as long as that list lives
      pd = PREPARED.get(d.triangles) ?? prepare(d);
      PREPARED.set(d.triangles, pd);
      prepared.set(d.triangles, pd);
    }
    const c = Math.cos(theta);
    const s = Math.sin(theta);
    const i0 = Math.cos(theta - phi);
    const i1 = Math.cos(theta - phi - (2 * Math.PI) / 3);
    const i2 = Math.cos(theta - phi - (4 * Math.PI) / 3);
    // midpoint current of a realisation by its mask of phases at the midpoint potential
    for (let mask = 0; mask < 8; mask++) q[mask] = (mask & 1 ? i0 : 0) + (mask & 2 ? i1 : 0) + (mask & 4 ? i2 : 0);
    r0s.length = 0;
    r1s.length = 0;
    const end = pd.rayStart[k + 1] as number;
    for (let at = pd.rayStart[k] as number; at < end; at++) {
      const t = pd.rayTri[at] as number;
      const o = 9 * t;
      const a0 = (pd.rows[o] as number) * c + (pd.rows[o + 1] as number) * s;
      const a1 = (pd.rows[o + 3] as number) * c + (pd.rows[o + 4] as number) * s;
      const a2 = (pd.rows[o + 6] as number) * c + (pd.rows[o + 7] as number) * s;
      const b0 = pd.rows[o + 2] as number;
      const b1 = pd.rows[o + 5] as number;
      const b2 = pd.rows[o + 8] as number;
      // d_j(r) = a_j·r + b_j ≥ 0 for the three vertices: the stretch of the ray inside the triangle
      span[0] = 0;
      span[1] = mTop;
      narrowSpan(a0, b0, span);
      narrowSpan(a1, b1, span);
      narrowSpan(a2, b2, span);
      const r0 = span[0] as number;
      const r1 = span[1] as number;
      if (r1 - r0 <= 1e-12) continue;
      let ls = 0;
      let lc = 0;
      let hs = 0;
      let hc = 0;
      for (let j = 0; j < 3; j++) {
        const aj = j === 0 ? a0 : j === 1 ? a1 : a2;
        const bj = j === 0 ? b0 : j === 1 ? b1 : b2;
        let mn = Infinity;
        let mx = -Infinity;
        for (const mask of pd.masks[3 * t + j] as readonly number[]) {
          const v = q[mask] as number;
          if (v < mn) mn = v;
          if (v > mx) mx = v;
        }
        ls += aj * mn;
        lc += bj * mn;
        hs += aj * mx;
        hc += bj * mx;
      }
      r0s.push(r0);
      r1s.push(r1);
      piece.push([r0, r1, ls, lc, hs, hc]);
    }
    // One event where a piece ends and the next begins (the difference of their coefficients),
    // none at 0 or at mTop: a ray then adds two or three radii to sort instead of six.
    piece.sort((x, y) => (x[0] as number) - (y[0] as number));
    let prev: number[] | null = null;
    for (const p of piece) {
      const r0 = p[0] as number;
      if (r0 <= 1e-12) {
        for (let j = 0; j < 4; j++) base[j] = (base[j] as number) + (p[2 + j] as number);
      } else if (prev && Math.abs((prev[1] as number) - r0) <= 1e-12) {
        push(
          r0,
          (p[2] as number) - (prev[2] as number),
          (p[3] as number) - (prev[3] as number),
          (p[4] as number) - (prev[4] as number),
          (p[5] as number) - (prev[5] as number),
        );
        prev[1] = -1; // its end is accounted for
      } else {
        if (prev && (prev[1] as number) >= 0 && (prev[1] as number) < mTop)
          push(prev[1] as number, -(prev[2] as number), -(prev[3] as number), -(prev[4] as number), -(prev[5] as number));
        push(r0, p[2] as number, p[3] as number, p[4] as number, p[5] as number);
      }
      prev = p;
    }
    if (prev && (prev[1] as number) >= 0 && (prev[1] as number) < mTop - 1e-12)
      push(prev[1] as number, -(prev[2] as number), -(prev[3] as number), -(prev[4] as number), -(prev[5] as number));
    piece.length = 0;
    // the pieces of one ray must join up from 0; where they do not, the reference leaves the tiling
    let reach = 0;
    for (let grew = true; grew;) {
      grew = false;
      for (let p = 0; p < r0s.length; p++) {
        if ((r0s[p] as number) <= reach + 1e-9 && (r1s[p] as number) > reach) {
          reach = r1s[p] as number;
          grew = true;
        }
      }
    }
    if (reach < mTop - 1e-9) gapAt = Math.min(gapAt, reach);
  }
  // segment k runs from breaks[k] to breaks[k + 1] (or mTop); every piece starting at or before
  // breaks[k] and not yet ended there is active on it. Events are binned to their break by binary
  // search over the natively sorted radii (no comparator sort), then summed up in order.
  const { radii: er, values: ev, count: n } = events;
  const sorted = er.slice(0, n).sort();
  const breaks: number[] = [0];
  for (let e = 0; e < n; e++) {
    const r = sorted[e] as number;
    if (r < mTop && r > (breaks[breaks.length - 1] as number)) breaks.push(r);
  }
  const b = breaks.length;
  const delta = new Float64Array(4 * b);
  for (let j = 0; j < 4; j++) delta[j] = base[j] as number;
  for (let e = 0; e < n; e++) {
    const r = er[e] as number;
    if (r >= mTop) continue;
    let lo = 0;
    let hi = b - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if ((breaks[mid] as number) <= r) lo = mid;
      else hi = mid - 1;
    }
    for (let j = 0; j < 4; j++) delta[4 * lo + j] = (delta[4 * lo + j] as number) + (ev[4 * e + j] as number);
  }
  const lowSlope: number[] = [];
  const lowConst: number[] = [];
  const highSlope: number[] = [];
  const highConst: number[] = [];
  let [ls, lc, hs, hc] = [0, 0, 0, 0];
  for (let k = 0; k < b; k++) {
    ls += delta[4 * k] as number;
    lc += delta[4 * k + 1] as number;
    hs += delta[4 * k + 2] as number;
    hc += delta[4 * k + 3] as number;
    lowSlope.push(ls / MIDPOINT_SAMPLES);
    lowConst.push(lc / MIDPOINT_SAMPLES);
    highSlope.push(hs / MIDPOINT_SAMPLES);
    highConst.push(hc / MIDPOINT_SAMPLES);
  }
  return { mTop, gapAt, breaks, lowSlope, lowConst, highSlope, highConst };
}

// Narrows the stretch [span[0], span[1]] of a ray to where d(r) = a·r + b ≥ 0 (span[1] = −1: nowhere).
function narrowSpan(a: number, b: number, span: Float64Array): void {
  if (Math.abs(a) < 1e-15) {
    if (b < -1e-12) span[1] = -1;
  } else if (a > 0) span[0] = Math.max(span[0] as number, -b / a);
  else span[1] = Math.min(span[1] as number, -b / a);
}

/** The start and end events of ray pieces: a radius and four coefficients each, in flat arrays that grow by doubling. */
class RayEvents {
  radii: Float64Array;
  values: Float64Array;
  count = 0;

  constructor(capacity: number) {
    this.radii = new Float64Array(capacity);
    this.values = new Float64Array(4 * capacity);
  }

  push(r: number, ls: number, lc: number, hs: number, hc: number): void {
    if (this.count === this.radii.length) {
      const radii = new Float64Array(2 * this.radii.length);
      radii.set(this.radii);
      this.radii = radii;
      const values = new Float64Array(2 * this.values.length);
      values.set(this.values);
      this.values = values;
    }
    const n = this.count++;
    this.radii[n] = r;
    this.values[4 * n] = ls;
    this.values[4 * n + 1] = lc;
    this.values[4 * n + 2] = hs;
    this.values[4 * n + 3] = hc;
  }
}

/** A diagram prepared for ray sweeps: flat dwell rows, realisation masks and angular spans. */
interface Prepared {
  readonly count: number;
  /** 9 numbers per triangle: the dwell matrix by rows. */
  readonly rows: Float64Array;
  /** Per triangle vertex (3 per triangle): the midpoint masks of its realisations. */
  readonly masks: readonly (readonly number[])[];
  /** Per sample ray k: the triangles it can meet are rayTri[rayStart[k] … rayStart[k+1]−1]. */
  readonly rayStart: Int32Array;
  readonly rayTri: Int32Array;
}

const PREPARED = new WeakMap<object, Prepared>();

function prepare(d: PolarityDiagram): Prepared {
  const count = d.triangles.length;
  const rows = new Float64Array(9 * count);
  const masks: number[][] = [];
  const centre = new Float64Array(count);
  const half = new Float64Array(count);
  d.triangles.forEach((tri, t) => {
    (d.dwell[t] as PolarityDiagram['dwell'][number]).forEach((row, j) => rows.set(row, 9 * t + 3 * j));
    const corners = tri.map((v) => d.vectors[v] as PolarityDiagram['vectors'][number]);
    for (const v of corners) masks.push(v.levels.map((r) => (r[0] === 0 ? 1 : 0) | (r[1] === 0 ? 2 : 0) | (r[2] === 0 ? 4 : 0)));
    const cx = corners.reduce((acc, v) => acc + v.alpha, 0) / 3;
    const cy = corners.reduce((acc, v) => acc + v.beta, 0) / 3;
    const at = Math.atan2(cy, cx);
    let w = 0;
    for (const v of corners) {
      if (Math.hypot(v.alpha, v.beta) < 1e-9) continue;
      w = Math.max(w, Math.abs(wrap(Math.atan2(v.beta, v.alpha) - at)));
    }
    // only a triangle with the origin strictly inside meets every direction; one with the origin as a
    // corner or on an edge meets just the directions between its other corners
    const containsOrigin = (d.dwell[t] as PolarityDiagram['dwell'][number]).every((row) => row[2] > 1e-12);
    centre[t] = at;
    half[t] = containsOrigin || w >= Math.PI / 2 ? -1 : w + 1e-9;
  });
  // The sample directions are fixed, so which rays can meet which triangle is known up front: each
  // ray then visits the two or three triangles it crosses instead of testing all of them.
  // sample k sits at θ_k = (k + ½)·Δ; a span [c − h, c + h] holds the k with θ_k inside it. Two
  // passes fill the ray lists as one flat array (count, then place).
  const step = (2 * Math.PI) / MIDPOINT_SAMPLES;
  const K = MIDPOINT_SAMPLES;
  const range = (t: number): [number, number] => {
    const h = half[t] as number;
    if (h < 0) return [0, K - 1];
    const c = centre[t] as number;
    return [Math.ceil((c - h) / step - 0.5), Math.floor((c + h) / step - 0.5)];
  };
  // a triangle lies on several rays, so this is not offsetLists' one-key-per-item form
  const rayStart = new Int32Array(K + 1);
  for (let t = 0; t < count; t++) {
    const [k0, k1] = range(t);
    for (let k = k0; k <= k1; k++) {
      const r = (((k % K) + K) % K) + 1;
      rayStart[r] = (rayStart[r] as number) + 1;
    }
  }
  for (let k = 0; k < K; k++) rayStart[k + 1] = (rayStart[k + 1] as number) + (rayStart[k] as number);
  const fill = rayStart.slice(0, K);
  const rayTri = new Int32Array(rayStart[K] as number);
  for (let t = 0; t < count; t++) {
    const [k0, k1] = range(t);
    for (let k = k0; k <= k1; k++) {
      const r = ((k % K) + K) % K;
      rayTri[fill[r] as number] = t;
      fill[r] = (fill[r] as number) + 1;
    }
  }
  return { count, rows, masks, rayStart, rayTri };
}

function wrap(x: number): number {
  let y = x % (2 * Math.PI);
  if (y > Math.PI) y -= 2 * Math.PI;
  if (y < -Math.PI) y += 2 * Math.PI;
  return y;
}

/**
 * The reachable range of the average midpoint current at one m, from a profile.
 *
 * @param p - the profile
 * @param m - modulation index in [0, p.mTop]
 * @returns `[lowest, highest]` per unit of current amplitude, or `null` where the reference leaves
 *   the tiling at m
 * @example
 * ```ts
 * midpointRangeAt(profile, 0.5); // e.g. [-0.1, 0.08]
 * ```
 */
export function midpointRangeAt(p: MidpointProfile, m: number): readonly [number, number] | null {
  if (m >= p.gapAt || m > p.mTop) return null;
  let k = 0;
  while (k + 1 < p.lowSlope.length && (p.breaks[k + 1] as number) <= m) k++;
  return [(p.lowSlope[k] ?? 0) * m + (p.lowConst[k] ?? 0), (p.highSlope[k] ?? 0) * m + (p.highConst[k] ?? 0)];
}

/**
 * mMaxBalanced from a profile: the largest m ≤ mTop such that zero average
 * midpoint current is reachable at every m' ≤ m. Exact for the sampled θ: each linear piece of
 * `low` and `high` is solved for where it leaves [−tolerance, +tolerance].
 *
 * @param p - the profile (built with mTop = mMax)
 * @returns mMaxBalanced
 * @example
 * ```ts
 * balancedLimit(midpointProfile(atlas.faulted, plan.mMax, 25, 0));
 * ```
 */
export function balancedLimit(p: MidpointProfile): number {
  const tol = MIDPOINT_TOLERANCE;
  for (let k = 0; k < p.lowSlope.length; k++) {
    const a = p.breaks[k] as number;
    const b = Math.min(p.breaks[k + 1] ?? p.mTop, p.mTop, p.gapAt);
    const lo = (m: number) => (p.lowSlope[k] as number) * m + (p.lowConst[k] as number);
    const hi = (m: number) => (p.highSlope[k] as number) * m + (p.highConst[k] as number);
    if (lo(a) > tol || hi(a) < -tol) return a;
    let end = b;
    if (lo(b) > tol) end = Math.min(end, a + ((tol - lo(a)) / (lo(b) - lo(a))) * (b - a));
    if (hi(b) < -tol) end = Math.min(end, a + ((-tol - hi(a)) / (hi(b) - hi(a))) * (b - a));
    if (end < b) return end;
    if (b >= p.gapAt) return p.gapAt;
  }
  return Math.min(p.mTop, p.gapAt);
}
