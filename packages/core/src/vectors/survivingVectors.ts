import { type LevelTriplet, type Point } from '../geometry/clarke.js';
import { BoundedCache } from '../shared/boundedCache.js';
import { VECTOR_TOLERANCE } from '../shared/tolerance.js';

/** A distinct space vector with every level triplet that realises it (its redundancy). */
export interface SpaceVector {
  readonly alpha: number;
  readonly beta: number;
  /** Realising triplets, lexicographically descending (phase a first). */
  readonly levels: readonly LevelTriplet[];
}

/**
 * All space vectors reachable from per-phase level sets, merged into distinct points.
 *
 * Triplets closer than {@link VECTOR_TOLERANCE} in the α-β plane are one vector. Vectors are
 * ordered by length, then by angle in [0, 2π) counter-clockwise from α; both rounded to the
 * tolerance so that the order does not depend on the last bit of the Clarke transform.
 *
 * @param sets - the allowed levels of phases a, b and c
 * @returns distinct vectors in deterministic order (empty when any set is empty)
 * @example
 * ```ts
 * survivingVectors([[-1, 1], [-1, 1], [-1, 1]]).length; // 7 (two-level hexagon and the zero vector)
 * ```
 */
export function survivingVectors(sets: readonly [readonly number[], readonly number[], readonly number[]], scale = 1): SpaceVector[] {
  const tol = VECTOR_TOLERANCE * scale;
  const [sa, sb, sc] = sets;
  // Groups are found through a grid of cells: a point within the tolerance of a group lies in that
  // group's cell or a neighbouring one, and among those the earliest group within the tolerance
  // takes it (the group a scan of all groups in order would find), so the result is a linear
  // search's, in linear time (a many-level leg has N³ triplets). Cells are 16 tolerances wide and a
  // neighbour is looked at only where the point is near that side (two tolerances, safe from
  // rounding in the cell index): most points look at one cell. A group is its index into `gx`/`gy`
  // (its first point) and `members` (its triplets, by position in the sets); indexed loops and
  // plain numbers throughout, because this runs once per diagram, mostly before the engine has
  // optimised it, where every iterator and every small array costs an allocation.
  const gx: number[] = [];
  const gy: number[] = [];
  const members: number[][] = [];
  const cells = new CellGrid<number>();
  const size = 16 * tol;
  const nb = sb.length;
  const nc = sc.length;
  for (let ia = 0; ia < sa.length; ia++) {
    const la = sa[ia] as number;
    for (let ib = 0; ib < nb; ib++) {
      const lb = sb[ib] as number;
      for (let ic = 0; ic < nc; ic++) {
        const lc = sc[ic] as number;
        // clarkeAlpha and clarkeBeta written out (the same operations, so the same bits): this loop
        // mostly runs before the engine optimises it, where each call costs
        const px = (2 / 3) * (la - (lb + lc) / 2);
        const py = (lb - lc) / SQRT3;
        const cx = Math.floor(px / size);
        const cy = Math.floor(py / size);
        const fx = px - cx * size;
        const fy = py - cy * size;
        const x1 = size - fx < 2 * tol ? 1 : 0;
        const y1 = size - fy < 2 * tol ? 1 : 0;
        const y0 = fy < 2 * tol ? -1 : 0;
        let g = -1;
        for (let dx = fx < 2 * tol ? -1 : 0; dx <= x1; dx++)
          for (let dy = y0; dy <= y1; dy++) {
            const list = cells.get(cx + dx, cy + dy);
            if (list === undefined) continue;
            // a cell lists its groups in the order they were made: the first match is its earliest
            for (let k = 0; k < list.length; k++) {
              const x = list[k] as number;
              if (g >= 0 && x > g) break;
              if (Math.hypot((gx[x] as number) - px, (gy[x] as number) - py) <= tol) {
                g = x;
                break;
              }
            }
          }
        const code = (ia * nb + ib) * nc + ic;
        if (g >= 0) (members[g] as number[]).push(code);
        else {
          cells.add(cx, cy, gx.length);
          gx.push(px);
          gy.push(py);
          members.push([code]);
        }
      }
    }
  }
  // order by length, then by angle, both rounded to the tolerance
  const count = gx.length;
  const kr = new Float64Array(count);
  const ka = new Float64Array(count);
  for (let i = 0; i < count; i++) {
    const x = gx[i] as number;
    const y = gy[i] as number;
    const r = Math.hypot(x, y);
    kr[i] = Math.round(r / tol);
    ka[i] = Math.round((r <= tol ? 0 : (Math.atan2(y, x) + 2 * Math.PI) % (2 * Math.PI)) / tol);
  }
  const order = Array.from({ length: count }, (_, i) => i).sort((i, j) => (kr[i] as number) - (kr[j] as number) || (ka[i] as number) - (ka[j] as number));
  const out: SpaceVector[] = new Array(count);
  for (let k = 0; k < count; k++) {
    const i = order[k] as number;
    const codes = members[i] as number[];
    const levels: LevelTriplet[] = new Array(codes.length);
    // triplets come in the order of the sets; they are wanted in descending order, which is that
    // order (or its reverse) whenever the sets are sorted, as a leg's are: checked in passing, so
    // that the comparator sort runs only where it must
    let descending = true;
    let ascending = true;
    for (let m = 0; m < codes.length; m++) {
      const code = codes[m] as number;
      const ic = code % nc;
      const ib = ((code - ic) / nc) % nb;
      const ia = (code - ic - ib * nc) / (nb * nc);
      const t = Object.freeze([sa[ia] as number, sb[ib] as number, sc[ic] as number] as const);
      if (m > 0) {
        const c = compareTripletsDesc(levels[m - 1] as LevelTriplet, t);
        if (c >= 0) descending = false;
        if (c <= 0) ascending = false;
      }
      levels[m] = t;
    }
    if (!descending) {
      if (ascending) levels.reverse();
      else levels.sort(compareTripletsDesc);
    }
    // frozen as made (the shared sets are frozen anyway, and freezing a fresh object costs less than
    // walking the finished graph to freeze it)
    out[k] = Object.freeze({ alpha: gx[i] as number, beta: gy[i] as number, levels: Object.freeze(levels) });
  }
  return out;
}

const SQRT3 = Math.sqrt(3);

// Vector sets already built, by level sets and scale (frozen; see BoundedCache).
const SHARED = new BoundedCache<readonly SpaceVector[]>(256);

/**
 * {@link survivingVectors}, remembered: the healthy set of a leg is asked for by every diagram atlas
 * and again by its healthy diagrams, and a fault atlas builds hundreds of atlases of one leg.
 *
 * @param sets - per phase a, b, c: the available levels
 * @param scale - length scale of the tolerance (default 1)
 * @returns the same vectors as `survivingVectors`, frozen and shared
 * @example
 * ```ts
 * sharedSurvivingVectors([[-1, 0, 1], [-1, 0, 1], [-1, 0, 1]]).length; // 19
 * ```
 */
export function sharedSurvivingVectors(sets: readonly [readonly number[], readonly number[], readonly number[]], scale = 1): readonly SpaceVector[] {
  return SHARED.through(`${scale}|${sets.map((l) => l.join(',')).join('|')}`, () => survivingVectors(sets, scale));
}

function compareTripletsDesc(x: LevelTriplet, y: LevelTriplet): number {
  return y[0] - x[0] || y[1] - x[1] || y[2] - x[2];
}

/**
 * Finds the vector at a point.
 *
 * @param vectors - a vector list
 * @param p - the point
 * @returns the index of the vector within {@link VECTOR_TOLERANCE}, or -1
 * @example
 * ```ts
 * indexOfVector(survivingVectors([[1], [-1], [-1]]), [4 / 3, 0]); // 0
 * ```
 */
export function indexOfVector(vectors: readonly SpaceVector[], p: Point, scale = 1): number {
  return vectors.findIndex((v) => Math.hypot(v.alpha - p[0], v.beta - p[1]) <= VECTOR_TOLERANCE * scale);
}

/**
 * {@link indexOfVector} for many look-ups: the vectors are put in a grid of tolerance-wide cells
 * once, so each look-up tests a handful of vectors (the earliest within the tolerance wins, as the
 * scan would find it).
 *
 * @param vectors - a vector list
 * @param scale - length scale of the diagram (tolerance relative to it; default 1)
 * @returns a function of a point giving the index within the tolerance, or -1
 * @example
 * ```ts
 * const find = vectorFinder(vectors);
 * healthy.filter((h) => find([h.alpha, h.beta]) < 0); // lost vectors
 * ```
 */
export function vectorFinder(vectors: readonly SpaceVector[], scale = 1): (p: Point) => number {
  const tol = VECTOR_TOLERANCE * scale;
  const cells = new CellGrid<number>();
  vectors.forEach((v, i) => cells.add(Math.floor(v.alpha / tol), Math.floor(v.beta / tol), i));
  return (p) => {
    const cx = Math.floor(p[0] / tol);
    const cy = Math.floor(p[1] / tol);
    let best = -1;
    for (let dx = -1; dx <= 1; dx++)
      for (let dy = -1; dy <= 1; dy++) {
        const list = cells.get(cx + dx, cy + dy);
        if (list)
          for (const i of list) {
            const v = vectors[i] as SpaceVector;
            if ((best < 0 || i < best) && Math.hypot(v.alpha - p[0], v.beta - p[1]) <= tol) best = i;
          }
      }
    return best;
  };
}

// Cells keyed by two integers through nested maps: a look-up is two number-keyed gets instead of a
// string built per neighbour (nine per point, N³ points on an N-level leg).
class CellGrid<T> {
  private readonly rows = new Map<number, Map<number, T[]>>();

  get(cx: number, cy: number): T[] | undefined {
    return this.rows.get(cx)?.get(cy);
  }

  add(cx: number, cy: number, item: T): void {
    let row = this.rows.get(cx);
    if (!row) this.rows.set(cx, (row = new Map()));
    const list = row.get(cy);
    if (list) list.push(item);
    else row.set(cy, [item]);
  }
}
