import type { FaultMode, LegNetlist, LevelStepRule, Phase } from '@hexsalvage/core';
import type { ExplorerState } from './explorerState.js';

/** An {@link ExplorerState} as it crosses to the worker (maps and sets as arrays). */
export interface WireState {
  readonly topology: string;
  readonly netlist?: LegNetlist;
  readonly faults: readonly (readonly [string, FaultMode])[];
  readonly ambiguous: readonly string[];
  readonly bypass: Phase | null;
  readonly loadAngleDeg: number;
  readonly polarityMarginDeg: number;
  readonly levelSteps: LevelStepRule;
  readonly vdc: number | null;
}

/** What the page asks the worker. */
export type ExplorerRequest =
  | { readonly kind: 'update'; readonly id: number; readonly state: WireState; readonly polarity: string }
  | { readonly kind: 'plan-json'; readonly id: number; readonly state: WireState }
  | {
      readonly kind: 'report';
      readonly id: number;
      readonly state: WireState;
      readonly version: string;
      readonly inputs: readonly { path: string; sha256: string }[];
    };

/** What the worker answers; an update is answered twice (the result, then the pictures). */
export type ExplorerReply =
  | {
      readonly kind: 'result';
      readonly id: number;
      readonly mMax: number;
      readonly faults: string;
      readonly loadAngleDeg: number;
      readonly html: string;
      readonly ms: number;
    }
  | {
      readonly kind: 'pictures';
      readonly id: number;
      readonly polarities: readonly { value: string; label: string }[];
      readonly polarity: string;
      readonly diagram: string;
      readonly derating: string;
      readonly remedies: string;
      readonly levels: string;
      readonly ms: number;
    }
  | { readonly kind: 'file'; readonly id: number; readonly text: string }
  | { readonly kind: 'error'; readonly id: number; readonly message: string };

/**
 * A state ready to post.
 *
 * @param s - the state
 * @returns plain data
 * @example
 * ```ts
 * toWire(initialState('npc')).faults; // []
 * ```
 */
export function toWire(s: ExplorerState): WireState {
  return {
    topology: s.topology,
    ...(s.netlist ? { netlist: s.netlist } : {}),
    faults: [...s.faults],
    ambiguous: [...s.ambiguous],
    bypass: s.bypass,
    loadAngleDeg: s.loadAngleDeg,
    polarityMarginDeg: s.polarityMarginDeg,
    levelSteps: s.levelSteps,
    vdc: s.vdc,
  };
}

/**
 * A posted state back as a state.
 *
 * @param w - plain data from {@link toWire}
 * @returns the state
 * @example
 * ```ts
 * fromWire(toWire(s)).faults.size === s.faults.size;
 * ```
 */
export function fromWire(w: WireState): ExplorerState {
  return {
    topology: w.topology,
    ...(w.netlist ? { netlist: w.netlist } : {}),
    faults: new Map(w.faults),
    ambiguous: new Set(w.ambiguous),
    bypass: w.bypass,
    loadAngleDeg: w.loadAngleDeg,
    polarityMarginDeg: w.polarityMarginDeg,
    levelSteps: w.levelSteps,
    vdc: w.vdc,
  };
}
