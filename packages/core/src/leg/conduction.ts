import { HexsalvageInputError } from '../shared/errors.js';
import type { PhaseFaults } from '../netlist/faults.js';
import type { LegElement, LegNetlist } from '../netlist/netlist.js';

/** Current sign of a phase: `+` flows out of the leg into the load, `-` into the leg. */
export type CurrentSign = '+' | '-';

/** Polarity of one phase as used in level sets: a measured sign, or `?` (unknown: robust). */
export type PhasePolarity = CurrentSign | '?';

/** A directed conduction edge: current may flow `from → to` through `element`. */
export interface ConductionEdge {
  readonly from: string;
  readonly to: string;
  readonly element: string;
}

/** The output of a leg for one gate set and one current sign. */
export interface SignOutcome {
  /** Output potential in units of Vdc/2, or `null` when the current is interrupted. */
  readonly level: number | null;
  /** DC nodes the current is exchanged with (those at `level`). */
  readonly dcNodes: readonly string[];
  /** Elements on some conducting path between those DC nodes and the output, in netlist order. */
  readonly path: readonly string[];
}

/** A forward conducting path from one DC node to another of lower potential. */
export interface ShootThrough {
  readonly from: string;
  readonly to: string;
  /** Element ids along the path, from `from` to `to`. */
  readonly path: readonly string[];
}

/**
 * The conduction edges of a leg for a gate set and faults, by the contract's element rules.
 *
 * An IGBT conducts from→to when gated; a MOSFET channel both ways when gated; a diode from→to
 * always; an open element never; a shorted element both ways whatever its gate.
 *
 * @param elements - the expanded elements of the leg
 * @param gates - ids of the switches gated on
 * @param faults - element id → fault mode for this phase
 * @returns directed edges in element order
 * @example
 * ```ts
 * conductionEdges(expandElements(leg), new Set(['upper']), new Map());
 * ```
 */
export function conductionEdges(elements: readonly LegElement[], gates: ReadonlySet<string>, faults: PhaseFaults): ConductionEdge[] {
  const edges: ConductionEdge[] = [];
  for (const e of elements) {
    const mode = faults.get(e.id);
    if (mode === 'open') continue;
    const fwd = { from: e.from, to: e.to, element: e.id };
    const rev = { from: e.to, to: e.from, element: e.id };
    if (mode === 'short') edges.push(fwd, rev);
    else if (!e.gated) edges.push(fwd);
    else if (gates.has(e.id)) edges.push(...(e.kind === 'mosfet' ? [fwd, rev] : [fwd]));
  }
  return edges;
}

/**
 * Output level for one current sign, following the contract: for `+` the highest DC node with a
 * forward path to the output, for `-` the lowest DC node the output has a forward path to.
 * Paths do not pass through DC nodes: a DC node is a terminal, and a path through one would be a
 * shoot-through that {@link findShootThrough} reports on its own.
 *
 * @param leg - the leg netlist
 * @param edges - conduction edges from {@link conductionEdges}
 * @param sign - current sign
 * @returns the level (or `null` when interrupted), the DC nodes and the conducting elements
 * @example
 * ```ts
 * outputForSign(leg, conductionEdges(elements, new Set(['upper']), new Map()), '+').level; // 1
 * ```
 */
export function outputForSign(leg: LegNetlist, edges: readonly ConductionEdge[], sign: CurrentSign): SignOutcome {
  const isDc = (n: string) => n in leg.dcNodes;
  const fwd = adjacency(edges, false);
  const back = adjacency(edges, true);
  // '+': who reaches out (search backwards from out); '-': whom out reaches (search forwards).
  const fromOut = reach(leg.output, sign === '+' ? back : fwd, isDc);
  const touched = Object.keys(leg.dcNodes).filter((d) => fromOut.has(d));
  if (touched.length === 0) return { level: null, dcNodes: [], path: [] };
  const pick = sign === '+' ? Math.max : Math.min;
  const level = pick(...touched.map((d) => leg.dcNodes[d] as number));
  const chosen = touched.filter((d) => leg.dcNodes[d] === level);
  // Elements on a simple path chosen-DC → out (for '-': out → chosen-DC) avoiding other DC nodes.
  const onPath = new Set<string>();
  for (const d of chosen) {
    if (sign === '+') collectSimplePaths(d, leg.output, fwd, isDc, onPath);
    else collectSimplePaths(leg.output, d, fwd, isDc, onPath);
  }
  return {
    level,
    dcNodes: chosen,
    path: edges
      .filter((e) => onPath.has(e.element))
      .map((e) => e.element)
      .filter(unique),
  };
}

/**
 * Finds a forward conducting path from a DC node to a DC node of lower potential.
 *
 * @param leg - the leg netlist
 * @param edges - conduction edges from {@link conductionEdges}
 * @returns the first such path (DC nodes taken in netlist order, shortest path) or `null`
 * @example
 * ```ts
 * findShootThrough(leg, conductionEdges(elements, new Set(['upper', 'lower']), new Map())); // { from: 'P', to: 'N', … }
 * ```
 */
export function findShootThrough(leg: LegNetlist, edges: readonly ConductionEdge[]): ShootThrough | null {
  const fwd = adjacency(edges, false);
  for (const [src, v] of Object.entries(leg.dcNodes)) {
    // Breadth-first search with parent links so the reported path is a real, shortest one.
    const parent = new Map<string, ConductionEdge | null>([[src, null]]);
    const queue = [src];
    while (queue.length > 0) {
      const n = queue.shift() as string;
      for (const e of fwd.get(n) ?? []) {
        if (parent.has(e.to)) continue;
        parent.set(e.to, e);
        const pot = leg.dcNodes[e.to];
        if (pot !== undefined && pot < v) return { from: src, to: e.to, path: tracePath(parent, e.to) };
        if (pot === undefined) queue.push(e.to);
      }
    }
  }
  return null;
}

// Elements on some simple path from start to goal through non-DC nodes. The walk goes over nodes,
// not elements: elements side by side between the same two nodes (a MOSFET channel and its body
// diode, parallel devices) are all on a path when one of them is, so a chain of k such pairs costs
// one node path, not 2^k element paths. It keeps loops such as out → diode → X → channel → out
// out of the reported conduction path.
function collectSimplePaths(start: string, goal: string, adj: Map<string, ConductionEdge[]>, isDc: (n: string) => boolean, into: Set<string>): void {
  const hops = nodeHops(adj);
  const onStack = new Set<string>([start]);
  const trail: ConductionEdge[][] = [];
  let walked = 0;
  const visit = (n: string): void => {
    for (const [to, edges] of hops.get(n) ?? []) {
      if (++walked > MAX_WALK)
        throw new HexsalvageInputError(
          'netlist',
          'leg',
          '(structure)',
          `a leg whose conducting paths can be listed in ${MAX_WALK} steps (this one has more: too many meshed branches)`,
        );
      if (onStack.has(to)) continue;
      if (to === goal) {
        for (const hop of trail) for (const e of hop) into.add(e.element);
        for (const e of edges) into.add(e.element);
        continue;
      }
      if (isDc(to)) continue;
      onStack.add(to);
      trail.push(edges);
      visit(to);
      trail.pop();
      onStack.delete(to);
    }
  };
  visit(start);
}

/** Most node visits one path listing may take (legs take a few hundred). */
const MAX_WALK = 200000;

// Per node, the nodes one edge leads to, each with every edge that does.
function nodeHops(adj: Map<string, ConductionEdge[]>): Map<string, Map<string, ConductionEdge[]>> {
  const hops = new Map<string, Map<string, ConductionEdge[]>>();
  for (const [n, edges] of adj) {
    const m = new Map<string, ConductionEdge[]>();
    for (const e of edges) {
      const list = m.get(e.to);
      if (list) list.push(e);
      else m.set(e.to, [e]);
    }
    hops.set(n, m);
  }
  return hops;
}

function tracePath(parent: Map<string, ConductionEdge | null>, end: string): string[] {
  const path: string[] = [];
  for (let e = parent.get(end); e; e = parent.get(e.from)) path.unshift(e.element);
  return path;
}

function adjacency(edges: readonly ConductionEdge[], reverse: boolean): Map<string, ConductionEdge[]> {
  const m = new Map<string, ConductionEdge[]>();
  for (const e of edges) {
    const key = reverse ? e.to : e.from;
    const list = m.get(key);
    const oriented = reverse ? { from: e.to, to: e.from, element: e.element } : e;
    if (list) list.push(oriented);
    else m.set(key, [oriented]);
  }
  return m;
}

// Nodes reachable from `start`; nodes for which `stop` holds are reached but not passed through.
function reach(start: string, adj: Map<string, ConductionEdge[]>, stop: (n: string) => boolean): Set<string> {
  const seen = new Set([start]);
  const stack = [start];
  while (stack.length > 0) {
    const n = stack.pop() as string;
    if (n !== start && stop(n)) continue;
    for (const e of adj.get(n) ?? []) {
      if (!seen.has(e.to)) {
        seen.add(e.to);
        stack.push(e.to);
      }
    }
  }
  return seen;
}

function unique<T>(x: T, i: number, arr: readonly T[]): boolean {
  return arr.indexOf(x) === i;
}
