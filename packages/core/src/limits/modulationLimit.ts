import type { PolarityString } from '../leg/polarity.js';
import type { PolarityDiagram } from '../vectors/polarityDiagram.js';
import { mod360, polaritySectors, type PolaritySector } from '../vectors/polaritySectors.js';
import { minRadialExtent } from '../geometry/radialExtent.js';
import { BoundedCache } from '../shared/boundedCache.js';
import { requireNumber } from '../shared/validate.js';

const RAD = Math.PI / 180;

// Sectors by load angle and margin (frozen, shared): a derating curve or a fault atlas asks for the
// same few hundred angles again for every leg and fault.
const SECTORS = new BoundedCache<readonly PolaritySector[]>(2048);

function sharedSectors(loadAngleDeg: number, marginDeg: number): readonly PolaritySector[] {
  return SECTORS.through(`${loadAngleDeg}|${marginDeg}`, () => polaritySectors(loadAngleDeg, marginDeg));
}

/**
 * Which extent a limit is taken over: `tiling` — the admissible tiling (the safe limit, `mMax`);
 * `hull` — the convex hull of the surviving vectors (the convex-hull bound, `mMaxHull`, not safe by itself).
 */
export type ExtentKind = 'tiling' | 'hull';

/**
 * The radial geometry of a diagram for an extent kind.
 *
 * @param d - a polarity diagram
 * @param kind - `tiling` or `hull`
 * @returns the geometry the limit is taken over
 * @example
 * ```ts
 * extentGeometry(diagram, 'hull').containsOrigin;
 * ```
 */
export function extentGeometry(d: PolarityDiagram, kind: ExtentKind): PolarityDiagram['geometry'] {
  return kind === 'hull' ? d.hullGeometry : d.geometry;
}

/** The exact modulation limit and where it binds. */
export interface ModulationLimit {
  /** min over θ of r(θ), units of Vdc/2. */
  readonly mMax: number;
  /** A θ in [0, 360) where the minimum is reached. */
  readonly limitingAngleDeg: number;
  /** Polarity string in force there. */
  readonly limitingPolarity: PolarityString;
  /** The binding hull edge as indices into that polarity's vectors; `null` when mMax is 0 by degeneracy. */
  readonly bindingEdge: readonly [number, number] | null;
  /** Per sector: its own minimum and where. */
  readonly sectorMinima: readonly { readonly value: number; readonly thetaDeg: number }[];
  readonly sectors: readonly PolaritySector[];
}

/**
 * Exact maximum modulation index for a load angle and polarity margin.
 *
 * θ is split at every current zero crossing and margin edge; within each sector the minimum of
 * the hull's radial extent is taken exactly (interval ends and facet normals inside).
 *
 * @param diagrams - diagram per polarity string
 * @param loadAngleDeg - load angle φ, degrees
 * @param marginDeg - polarity margin δ, degrees
 * @param kind - extent the limit is taken over (default `tiling`: the safe limit)
 * @returns mMax with the limiting angle, polarity and binding edge
 * @example
 * ```ts
 * modulationLimit(atlas.faulted, 30, 0).mMax;
 * ```
 */
export function modulationLimit(
  diagrams: ReadonlyMap<PolarityString, PolarityDiagram>,
  loadAngleDeg: number,
  marginDeg: number,
  kind: ExtentKind = 'tiling',
): ModulationLimit {
  requireNumber(loadAngleDeg, 'modulationLimit', 'loadAngleDeg', { min: -360, max: 360 });
  requireNumber(marginDeg, 'modulationLimit', 'marginDeg', { min: 0, max: 60, openMax: true });
  const sectors = sharedSectors(loadAngleDeg, marginDeg);
  let best: { value: number; theta: number; polarity: PolarityString; edge: readonly [number, number] | null } | null = null;
  const sectorMinima = sectors.map((s) => {
    const g = extentGeometry(diagrams.get(s.polarity) as PolarityDiagram, kind);
    const m = minRadialExtent(g, s.fromDeg * RAD, s.toDeg * RAD);
    const e = m.edge === null ? null : g.edges[m.edge];
    if (best === null || m.value < best.value) best = { value: m.value, theta: m.theta, polarity: s.polarity, edge: e ? [e.from, e.to] : null };
    return { value: m.value, thetaDeg: mod360(m.theta / RAD) };
  });
  const b = best as unknown as { value: number; theta: number; polarity: PolarityString; edge: readonly [number, number] | null };
  return { mMax: b.value, limitingAngleDeg: angleOut(b.theta / RAD), limitingPolarity: b.polarity, bindingEdge: b.edge, sectorMinima, sectors };
}

/** The worst case of the limit over a range of load angles. */
export interface LimitOverRange {
  /** min over φ ∈ [from, to] of mMax(φ). */
  readonly mMax: number;
  /** A load angle in the range where it is reached. */
  readonly loadAngleDeg: number;
  /** θ (in [0, 360)) where it binds at that load angle. */
  readonly limitingAngleDeg: number;
  readonly limitingPolarity: PolarityString;
  readonly bindingEdge: readonly [number, number] | null;
}

// A direction as reported: in [0, 360), rounded to 1e-9° (the contract's precision), so that the
// directions that are exact in the math (edge normals at multiples of 30°) print as such.
function angleOut(deg: number): number {
  const r = Math.round(mod360(deg) * 1e9) / 1e9;
  return r >= 360 ? 0 : r;
}

// Minima of mMax within this of each other are the same minimum (closed forms in units of Vdc/2
// agree to a few ulps); the lowest load angle among them is reported.
const WORST_TIE = 1e-12;

/**
 * Exact minimum of mMax over a closed range of load angles.
 *
 * Polarity depends only on θ − φ, so a sector [a, b] (relative to φ) sweeps θ over
 * [from + a, to + b] as φ runs over the range; the joint minimum over (φ, θ) is the minimum over
 * those widened intervals, again exact.
 *
 * @param diagrams - diagram per polarity string
 * @param fromDeg - lowest load angle
 * @param toDeg - highest load angle (≥ fromDeg)
 * @param marginDeg - polarity margin δ
 * @param kind - extent the limit is taken over (default `tiling`)
 * @returns the worst limit, a load angle where it occurs, and where it binds
 * @example
 * ```ts
 * limitOverLoadAngles(atlas.faulted, -30, 30, 5).mMax;
 * ```
 */
export function limitOverLoadAngles(
  diagrams: ReadonlyMap<PolarityString, PolarityDiagram>,
  fromDeg: number,
  toDeg: number,
  marginDeg: number,
  kind: ExtentKind = 'tiling',
): LimitOverRange {
  requireNumber(fromDeg, 'limitOverLoadAngles', 'fromDeg', { min: -180, max: 180 });
  requireNumber(toDeg, 'limitOverLoadAngles', 'toDeg', { min: fromDeg, max: 180 });
  requireNumber(marginDeg, 'limitOverLoadAngles', 'marginDeg', { min: 0, max: 60, openMax: true });
  let best: LimitOverRange | null = null;
  for (const s of polaritySectors(0, marginDeg)) {
    const g = extentGeometry(diagrams.get(s.polarity) as PolarityDiagram, kind);
    const lo = fromDeg + s.fromDeg;
    const hi = Math.min(toDeg + s.toDeg, lo + 360);
    // the earliest direction among minima equal up to rounding, so that the load angle reported
    // is the lowest one where the minimum is reached (on a flat curve: the range's low end)
    const m = minRadialExtent(g, lo * RAD, hi * RAD, WORST_TIE);
    const theta = m.theta / RAD;
    // Any φ in the range with θ − φ inside the sector; the lowest one keeps the answer stable.
    // When the widened interval was capped at a full turn, θ may need a shift by a turn first.
    const shifted = [theta, theta - 360, theta + 360].find((t) => t >= fromDeg + s.fromDeg - 1e-9 && t <= toDeg + s.toDeg + 1e-9) ?? theta;
    // rounded to 1e-9°: the arithmetic of θ − b leaves noise (−59.999999999999986 for −60)
    const phi = Math.min(toDeg, Math.max(fromDeg, Math.round((shifted - s.toDeg) * 1e9) / 1e9));
    const prev: LimitOverRange | null = best;
    if (prev !== null && !(m.value < prev.mMax - WORST_TIE || (m.value <= prev.mMax + WORST_TIE && phi < prev.loadAngleDeg))) {
      if (m.value < prev.mMax) best = Object.assign({}, prev as LimitOverRange, { mMax: m.value });
      continue;
    }
    const e = m.edge === null ? null : g.edges[m.edge];
    best = {
      mMax: prev === null ? m.value : Math.min(m.value, prev.mMax),
      loadAngleDeg: phi,
      limitingAngleDeg: angleOut(theta),
      limitingPolarity: s.polarity,
      bindingEdge: e ? [e.from, e.to] : null,
    };
  }
  return best as LimitOverRange;
}
