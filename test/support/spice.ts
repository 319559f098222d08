import { execFile, spawnSync } from 'node:child_process';
import { availableParallelism } from 'node:os';
import { promisify } from 'node:util';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { type LegNetlist, type PhaseFaults } from '@hexsalvage/core';
import { expandElements } from '@hexsalvage/core/internal';

/** Volts per unit of Vdc/2 in the circuits (diode drops stay small beside a level step). */
export const VOLTS_PER_UNIT = 100;

/** One operating point of one phase leg: gates, faults and a DC current at the output. */
export interface SpiceCase {
  readonly leg: LegNetlist;
  readonly faults: PhaseFaults;
  readonly gates: readonly string[];
  /** Output current, A: positive out of the leg into the load (contract sign `+`). */
  readonly current: number;
}

/** What ngspice found at one operating point. */
export interface SpiceResult {
  readonly out: number;
  /** Node voltages by netlist node name. */
  readonly nodes: ReadonlyMap<string, number>;
  /** Current through each element, A, positive from its `from` node to its `to` node. */
  readonly elements: ReadonlyMap<string, number>;
  /** Current each DC source delivers, A (its largest magnitude tells a shoot-through). */
  readonly sourceMax: number;
}

/** Whether Debian's ngspice is on this machine (tests that need it skip, saying so, outside CI). */
export const HAS_NGSPICE = spawnSync('ngspice', ['-v'], { encoding: 'utf8' }).status === 0;

const run = promisify(execFile);

/**
 * Solves operating points with ngspice, a few independent circuits per netlist, netlists in
 * parallel (one per core); a netlist that does not converge is solved again circuit by circuit.
 * Each element: a zero-volt ammeter in series with its conduction model: a healthy diode a diode,
 * a gated IGBT a forward-only path, a gated MOSFET channel or a shorted element 1 mΩ, an open or
 * ungated element nothing; a 1 MΩ sharing resistor across every element position; the DC nodes
 * are voltage sources at their potentials behind 0.1 Ω (so that a shoot-through stays finite), the
 * output a DC current source with 100 kΩ beside it.
 *
 * @param cases - operating points
 * @returns one result per case (NaN voltages where ngspice found none)
 */
export async function solveWithNgspice(cases: readonly SpiceCase[]): Promise<SpiceResult[]> {
  const out: SpiceResult[] = new Array(cases.length);
  const batches: number[][] = [];
  for (let i = 0; i < cases.length; i += 12) batches.push(Array.from({ length: Math.min(12, cases.length - i) }, (_, j) => i + j));
  const dir = mkdtempSync(join(tmpdir(), 'hexsalvage-spice-'));
  let file = 0;
  const solve = async (ids: number[]): Promise<boolean> => {
    const { text, meta } = netlist(ids.map((i) => cases[i] as SpiceCase));
    const f = join(dir, `c${file++}.cir`);
    writeFileSync(f, text);
    try {
      // ngspice -b exits 1 when the analysis runs from a .control block ("no simulations run"):
      // what counts is what it printed
      const stdout = await run('ngspice', ['-b', f], { encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 }).then(
        (r) => r.stdout,
        (e: { stdout?: string }) => e.stdout ?? '',
      );
      const values = new Map<string, number>();
      for (const m of stdout.matchAll(/^(\S+) = (\S+)$/gm)) values.set((m[1] as string).toLowerCase(), Number(m[2]));
      if (values.size === 0) return false;
      ids.forEach((id, ci) => {
        out[id] = read(values, meta[ci] as Meta, ci, cases[id] as SpiceCase);
      });
      return true;
    } catch {
      return false;
    }
  };
  const queue = [...batches];
  const worker = async () => {
    for (let b = queue.shift(); b; b = queue.shift()) {
      if (await solve(b)) continue;
      for (const id of b) {
        if (!(await solve([id]))) out[id] = { out: NaN, nodes: new Map(), elements: new Map(), sourceMax: NaN };
      }
    }
  };
  try {
    await Promise.all(Array.from({ length: Math.max(1, availableParallelism()) }, worker));
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  return out;
}

interface Meta {
  readonly els: ReturnType<typeof expandElements>;
  readonly nodeNames: Map<string, string>;
}

function netlist(cases: readonly SpiceCase[]): { text: string; meta: Meta[] } {
  const lines: string[] = ['hexsalvage leg cross-check'];
  const meta = cases.map((c, ci) => {
    const els = expandElements(c.leg);
    const nodeNames = new Map<string, string>();
    const node = (n: string) => {
      let k = nodeNames.get(n);
      if (!k) {
        k = `c${ci}n${nodeNames.size}`;
        nodeNames.set(n, k);
      }
      return k;
    };
    for (const [name, v] of Object.entries(c.leg.dcNodes)) {
      const k = node(name);
      lines.push(`V${ci}dc${k} ${k}s 0 DC ${v * VOLTS_PER_UNIT}`, `R${ci}dc${k} ${k}s ${k} 0.1`);
    }
    const gated = new Set(c.gates);
    els.forEach((e, j) => {
      const a = node(e.from);
      const b = node(e.to);
      lines.push(`R${ci}s${j} ${a} ${b} 1e6`);
      const mode = c.faults.get(e.id);
      if (mode === 'open') return;
      const mid = `c${ci}m${j}`;
      const amm = () => lines.push(`V${ci}a${j} ${a} ${mid} DC 0`);
      if (mode === 'short' || (e.gated && e.kind === 'mosfet' && gated.has(e.id))) {
        amm();
        lines.push(`R${ci}c${j} ${mid} ${b} 1e-3`);
      } else if (!e.gated || gated.has(e.id)) {
        amm();
        lines.push(`D${ci}c${j} ${mid} ${b} DI`);
      }
    });
    const out = node(c.leg.output);
    // the load current, with 100 kΩ beside it so that an interrupted current stops at 100 kV
    lines.push(c.current >= 0 ? `I${ci}o ${out} 0 DC ${c.current}` : `I${ci}o 0 ${out} DC ${-c.current}`, `R${ci}o ${out} 0 1e5`);
    return { els, nodeNames };
  });
  // looser tolerances and a shunt across every node: interrupted currents leave kilovolt nodes
  // behind reverse-biased junctions, where the default Newton settings do not converge
  lines.push(
    '.options abstol=1e-9 vntol=1e-3 reltol=1e-3 itl1=1000 rshunt=1e12',
    '.model DI D(IS=1e-14 N=1 RS=1e-3)',
    '.control',
    'op',
    'print all',
    '.endc',
    '.end',
  );
  return { text: `${lines.join('\n')}\n`, meta };
}

function read(values: ReadonlyMap<string, number>, mt: Meta, ci: number, c: SpiceCase): SpiceResult {
  const nodes = new Map([...mt.nodeNames].map(([name, k]) => [name, values.get(k.toLowerCase()) ?? NaN] as const));
  const elements = new Map(mt.els.map((e, j) => [e.id, values.get(`v${ci}a${j}#branch`) ?? 0] as const));
  let sourceMax = 0;
  for (const k of mt.nodeNames.values()) {
    const i = values.get(`v${ci}dc${k}#branch`.toLowerCase());
    if (i !== undefined) sourceMax = Math.max(sourceMax, Math.abs(i));
  }
  return { out: nodes.get(c.leg.output) ?? NaN, nodes, elements, sourceMax };
}
