import { HexsalvageInputError } from '../shared/errors.js';

/** Which level changes a switching sequence may make. */
export const LEVEL_STEP_RULES = ['commutable', 'adjacent', 'any'] as const;
/**
 * - `commutable` (default): a phase may change between two levels when some pair of patterns
 *   commutates safely both ways;
 * - `adjacent`: as `commutable`, and only between neighbouring DC potentials (the trade habit);
 * - `any`: every triangle allowed (the convex-hull bound), no sequence rule in the limit.
 */
export type LevelStepRule = (typeof LEVEL_STEP_RULES)[number];

/** The rules a limit is computed under. */
export interface LimitRules {
  /** Apply device voltage ratings (static voltage check). Default true. */
  readonly ratings: boolean;
  readonly levelSteps: LevelStepRule;
}

/** Options that select {@link LimitRules}; both optional. */
export interface LimitRuleOptions {
  /** Skip the static voltage check (the convex-hull bound's level tables, unsafe). Default false. */
  readonly ignoreRatings?: boolean;
  /** Default `commutable`. */
  readonly levelSteps?: LevelStepRule;
  /**
   * A phase tied to the DC node at 0 by a fitted bypass, every gate of it off (not a rule but a
   * configuration of the leg; carried with the rules so that every entry point passes it on).
   */
  readonly bypass?: 'a' | 'b' | 'c';
}

/** The default rules: ratings applied, commutable level steps. */
export const DEFAULT_RULES: LimitRules = { ratings: true, levelSteps: 'commutable' };

/**
 * Validates rule options and fills in the defaults.
 *
 * @param options - `ignoreRatings` and `levelSteps`, both optional
 * @param input - name of the input for error messages
 * @returns the resolved rules
 * @throws HexsalvageInputError on a value of the wrong type or an unknown rule
 * @example
 * ```ts
 * resolveRules({ levelSteps: 'adjacent' }); // { ratings: true, levelSteps: 'adjacent' }
 * ```
 */
export function resolveRules(options: LimitRuleOptions = {}, input = 'options'): LimitRules {
  const { ignoreRatings, levelSteps } = options;
  if (ignoreRatings !== undefined && typeof ignoreRatings !== 'boolean')
    throw new HexsalvageInputError('option', input, 'ignoreRatings', 'true or false', ignoreRatings);
  if (levelSteps !== undefined && !(LEVEL_STEP_RULES as readonly unknown[]).includes(levelSteps)) {
    throw new HexsalvageInputError('option', input, 'levelSteps', `one of ${LEVEL_STEP_RULES.join(', ')}`, levelSteps);
  }
  return { ratings: ignoreRatings !== true, levelSteps: levelSteps ?? 'commutable' };
}

/**
 * The rules in plain words, for text output and the report.
 *
 * @param rules - resolved rules
 * @returns e.g. `device ratings applied; level changes: commutable`
 * @example
 * ```ts
 * describeRules(DEFAULT_RULES);
 * ```
 */
export function describeRules(rules: LimitRules): string {
  const steps = {
    commutable: 'a phase changes level only where a safe commutation exists (both ways)',
    adjacent: 'a phase changes level only to a neighbouring level, by a safe commutation',
    any: 'every level change and every triangle allowed (first-version rule, no commutation check)',
  }[rules.levelSteps];
  return `${rules.ratings ? 'device voltage ratings applied' : 'device voltage ratings ignored'}; ${steps}`;
}

/**
 * Why results under these rules are not a safe operating limit, or `null` when they are: ignoring
 * ratings lets a device block more than it may; `any` lets a sequence make level changes no safe
 * commutation exists for. Text output says "NOT safe" with this reason wherever it would say safe.
 *
 * @param rules - resolved rules
 * @returns the reason in words, or `null` under ratings with `commutable` or `adjacent` steps
 * @example
 * ```ts
 * unsafeRules({ ratings: false, levelSteps: 'commutable' }); // 'device voltage ratings ignored'
 * ```
 */
export function unsafeRules(rules: LimitRules): string | null {
  const why = [
    rules.ratings ? '' : 'device voltage ratings ignored',
    rules.levelSteps === 'any' ? 'level changes not checked for a safe commutation' : '',
  ].filter(Boolean);
  return why.length ? why.join('; ') : null;
}
