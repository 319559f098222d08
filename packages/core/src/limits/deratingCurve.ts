import type { DiagramAtlas } from '../vectors/diagramAtlas.js';
import { HexsalvageInputError } from '../shared/errors.js';
import { extentGeometry, limitOverLoadAngles, modulationLimit, type ExtentKind } from './modulationLimit.js';
import { requireNumber, requireObject, requireAtlas } from '../shared/validate.js';
import type { PolarityDiagram } from '../vectors/polarityDiagram.js';
import { polaritySectors, type PolaritySector } from '../vectors/polaritySectors.js';
import { minRadialExtent } from '../geometry/radialExtent.js';

const RAD = Math.PI / 180;

/** Options of {@link deratingCurve}. */
export interface DeratingCurveOptions {
  /** First load angle, degrees. Default −90. */
  readonly fromDeg?: number;
  /** Last load angle, degrees. Default 90. */
  readonly toDeg?: number;
  /** Grid step, degrees (> 0). Default 1. */
  readonly stepDeg?: number;
  /** Polarity margin δ, degrees. Default 0. */
  readonly polarityMarginDeg?: number;
  /** `tiling` (default): the safe limit mMax; `hull`: the convex-hull bound (not safe by itself). */
  readonly extent?: ExtentKind;
}

/** One point of the derating curve. */
export interface DeratingPoint {
  readonly loadAngleDeg: number;
  readonly mMax: number;
  readonly deratingRatio: number;
  readonly limitingAngleDeg: number;
  readonly limitingPolarity: string;
  /** The convex-hull bound (not safe by itself) at the same load angle (for comparison; not safe). */
  readonly mMaxHull: number;
  /** `begins` where, as φ grows, the limit drops below the healthy one; `ends` where it returns. */
  readonly deratingEdge: 'begins' | 'ends' | null;
  /** True where the curve may have a kink (see {@link deratingCurve}); false on plain grid points. */
  readonly breakpoint: boolean;
}

/**
 * mMax versus load angle on a regular grid plus the curve's breakpoints, all evaluated exactly.
 *
 * mMax(φ) is the minimum over polarity sectors of each sector's own minimum, and a sector's
 * minimum changes form only where one of its ends (at φ + const) crosses a hull vertex or facet
 * normal direction of its polarity's diagram: those φ are computed in closed form. Between two
 * such φ each sector minimum is smooth, so the remaining kinks are where the minimising sector
 * changes; those are located by bisection to 1e-9°. Candidates where the one-sided slopes agree
 * (a flat stretch, say) are not reported as breakpoints.
 *
 * @param atlas - diagrams of the faulted and healthy leg
 * @param options - range, step and margin
 * @returns points sorted by load angle
 * @example
 * ```ts
 * deratingCurve(diagramAtlas({ topology: 'npc', faults: ['a.outerUpper'] }), { stepDeg: 5 });
 * ```
 */
export function deratingCurve(atlas: DiagramAtlas, options: DeratingCurveOptions = {}): DeratingPoint[] {
  requireAtlas(atlas, 'deratingCurve');
  requireObject(options, 'deratingCurve', 'an options object { fromDeg?, toDeg?, stepDeg?, polarityMarginDeg?, extent? }');
  const fromDeg = requireNumber(options.fromDeg ?? -90, 'deratingCurve', 'fromDeg', { min: -180, max: 180 });
  const toDeg = requireNumber(options.toDeg ?? 90, 'deratingCurve', 'toDeg', { min: fromDeg, max: 180 });
  const stepDeg = requireNumber(options.stepDeg ?? 1, 'deratingCurve', 'stepDeg', { min: Math.max((toDeg - fromDeg) / 100000, 0), openMin: true, max: 360 });
  const margin = requireNumber(options.polarityMarginDeg ?? 0, 'deratingCurve', 'polarityMarginDeg', { min: 0, max: 60, openMax: true });
  if (options.extent !== undefined && options.extent !== 'tiling' && options.extent !== 'hull')
    throw new HexsalvageInputError('option', 'deratingCurve', 'extent', 'tiling or hull', options.extent);
  const kind = options.extent ?? 'tiling';
  const grid: number[] = [];
  const n = Math.floor((toDeg - fromDeg) / stepDeg + 1e-9);
  for (let k = 0; k <= n; k++) grid.push(fromDeg + k * stepDeg);
  if (grid[grid.length - 1] !== toDeg) grid.push(toDeg);

  // the sectors relative to φ (the φ = 0 partition): computed once, shared by every search below
  const rel = polaritySectors(0, margin);
  const structural = structuralBreakpoints(atlas.faulted, fromDeg, toDeg, rel, kind);
  const cuts = [...new Set([fromDeg, ...structural, toDeg])].sort((x, y) => x - y);
  const crossings: number[] = [];
  for (let i = 0; i + 1 < cuts.length; i++) {
    const x = minimiserChange(atlas.faulted, cuts[i] as number, cuts[i + 1] as number, rel, kind);
    if (x !== null) crossings.push(x);
  }
  // keep the candidates where the curve really bends: one-sided slopes differ
  const h = 1e-4;
  const at = (phi: number) => modulationLimit(atlas.faulted, phi, margin, kind).mMax;
  const kink = (phi: number) => {
    const m0 = at(phi);
    const left = m0 - at(phi - h);
    const right = at(phi + h) - m0;
    // a kink (one-sided slopes differ), or the end of a flat stretch where the curve leaves it with
    // zero slope (a C¹ point such as where a sector end meets an edge normal): both change the formula
    const flat = (d: number) => Math.abs(d) <= 1e-13 * Math.max(1, Math.abs(m0));
    return Math.abs(right / h - left / h) > 1e-6 || flat(left) !== flat(right);
  };
  // the ends of the range are candidates too: φ is periodic, so −180° and 180° get the same verdict
  const candidates = [...new Set([...structural, ...crossings, fromDeg, toDeg])];
  const breaks = new Set(candidates.filter(kink));
  // where the curve leaves (or comes back to) the healthy limit: often a smooth (C¹) point that the
  // kink test does not see, and the one a reviewer looks for first
  const full = (phi: number) => at(phi) >= modulationLimit(atlas.healthy, phi, margin, kind).mMax - 1e-9;
  const edges = new Map<number, 'begins' | 'ends'>();
  for (const phi of candidates) {
    const before = full(phi - h);
    const after = full(phi + h);
    if (before && !after) edges.set(phi, 'begins');
    if (!before && after) edges.set(phi, 'ends');
  }
  const all = [...new Set([...grid, ...breaks, ...edges.keys()])].sort((x, y) => x - y);
  return all.map((phi) => {
    const f = modulationLimit(atlas.faulted, phi, margin, kind);
    const h = modulationLimit(atlas.healthy, phi, margin, kind);
    return {
      deratingEdge: edges.get(phi) ?? null,
      loadAngleDeg: phi,
      mMax: f.mMax,
      deratingRatio: h.mMax > 0 ? f.mMax / h.mMax : 0,
      limitingAngleDeg: f.limitingAngleDeg,
      limitingPolarity: f.limitingPolarity,
      mMaxHull: kind === 'hull' ? f.mMax : modulationLimit(atlas.faulted, phi, margin, 'hull').mMax,
      breakpoint: breaks.has(phi),
    };
  });
}

// Load angles where a sector end crosses a corner or facet-normal direction of its extent.
function structuralBreakpoints(
  diagrams: ReadonlyMap<string, PolarityDiagram>,
  fromDeg: number,
  toDeg: number,
  rel: readonly PolaritySector[],
  kind: ExtentKind,
): number[] {
  const out = new Set<number>();
  for (const s of rel) {
    const d = diagrams.get(s.polarity) as PolarityDiagram;
    const g = extentGeometry(d, kind);
    if (!g.containsOrigin) continue;
    const outlined = g.edges.some((e) => e.span);
    const dirs = [
      ...g.edges.map((e) => e.normalAngle / RAD),
      ...(outlined
        ? g.edges.flatMap((e) => (e.span ? [e.span[0] / RAD, e.span[1] / RAD] : []))
        : d.hull.map(
            (i) => Math.atan2((d.vectors[i] as PolarityDiagram['vectors'][number]).beta, (d.vectors[i] as PolarityDiagram['vectors'][number]).alpha) / RAD,
          )),
    ];
    for (const psi of dirs)
      for (const end of [s.fromDeg, s.toDeg]) {
        for (let k = -2; k <= 2; k++) {
          const phi = psi - end + 360 * k;
          if (phi > fromDeg && phi < toDeg) out.add(roundDeg(phi));
        }
      }
  }
  return [...out];
}

// Within [lo, hi] each sector minimum is smooth; if the minimising sector differs at the two ends,
// bisect the difference of the two sector minima to find where they cross.
function minimiserChange(
  diagrams: ReadonlyMap<string, PolarityDiagram>,
  lo: number,
  hi: number,
  rel: readonly PolaritySector[],
  kind: ExtentKind,
): number | null {
  const a = sectorMinimum(diagrams, lo, rel, kind);
  const b = sectorMinimum(diagrams, hi, rel, kind);
  if (a.key === b.key || hi - lo < 1e-9) return null;
  const diff = (phi: number) => sectorValue(diagrams, phi, rel[a.key] as PolaritySector, kind) - sectorValue(diagrams, phi, rel[b.key] as PolaritySector, kind);
  let [x0, x1] = [lo, hi];
  const s0 = Math.sign(diff(x0));
  if (s0 === 0 || Math.sign(diff(x1)) === s0) return null;
  while (x1 - x0 > 1e-9) {
    const m = (x0 + x1) / 2;
    if (Math.sign(diff(m)) === s0) x0 = m;
    else x1 = m;
  }
  return roundDeg((x0 + x1) / 2);
}

// Sectors keep their identity across φ by their position relative to φ (the index in the φ = 0
// partition), which is what makes "the minimising sector" meaningful as φ moves.
function sectorMinimum(
  diagrams: ReadonlyMap<string, PolarityDiagram>,
  phi: number,
  rel: readonly PolaritySector[],
  kind: ExtentKind,
): { key: number; value: number } {
  let best = { key: -1, value: Infinity };
  rel.forEach((s, k) => {
    const v = sectorValue(diagrams, phi, s, kind);
    if (v < best.value) best = { key: k, value: v };
  });
  return best;
}

function sectorValue(diagrams: ReadonlyMap<string, PolarityDiagram>, phi: number, s: PolaritySector, kind: ExtentKind): number {
  const g = extentGeometry(diagrams.get(s.polarity) as PolarityDiagram, kind);
  return minRadialExtent(g, (phi + s.fromDeg) * RAD, (phi + s.toDeg) * RAD).value;
}

function roundDeg(x: number): number {
  return Math.round(x * 1e9) / 1e9;
}

/** Options of {@link deratingSteps}. */
export interface DeratingStepsOptions {
  /** Cell width, degrees; 360 must be a whole number of cells. Default 0.5. */
  readonly stepDeg?: number;
  /** Polarity margin δ, degrees. Default 0. */
  readonly polarityMarginDeg?: number;
}

/**
 * The safe limit over load angle as a step function that is never above it: the exact minimum of
 * mMax over each cell `[−180 + i·step, −180 + (i+1)·step]` (breakpoints inside a cell included, as
 * `check` computes a range). What the C header's `<prefix>_m_max_at()` returns.
 *
 * @param atlas - diagrams of the faulted leg
 * @param options - cell width and margin
 * @returns the cell width and one minimum per cell, from −180°
 * @throws HexsalvageInputError on a bad cell width or margin
 * @example
 * ```ts
 * deratingSteps(diagramAtlas({ topology: 'npc', faults: ['a.outerUpper'] })).minima.length; // 720
 * ```
 */
export function deratingSteps(atlas: DiagramAtlas, options: DeratingStepsOptions = {}): { readonly stepDeg: number; readonly minima: readonly number[] } {
  requireAtlas(atlas, 'deratingSteps');
  requireObject(options, 'deratingSteps', 'an options object { stepDeg?, polarityMarginDeg? }');
  const stepDeg = requireNumber(options.stepDeg ?? 0.5, 'deratingSteps', 'stepDeg', { min: 0.01, max: 360 });
  const cells = Math.round(360 / stepDeg);
  if (Math.abs(cells * stepDeg - 360) > 1e-9)
    throw new HexsalvageInputError('option', 'deratingSteps', 'stepDeg', 'a cell width that divides 360 degrees', stepDeg);
  const margin = requireNumber(options.polarityMarginDeg ?? 0, 'deratingSteps', 'polarityMarginDeg', { min: 0, max: 60, openMax: true });
  const minima: number[] = [];
  for (let i = 0; i < cells; i++) {
    const lo = -180 + i * stepDeg;
    const hi = i === cells - 1 ? 180 : -180 + (i + 1) * stepDeg;
    minima.push(limitOverLoadAngles(atlas.faulted, lo, hi, margin).mMax);
  }
  return { stepDeg, minima };
}
