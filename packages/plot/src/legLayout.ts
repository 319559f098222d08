import type { LegNetlist } from '@hexsalvage/core';

/** Node positions of a leg schematic in unit coordinates (x: 0 DC side … 1 output; y: up = higher potential). */
export type LegLayout = ReadonlyMap<string, readonly [number, number]>;

/**
 * Places the nodes of a leg for drawing, from the netlist alone.
 *
 * DC nodes form the left column at their potentials; the output sits on the right at the mean
 * potential; an internal node sits, left to right, at its share of the graph distance between the
 * DC nodes and the output, and, up and down, at the average height of its neighbours (a few
 * rounds of relaxation), so chains of switches fall between the potentials they connect.
 *
 * @param leg - the leg netlist
 * @returns node → [x, y], x in [0, 1], y in potential units
 * @example
 * ```ts
 * legLayout(builtinLeg('npc')).get('X'); // [0.5, 0.33…]
 * ```
 */
export function legLayout(leg: LegNetlist): LegLayout {
  const adj = new Map<string, Set<string>>();
  const link = (a: string, b: string) => {
    if (!adj.has(a)) adj.set(a, new Set());
    adj.get(a)!.add(b);
  };
  for (const d of leg.devices) {
    link(d.from, d.to);
    link(d.to, d.from);
  }
  const dc = Object.keys(leg.dcNodes);
  const dist = (sources: string[]) => {
    const out = new Map(sources.map((s) => [s, 0]));
    const queue = [...sources];
    while (queue.length) {
      const v = queue.shift() as string;
      for (const w of adj.get(v) ?? [])
        if (!out.has(w)) {
          out.set(w, (out.get(v) as number) + 1);
          queue.push(w);
        }
    }
    return out;
  };
  const fromDc = dist(dc);
  const fromOut = dist([leg.output]);
  const pots = Object.values(leg.dcNodes);
  const mid = (Math.max(...pots) + Math.min(...pots)) / 2;
  const pos = new Map<string, [number, number]>();
  for (const node of adj.keys()) {
    if (node in leg.dcNodes) pos.set(node, [0, leg.dcNodes[node] as number]);
    else if (node === leg.output) pos.set(node, [1, mid]);
    else {
      const a = fromDc.get(node) ?? 1;
      const b = fromOut.get(node) ?? 1;
      pos.set(node, [a / (a + b), mid]);
    }
  }
  const free = [...adj.keys()].filter((v) => !(v in leg.dcNodes) && v !== leg.output).sort();
  for (let round = 0; round < 60; round++) {
    for (const v of free) {
      const ns = [...(adj.get(v) ?? [])];
      const y = ns.reduce((s, w) => s + (pos.get(w) as [number, number])[1], 0) / ns.length;
      (pos.get(v) as [number, number])[1] = y;
    }
  }
  return pos;
}
