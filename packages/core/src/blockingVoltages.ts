import type { ConductionEdge } from './conduction.js';
import type { LegNetlist } from './netlist.js';

/**
 * Worst-case voltage each device may have to block, from static bounds on node potentials.
 *
 * With ideal devices every conducting element u→v forces V(u) ≤ V(v) (it would conduct
 * otherwise), DC nodes sit at their potentials and the output at the level it takes. Bounds
 * [lo, hi] of the other nodes start at the DC-link extremes and are tightened along those
 * constraints until nothing changes. A device then blocks at most
 * max(hi(from) − lo(to), hi(to) − lo(from)). A node whose bounds stay wide is "unclamped": nothing
 * in the circuit fixes how the link voltage shares across the off devices beside it.
 *
 * @param leg - the leg netlist
 * @param edges - conduction edges of the gate set (faults applied)
 * @param outputLevel - potential of the output node
 * @returns device id → worst-case blocking voltage, units of Vdc/2
 * @example
 * ```ts
 * blockingVoltages(leg, conductionEdges(elements, new Set(), new Map()), -1).get('innerUpper'); // 2 on an ANPC leg
 * ```
 */
export function blockingVoltages(leg: LegNetlist, edges: readonly ConductionEdge[], outputLevel: number): Map<string, number> {
  const pots = Object.values(leg.dcNodes);
  const vmin = Math.min(...pots);
  const vmax = Math.max(...pots);
  const lo = new Map<string, number>();
  const hi = new Map<string, number>();
  for (const d of leg.devices) for (const n of [d.from, d.to]) {
    lo.set(n, vmin);
    hi.set(n, vmax);
  }
  const fixed = new Map<string, number>([...Object.entries(leg.dcNodes), [leg.output, outputLevel]]);
  for (const [n, v] of fixed) {
    lo.set(n, v);
    hi.set(n, v);
  }
  // Bellman-Ford style relaxation; bounds only move inwards, so it ends within |nodes| rounds.
  for (let round = 0, changed = true; changed && round <= lo.size + 1; round++) {
    changed = false;
    for (const e of edges) {
      if (!fixed.has(e.to) && (lo.get(e.from) as number) > (lo.get(e.to) as number)) {
        lo.set(e.to, lo.get(e.from) as number);
        changed = true;
      }
      if (!fixed.has(e.from) && (hi.get(e.to) as number) < (hi.get(e.from) as number)) {
        hi.set(e.from, hi.get(e.to) as number);
        changed = true;
      }
    }
  }
  const out = new Map<string, number>();
  for (const d of leg.devices) {
    const v = Math.max((hi.get(d.from) as number) - (lo.get(d.to) as number), (hi.get(d.to) as number) - (lo.get(d.from) as number), 0);
    out.set(d.id, v);
  }
  return out;
}
