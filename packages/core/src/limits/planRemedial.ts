import { faultTexts, type AnalyseLegOptions } from '../leg/analyseLeg.js';
import { planLimits } from './planLimits.js';
import { planRemedies, type Remedy } from './remedies.js';
import type { LevelTriplet } from '../geometry/clarke.js';
import { legLevels } from '../netlist/expandElements.js';
import { CAUTIONS } from '../shared/cautions.js';
import { diagramAtlas, type DiagramAtlas } from '../vectors/diagramAtlas.js';
import type { DwellMatrix } from '../geometry/dwell.js';
import { HexsalvageInputError } from '../shared/errors.js';
import { formatFault, PHASES, type Phase } from '../netlist/faults.js';
import type { LevelSets } from '../leg/legTable.js';
import { modulationLimit } from './modulationLimit.js';
import { parsePolarity, POLARITY_STRINGS, type PolarityString } from '../leg/polarity.js';
import type { ClassifiedVector, PolarityDiagram } from '../vectors/polarityDiagram.js';
import { explainRestrictions } from '../leg/restrictions.js';
import { faultReason } from '../leg/faultReason.js';
import { originGaps } from '../geometry/originGaps.js';
import { planVolts, requireVdc, type PlanVolts } from '../shared/physicalUnits.js';
import { requireObject, requireAtlas } from '../shared/validate.js';
import type { LimitRuleOptions, LimitRules } from '../leg/rules.js';

/** Version of the plan document layout; bumped on any incompatible change. */
export const PLAN_SCHEMA_VERSION = 2;

/**
 * Options of {@link planRemedial}. The rules default to the safe limit: device ratings applied
 * (`ignoreRatings: false`) and `levelSteps: 'commutable'`.
 */
export interface PlanOptions extends LimitRuleOptions {
  /** Built-in topology id or a netlist object in the file format. */
  readonly topology: unknown;
  /** Fault strings `PHASE.DEVICE[:MODE]`. Default: none (healthy). */
  readonly faults?: readonly string[];
  /** Load angle φ in degrees, −180…180, positive inductive. Default 0. */
  readonly loadAngleDeg?: number;
  /** List the remedies (`remedies`; each is a further analysis). Default true. */
  readonly remedies?: boolean;
  /** Polarity margin δ in degrees, 0 ≤ δ < 60. Default 0. */
  readonly polarityMarginDeg?: number;
  /** Total DC-link voltage in volts: adds `volts` to the plan. Default none (per unit only). */
  readonly vdc?: number;
}

/** A vector as printed in plan and vectors documents. */
export interface PlanVector {
  readonly alpha: number;
  readonly beta: number;
  readonly levels: readonly LevelTriplet[];
  readonly class: string;
}

/** One polarity string's diagram as printed. */
export interface PlanPolarity {
  readonly vectors: readonly PlanVector[];
  readonly hull: readonly (readonly [number, number])[];
  /** The admissible tiling (Delaunay under `levelSteps: any`). */
  readonly triangles: readonly (readonly [number, number, number])[];
  /** First-version meaning: the largest origin-centred circle inside the hull. */
  readonly radius: number;
  /** min over θ of the extent of the union of admissible triangles. */
  readonly reach: number;
  /**
   * Outline of the tiling as segments `[[α0, β0], [α1, β1]]` (the tiling on their left) when it does
   * not fill the hull; `null` when it does. References outside are clamped to it along their ray.
   */
  readonly outline: readonly (readonly [readonly [number, number], readonly [number, number]])[] | null;
  /** Dwell-time matrix per triangle: `[d0 d1 d2]ᵀ = M·[alpha beta 1]ᵀ`. */
  readonly dwell: readonly DwellMatrix[];
  /** Healthy vectors not available under this polarity. */
  readonly lost: readonly PlanVector[];
  readonly lostTriplets: number;
}

/** One polarity sector of the fundamental cycle at the plan's load angle. */
export interface PlanSector {
  readonly fromDeg: number;
  readonly toDeg: number;
  readonly polarity: PolarityString;
  readonly vectors: readonly PlanVector[];
  readonly triangles: readonly (readonly [number, number, number])[];
  /** Smallest r(θ) inside this sector and where. */
  readonly minExtent: number;
  readonly minExtentAngleDeg: number;
}

/** The remedial plan: what the `plan` command prints and `planRemedial` returns. */
export interface RemedialPlan {
  readonly schemaVersion: number;
  readonly topology: string;
  readonly faults: readonly string[];
  readonly loadAngleDeg: number;
  readonly polarityMarginDeg: number;
  /** The safe limit: the extent of the admissible tiling, min over θ. */
  readonly mMax: number;
  readonly mMaxHealthy: number;
  readonly deratingRatio: number;
  /** The convex-hull bound (not safe by itself) (level sets with the ratings rule applied). */
  readonly mMaxHull: number;
  /** Largest m ≤ mMax up to which the average midpoint current can be held at zero. */
  readonly mMaxBalanced: number;
  readonly limitingAngleDeg: number;
  readonly limitingPolarity: PolarityString;
  /** The outline edge that binds, as its two vectors; `null` when mMax is 0 because the origin is not inside. */
  readonly bindingEdge: readonly [PlanVector, PlanVector] | null;
  readonly rules: LimitRules;
  /** Devices without a voltage rating (not checked). */
  readonly unrated: readonly string[];
  /** What the rules take away from the faulted phases, in words. */
  readonly restrictions: readonly string[];
  /** Remarks on how the limit was obtained (e.g. a tiling that could not reach the whole union). */
  readonly notes: readonly string[];
  readonly levels: Readonly<Record<Phase, LevelSets>>;
  /** The leg's DC potentials, ascending (units of Vdc/2): what `levelNotation` writes vectors with. */
  readonly dcLevels: readonly number[];
  readonly sectors: readonly PlanSector[];
  readonly polarities: Readonly<Record<PolarityString, PlanPolarity>>;
  /** With `vdc`: the limits in volts (contract "Physical units"). */
  readonly volts?: PlanVolts;
  /** When `mMax` is 0: why the drive cannot run; `null` otherwise. */
  readonly stop: PlanStop | null;
  /** The phase tied to the DC midpoint by a fitted bypass, or `null`. */
  readonly bypass: Phase | null;
  /**
   * The configurations the plan holds in (one alternative per failure, as fault strings); one for
   * faults without alternatives (ambiguous diagnoses, docs/remedial-options.md).
   */
  readonly alternatives?: readonly (readonly string[])[];
  /** The limit each configuration alone would give, in the order of `alternatives`. */
  readonly mMaxByAlternative?: readonly number[];
  /** What could be done about the fault, best first (`planRemedial`; docs/remedial-options.md). */
  readonly remedies?: readonly Remedy[];
  readonly cautions: readonly string[];
}

/**
 * Why a plan leaves no output voltage. Every polarity of the cycle is visited at every load angle
 * (only where it falls in θ moves), and a polarity whose admissible triangles do not surround the
 * origin has extent 0 in every direction: a leg that cannot run at one load angle cannot run at any.
 */
export interface PlanStop {
  /** True: no load angle helps (always so for the reason above; kept explicit for readers). */
  readonly everyLoadAngle: boolean;
  /** The polarity whose triangles do not surround the origin. */
  readonly polarity: PolarityString;
  /** Directions next to the origin (degrees, `from < to`, `to` may pass 360) no admissible triangle covers. */
  readonly gapsDeg: readonly (readonly [number, number])[];
  /** The reason in words: the polarity, the directions, and what the faults take away. */
  readonly reason: string;
}

/**
 * Plans remedial operation of a faulted leg: vectors per polarity, the re-triangulated diagram and
 * the exact modulation limit at one load angle.
 *
 * @param options - topology, faults, load angle and polarity margin (validated here)
 * @returns the plan document (plain data, JSON-ready)
 * @throws HexsalvageInputError on bad topology, fault, load angle or margin
 * @example
 * ```ts
 * const plan = planRemedial({ topology: 'npc', faults: ['a.outerUpper'], loadAngleDeg: 30 });
 * plan.mMax; // exact limit, units of Vdc/2
 * ```
 */
export function planRemedial(options: PlanOptions): RemedialPlan {
  requireObject(options, 'planRemedial', 'an options object { topology, faults?, loadAngleDeg?, polarityMarginDeg?, ignoreRatings?, levelSteps? }');
  const loadAngleDeg = checkAngle(options.loadAngleDeg ?? 0, 'loadAngleDeg', -180, 180, { hiInclusive: true });
  const polarityMarginDeg = checkAngle(options.polarityMarginDeg ?? 0, 'polarityMarginDeg', 0, 60);
  const { topology, faults, ignoreRatings, levelSteps, bypass } = options;
  const vdc = options.vdc === undefined ? undefined : requireVdc(options.vdc, 'options', 'vdc');
  const legOptions = { topology, faults: faults ?? [], ignoreRatings, levelSteps, ...(bypass === undefined ? {} : { bypass }) };
  const atlas = diagramAtlas(legOptions);
  const plan = withRemedies(planFromAtlas(atlas, loadAngleDeg, polarityMarginDeg), atlas, legOptions, { remedies: options.remedies !== false });
  return vdc === undefined ? plan : withVolts(plan, vdc);
}

/**
 * A plan with its alternatives (the limit of each configuration of an ambiguous diagnosis alone)
 * and, optionally, its remedies.
 *
 * @param plan - from {@link planFromAtlas}
 * @param atlas - the atlas it was made from
 * @param options - the options the atlas was made with
 * @param withOptions - `remedies`: also list the remedies (default true)
 * @returns the plan with `alternatives`, `mMaxByAlternative` and `remedies`
 * @example
 * ```ts
 * withRemedies(planFromAtlas(atlas, 0, 0), atlas, { topology: 'npc', faults: ['a.outerUpper'] }).remedies;
 * ```
 */
export function withRemedies(
  plan: RemedialPlan,
  atlas: DiagramAtlas,
  options: AnalyseLegOptions,
  withOptions: { readonly remedies?: boolean } = {},
): RemedialPlan {
  const remedies = withOptions.remedies ?? true;
  const configs = atlas.analysis.configurations;
  const alternatives = configs.map((c) => c.map(formatFault));
  const { bypass, ...rest } = options;
  const mMaxByAlternative =
    configs.length === 1
      ? [plan.mMax]
      : alternatives.map(
          (faults) =>
            planLimits(diagramAtlas({ ...rest, faults, ...(bypass === undefined ? {} : { bypass }) }), plan.loadAngleDeg, plan.polarityMarginDeg).mMax,
        );
  const { cautions, volts, ...head } = plan;
  return {
    ...head,
    alternatives,
    mMaxByAlternative,
    ...(remedies ? { remedies: planRemedies(atlas, options, plan.loadAngleDeg, plan.polarityMarginDeg) } : {}),
    ...(volts ? { volts } : {}),
    cautions,
  };
}

/**
 * A plan with its `volts` block for a DC-link voltage.
 *
 * @param plan - a plan
 * @param vdc - total DC-link voltage, volts (checked)
 * @returns the plan with `volts`
 * @example
 * ```ts
 * withVolts(planRemedial({ topology: 'npc' }), 750).volts?.lineRmsMax; // ≈ 530.3
 * ```
 */
export function withVolts(plan: RemedialPlan, vdc: number): RemedialPlan {
  const { cautions, ...rest } = plan;
  return { ...rest, volts: planVolts(plan.mMax, plan.mMaxHealthy, requireVdc(vdc, 'options', 'vdc')), cautions };
}

/**
 * Builds the plan document from a prepared atlas (lets sweeps reuse one atlas for many load angles).
 *
 * @param atlas - from `diagramAtlas`
 * @param loadAngleDeg - validated load angle
 * @param polarityMarginDeg - validated margin
 * @returns the plan document
 * @example
 * ```ts
 * planFromAtlas(diagramAtlas({ topology: 'tnpc' }), 0, 0).mMax; // 2/√3
 * ```
 */
export function planFromAtlas(atlas: DiagramAtlas, loadAngleDeg: number, polarityMarginDeg: number): RemedialPlan {
  requireAtlas(atlas, 'planFromAtlas');
  checkAngle(loadAngleDeg, 'loadAngleDeg', -180, 180, { hiInclusive: true });
  checkAngle(polarityMarginDeg, 'polarityMarginDeg', 0, 60);
  const { limit: lim, mMaxBalanced: balanced } = planLimits(atlas, loadAngleDeg, polarityMarginDeg);
  const healthy = modulationLimit(atlas.healthy, loadAngleDeg, polarityMarginDeg);
  const hull = modulationLimit(atlas.faulted, loadAngleDeg, polarityMarginDeg, 'hull');
  const leg = atlas.analysis.leg;
  const notes = [...new Set(lim.sectors.map((s) => s.polarity))]
    .filter((p) => !(atlas.faulted.get(p) as PolarityDiagram).exactTiling)
    .map(
      (p) =>
        `polarity ${p}: no non-overlapping set of admissible triangles reaches as far as their union in every direction; mMax uses the tiling (${(atlas.faulted.get(p) as PolarityDiagram).reach.toFixed(4)} is the union's reach)`,
    );
  notes.push(...bypassNotes(atlas));
  const polarities: Record<PolarityString, PlanPolarity> = {};
  for (const p of POLARITY_STRINGS) polarities[p] = polarityDocument(atlas.faulted.get(p) as PolarityDiagram);
  const limitDiagram = atlas.faulted.get(lim.limitingPolarity) as PolarityDiagram;
  const levels = {} as Record<Phase, LevelSets>;
  for (const ph of PHASES) levels[ph] = atlas.analysis.phases[ph].levels;
  return {
    schemaVersion: PLAN_SCHEMA_VERSION,
    topology: atlas.analysis.topology,
    faults: faultTexts(atlas.analysis),
    loadAngleDeg,
    polarityMarginDeg,
    mMax: lim.mMax,
    mMaxHealthy: healthy.mMax,
    deratingRatio: healthy.mMax > 0 ? lim.mMax / healthy.mMax : 0,
    mMaxHull: hull.mMax,
    mMaxBalanced: balanced,
    limitingAngleDeg: lim.limitingAngleDeg,
    limitingPolarity: lim.limitingPolarity,
    bindingEdge: lim.bindingEdge
      ? [
          vectorDocument(limitDiagram.vectors[lim.bindingEdge[0]] as ClassifiedVector),
          vectorDocument(limitDiagram.vectors[lim.bindingEdge[1]] as ClassifiedVector),
        ]
      : null,
    rules: atlas.analysis.rules,
    unrated: atlas.analysis.unrated,
    restrictions: explainRestrictions(atlas.analysis),
    notes,
    levels,
    dcLevels: legLevels(leg),
    sectors: lim.sectors.map((s, i) => {
      const d = atlas.faulted.get(s.polarity) as PolarityDiagram;
      const m = lim.sectorMinima[i] as { value: number; thetaDeg: number };
      return { ...s, vectors: polarityDocument(d).vectors, triangles: d.triangles, minExtent: m.value, minExtentAngleDeg: m.thetaDeg };
    }),
    polarities,
    stop: lim.mMax > 0 ? null : planStop(atlas, limitDiagram, lim.limitingPolarity),
    bypass: atlas.analysis.bypass?.phase ?? null,
    cautions: CAUTIONS,
  };
}

// Why the limit is 0: the polarity, the uncovered directions, and the faults' findings.
function planStop(atlas: DiagramAtlas, d: PolarityDiagram, polarity: PolarityString): PlanStop {
  const gapsDeg = originGaps(
    d.vectors.map((v) => [v.alpha, v.beta] as const),
    d.triangles,
  );
  const signs = parsePolarity(polarity)
    .map((c, k) => `i${'abc'[k]} ${c === '+' ? '> 0' : c === '-' ? '< 0' : 'near zero'}`)
    .join(', ');
  const where =
    gapsDeg.length === 0 || (gapsDeg.length === 1 && (gapsDeg[0] as [number, number])[1] - (gapsDeg[0] as [number, number])[0] >= 360)
      ? 'no admissible triangle has the origin as a corner: not even a zero voltage can be held'
      : `no admissible triangle covers the directions ${gapsDeg.map(([f, t]) => `${fmtDeg(f)}° to ${fmtDeg(t)}°`).join(' and ')} next to the origin, so no small voltage can be made there`;
  const findings = faultReason(atlas.analysis, 0).details;
  const rules = atlas.analysis.rules.levelSteps === 'adjacent' ? ' under the adjacent rule (a phase steps only to a neighbouring level)' : '';
  return {
    everyLoadAngle: true,
    polarity,
    gapsDeg,
    reason: `with currents ${signs} (polarity ${polarity}), ${where}${rules}${findings.length ? `; ${findings.join('; ')}` : ''}.`,
  };
}

// a gap's end past 360° is written as the direction it is (e.g. 390 → 30)
const fmtDeg = (x: number): string => String(Math.round((x > 360 ? x - 360 : x) * 1e6) / 1e6);

/**
 * One polarity diagram as a plain document (the `vectors` command prints this plus `polarity`).
 *
 * @param d - a polarity diagram
 * @returns vectors, hull points, triangles, radius, dwell matrices and losses
 * @example
 * ```ts
 * polarityDocument(atlas.faulted.get('+--')!).hull;
 * ```
 */
export function polarityDocument(d: PolarityDiagram): PlanPolarity {
  // Diagrams are immutable and shared by every polarity (and plan) with the same level sets, so
  // their documents are too: built once, frozen (a many-level leg has 25 polarities of thousands
  // of vectors each, all alike when healthy).
  // keyed by the vectors array: the copies a diagram cache hands out per polarity share it
  const known = DOCUMENTS.get(d.vectors);
  if (known) return known;
  const doc: PlanPolarity = Object.freeze({
    vectors: Object.freeze(d.vectors.map(vectorDocument)),
    hull: Object.freeze(d.hull.map((i) => Object.freeze([(d.vectors[i] as ClassifiedVector).alpha, (d.vectors[i] as ClassifiedVector).beta] as const))),
    triangles: d.triangles,
    radius: d.radius,
    reach: d.reach,
    outline: d.outline ? Object.freeze(d.outline.map((e) => e.segment)) : null,
    // read through: the diagram builds its dwell matrices only when someone asks for them
    get dwell() {
      return d.dwell;
    },
    lost: Object.freeze(d.lost.map(vectorDocument)),
    lostTriplets: d.lostTriplets,
  });
  DOCUMENTS.set(d.vectors, doc);
  return doc;
}

const DOCUMENTS = new WeakMap<readonly ClassifiedVector[], PlanPolarity>();

function vectorDocument(v: ClassifiedVector): PlanVector {
  return Object.freeze({ alpha: v.alpha, beta: v.beta, levels: v.levels, class: v.class });
}

/**
 * Validates an angle option.
 *
 * @param v - value
 * @param key - option name
 * @param lo - lowest allowed
 * @param hi - highest allowed
 * @param range - `hiInclusive`: whether `hi` itself is allowed (default false)
 * @returns the value
 * @example
 * ```ts
 * checkAngle(30, 'loadAngleDeg', -180, 180, { hiInclusive: true }); // 30
 * ```
 */
export function checkAngle(v: unknown, key: string, lo: number, hi: number, range: { readonly hiInclusive?: boolean } = {}): number {
  const hiInclusive = range.hiInclusive ?? false;
  const ok = typeof v === 'number' && Number.isFinite(v) && v >= lo && (hiInclusive ? v <= hi : v < hi);
  if (!ok) throw new HexsalvageInputError('option', 'options', key, `a number of degrees in [${lo}, ${hi}${hiInclusive ? ']' : ')'}`, v);
  return v as number;
}

// What a bypass means for the plan: the tie, and the midpoint carrying the phase's current.
function bypassNotes(atlas: DiagramAtlas): string[] {
  const b = atlas.analysis.bypass;
  if (!b) return [];
  const out = [
    `phase ${b.phase} bypassed: its output tied to the DC node ${b.node} (potential 0) by a fitted device, every gate of phase ${b.phase} off; it stays at 0 and never changes level`,
  ];
  if (!atlas.analysis.faults.some((f) => f.phase === b.phase)) out.push(`phase ${b.phase} has no fault: the bypass takes a healthy phase out of use`);
  out.push(
    `the DC midpoint carries phase ${b.phase}'s whole current: its voltage swings at the fundamental frequency by about 2·Î/(ω·2C) peak to peak (Î the phase current peak, ω = 2π·f1, C each half of the link; see simulate --capacitance)`,
  );
  if (b.unavailable) out.push(`the bypassed state is not usable: ${b.unavailable}`);
  return out;
}
