import type { LevelTriplet } from '../geometry/clarke.js';
import type { DwellMatrix } from '../geometry/dwell.js';
import { HexsalvageInputError } from '../shared/errors.js';
import { clampInto, clampToOutline, type OutlineSegment } from '../geometry/locateReference.js';
import { parsePolarity, POLARITY_STRINGS, type PolarityString } from '../leg/polarity.js';
import type { PlanPolarity } from '../limits/planRemedial.js';
import { DWELL_TOLERANCE } from '../shared/tolerance.js';
import { requireObject } from '../shared/validate.js';

const POLARITY_INDEX = new Map(POLARITY_STRINGS.map((p, k) => [p, k] as const));

/** Largest |α| or |β| a modulator accepts (units of Vdc/2): far beyond any leg, far below overflow. */
export const REFERENCE_LIMIT = 1e6;

/** What `modulate` returns. */
export interface ModulationResult {
  /** Triangle index in that polarity's `triangles`, or -1 when the polarity has none. */
  readonly triangle: number;
  /** Duty cycles of the triangle's vertices, each in [0, 1], summing to 1. */
  readonly dwell: readonly [number, number, number];
  /** The level triplet applied for each vertex (vertex order of the triangle). */
  readonly vertices: readonly LevelTriplet[];
  /** True when the reference lay outside the hull and was brought back to its boundary. */
  readonly clamped: boolean;
}

/** The runtime modulator built from a plan or a switching table. */
export interface Modulator {
  /**
   * Locates a reference and returns dwell times for the measured polarity.
   *
   * @param alpha - reference α, units of Vdc/2
   * @param beta - reference β
   * @param polarity - polarity string, e.g. `+-?`
   * @returns triangle, dwell times, vertex triplets and the clamp flag
   */
  modulate(alpha: number, beta: number, polarity: PolarityString): ModulationResult;
  /**
   * Allocation-free form for hot loops: writes `[d0, d1, d2, clamped]` into `out`.
   *
   * @param alpha - reference α
   * @param beta - reference β
   * @param polarityIndex - index into `POLARITY_STRINGS` (see {@link Modulator.polarityIndex})
   * @param out - caller-owned array of length ≥ 4
   * @returns the triangle index; -1 when the polarity has no triangles, -2 when the reference is not
   *   a finite number within ±{@link REFERENCE_LIMIT}
   * @throws HexsalvageInputError when `out` is shorter than 4
   */
  modulateInto(alpha: number, beta: number, polarityIndex: number, out: Float64Array): number;
  /** Index of a polarity string for {@link Modulator.modulateInto}. */
  polarityIndex(polarity: PolarityString): number;
}

/** Source of a modulator: a plan (`planRemedial`) or a switching table (`switchingTable`). */
export type ModulatorSource = {
  readonly polarities: Readonly<Record<PolarityString, PlanPolarity & { readonly tableTriangles?: readonly SequencedTriangle[] }>>;
};

/**
 * What the modulator reads of a switching table's triangle: the triplet its sequence chose for each
 * vertex (a table's `TableTriangle` has this shape).
 */
export interface SequencedTriangle {
  readonly vertices: readonly { readonly realisations: readonly { readonly levels: LevelTriplet }[] }[];
  readonly sequence: { readonly choice: readonly number[] } | null;
}

interface Prepared {
  readonly count: number;
  readonly m: Float64Array; // 9 per triangle, row-major
  readonly hull: readonly (readonly [number, number])[];
  /** The tiling's outline where it does not fill the hull (clamping then follows it). */
  readonly outline: readonly OutlineSegment[] | null;
  readonly vertices: readonly (readonly LevelTriplet[])[];
  // uniform grid over the hull's bounding box: cell → triangle indices, ascending
  readonly x0: number;
  readonly y0: number;
  readonly cell: number;
  readonly nx: number;
  readonly ny: number;
  // cell c holds triangles cellTri[cellStart[c] … cellStart[c+1]-1], ascending
  readonly cellStart: Int32Array;
  readonly cellTri: Int32Array;
}

/**
 * Builds the runtime modulator: a point-location grid per polarity string so that a reference is
 * tested against a handful of triangles instead of all of them, and, first, the triangle the
 * polarity's previous reference fell in (a rotating reference usually stays in it; the answer is
 * taken from there only when the point is well inside, so it is always the plain search's).
 *
 * With a switching table as source, each vertex is applied with the triplet its switching
 * sequence chose; with a plan, with the vertex's first realising triplet. Both the object and the
 * allocation-free paths give exactly what a plain search of the triangles in index order gives
 * (`locateReference`): same triangle, same dwell times, same clamping.
 *
 * @param source - a plan or a switching table
 * @returns the modulator
 * @example
 * ```ts
 * const mod = createModulator(planRemedial({ topology: 'npc', faults: ['a.outerUpper'] }));
 * mod.modulate(0.3, 0.1, '+--').dwell;
 * ```
 */
export function createModulator(source: ModulatorSource): Modulator {
  const polarities = requireObject(
    requireObject(source, 'createModulator', 'a plan or a switching table (with "polarities")').polarities,
    'createModulator',
    'a plan or a switching table: its "polarities" object',
  );
  const prepared: (Prepared | null)[] = POLARITY_STRINGS.map((p) => {
    const d = Object.prototype.hasOwnProperty.call(polarities, p) ? (polarities[p] as ModulatorSource['polarities'][string]) : undefined;
    if (d === undefined) return null;
    const ok =
      typeof d === 'object' &&
      d !== null &&
      Array.isArray(d.triangles) &&
      Array.isArray(d.dwell) &&
      Array.isArray(d.vectors) &&
      Array.isArray(d.hull) &&
      d.dwell.length === d.triangles.length;
    if (!ok)
      throw new HexsalvageInputError(
        'option',
        'createModulator',
        `polarities.${p}`,
        'a polarity with vectors, hull, triangles and one dwell matrix per triangle',
      );
    return prepare(d);
  });
  return modulatorFrom(prepared);
}

/**
 * A point locator for one tiling, answering as `modulateInto` does (the triangle index; a clamped
 * reference's triangle; -2 beyond ±{@link REFERENCE_LIMIT}): the switching table uses it to find the
 * healthy triangle under a faulted one.
 *
 * @param tiling - vectors, hull (as points), triangles and dwell matrices of one polarity
 * @returns locate(alpha, beta) → triangle index
 * @example
 * ```ts
 * triangleLocator(plan.polarities['+--'])(0.2, 0.1);
 * ```
 */
export function triangleLocator(tiling: Pick<PlanPolarity, 'vectors' | 'hull' | 'triangles' | 'dwell'>): (alpha: number, beta: number) => number {
  const k = POLARITY_INDEX.get('+--') as number;
  const mod = modulatorFrom(POLARITY_STRINGS.map((_, i) => (i === k ? prepare(tiling) : null)));
  const out = new Float64Array(4);
  return (alpha, beta) => mod.modulateInto(alpha, beta, k, out);
}

// The modulator's two paths over the prepared polarities (null: a polarity the source lacks).
function modulatorFrom(prepared: readonly (Prepared | null)[]): Modulator {
  const scratch = new Float64Array(4);
  const clampBuf = new Float64Array(2);
  // The triangle each polarity's last reference fell in: a rotating reference (firmware and
  // simulations step it by a small angle per call) is usually still inside it.
  const last = new Int32Array(POLARITY_STRINGS.length).fill(-1);
  // every polarity's dwell matrices in one array, and where each polarity's last triangle starts
  // in it: the fast path then reads two typed arrays and nothing else
  const base = new Int32Array(POLARITY_STRINGS.length);
  const all = new Float64Array(
    prepared.reduce((n, pr, k) => {
      base[k] = n;
      return n + (pr ? pr.m.length : 0);
    }, 0),
  );
  prepared.forEach((pr, k) => {
    if (pr) all.set(pr.m, base[k] as number);
  });
  const lastAt = new Int32Array(POLARITY_STRINGS.length).fill(-1);

  const run = (alpha: number, beta: number, k: number, out: Float64Array): number => {
    // four slots are written: a shorter buffer would lose the clamp flag (or more) without a word
    if (out.length < 4) throw new HexsalvageInputError('option', 'modulateInto', 'out', 'a Float64Array of length 4 or more', out.length);
    // the previous triangle first, written out here because this is the path almost every call of
    // a rotating reference takes; a reference that is not finite fails the comparisons
    const o = k >= 0 && k < lastAt.length ? (lastAt[k] as number) : -1;
    if (o >= 0) {
      const d0 = (all[o] as number) * alpha + (all[o + 1] as number) * beta + (all[o + 2] as number);
      const d1 = (all[o + 3] as number) * alpha + (all[o + 4] as number) * beta + (all[o + 5] as number);
      const d2 = (all[o + 6] as number) * alpha + (all[o + 7] as number) * beta + (all[o + 8] as number);
      if (d0 >= WELL_INSIDE && d1 >= WELL_INSIDE && d2 >= WELL_INSIDE) {
        // all positive: the same arithmetic as normaliseInto, so the same dwell times
        const s = d0 + d1 + d2;
        out[0] = d0 / s;
        out[1] = d1 / s;
        out[2] = d2 / s;
        out[3] = 0;
        return last[k] as number;
      }
    }
    return locate(alpha, beta, k, out);
  };

  // Kept out of `run` so that `run` stays small enough for the engine to inline into the caller's
  // loop (measured: the rotating-reference call costs about two thirds of what it costs otherwise).
  const locate = (alpha: number, beta: number, k: number, out: Float64Array): number => {
    const pr = prepared[k];
    if (!pr || pr.count === 0) return -1;
    // a reference beyond ±REFERENCE_LIMIT (or not finite) is not a modulation index: -2, told apart
    // from a polarity without triangles (the object path refuses it with a typed error)
    if (!(Math.abs(alpha) <= REFERENCE_LIMIT && Math.abs(beta) <= REFERENCE_LIMIT)) return -2;
    let t = search(pr, alpha, beta, out);
    if (t >= 0) {
      last[k] = t;
      lastAt[k] = (base[k] as number) + 9 * t;
      out[3] = 0;
      return t;
    }
    if (pr.outline) clampToOutline(pr.outline, alpha, beta, clampBuf);
    else clampInto(pr.hull, alpha, beta, clampBuf);
    const ca = clampBuf[0] as number;
    const cb = clampBuf[1] as number;
    t = search(pr, ca, cb, out);
    if (t < 0) t = leastOutside(pr, ca, cb, out);
    out[3] = 1;
    return t;
  };

  // a look-up per call instead of a regular expression: the valid strings are known in advance;
  // the polarity usually repeats from call to call, so the last answer is checked first
  let lastPolarity: unknown = undefined;
  let lastIndex = -1;
  const polarityIndex = (p: PolarityString): number => {
    if (p === lastPolarity) return lastIndex;
    const k = POLARITY_INDEX.get(p);
    if (k === undefined) {
      parsePolarity(p, 'polarity');
      return -1;
    }
    lastPolarity = p;
    lastIndex = k;
    return k;
  };

  return {
    modulate(alpha, beta, polarity) {
      const k = polarityIndex(polarity);
      const t = run(alpha, beta, k, scratch);
      if (t < 0) {
        if (!(Math.abs(alpha) <= REFERENCE_LIMIT && Math.abs(beta) <= REFERENCE_LIMIT)) {
          throw new HexsalvageInputError(
            'option',
            'modulate',
            'alpha/beta',
            `finite numbers within ±${REFERENCE_LIMIT} (units of Vdc/2)`,
            Math.abs(alpha) <= REFERENCE_LIMIT ? beta : alpha,
          );
        }
        return { triangle: -1, dwell: [0, 0, 0], vertices: [], clamped: true };
      }
      return {
        triangle: t,
        dwell: [scratch[0] as number, scratch[1] as number, scratch[2] as number],
        vertices: (prepared[k] as Prepared).vertices[t] as LevelTriplet[],
        clamped: scratch[3] === 1,
      };
    },
    modulateInto: run,
    polarityIndex,
  };
}

function prepare(
  d: Pick<PlanPolarity, 'vectors' | 'hull' | 'triangles' | 'dwell'> & {
    readonly outline?: PlanPolarity['outline'];
    readonly tableTriangles?: readonly SequencedTriangle[];
  },
): Prepared {
  const count = d.triangles.length;
  const m = new Float64Array(9 * count);
  d.dwell.forEach((mat: DwellMatrix, t) => {
    for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) m[9 * t + 3 * r + c] = mat[r]![c]!;
  });
  const vertices = d.triangles.map((tri, t) =>
    tri.map((vi, pos) => {
      const seq = d.tableTriangles?.[t]?.sequence;
      const choice = seq ? (seq.choice[pos] ?? 0) : 0;
      const v = d.vectors[vi];
      return (d.tableTriangles?.[t]?.vertices[pos]?.realisations[choice]?.levels ?? v?.levels[0]) as LevelTriplet;
    }),
  );
  const xs = d.hull.map((p) => p[0]);
  const ys = d.hull.map((p) => p[1]);
  const x0 = Math.min(...xs, 0);
  const y0 = Math.min(...ys, 0);
  const w = Math.max(...xs, 0) - x0;
  const h = Math.max(...ys, 0) - y0;
  // about nine cells per triangle, so that most cells meet a single triangle
  const n = Math.max(1, Math.ceil(3 * Math.sqrt(count)));
  const cell = Math.max(w, h, 1e-9) / n;
  const nx = Math.max(1, Math.ceil(w / cell));
  const ny = Math.max(1, Math.ceil(h / cell));
  const lists: number[][] = Array.from({ length: nx * ny }, () => []);
  // a pad far above the locator's tolerance, so that every triangle that can claim a point of
  // the cell is listed for it (the lowest such index is what the plain search returns)
  const pad = 1e-6;
  d.triangles.forEach((tri, t) => {
    const P = tri.map((i) => [d.vectors[i]!.alpha, d.vectors[i]!.beta] as const);
    const px = P.map((p) => p[0]);
    const py = P.map((p) => p[1]);
    const i0 = clampIdx(Math.floor((Math.min(...px) - pad - x0) / cell), nx);
    const i1 = clampIdx(Math.floor((Math.max(...px) + pad - x0) / cell), nx);
    const j0 = clampIdx(Math.floor((Math.min(...py) - pad - y0) / cell), ny);
    const j1 = clampIdx(Math.floor((Math.max(...py) + pad - y0) / cell), ny);
    for (let i = i0; i <= i1; i++)
      for (let j = j0; j <= j1; j++) {
        if (boxMeetsTriangle(x0 + i * cell, y0 + j * cell, cell, P, pad)) lists[j * nx + i]!.push(t);
      }
  });
  const cellStart = new Int32Array(nx * ny + 1);
  lists.forEach((l, c) => {
    cellStart[c + 1] = (cellStart[c] as number) + l.length;
  });
  const cellTri = Int32Array.from(lists.flat());
  const outline = d.outline && d.outline.length > 0 ? d.outline : null;
  return { count, m, hull: d.hull, outline, vertices, x0, y0, cell, nx, ny, cellStart, cellTri };
}

// Separating-axis test of a square cell against a triangle, both grown by `pad`.
function boxMeetsTriangle(bx: number, by: number, size: number, P: readonly (readonly [number, number])[], pad: number): boolean {
  const corners = [
    [bx, by],
    [bx + size, by],
    [bx, by + size],
    [bx + size, by + size],
  ] as const;
  for (let e = 0; e < 3; e++) {
    const [ax, ay] = P[e] as readonly [number, number];
    const [cx, cy] = P[(e + 1) % 3] as readonly [number, number];
    const nx = cy - ay;
    const ny = -(cx - ax);
    const len = Math.hypot(nx, ny);
    const third = P[(e + 2) % 3] as readonly [number, number];
    const side = Math.sign(nx * (third[0] - ax) + ny * (third[1] - ay));
    // every corner strictly on the far side of this edge (beyond the pad): separated
    if (corners.every(([x, y]) => side * (nx * (x - ax) + ny * (y - ay)) < -pad * len)) return false;
  }
  return true;
}

function clampIdx(i: number, n: number): number {
  return i < 0 ? 0 : i >= n ? n - 1 : i;
}

// Same arithmetic, same order as locateReference: first triangle (lowest index) containing the point.
function search(pr: Prepared, a: number, b: number, out: Float64Array): number {
  const i = Math.floor((a - pr.x0) / pr.cell);
  const j = Math.floor((b - pr.y0) / pr.cell);
  if (i < 0 || j < 0 || i >= pr.nx || j >= pr.ny) return linear(pr, a, b, out);
  const c = j * pr.nx + i;
  const end = pr.cellStart[c + 1] as number;
  for (let k = pr.cellStart[c] as number; k < end; k++) {
    const t = pr.cellTri[k] as number;
    if (inside(pr.m, t, a, b, out)) return t;
  }
  // a point on the grid's far border or rounding at a cell edge: fall back to the full scan
  return linear(pr, a, b, out);
}

function linear(pr: Prepared, a: number, b: number, out: Float64Array): number {
  for (let t = 0; t < pr.count; t++) if (inside(pr.m, t, a, b, out)) return t;
  return -1;
}

function inside(m: Float64Array, t: number, a: number, b: number, out: Float64Array): boolean {
  // early exits per vertex; equivalent to min(d0, d1, d2) >= -tolerance as in locateReference
  const o = 9 * t;
  const d0 = (m[o] as number) * a + (m[o + 1] as number) * b + (m[o + 2] as number);
  if (d0 < -DWELL_TOLERANCE) return false;
  const d1 = (m[o + 3] as number) * a + (m[o + 4] as number) * b + (m[o + 5] as number);
  if (d1 < -DWELL_TOLERANCE) return false;
  const d2 = (m[o + 6] as number) * a + (m[o + 7] as number) * b + (m[o + 8] as number);
  if (d2 < -DWELL_TOLERANCE) return false;
  normaliseInto(d0, d1, d2, out);
  return true;
}

/**
 * Inside by a clear margin: every dwell at least this. No other triangle of a non-overlapping
 * tiling can then hold the point even within the locator's tolerance (that would need it within
 * about 1e-9 of a triangle size from this one's edges, while it is 1e-6 of this one's height
 * away), so the plain search would return this triangle too: the answer is the same. The
 * modulator, the runtime and the C header test their previous triangle with it.
 */
export const WELL_INSIDE = 1e-6;

function leastOutside(pr: Prepared, a: number, b: number, out: Float64Array): number {
  let best = 0;
  let score = -Infinity;
  for (let t = 0; t < pr.count; t++) {
    const o = 9 * t;
    const s = Math.min(
      (pr.m[o] as number) * a + (pr.m[o + 1] as number) * b + (pr.m[o + 2] as number),
      (pr.m[o + 3] as number) * a + (pr.m[o + 4] as number) * b + (pr.m[o + 5] as number),
      (pr.m[o + 6] as number) * a + (pr.m[o + 7] as number) * b + (pr.m[o + 8] as number),
    );
    if (s > score) [best, score] = [t, s];
  }
  const o = 9 * best;
  normaliseInto(
    (pr.m[o] as number) * a + (pr.m[o + 1] as number) * b + (pr.m[o + 2] as number),
    (pr.m[o + 3] as number) * a + (pr.m[o + 4] as number) * b + (pr.m[o + 5] as number),
    (pr.m[o + 6] as number) * a + (pr.m[o + 7] as number) * b + (pr.m[o + 8] as number),
    out,
  );
  return best;
}

function normaliseInto(d0: number, d1: number, d2: number, out: Float64Array): void {
  const c0 = Math.max(0, d0);
  const c1 = Math.max(0, d1);
  const c2 = Math.max(0, d2);
  const s = c0 + c1 + c2;
  out[0] = c0 / s;
  out[1] = c1 / s;
  out[2] = c2 / s;
}
