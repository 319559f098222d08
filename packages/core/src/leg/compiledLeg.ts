import type { ShootThrough } from './conduction.js';
import type { PhaseFaults } from '../netlist/faults.js';
import type { LegElement, LegNetlist } from '../netlist/netlist.js';
import { offsetLists } from '../shared/offsetLists.js';

/** Levels and shoot-through of one gate set, without the conducting paths. */
export interface GateSetLevels {
  /** The first shoot-through found (same rule as `findShootThrough`), or `null`. */
  readonly shootThrough: ShootThrough | null;
  /** Output level for i > 0 and for i < 0 (`null`: interrupted); meaningless under a shoot-through. */
  readonly plus: number | null;
  readonly minus: number | null;
}

/**
 * The conduction rules of the contract compiled for one phase (leg and faults fixed): nodes are
 * numbered once and each element becomes directed edges, so that a gate set is solved with a few
 * array walks instead of building maps. Gives exactly what `conductionEdges`, `findShootThrough` and
 * `outputForSign` give for the level (the paths are left to those); used for the many intermediate
 * gate sets of the commutation search and the exploration.
 *
 * @param leg - the leg netlist
 * @param elements - its expanded elements
 * @param faults - element id → fault mode for this phase
 * @returns a function of the gates switched on
 * @example
 * ```ts
 * compiledLeg(leg, expandElements(leg), new Map())(['upper']).plus; // 1 on a two-level leg
 * ```
 */
export function compiledLeg(leg: LegNetlist, elements: readonly LegElement[], faults: PhaseFaults): (gates: readonly string[]) => GateSetLevels {
  const { dcNames, out, n, from, to, el, needs, gateIndex } = compileEdges(leg, elements, faults);
  const gateOn = new Uint8Array(gateIndex.size);
  const pot = new Float64Array(n).fill(NaN);
  dcNames.forEach((d, k) => {
    pot[k] = leg.dcNodes[d] as number;
  });
  const isDc = (k: number) => !Number.isNaN(pot[k] as number);
  const byPotential = dcNames.map((_, k) => k).sort((x, y) => (pot[y] as number) - (pot[x] as number));
  const seen = new Int32Array(n);
  const via = new Int32Array(n); // edge that reached a node (for the shoot-through path)
  const stack = new Int32Array(n);
  // adjacency of the selected edges, rebuilt per gate set: out-edges and in-edges of each node, in
  // edge order, so that a search visits them as a scan of the edge list filtered by node would
  const outStart = new Int32Array(n + 1);
  const inStart = new Int32Array(n + 1);
  const outCur = new Int32Array(n);
  const inCur = new Int32Array(n);
  const outList = new Int32Array(from.length);
  const inList = new Int32Array(from.length);
  let stamp = 0;
  const outKey = new Int32Array(from.length);
  const inKey = new Int32Array(from.length);
  const indexSelectedEdges = () => {
    // an edge whose gate is off is left out (key −1)
    for (let k = 0; k < from.length; k++) {
      const g = needs[k] as number;
      const on = g < 0 || gateOn[g] !== 0;
      outKey[k] = on ? (from[k] as number) : -1;
      inKey[k] = on ? (to[k] as number) : -1;
    }
    offsetLists(outKey, from.length, n, outStart, outList, outCur);
    offsetLists(inKey, from.length, n, inStart, inList, inCur);
  };

  return (gates) => {
    gateOn.fill(0);
    for (const g of gates) {
      const k = gateIndex.get(g);
      if (k !== undefined) gateOn[k] = 1;
    }
    indexSelectedEdges();
    // shoot-through: a forward path from a DC node to a lower one through non-DC nodes. Whether
    // there is one is decided in one pass: sources from the highest potential down, each node
    // entered once only, by the highest source that reaches it (a lower source reaching a node
    // through it would find nothing the higher one did not: the DC nodes below it are below both).
    stamp++;
    let any = false;
    for (const s of byPotential)
      if (lowerReached(s) >= 0) {
        any = true;
        break;
      }
    if (!any) return { shootThrough: null, plus: extreme(true), minus: extreme(false) };
    // There is one: the searches are redone one per DC node in netlist order, each from scratch,
    // so that the path reported is the one findShootThrough reports (BFS, a shortest path).
    for (let s = 0; s < dcNames.length; s++) {
      stamp++;
      const t = lowerReached(s);
      if (t >= 0) return { shootThrough: trace(s, t), plus: null, minus: null };
    }
    return { shootThrough: null, plus: null, minus: null }; // not reached: the pass above found one
  };

  // Breadth-first from DC node s through non-DC nodes not yet entered under the current stamp; the
  // first DC node below s that is reached (its edge kept in `via`), or -1. DC nodes are compared
  // with s, never entered.
  function lowerReached(s: number): number {
    seen[s] = stamp;
    let head = 0;
    let tail = 0;
    stack[tail++] = s;
    while (head < tail) {
      const x = stack[head++] as number;
      for (let a = outStart[x] as number; a < (outStart[x + 1] as number); a++) {
        const k = outList[a] as number;
        const t = to[k] as number;
        if (isDc(t)) {
          if ((pot[t] as number) < (pot[s] as number)) {
            via[t] = k;
            return t;
          }
          continue;
        }
        if (seen[t] === stamp) continue;
        seen[t] = stamp;
        via[t] = k;
        stack[tail++] = t;
      }
    }
    return -1;
  }

  // '+': highest DC node with a forward path to out (search backwards); '-': lowest DC node out reaches
  function extreme(plus: boolean): number | null {
    stamp++;
    seen[out] = stamp;
    let top = 0;
    stack[top++] = out;
    let best: number | null = null;
    const start = plus ? inStart : outStart;
    const list = plus ? inList : outList;
    const next = plus ? from : to;
    while (top > 0) {
      const x = stack[--top] as number;
      if (x !== out && isDc(x)) {
        const p = pot[x] as number;
        if (best === null || (plus ? p > best : p < best)) best = p;
        continue;
      }
      for (let a = start[x] as number; a < (start[x + 1] as number); a++) {
        const y = next[list[a] as number] as number;
        if (seen[y] === stamp) continue;
        seen[y] = stamp;
        stack[top++] = y;
      }
    }
    return best;
  }

  function trace(s: number, t: number): ShootThrough {
    const path: string[] = [];
    for (let x = t; x !== s;) {
      const k = via[x] as number;
      path.unshift((elements[el[k] as number] as LegElement).id);
      x = from[k] as number;
    }
    return { from: dcNames[s] as string, to: dcNames[t] as string, path };
  }
}

/** One phase's conduction as numbered nodes and flat edge arrays. */
interface CompiledEdges {
  /** DC node names in netlist order: they are nodes 0 … dcNames.length − 1. */
  readonly dcNames: readonly string[];
  /** The output node's number. */
  readonly out: number;
  /** Number of nodes. */
  readonly n: number;
  /** Per edge: from and to node, element index, and the gate it needs (-1: none). */
  readonly from: Int32Array;
  readonly to: Int32Array;
  readonly el: Int32Array;
  readonly needs: Int32Array;
  /** Gated element id → gate number. */
  readonly gateIndex: ReadonlyMap<string, number>;
}

// Nodes numbered once, DC nodes first in netlist order (so that "DC nodes taken in netlist order"
// holds), and every element as directed edges in element order: an open element none, a short both
// ways whatever its gate, a switch forward under its gate (a MOSFET both ways), a diode forward.
function compileEdges(leg: LegNetlist, elements: readonly LegElement[], faults: PhaseFaults): CompiledEdges {
  const index = new Map<string, number>();
  const node = (n: string) => {
    let k = index.get(n);
    if (k === undefined) {
      k = index.size;
      index.set(n, k);
    }
    return k;
  };
  // DC nodes first, in netlist order, so that "DC nodes taken in netlist order" holds
  const dcNames = Object.keys(leg.dcNodes);
  for (const d of dcNames) node(d);
  const out = node(leg.output);
  // every edge in element order (from, to, element index) and the gate it needs (-1: none), in flat
  // arrays: a gate set then only selects edges, with no object built per call
  const gateIndex = new Map<string, number>();
  const eFrom: number[] = [];
  const eTo: number[] = [];
  const eEl: number[] = [];
  const eGate: number[] = [];
  const edge = (f: number, t: number, i: number, g: number) => {
    eFrom.push(f);
    eTo.push(t);
    eEl.push(i);
    eGate.push(g);
  };
  elements.forEach((e, i) => {
    const mode = faults.get(e.id);
    if (mode === 'open') return;
    const f = node(e.from);
    const t = node(e.to);
    if (mode === 'short') {
      edge(f, t, i, -1);
      edge(t, f, i, -1);
      return;
    }
    if (!e.gated) {
      edge(f, t, i, -1);
      return;
    }
    let g = gateIndex.get(e.id);
    if (g === undefined) {
      g = gateIndex.size;
      gateIndex.set(e.id, g);
    }
    edge(f, t, i, g);
    if (e.kind === 'mosfet') edge(t, f, i, g);
  });
  return {
    dcNames,
    out,
    n: index.size,
    from: Int32Array.from(eFrom),
    to: Int32Array.from(eTo),
    el: Int32Array.from(eEl),
    needs: Int32Array.from(eGate),
    gateIndex,
  };
}
