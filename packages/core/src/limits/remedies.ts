import type { AnalyseLegOptions, LegAnalysis } from '../leg/analyseLeg.js';
import { diagramAtlas, type DiagramAtlas } from '../vectors/diagramAtlas.js';
import { BoundedCache } from '../shared/boundedCache.js';
import { HexsalvageInputError } from '../shared/errors.js';
import { formatFault, PHASES, type Fault } from '../netlist/faults.js';
import { limitOverLoadAngles } from './modulationLimit.js';
import { planLimits } from './planLimits.js';

/** One remedy: a change to the hardware (or none) and the limit it leaves. */
export interface Remedy {
  /** `as-is`, `clear-shorts`, `bypass-<phase>` or `clear-shorts+bypass-<phase>`. */
  readonly id: string;
  /** What is done, in words. */
  readonly description: string;
  readonly mMax: number;
  readonly mMaxBalanced: number;
  /** What it needs in hardware, in words (`nothing` for `as-is`). */
  readonly requires: string;
}

/** One remedy considered for a fault set: the options to analyse it with, and its words. */
export interface RemedyCase {
  readonly id: string;
  readonly description: string;
  readonly requires: string;
  /** The analysis options of the leg with the remedy applied. */
  readonly options: AnalyseLegOptions;
}

/**
 * The remedies that apply to a fault set: running as it is; clearing every short to an open (a
 * series fuse or breaker in the shorted branch); tying a faulted phase to the DC node at 0 with
 * every gate of it off (a fitted bypass, only on a leg with a DC node at 0 and where that state is
 * usable); and both. Each comes with the analysis options that model it.
 *
 * @param analysis - the fault set as analysed (its failures, alternatives included)
 * @param options - the options it was analysed with (topology, faults, rules, bypass)
 * @returns the cases, `as-is` first
 * @example
 * ```ts
 * remedyCases(analyseLeg({ topology: 'npc', faults: ['a.innerUpper:short'] }), { topology: 'npc', faults: ['a.innerUpper:short'] }).map((r) => r.id);
 * // ['as-is', 'clear-shorts', 'bypass-a', 'clear-shorts+bypass-a']
 * ```
 */
export function remedyCases(analysis: LegAnalysis, options: AnalyseLegOptions): RemedyCase[] {
  const texts = analysis.failures.map((alternatives) => alternatives.map(formatFault).join('|'));
  const shorts = analysis.failures.flat().filter((f) => f.mode === 'short');
  const cleared = analysis.failures.map((alternatives) => alternatives.map((f) => formatFault({ ...f, mode: 'open' })).join('|'));
  const { bypass: fitted, ...rest } = options;
  const base: AnalyseLegOptions = { ...rest, faults: texts };
  const cases: RemedyCase[] = [
    {
      id: 'as-is',
      description: fitted ? `run as it is, phase ${fitted} bypassed` : 'run the degraded table as it is',
      requires: 'nothing',
      options: { ...base, ...(fitted ? { bypass: fitted } : {}) },
    },
  ];
  const shortWords = shorts.map(formatFault).join(', ');
  const clearWords = `a series fuse or breaker that clears each short to an open (${shortWords})`;
  if (shorts.length > 0)
    cases.push({
      id: 'clear-shorts',
      description: `each short cleared to an open (${shortWords})`,
      requires: clearWords,
      options: { ...base, faults: cleared, ...(fitted ? { bypass: fitted } : {}) },
    });
  const zero = Object.entries(analysis.leg.dcNodes).find(([, v]) => v === 0)?.[0];
  if (zero === undefined || fitted) return cases;
  const faulted = PHASES.filter((ph) => analysis.faults.some((f: Fault) => f.phase === ph));
  for (const ph of faulted) {
    const tie = `a bypass (a contactor or an antiparallel thyristor pair) from the output of phase ${ph} to the DC midpoint ${zero}, every gate of phase ${ph} held off`;
    cases.push({
      id: `bypass-${ph}`,
      description: `phase ${ph} tied to the DC midpoint ${zero}, its gates off`,
      requires: tie,
      options: { ...base, bypass: ph },
    });
    if (shorts.length > 0)
      cases.push({
        id: `clear-shorts+bypass-${ph}`,
        description: `each short cleared to an open, and phase ${ph} tied to the DC midpoint ${zero}`,
        requires: `${clearWords}, and ${tie}`,
        options: { ...base, faults: cleared, bypass: ph },
      });
  }
  return cases;
}

/**
 * The remedies of a fault set at one load angle, best first (by mMax, then mMaxBalanced; `as-is`
 * before others on a tie). A bypass whose tied state is not usable (a short from the output to a
 * DC node, say) does not apply and is left out.
 *
 * @param atlas - the fault set's atlas (its `as-is` limit is taken from it)
 * @param options - the options the atlas was made with
 * @param loadAngleDeg - load angle, degrees
 * @param polarityMarginDeg - polarity margin, degrees
 * @returns the remedies that apply
 * @example
 * ```ts
 * planRemedies(diagramAtlas({ topology: 'two-level', faults: ['a.upper'] }), { topology: 'two-level', faults: ['a.upper'] }, 0, 0);
 * ```
 */
export function planRemedies(atlas: DiagramAtlas, options: AnalyseLegOptions, loadAngleDeg: number, polarityMarginDeg: number): Remedy[] {
  const out: (Remedy & { order: number })[] = [];
  remedyCases(atlas.analysis, options).forEach((c, order) => {
    const a = c.id === 'as-is' ? atlas : applicable(c.options);
    if (a === null) return;
    const { mMax, mMaxBalanced } = planLimits(a, loadAngleDeg, polarityMarginDeg);
    out.push({ id: c.id, description: c.description, mMax, mMaxBalanced, requires: c.requires, order });
  });
  return out.sort(byMerit).map(({ order: _o, ...r }) => r);
}

/** The best remedy over a load-angle range, other than running as it is, where it does better. */
export interface BestRemedy {
  readonly id: string;
  /** min of mMax over the range with the remedy. */
  readonly mMaxMin: number;
  readonly requires: string;
}

/**
 * The remedy that raises the worst-case limit over a load-angle range most (exact over the range),
 * or `null` when none does better than running as it is.
 *
 * @param atlas - the fault set's atlas
 * @param options - the options it was made with
 * @param range - load angles [LO, HI], degrees
 * @param polarityMarginDeg - polarity margin, degrees
 * @param asIs - min of mMax over the range as it is
 * @returns the best remedy, or `null`
 * @example
 * ```ts
 * bestRemedy(atlas, { topology: 'two-level', faults: ['a.upper'] }, [-90, 90], 0, 0)?.id; // 'bypass-a' on a split link
 * ```
 */
export function bestRemedy(
  atlas: DiagramAtlas,
  options: AnalyseLegOptions,
  range: readonly [number, number],
  polarityMarginDeg: number,
  asIs: number,
): BestRemedy | null {
  let best: BestRemedy | null = null;
  for (const c of remedyCases(atlas.analysis, options)) {
    if (c.id === 'as-is') continue;
    const a = applicable(c.options);
    if (a === null) continue;
    const m = limitOverLoadAngles(a.faulted, range[0], range[1], polarityMarginDeg).mMax;
    if (m > (best?.mMaxMin ?? asIs) + 1e-12) best = { id: c.id, mMaxMin: m, requires: c.requires };
  }
  return best;
}

// The remedy's atlas, or null where a bypass cannot be fitted (its tied state shoots through or
// overstresses a device): such a remedy does not apply.
function applicable(options: AnalyseLegOptions): DiagramAtlas | null {
  const key = JSON.stringify([options.topology, options.faults, options.ignoreRatings, options.levelSteps, options.bypass]);
  if (UNFIT.get(key)) return null;
  try {
    return diagramAtlas(options);
  } catch (e) {
    if (e instanceof HexsalvageInputError && e.input === '--bypass') {
      UNFIT.set(key, true);
      return null;
    }
    throw e;
  }
}

// Remedies already found not to apply (a bypass whose tied state is unusable), by their options.
const UNFIT = new BoundedCache<boolean>(256);

function byMerit(x: Remedy & { order: number }, y: Remedy & { order: number }): number {
  return y.mMax - x.mMax > 1e-12
    ? 1
    : x.mMax - y.mMax > 1e-12
      ? -1
      : y.mMaxBalanced - x.mMaxBalanced > 1e-12
        ? 1
        : x.mMaxBalanced - y.mMaxBalanced > 1e-12
          ? -1
          : x.order - y.order;
}
