import { CAUTIONS } from '../shared/cautions.js';
import { diagramAtlas } from '../vectors/diagramAtlas.js';
import { HexsalvageInputError } from '../shared/errors.js';
import { expandElements, unratedDevices } from '../netlist/expandElements.js';
import { FAULT_MODES, PHASES, type FaultMode } from '../netlist/faults.js';
import { limitOverLoadAngles, modulationLimit } from '../limits/modulationLimit.js';
import { resolveRules, type LimitRuleOptions, type LimitRules } from '../leg/rules.js';
import { resolveTopology } from '../netlist/resolveTopology.js';
import { faultReason } from '../leg/faultReason.js';
import { bestRemedy } from '../limits/remedies.js';
import { lineRmsVolts, phasePeakVolts, requireVdc } from '../shared/physicalUnits.js';
import { requireNumber, requireObject } from '../shared/validate.js';

/** Version of the atlas document's layout. */
export const ATLAS_SCHEMA_VERSION = 1;

/** Options of {@link faultAtlas}. */
export interface FaultAtlasOptions extends LimitRuleOptions {
  /** A built-in topology id or a netlist object in the file format. */
  readonly topology: unknown;
  /** Fault modes to try for every element. Default `['open', 'short']`. */
  readonly modes?: readonly FaultMode[];
  /** Load-angle range [LO, HI] in degrees, −180 ≤ LO ≤ HI ≤ 180. Default [−90, 90] (motoring and generating at any power factor). */
  readonly loadAngleRangeDeg?: readonly [number, number];
  /** Step of the `mMaxAt` curve in degrees (> 0; at most 10000 points). Default 5. */
  readonly stepDeg?: number;
  /** Polarity margin δ in degrees, 0 ≤ δ < 60. Default 0. */
  readonly polarityMarginDeg?: number;
  /** Every unordered pair of faults in any phases instead of every single fault of phase a. Default false. */
  readonly pairs?: boolean;
  /** Total DC-link voltage in volts: adds `volts` to the document and its entries. Default none. */
  readonly vdc?: number;
}

/** {@link FaultAtlasOptions} checked and with defaults filled in: plain data a worker thread can take. */
export interface AtlasSettings {
  /** The topology as given (built-in id or netlist object). */
  readonly topology: unknown;
  /** Topology id for built-ins, the netlist's `name` otherwise. */
  readonly topologyName: string;
  readonly rules: LimitRules;
  readonly modes: readonly FaultMode[];
  readonly loadAngleRangeDeg: readonly [number, number];
  readonly stepDeg: number;
  readonly polarityMarginDeg: number;
  readonly pairs: boolean;
  readonly vdc: number | null;
  /** Devices without a voltage rating (found once, from the leg resolved here). */
  readonly unrated: readonly string[];
}

/** The work of an atlas: the fault sets to list, grouped into classes computed once each. */
export interface AtlasWork {
  readonly settings: AtlasSettings;
  /** Every fault set the atlas lists, in enumeration order. */
  readonly faultSets: readonly (readonly string[])[];
  /** Per fault set, the index of its class in `classes`. */
  readonly classOf: readonly number[];
  /**
   * One representative fault set per class (the set with its faults moved to the lowest phases by a
   * rotation a→b→c): a rotation of all three phases leaves the limit at every load angle unchanged,
   * since the limit is a minimum over a whole revolution of the reference.
   */
  readonly classes: readonly (readonly string[])[];
}

/** What is computed for one fault class. */
export interface AtlasClassResult {
  readonly mMaxMin: number;
  readonly worstLoadAngleDeg: number;
  readonly mMaxHullMin: number;
  /** `[load angle, mMax]` on the grid. */
  readonly mMaxAt: readonly (readonly [number, number])[];
  readonly reason: string;
  /** Every restriction and lost level, in words. */
  readonly details: readonly string[];
  /**
   * The remedy that raises the worst-case limit over the range most (`clear-shorts`, `bypass-<phase>`
   * or both; see `plan` `remedies`), with that limit; `null` when none does better than as it is.
   */
  readonly bestRemedy: { readonly id: string; readonly mMaxMin: number } | null;
}

/** One line of the atlas. */
export interface AtlasEntry extends AtlasClassResult {
  readonly faults: readonly string[];
  /** mMaxMin / the healthy leg's minimum over the same range. */
  readonly deratingRatio: number;
  readonly verdict: 'full' | 'derated' | 'cannot-run';
  /** With `vdc`: the phase peak and line-to-line RMS voltage the fault leaves over the whole range. */
  readonly volts?: { readonly phasePeakMin: number; readonly lineRmsMin: number };
}

/** The atlas document (`atlas --json`). */
export interface FaultAtlas {
  readonly schemaVersion: number;
  readonly topology: string;
  readonly rules: LimitRules;
  readonly modes: readonly FaultMode[];
  readonly pairs: boolean;
  readonly loadAngleRangeDeg: readonly [number, number];
  readonly stepDeg: number;
  readonly polarityMarginDeg: number;
  /** The healthy leg over the same range, the yardstick of `full`. */
  readonly healthy: { readonly mMaxMin: number; readonly mMaxAt: readonly (readonly [number, number])[] };
  /** Worst first: ascending `mMaxMin`, ties in enumeration order. */
  readonly entries: readonly AtlasEntry[];
  /** Fault classes actually computed (the rest follow by phase rotation). */
  readonly classesComputed: number;
  readonly volts?: { readonly vdc: number; readonly phasePeakMaxHealthy: number; readonly lineRmsMaxHealthy: number };
  readonly unrated: readonly string[];
  readonly cautions: readonly string[];
}

/** Called after each computed class: `done` of `total`. */
export type AtlasProgress = (done: number, total: number) => void;

/** Above this the curve's grid would be a typing error rather than a wish. */
const MAX_GRID_POINTS = 10000;
/** `mMaxMin` at or below this is "cannot run"; within this of the healthy minimum, "full". */
const VERDICT_TOLERANCE = 1e-9;

/**
 * Checks atlas options and lists the fault sets and the classes to compute.
 *
 * @param options - see {@link FaultAtlasOptions}
 * @returns the settings, every fault set and its class
 * @example
 * ```ts
 * atlasWork({ topology: 'npc', modes: ['open'] }).faultSets.length; // 10: every element of phase a
 * ```
 */
export function atlasWork(options: FaultAtlasOptions): AtlasWork {
  requireObject(options, 'faultAtlas', 'an options object { topology, modes?, loadAngleRangeDeg?, stepDeg?, polarityMarginDeg?, pairs?, vdc? }');
  const rules = resolveRules(options, 'faultAtlas');
  const leg = resolveTopology(options.topology);
  const modes = options.modes ?? FAULT_MODES;
  if (
    !Array.isArray(modes) ||
    modes.length === 0 ||
    modes.some((m) => !(FAULT_MODES as readonly unknown[]).includes(m)) ||
    new Set(modes).size !== modes.length
  ) {
    throw new HexsalvageInputError('option', 'faultAtlas', 'modes', `a non-empty list of distinct fault modes (${FAULT_MODES.join(', ')})`, modes);
  }
  const range = options.loadAngleRangeDeg ?? [-90, 90];
  if (!Array.isArray(range) || range.length !== 2) throw new HexsalvageInputError('option', 'faultAtlas', 'loadAngleRangeDeg', '[LO, HI] in degrees', range);
  const lo = requireNumber(range[0], 'faultAtlas', 'loadAngleRangeDeg[0]', { min: -180, max: 180 });
  const hi = requireNumber(range[1], 'faultAtlas', 'loadAngleRangeDeg[1]', { min: lo, max: 180 });
  const stepDeg = requireNumber(options.stepDeg ?? 5, 'faultAtlas', 'stepDeg', { min: 0, openMin: true, max: 360 });
  if ((hi - lo) / stepDeg > MAX_GRID_POINTS)
    throw new HexsalvageInputError('option', 'faultAtlas', 'stepDeg', `a step giving at most ${MAX_GRID_POINTS} points over the range`, stepDeg);
  const polarityMarginDeg = requireNumber(options.polarityMarginDeg ?? 0, 'faultAtlas', 'polarityMarginDeg', { min: 0, max: 60, openMax: true });
  if (options.pairs !== undefined && typeof options.pairs !== 'boolean')
    throw new HexsalvageInputError('option', 'faultAtlas', 'pairs', 'true or false', options.pairs);
  const vdc = options.vdc === undefined ? null : requireVdc(options.vdc, 'faultAtlas', 'vdc');
  const settings: AtlasSettings = {
    topology: options.topology,
    topologyName: typeof options.topology === 'string' ? options.topology : leg.name,
    rules,
    modes: [...modes],
    loadAngleRangeDeg: [lo, hi],
    stepDeg,
    polarityMarginDeg,
    pairs: options.pairs === true,
    vdc,
    unrated: unratedDevices(leg),
  };
  const elements = expandElements(leg).map((e) => e.id);
  const faultSets: string[][] = [];
  if (!settings.pairs) {
    for (const e of elements) for (const m of settings.modes) faultSets.push([`a.${e}:${m}`]);
  } else {
    const all: { phase: number; element: string; text: string }[] = [];
    PHASES.forEach((ph, k) => {
      for (const e of elements) for (const m of settings.modes) all.push({ phase: k, element: e, text: `${ph}.${e}:${m}` });
    });
    for (let i = 0; i < all.length; i++)
      for (let j = i + 1; j < all.length; j++) {
        const x = all[i] as (typeof all)[number];
        const y = all[j] as (typeof all)[number];
        if (x.phase === y.phase && x.element === y.element) continue; // one mode per device
        faultSets.push([x.text, y.text]);
      }
  }
  const classIndex = new Map<string, number>();
  const classes: string[][] = [];
  const classOf = faultSets.map((f) => {
    const rep = canonicalRotation(f);
    const key = rep.join('|');
    let k = classIndex.get(key);
    if (k === undefined) {
      k = classes.length;
      classIndex.set(key, k);
      classes.push(rep);
    }
    return k;
  });
  return { settings, faultSets, classOf, classes };
}

/**
 * The representative of a fault set under the rotation of the phases a→b→c→a: of the three
 * rotations (each sorted), the first in text order.
 *
 * @param faults - fault strings `PHASE.ELEMENT:MODE`
 * @returns the representative, sorted
 * @example
 * ```ts
 * canonicalRotation(['c.innerUpper:open']); // ['a.innerUpper:open']
 * ```
 */
export function canonicalRotation(faults: readonly string[]): string[] {
  const rotate = (f: string, r: number) => `${PHASES[(PHASES.indexOf(f[0] as (typeof PHASES)[number]) + r) % 3]}${f.slice(1)}`;
  const options = [0, 1, 2].map((r) => faults.map((f) => rotate(f, r)).sort());
  options.sort((x, y) => (x.join('|') < y.join('|') ? -1 : x.join('|') > y.join('|') ? 1 : 0));
  return options[0] as string[];
}

/**
 * The load angles of the atlas curve: LO, LO + step, … and HI itself.
 *
 * @param settings - resolved settings
 * @returns the grid, ascending
 * @example
 * ```ts
 * atlasGrid(atlasWork({ topology: 'npc' }).settings).length; // 37 (−90…90 by 5)
 * ```
 */
export function atlasGrid(settings: AtlasSettings): number[] {
  const [lo, hi] = settings.loadAngleRangeDeg;
  const n = Math.floor((hi - lo) / settings.stepDeg + 1e-9);
  const grid = Array.from({ length: n + 1 }, (_, k) => Number((lo + k * settings.stepDeg).toPrecision(12)));
  if (grid[grid.length - 1] !== hi) grid.push(hi);
  return grid;
}

/**
 * Computes one fault class: the exact minimum of mMax over the range (as `check` does), where it
 * is reached, the convex-hull bound for comparison, the curve on the grid, and the reason in words.
 * A pure function of plain data: worker threads call it with the same result.
 *
 * @param settings - resolved settings
 * @param faults - the class's fault strings
 * @returns the class result
 * @example
 * ```ts
 * const w = atlasWork({ topology: 'npc' });
 * atlasClass(w.settings, w.classes[0]!).mMaxMin;
 * ```
 */
export function atlasClass(settings: AtlasSettings, faults: readonly string[]): AtlasClassResult {
  const [lo, hi] = settings.loadAngleRangeDeg;
  const atlas = diagramAtlas({ topology: settings.topology, faults, levelSteps: settings.rules.levelSteps, ignoreRatings: !settings.rules.ratings });
  const worst = limitOverLoadAngles(atlas.faulted, lo, hi, settings.polarityMarginDeg);
  const hull = limitOverLoadAngles(atlas.faulted, lo, hi, settings.polarityMarginDeg, 'hull');
  const mMaxAt = atlasGrid(settings).map((phi) => [phi, modulationLimit(atlas.faulted, phi, settings.polarityMarginDeg).mMax] as const);
  const why = faultReason(atlas.analysis, worst.mMax);
  const options = { topology: settings.topology, faults, levelSteps: settings.rules.levelSteps, ignoreRatings: !settings.rules.ratings };
  // a fault that keeps full voltage needs no remedy (the healthy diagrams are shared: cheap)
  const healthy = limitOverLoadAngles(atlas.healthy, lo, hi, settings.polarityMarginDeg).mMax;
  const remedy = worst.mMax >= healthy - VERDICT_TOLERANCE ? null : bestRemedy(atlas, options, [lo, hi], settings.polarityMarginDeg, worst.mMax);
  return {
    mMaxMin: worst.mMax,
    worstLoadAngleDeg: worst.loadAngleDeg,
    mMaxHullMin: hull.mMax,
    mMaxAt,
    reason: why.reason,
    details: why.details,
    bestRemedy: remedy ? { id: remedy.id, mMaxMin: remedy.mMaxMin } : null,
  };
}

/**
 * Puts the computed classes together into the atlas document: every fault set with its class's
 * numbers, its ratio to the healthy leg and its verdict, worst first.
 *
 * @param work - from {@link atlasWork}
 * @param results - one per class, in class order
 * @returns the document
 * @example
 * ```ts
 * const w = atlasWork({ topology: 'npc' });
 * assembleAtlas(w, w.classes.map((c) => atlasClass(w.settings, c)));
 * ```
 */
export function assembleAtlas(work: AtlasWork, results: readonly AtlasClassResult[]): FaultAtlas {
  const s = work.settings;
  const [lo, hi] = s.loadAngleRangeDeg;
  const healthyAtlas = diagramAtlas({ topology: s.topology, faults: [], levelSteps: s.rules.levelSteps, ignoreRatings: !s.rules.ratings });
  const healthyMin = limitOverLoadAngles(healthyAtlas.healthy, lo, hi, s.polarityMarginDeg).mMax;
  const healthyAt = atlasGrid(s).map((phi) => [phi, modulationLimit(healthyAtlas.healthy, phi, s.polarityMarginDeg).mMax] as const);
  const volt = (m: number) => (s.vdc === null ? null : { phasePeak: phasePeakVolts(m, s.vdc), lineRms: lineRmsVolts(m, s.vdc) });
  const entries = work.faultSets.map((faults, i) => {
    const rep = work.classes[work.classOf[i] as number] as readonly string[];
    const computed = results[work.classOf[i] as number] as AtlasClassResult;
    // the class was computed for its representative: its words name that rotation's phases
    const back = rotationFrom(rep, faults);
    const r =
      back === 0
        ? computed
        : {
            ...computed,
            reason: rotatePhaseNames(computed.reason, back),
            details: computed.details.map((d) => rotatePhaseNames(d, back)),
            bestRemedy: computed.bestRemedy
              ? {
                  ...computed.bestRemedy,
                  id: computed.bestRemedy.id.replace(
                    /bypass-([abc])$/,
                    (_, p: string) => `bypass-${PHASES[(PHASES.indexOf(p as (typeof PHASES)[number]) + back) % 3]}`,
                  ),
                }
              : null,
          };
    const verdict: AtlasEntry['verdict'] = r.mMaxMin <= VERDICT_TOLERANCE ? 'cannot-run' : r.mMaxMin >= healthyMin - VERDICT_TOLERANCE ? 'full' : 'derated';
    const v = volt(r.mMaxMin);
    const entry: AtlasEntry = {
      faults,
      ...r,
      deratingRatio: healthyMin > 0 ? r.mMaxMin / healthyMin : 0,
      verdict,
      ...(v ? { volts: { phasePeakMin: v.phasePeak, lineRmsMin: v.lineRms } } : {}),
    };
    return { entry, i };
  });
  entries.sort((x, y) => x.entry.mMaxMin - y.entry.mMaxMin || x.i - y.i);
  const hv = volt(healthyMin);
  return {
    schemaVersion: ATLAS_SCHEMA_VERSION,
    topology: s.topologyName,
    rules: s.rules,
    modes: s.modes,
    pairs: s.pairs,
    loadAngleRangeDeg: s.loadAngleRangeDeg,
    stepDeg: s.stepDeg,
    polarityMarginDeg: s.polarityMarginDeg,
    healthy: { mMaxMin: healthyMin, mMaxAt: healthyAt },
    entries: entries.map((e) => e.entry),
    classesComputed: work.classes.length,
    ...(hv && s.vdc !== null ? { volts: { vdc: s.vdc, phasePeakMaxHealthy: hv.phasePeak, lineRmsMaxHealthy: hv.lineRms } } : {}),
    unrated: s.unrated,
    cautions: CAUTIONS,
  };
}

// The rotation r (0, 1, 2) that takes the phases of `rep` to those of `faults` (a→b is one step).
function rotationFrom(rep: readonly string[], faults: readonly string[]): number {
  const want = [...faults].sort().join('|');
  for (let r = 0; r < 3; r++) {
    const turned = rep
      .map((f) => `${PHASES[(PHASES.indexOf(f[0] as (typeof PHASES)[number]) + r) % 3]}${f.slice(1)}`)
      .sort()
      .join('|');
    if (turned === want) return r;
  }
  return 0;
}

// "phase a …" written for one rotation, for another: every phase named moves on by r.
function rotatePhaseNames(text: string, r: number): string {
  return text.replace(/\bphase ([abc])\b/g, (_, p: string) => `phase ${PHASES[(PHASES.indexOf(p as (typeof PHASES)[number]) + r) % 3]}`);
}

/**
 * Every single fault of a leg at once (or, with `pairs`, every unordered pair of faults): the safe
 * limit over a load-angle range for each, its worst load angle, the curve, the verdict (full,
 * derated, cannot run) and the reason in one phrase. Classes equal under phase rotation are
 * computed once; diagrams are shared through the diagram cache.
 *
 * @param options - see {@link FaultAtlasOptions}
 * @param onProgress - called after each computed class
 * @returns the atlas document
 * @example
 * ```ts
 * faultAtlas({ topology: 'npc', modes: ['open'] }).entries[0]!.verdict; // 'cannot-run' or 'derated'
 * ```
 */
export function faultAtlas(options: FaultAtlasOptions, onProgress?: AtlasProgress): FaultAtlas {
  const work = atlasWork(options);
  const results = work.classes.map((c, k) => {
    const r = atlasClass(work.settings, c);
    onProgress?.(k + 1, work.classes.length);
    return r;
  });
  return assembleAtlas(work, results);
}
