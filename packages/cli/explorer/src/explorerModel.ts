import {
  builtinLeg,
  deratingCurve,
  HexsalvageInputError,
  planRemedial,
  switchover,
  type AnalyseLegOptions,
  type DeratingPoint,
  type DiagramAtlas,
  type LegNetlist,
  type RemedialPlan,
  type Remedy,
} from '@hexsalvage/core';
import { diagramAtlas, planFromAtlas, planRemedies, switchingTableFromAtlas, withRemedies, withVolts } from '@hexsalvage/core/internal';
import { buildReport } from '../../src/report/buildReport.js';
import { commandLineOf, faultStrings, type ExplorerState } from './explorerState.js';

/** The leg netlist of a state (a built-in leg, or the file opened). */
export function legOf(state: ExplorerState): LegNetlist {
  if (state.netlist) return state.netlist;
  return builtinLeg(state.topology as Parameters<typeof builtinLeg>[0]);
}

/** The analysis options of a state. */
export function legOptionsOf(state: ExplorerState): AnalyseLegOptions {
  return {
    topology: state.netlist ?? state.topology,
    faults: faultStrings(state, legOf(state)),
    ignoreRatings: false,
    levelSteps: state.levelSteps,
    ...(state.bypass ? { bypass: state.bypass } : {}),
  };
}

/** What the result panel needs at once: the limit and how it binds. */
export interface ExplorerResult {
  readonly atlas: DiagramAtlas;
  /** The plan without remedies (the limit is the same as with them). */
  readonly plan: RemedialPlan;
  readonly options: AnalyseLegOptions;
}

/** What the pictures need besides the result. */
export interface ExplorerPictures {
  readonly remedies: readonly Remedy[];
  readonly curve: readonly DeratingPoint[];
}

/**
 * The limit of a state: the same computation as `planRemedial` (the diagram atlas, then the plan at
 * the load angle), without the remedies, which the pictures add. Input errors are thrown as
 * {@link HexsalvageInputError} (one line, as the CLI prints them).
 *
 * @param state - what is on screen
 * @returns atlas, plan and options
 * @example
 * ```ts
 * computeResult(initialState('npc')).plan.mMax; // 2/√3
 * ```
 */
export function computeResult(state: ExplorerState): ExplorerResult {
  const options = legOptionsOf(state);
  const atlas = diagramAtlas(options);
  const plan = withRemedies(planFromAtlas(atlas, state.loadAngleDeg, state.polarityMarginDeg), atlas, options, { remedies: false });
  return { atlas, plan: state.vdc === null ? plan : withVolts(plan, state.vdc), options };
}

/**
 * The remedies and the derating curve of a result.
 *
 * @param state - what is on screen
 * @param result - from {@link computeResult}
 * @returns remedies (best first) and the curve from −90° to 90°
 * @example
 * ```ts
 * computePictures(s, computeResult(s)).remedies[0]?.id; // 'as-is'
 * ```
 */
export function computePictures(state: ExplorerState, result: ExplorerResult): ExplorerPictures {
  return {
    remedies: planRemedies(result.atlas, result.options, state.loadAngleDeg, state.polarityMarginDeg),
    curve: deratingCurve(result.atlas, { polarityMarginDeg: state.polarityMarginDeg }),
  };
}

/**
 * The plan document of a state, byte for byte what `hexsalvage plan --json` prints for the same
 * command line.
 *
 * @param state - what is on screen
 * @returns the JSON text with its final newline
 * @example
 * ```ts
 * JSON.parse(planJson(initialState('npc'))).mMax;
 * ```
 */
export function planJson(state: ExplorerState): string {
  const o = legOptionsOf(state);
  const plan = planRemedial({
    ...o,
    loadAngleDeg: state.loadAngleDeg,
    polarityMarginDeg: state.polarityMarginDeg,
    ...(state.vdc === null ? {} : { vdc: state.vdc }),
  });
  return `${JSON.stringify(plan)}\n`;
}

/**
 * The review report of a state, as `hexsalvage report` writes it for the same inputs (the date is
 * the moment of the download).
 *
 * @param state - what is on screen
 * @param version - the tool version for the header
 * @param inputs - files the report names with their SHA-256 (the netlist opened)
 * @returns the HTML document
 * @example
 * ```ts
 * reportHtml(initialState('npc'), '0.1.0', []).startsWith('<!doctype html>');
 * ```
 */
export function reportHtml(state: ExplorerState, version: string, inputs: readonly { path: string; sha256: string }[]): string {
  const { atlas, options } = computeResult(state);
  const plan = planFromAtlas(atlas, state.loadAngleDeg, state.polarityMarginDeg);
  const remedies = planRemedies(atlas, options, state.loadAngleDeg, state.polarityMarginDeg);
  const leg = legOf(state);
  const sw = options.faults?.length && !state.bypass ? switchover({ ...options }) : undefined;
  const out = `${state.topology.startsWith('file:') ? state.topology.slice(5).replace(/\.json$/i, '') : state.topology}-review.html`;
  return buildReport({
    atlas,
    plan,
    remedies,
    ...(sw ? { switchover: sw } : {}),
    table: switchingTableFromAtlas(atlas),
    runtime: { sequence: 'continuous', balance: 'on' },
    topologyText: state.topology.startsWith('file:') ? state.topology.slice(5) : state.topology,
    ...(state.vdc === null ? {} : { vdc: state.vdc }),
    generatedBy: `hexsalvage ${version} (explorer page)`,
    commandLine: commandLineOf('report', state, leg, ['--out', out]),
    date: `${new Date().toISOString().slice(0, 19)}Z`,
    inputs: [...inputs],
  });
}

/**
 * The one line shown for an error: the message of an input error (as the CLI prints it after the
 * command name), or the first line of anything else.
 *
 * @param e - what was thrown
 * @returns one line
 * @example
 * ```ts
 * errorLine(new Error('x\ny')); // 'internal error: x'
 * ```
 */
export function errorLine(e: unknown): string {
  if (e instanceof HexsalvageInputError) return e.message;
  return `internal error: ${String((e as Error)?.message ?? e).split('\n')[0]}`;
}
