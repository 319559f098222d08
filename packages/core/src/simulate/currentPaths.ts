import { conductionEdges, outputForSign, type ConductionEdge, type CurrentSign } from '../leg/conduction.js';
import type { PhaseFaults } from '../netlist/faults.js';
import type { LegElement, LegNetlist } from '../netlist/netlist.js';

/** One element the current can take between two nodes, and the direction it is crossed in. */
export interface PathBranch {
  readonly element: string;
  /** True where the current runs from the element's `from` node to its `to` node. */
  readonly forward: boolean;
}

/**
 * One way the phase current can go through the leg, node by node: for each hop the elements side by
 * side that can carry it (a MOSFET channel and its body diode, parallel devices); the current takes
 * one of them per hop.
 */
export interface NodePath {
  readonly hops: readonly (readonly PathBranch[])[];
}

/** One way the current goes through the leg: its elements in order, each with its direction. */
export interface CurrentPath {
  /** Element ids from the DC node to the output (sign `+`) or from the output to the DC node (`-`). */
  readonly elements: readonly string[];
  /** Per element: true where the current runs from its `from` node to its `to` node. */
  readonly forward: readonly boolean[];
}

/** The level a gate set gives for a current sign and every simple node path it offers. */
export interface PathChoice {
  /** Output level, `null` where the current is interrupted. */
  readonly level: number | null;
  readonly paths: readonly NodePath[];
}

/** Most node paths listed per gate set and sign (legs offer a handful). */
export const MAX_PATHS_PER_STATE = 64;

/**
 * Every simple conducting node path of one phase's current for a gate set and sign: from a DC node
 * at the output level to the output (`+`), or from the output to such a node (`-`), through non-DC
 * nodes only, each hop with the elements that conduct it in that direction (contract element rules).
 *
 * @param leg - the leg
 * @param elements - its expanded elements
 * @param faults - the phase's faults
 * @param gates - switches gated on
 * @param sign - current sign
 * @returns the level and the node paths (at most {@link MAX_PATHS_PER_STATE})
 * @example
 * ```ts
 * currentPaths(leg, expandElements(leg), new Map(), ['upper'], '+').paths[0]?.hops[0]; // [{ element: 'upper', forward: true }]
 * ```
 */
export function currentPaths(leg: LegNetlist, elements: readonly LegElement[], faults: PhaseFaults, gates: readonly string[], sign: CurrentSign): PathChoice {
  const edges = conductionEdges(elements, new Set(gates), faults);
  const o = outputForSign(leg, edges, sign);
  if (o.level === null) return { level: null, paths: [] };
  const byId = new Map(elements.map((e) => [e.id, e] as const));
  // per node, the nodes one edge leads to with every edge that does
  const hops = new Map<string, Map<string, ConductionEdge[]>>();
  for (const e of edges) {
    let m = hops.get(e.from);
    if (!m) hops.set(e.from, (m = new Map()));
    const list = m.get(e.to);
    if (list) list.push(e);
    else m.set(e.to, [e]);
  }
  const isDc = (n: string) => n in leg.dcNodes;
  const paths: NodePath[] = [];
  const branch = (x: ConductionEdge): PathBranch => ({ element: x.element, forward: (byId.get(x.element) as LegElement).from === x.from });
  const walk = (start: string, goal: string) => {
    const onStack = new Set([start]);
    const trail: ConductionEdge[][] = [];
    const visit = (n: string): void => {
      for (const [to, list] of hops.get(n) ?? []) {
        if (paths.length >= MAX_PATHS_PER_STATE) return;
        if (onStack.has(to)) continue;
        if (to === goal) {
          paths.push({ hops: [...trail, list].map((h) => h.map(branch)) });
          continue;
        }
        if (isDc(to)) continue;
        onStack.add(to);
        trail.push(list);
        visit(to);
        trail.pop();
        onStack.delete(to);
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
