import type { PhaseFaults } from '../netlist/faults.js';
import type { LegElement, LegNetlist } from '../netlist/netlist.js';
import { offsetLists } from '../shared/offsetLists.js';

/** Result of the static voltage check of one gate set for one current sign. */
export type RatingCheck =
  | { readonly ok: true }
  | {
      readonly ok: false;
      /** Plain words, e.g. `innerUpper.diode blocks 2 > rating 1`. */
      readonly reason: string;
      /** The element that would be overstressed, `null` when no single element is to blame. */
      readonly element: string | null;
      /** The voltage it would have to block at least, units of Vdc/2 (`null` with `element`). */
      readonly voltage: number | null;
      readonly rating: number | null;
    };

const NOT_WITHIN: RatingCheck = { ok: false, reason: 'not within ratings', element: null, voltage: null, rating: null };

/** One difference constraint `x[to] − x[from] ≤ weight`, i.e. a graph edge from → to. */
interface Arc {
  readonly from: number;
  readonly to: number;
  readonly weight: number;
  /** Index of the rated element this arc expresses, or -1 for conduction and fixed potentials. */
  readonly rated: number;
}

/**
 * Static voltage check of a gate set: is there a distribution of node
 * potentials that every element can hold?
 *
 * DC nodes sit at their potentials and the output at `outputLevel`. Every element that can conduct
 * forward in this state (a healthy diode, a gated healthy IGBT, a gated healthy MOSFET both ways)
 * imposes V(from) ≤ V(to); a shorted element imposes V(from) = V(to); every rated element that is
 * not faulted imposes |V(from) − V(to)| ≤ rating. These are difference constraints: they have a
 * solution exactly when their constraint graph has no negative cycle, which Bellman–Ford decides
 * (Cormen et al., Introduction to Algorithms, 3rd ed. 2009, §24.4, from memory).
 *
 * When there is no solution the reason names the element whose rating cannot be met: each rated
 * device is tried with its own rating dropped; where the rest is then solvable, the least voltage
 * it must block is −(shortest path) between its terminals. Where no single device explains it
 * (several are overstressed at once), the voltage that conduction alone forces across each device
 * is used. The largest excess wins, ties in netlist order.
 *
 * @param leg - the leg netlist (DC potentials, output node)
 * @param elements - expanded elements (with ratings)
 * @param gates - switches gated on
 * @param faults - element id → fault mode for this phase
 * @param outputLevel - potential of the output node for the current sign considered
 * @returns `{ ok: true }` or the reason with the element, its voltage and rating
 * @example
 * ```ts
 * // NPC with innerUpper open, pattern P, positive current: the output freewheels to N
 * ratingCheck(leg, expandElements(leg), new Set(['outerUpper', 'innerUpper']), new Map([['innerUpper', 'open']]), -1);
 * // { ok: false, reason: 'innerUpper.diode blocks 2 > rating 1', … }
 * ```
 */
export function ratingCheck(
  leg: LegNetlist,
  elements: readonly LegElement[],
  gates: ReadonlySet<string>,
  faults: PhaseFaults,
  outputLevel: number,
): RatingCheck {
  return ratingChecker(leg, elements, faults)(gates, outputLevel);
}

/**
 * {@link ratingCheck} prepared once for a phase: the node numbering and every constraint that does
 * not depend on the gates (DC potentials, diodes, shorts, ratings) are built here, so each call only
 * adds the gated channels and the output potential. The gate-set solver checks dozens of gate sets
 * per phase this way.
 *
 * @param leg - the leg netlist
 * @param elements - expanded elements (with ratings)
 * @param faults - element id → fault mode for this phase
 * @returns a function of the gate set and the output level (and whether to find the device to blame,
 *   default true; else an unsafe state reads `not within ratings`), giving what {@link ratingCheck} gives
 * @example
 * ```ts
 * const check = ratingChecker(leg, expandElements(leg), new Map());
 * check(new Set(['upper']), 1).ok; // true
 * ```
 */
export function ratingChecker(
  leg: LegNetlist,
  elements: readonly LegElement[],
  faults: PhaseFaults,
): (gates: ReadonlySet<string>, outputLevel: number, explainIt?: boolean) => RatingCheck {
  const nodes = new Map<string, number>();
  const id = (n: string): number => {
    let k = nodes.get(n);
    if (k === undefined) {
      k = nodes.size + 1; // 0 is the reference node
      nodes.set(n, k);
    }
    return k;
  };
  const fixed: Arc[] = [];
  const fix = (into: Arc[], n: string, v: number) => {
    into.push({ from: 0, to: id(n), weight: v, rated: -1 }, { from: id(n), to: 0, weight: -v, rated: -1 });
  };
  for (const [n, v] of Object.entries(leg.dcNodes)) fix(fixed, n, v);
  // V(a) ≤ V(b) is x[a] − x[b] ≤ 0: an arc b → a of weight 0
  const notAbove = (into: Arc[], a: string, b: string) => into.push({ from: id(b), to: id(a), weight: 0, rated: -1 });
  const gatedArcs = new Map<string, Arc[]>();
  elements.forEach((e, i) => {
    const mode = faults.get(e.id);
    if (mode === 'open') return;
    if (mode === 'short') {
      notAbove(fixed, e.from, e.to);
      notAbove(fixed, e.to, e.from);
      return;
    }
    if (!e.gated) notAbove(fixed, e.from, e.to);
    else {
      const own: Arc[] = [];
      notAbove(own, e.from, e.to);
      if (e.kind === 'mosfet') notAbove(own, e.to, e.from);
      gatedArcs.set(e.id, own);
    }
    if (e.rating !== undefined) {
      fixed.push({ from: id(e.to), to: id(e.from), weight: e.rating, rated: i }, { from: id(e.from), to: id(e.to), weight: e.rating, rated: i });
    }
  });
  const out = id(leg.output);
  const n = nodes.size + 1;
  const eps = tolerance(leg);
  // the fast path in flat arrays, filled per call: fixed arcs, then the gated ones, then the output
  const cap = fixed.length + [...gatedArcs.values()].reduce((k, l) => k + l.length, 0) + 2;
  const from = new Int32Array(cap);
  const to = new Int32Array(cap);
  const weight = new Float64Array(cap);
  fixed.forEach((a, k) => {
    from[k] = a.from;
    to[k] = a.to;
    weight[k] = a.weight;
  });
  const scratch = scratchFor(n, cap);
  return (gates, outputLevel, explainIt = true) => {
    let m = fixed.length;
    for (const g of gates) {
      for (const a of gatedArcs.get(g) ?? []) {
        from[m] = a.from;
        to[m] = a.to;
        weight[m++] = 0;
      }
    }
    from[m] = 0;
    to[m] = out;
    weight[m++] = outputLevel;
    from[m] = out;
    to[m] = 0;
    weight[m++] = -outputLevel;
    if (feasibleFlat(n, m, from, to, weight, eps, scratch)) return { ok: true };
    if (!explainIt) return NOT_WITHIN;
    const arcs = [...fixed, { from: 0, to: out, weight: outputLevel, rated: -1 }, { from: out, to: 0, weight: -outputLevel, rated: -1 }];
    for (const g of gates) for (const a of gatedArcs.get(g) ?? []) arcs.push(a);
    return explain(arcs, n, eps, nodes, elements, faults);
  };
}

// Queue-based Bellman–Ford (SPFA) on flat arrays of m arcs: the same question as `feasible` (a
// virtual source at distance 0 to every node; a negative cycle ⇔ infeasible), but only the arcs
// out of a node that just moved are looked at again. A node whose distance is witnessed by a path
// of n arcs closes a cycle, which is negative since every step decreased a distance: infeasible.
// On long chains of conducting devices (many-level legs) this settles in a pass or two where the
// round-robin form needed as many rounds as the chain has links.
function feasibleFlat(n: number, m: number, from: Int32Array, to: Int32Array, weight: Float64Array, eps: number, s: Scratch): boolean {
  const { d, len, start, list, queue, queued } = s;
  offsetLists(from, m, n, start, list, s.cursor);
  d.fill(0);
  len.fill(0);
  let head = 0;
  let size = n;
  for (let k = 0; k < n; k++) {
    queue[k] = k;
    queued[k] = 1;
  }
  while (size > 0) {
    const u = queue[head] as number;
    head = head + 1 === n ? 0 : head + 1;
    size--;
    queued[u] = 0;
    const du = d[u] as number;
    for (let a = start[u] as number; a < (start[u + 1] as number); a++) {
      const k = list[a] as number;
      const t = to[k] as number;
      const v = du + (weight[k] as number);
      if (v < (d[t] as number) - eps) {
        d[t] = v;
        const l = (len[u] as number) + 1;
        if (l >= n) return false;
        len[t] = l;
        if (queued[t] === 0) {
          queued[t] = 1;
          queue[(head + size) % n] = t;
          size++;
        }
      }
    }
  }
  return true;
}

interface Scratch {
  readonly d: Float64Array;
  readonly len: Int32Array;
  readonly start: Int32Array;
  readonly cursor: Int32Array;
  readonly list: Int32Array;
  readonly queue: Int32Array;
  readonly queued: Uint8Array;
}

// Why there is no solution: the device to blame and the voltage it would block (see ratingCheck).
function explain(
  arcs: readonly Arc[],
  n: number,
  eps: number,
  nodes: ReadonlyMap<string, number>,
  elements: readonly LegElement[],
  faults: PhaseFaults,
): RatingCheck {
  // Blame a device, not an element: a switch and its antiparallel diode share one rating, so
  // dropping only one of them would leave the other holding the same constraint.
  let worst: { element: LegElement; voltage: number; excess: number } | null = null;
  const byDevice = new Map<string, number[]>();
  elements.forEach((e, i) => {
    if (e.rating === undefined || faults.get(e.id) !== undefined) return;
    byDevice.set(e.device, [...(byDevice.get(e.device) ?? []), i]);
  });
  // forced voltage across a device's terminals when the arcs in `rest` are all that holds
  const forced = (e: LegElement, rest: readonly Arc[]): number | null => {
    const a = nodes.get(e.from) as number;
    const b = nodes.get(e.to) as number;
    const da = shortest(n, rest, a, eps);
    const db = shortest(n, rest, b, eps);
    if (da === null || db === null) return null;
    return Math.max(-(da[b] as number), -(db[a] as number));
  };
  const consider = (e: LegElement, voltage: number | null) => {
    if (voltage === null) return;
    const excess = voltage - (e.rating as number);
    if (excess > eps && (worst === null || excess > worst.excess + eps)) worst = { element: e, voltage, excess };
  };
  // 1. a device alone to blame: the rest is solvable without its rating
  for (const members of byDevice.values()) {
    const rest = arcs.filter((a) => !members.includes(a.rated));
    if (feasible(n, rest, eps)) consider(elements[members[0] as number] as LegElement, forced(elements[members[0] as number] as LegElement, rest));
  }
  // 2. several devices overstressed at once: what conduction alone forces across each
  if (worst === null) {
    const conduction = arcs.filter((a) => a.rated < 0);
    for (const members of byDevice.values())
      consider(elements[members[0] as number] as LegElement, forced(elements[members[0] as number] as LegElement, conduction));
  }
  if (worst === null) {
    return { ok: false, reason: 'no static voltage distribution meets the ratings of the off devices together', element: null, voltage: null, rating: null };
  }
  const w = worst as { element: LegElement; voltage: number };
  const voltage = roundVoltage(w.voltage);
  return {
    ok: false,
    reason: `${w.element.id} blocks ${voltage} > rating ${w.element.rating}`,
    element: w.element.id,
    voltage,
    rating: w.element.rating as number,
  };
}

// Relative to the link span, so that a leg written in other units of potential behaves the same.
function tolerance(leg: LegNetlist): number {
  const pots = Object.values(leg.dcNodes);
  return 1e-9 * Math.max(Math.max(...pots) - Math.min(...pots), Number.MIN_VALUE);
}

// The same question as the checker's fast path, for the explanation's arc lists (a rare path):
// no negative cycle ⇔ a static voltage distribution exists.
function feasible(n: number, arcs: readonly Arc[], eps: number): boolean {
  const m = arcs.length;
  const from = Int32Array.from(arcs, (a) => a.from);
  const to = Int32Array.from(arcs, (a) => a.to);
  const weight = Float64Array.from(arcs, (a) => a.weight);
  return feasibleFlat(n, m, from, to, weight, eps, scratchFor(n, m));
}

function scratchFor(n: number, m: number): Scratch {
  return {
    d: new Float64Array(n),
    len: new Int32Array(n),
    start: new Int32Array(n + 1),
    cursor: new Int32Array(n),
    list: new Int32Array(m),
    queue: new Int32Array(n),
    queued: new Uint8Array(n),
  };
}

// Shortest distances from `src`, or null when a negative cycle is reachable (the rest is unsolvable).
function shortest(n: number, arcs: readonly Arc[], src: number, eps: number): Float64Array | null {
  const d = new Float64Array(n).fill(Infinity);
  d[src] = 0;
  for (let round = 0; round < n; round++) {
    let changed = false;
    for (const a of arcs) {
      const from = d[a.from] as number;
      if (from === Infinity) continue;
      const v = from + a.weight;
      if (v < (d[a.to] as number) - eps) {
        d[a.to] = v;
        changed = true;
      }
    }
    if (!changed) return d;
  }
  return null;
}

function roundVoltage(v: number): number {
  return Number(v.toPrecision(6));
}

/**
 * A rating check's reason in words with units: `outerUpper blocks 2 > rating 1` becomes
 * `outerUpper would block 2 × Vdc/2 (rating 1 × Vdc/2)`; other reasons are returned as they are.
 *
 * @param reason - a reason from {@link ratingCheck}
 * @returns the reason for a reader
 * @example
 * ```ts
 * reasonInWords('outerUpper blocks 2 > rating 1'); // 'outerUpper would block 2 × Vdc/2 (rating 1 × Vdc/2)'
 * ```
 */
export function reasonInWords(reason: string): string {
  const m = /^(\S+) blocks (\S+) > rating (\S+)$/.exec(reason);
  return m ? `${m[1]} would block ${m[2]} × Vdc/2 (rating ${m[3]} × Vdc/2)` : reason;
}
