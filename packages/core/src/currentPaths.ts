import { conductionEdges, outputForSign, type ConductionEdge, type CurrentSign } from './conduction.js';
import type { PhaseFaults } from './faults.js';
import type { LegElement, LegNetlist } from './netlist.js';

/** One way the phase current can go through the leg: its elements in order, each with the direction it is crossed. */
export interface CurrentPath {
  /** Element ids from the DC node to the output (sign `+`) or from the output to the DC node (`-`). */
  readonly elements: readonly string[];
  /** Per element: true where the current runs from its `from` node to its `to` node. */
  readonly forward: readonly boolean[];
}

/** The level a gate set gives for a current sign and every simple conducting path it offers. */
export interface PathChoice {
  /** Output level, `null` where the current is interrupted. */
  readonly level: number | null;
  readonly paths: readonly CurrentPath[];
}

/** Most simple paths listed per gate set and sign (legs offer a handful). */
export const MAX_PATHS_PER_STATE = 64;

/**
 * Every simple conducting path of one phase's current for a gate set and sign: from a DC node at
 * the output level to the output (`+`), or from the output to such a node (`-`), through non-DC
 * nodes only, each element used in a direction it conducts (contract element rules).
 *
 * @param leg - the leg
 * @param elements - its expanded elements
 * @param faults - the phase's faults
 * @param gates - switches gated on
 * @param sign - current sign
 * @returns the level and the paths (at most {@link MAX_PATHS_PER_STATE})
 * @example
 * ```ts
 * currentPaths(leg, expandElements(leg), new Map(), ['upper'], '+').paths[0]?.elements; // ['upper']
 * ```
 */
export function currentPaths(leg: LegNetlist, elements: readonly LegElement[], faults: PhaseFaults, gates: readonly string[], sign: CurrentSign): PathChoice {
  const edges = conductionEdges(elements, new Set(gates), faults);
  const o = outputForSign(leg, edges, sign);
  if (o.level === null) return { level: null, paths: [] };
  const byId = new Map(elements.map((e) => [e.id, e] as const));
  const adj = new Map<string, ConductionEdge[]>();
  for (const e of edges) {
    const list = adj.get(e.from);
    if (list) list.push(e);
    else adj.set(e.from, [e]);
  }
  const isDc = (n: string) => n in leg.dcNodes;
  const paths: CurrentPath[] = [];
  const walk = (start: string, goal: string) => {
    const onStack = new Set([start]);
    const trail: ConductionEdge[] = [];
    const visit = (n: string): void => {
      for (const e of adj.get(n) ?? []) {
        if (paths.length >= MAX_PATHS_PER_STATE) return;
        if (onStack.has(e.to)) continue;
        if (e.to === goal) {
          const all = [...trail, e];
          paths.push({ elements: all.map((x) => x.element), forward: all.map((x) => (byId.get(x.element) as LegElement).from === x.from) });
          continue;
        }
        if (isDc(e.to)) continue;
        onStack.add(e.to);
        trail.push(e);
        visit(e.to);
        trail.pop();
        onStack.delete(e.to);
      }
    };
    visit(start);
  };
  for (const d of o.dcNodes) {
    if (sign === '+') walk(d, leg.output);
    else walk(leg.output, d);
  }
  return { level: o.level, paths };
}
