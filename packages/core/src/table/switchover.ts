import { analyseLeg, faultTexts, type AnalyseLegOptions } from '../leg/analyseLeg.js';
import { CAUTIONS } from '../shared/cautions.js';
import type { CurrentSign } from '../leg/conduction.js';
import { diagramAtlas, type DiagramAtlas } from '../vectors/diagramAtlas.js';
import { HexsalvageInputError } from '../shared/errors.js';
import { gatedDeviceIds } from '../netlist/expandElements.js';
import { usableLevel, type GateSetSolver } from '../leg/gateSetSolver.js';
import { formatFault, PHASES, type Phase } from '../netlist/faults.js';
import type { LegTable, PatternResult } from '../leg/legTable.js';
import { planLimits } from '../limits/planLimits.js';
import { reasonInWords } from '../leg/ratingCheck.js';
import { runtimeStream } from './runtimeStream.js';
import { switchingTableFromAtlas } from './switchingTable.js';
import { requireNumber, requireObject } from '../shared/validate.js';

/** What a healthy pattern does once the fault is present, for one current sign. */
export type SwitchoverClass = 'same' | 'deviates' | 'unsafe';

/** One healthy pattern and sign under the fault, with the level and the reason. */
export interface SwitchoverCell {
  readonly class: SwitchoverClass;
  /** The level it gave healthy and gives now (`null`: not usable). */
  readonly healthyLevel: number | null;
  readonly level: number | null;
  /** For `unsafe`: why (shoot-through, interruption, a device over its rating), in words. */
  readonly reason?: string;
}

/** The healthy runtime at an operating point, run with the fault present (before the diagnosis acts). */
export interface SwitchoverRun {
  readonly m: number;
  readonly loadAngleDeg: number;
  readonly f1: number;
  readonly fsw: number;
  /** Segments (states held) in one fundamental period, and how many of them are unsafe under the fault. */
  readonly states: number;
  readonly unsafeStates: number;
  /** States that give another level than commanded (distortion). */
  readonly deviatingStates: number;
  /** Share of the period spent in unsafe states. */
  readonly unsafeShare: number;
  /** Longest stretch without an unsafe state, seconds (the whole period when there is none). */
  readonly longestSafeS: number;
  /** The first unsafe state: when (s from θ = 0), phase, pattern, sign and why; `null` when none. */
  readonly firstUnsafe: { readonly tS: number; readonly phase: Phase; readonly pattern: string; readonly sign: CurrentSign; readonly reason: string } | null;
  /** The verdict in words. */
  readonly verdict: string;
  /** `none` (nothing changes), `distortion` (levels deviate, no unsafe state), `hardware` (unsafe states: protection in hardware). */
  readonly urgency: 'none' | 'distortion' | 'hardware';
}

/** The way from one healthy state into the degraded table after detection, for one sign. */
export interface SwitchoverExit {
  readonly phase: Phase;
  readonly pattern: string;
  readonly sign: CurrentSign;
  /** Single gate actions, in order (`turn X off`, `turn Y on`), ending in a pattern of the degraded table; `null` when none exists. */
  readonly steps: readonly string[] | null;
  /** The degraded pattern reached, or `null`. */
  readonly to: string | null;
  /** Where no way exists: what blocking every gate of the phase does with the current, in words. */
  readonly blockAll?: string;
}

/** The `switchover` document. */
export interface Switchover {
  readonly topology: string;
  readonly faults: readonly string[];
  /** Per phase, per healthy pattern, per current sign: same, deviates or unsafe. */
  readonly patterns: Readonly<Record<Phase, Readonly<Record<string, Readonly<Record<CurrentSign, SwitchoverClass>>>>>>;
  /** The same, with levels and reasons. */
  readonly details: Readonly<Record<Phase, Readonly<Record<string, Readonly<Record<CurrentSign, SwitchoverCell>>>>>>;
  /** The healthy runtime at the operating point, when one is given. */
  readonly run: SwitchoverRun | null;
  /** From every healthy pattern and sign of a faulted phase, the safe way into the degraded table. */
  readonly exits: readonly SwitchoverExit[];
  readonly cautions: readonly string[];
}

/** Options of {@link switchover}. */
export interface SwitchoverOptions extends AnalyseLegOptions {
  /** Operating point of the healthy runtime (all four or none). */
  readonly m?: number;
  readonly loadAngleDeg?: number;
  readonly polarityMarginDeg?: number;
  readonly f1?: number;
  readonly fsw?: number;
}

/** The most gate sets the search for a way out visits per state and sign (bounded work). */
export const SWITCHOVER_SEARCH_LIMIT = 1 << 14;

/**
 * What happens between a fault and its diagnosis, and the way out after it: every healthy pattern of
 * every phase classified per current sign once the fault is present (`same`, `deviates`, `unsafe`);
 * with an operating point, the healthy runtime over one fundamental period run with the fault present
 * (how many unsafe states, the longest stretch without one, and a verdict in words); and from every
 * healthy state of a faulted phase, the single gate actions through usable states into a pattern of
 * the degraded table (or what blocking every gate does, where no way exists).
 *
 * @param options - the leg, the faults (alternatives allowed), the rules, and optionally `m`,
 *   `loadAngleDeg`, `f1`, `fsw` (`polarityMarginDeg` default 0)
 * @returns the switch-over document
 * @throws HexsalvageInputError on bad options, a bypass (not a switch-over case), or an m above the
 *   healthy limit
 * @example
 * ```ts
 * switchover({ topology: 'npc', faults: ['a.clampUpper'] }).patterns.a.O['+']; // 'unsafe'
 * ```
 */
export function switchover(options: SwitchoverOptions): Switchover {
  requireObject(options, 'switchover', 'an options object { topology, faults, m?, loadAngleDeg?, f1?, fsw? }');
  if (options.bypass !== undefined)
    throw new HexsalvageInputError(
      'option',
      'switchover',
      'bypass',
      'no bypass (the switch-over is from the healthy table into the degraded one)',
      options.bypass,
    );
  const atlas = diagramAtlas(options);
  const analysis = atlas.analysis;
  const details = {} as Record<Phase, Record<string, Record<CurrentSign, SwitchoverCell>>>;
  const patterns = {} as Record<Phase, Record<string, Record<CurrentSign, SwitchoverClass>>>;
  // under an ambiguous diagnosis each configuration is judged on its own and the worst case kept
  // (a pattern that deviates in one and is unchanged in another deviates)
  const configs =
    analysis.configurations.length > 1
      ? analysis.configurations.map((c) => ({ label: c.map(formatFault).join(', '), phases: analyseLeg({ ...options, faults: c.map(formatFault) }).phases }))
      : [{ label: '', phases: analysis.phases }];
  for (const ph of PHASES) {
    details[ph] = {};
    patterns[ph] = {};
    analysis.healthy.patterns.forEach((h, i) => {
      const cell = (s: CurrentSign) => worstOf(configs.map((c) => ({ label: c.label, cell: classify(h, c.phases[ph].patterns[i] as PatternResult, s) })));
      const row = { '+': cell('+'), '-': cell('-') };
      (details[ph] as Record<string, Record<CurrentSign, SwitchoverCell>>)[h.name] = row;
      (patterns[ph] as Record<string, Record<CurrentSign, SwitchoverClass>>)[h.name] = { '+': row['+'].class, '-': row['-'].class };
    });
  }
  const run = operatingRun(options, details);
  const faulted = PHASES.filter((ph) => analysis.faults.some((x) => x.phase === ph));
  const switches = gatedDeviceIds(analysis.leg);
  const exits = faulted.flatMap((ph) =>
    analysis.healthy.patterns.flatMap((h) =>
      (['+', '-'] as const)
        .filter((s) => h.status === 'allowed' && h.bySign[s].level !== null)
        .map((s) => exitFrom(ph, h, s, analysis.phases[ph], switches, analysis.leg.output)),
    ),
  );
  return { topology: analysis.topology, faults: faultTexts(analysis), patterns, details, run, exits, cautions: CAUTIONS };
}

const RANK: Readonly<Record<SwitchoverClass, number>> = { same: 0, deviates: 1, unsafe: 2 };

// The worst of the configurations' cells, its reason naming the configuration.
function worstOf(cells: readonly { label: string; cell: SwitchoverCell }[]): SwitchoverCell {
  let w = cells[0] as { label: string; cell: SwitchoverCell };
  for (const c of cells) if (RANK[c.cell.class] > RANK[w.cell.class]) w = c;
  if (cells.length === 1 || w.cell.class === 'same') return w.cell;
  const reason = w.cell.reason ?? `gives ${w.cell.level} × Vdc/2 instead of ${w.cell.healthyLevel} × Vdc/2`;
  return { ...w.cell, reason: `${reason} if ${w.label}` };
}

// A healthy pattern and sign against the faulted table.
function classify(h: PatternResult, f: PatternResult, s: CurrentSign): SwitchoverCell {
  const healthyLevel = h.status === 'allowed' ? h.bySign[s].level : null;
  if (f.status === 'forbidden')
    return {
      class: 'unsafe',
      healthyLevel,
      level: null,
      reason: `shoot-through ${f.shootThrough.from}→${f.shootThrough.to} via ${f.shootThrough.path.join(', ')}`,
    };
  const level = f.bySign[s].level;
  if (level === healthyLevel) return { class: 'same', healthyLevel, level };
  if (level === null)
    return {
      class: 'unsafe',
      healthyLevel,
      level,
      reason: f.unsafe[s] ? reasonInWords(f.unsafe[s] as string) : 'the current finds no path: it is interrupted',
    };
  return { class: 'deviates', healthyLevel, level };
}

// The healthy runtime over one fundamental period, each state judged under the fault.
function operatingRun(o: SwitchoverOptions, details: Record<Phase, Record<string, Record<CurrentSign, SwitchoverCell>>>): SwitchoverRun | null {
  const given = [o.m, o.loadAngleDeg, o.f1, o.fsw].filter((x) => x !== undefined).length;
  if (given === 0) return null;
  if (o.m === undefined || o.f1 === undefined || o.fsw === undefined)
    throw new HexsalvageInputError(
      'option',
      'switchover',
      o.m === undefined ? 'm' : o.f1 === undefined ? 'f1' : 'fsw',
      'm, f1 and fsw together (the operating point), or none of them',
      undefined,
    );
  const m = requireNumber(o.m, 'switchover', 'm', { min: 0 });
  const phi = requireNumber(o.loadAngleDeg ?? 0, 'switchover', 'loadAngleDeg', { min: -180, max: 180 });
  const delta = requireNumber(o.polarityMarginDeg ?? 0, 'switchover', 'polarityMarginDeg', { min: 0, max: 60, openMax: true });
  const f1 = requireNumber(o.f1, 'switchover', 'f1', { min: 0, openMin: true, max: 1e5 });
  const fsw = requireNumber(o.fsw, 'switchover', 'fsw', { min: 6 * f1, max: 20000 * f1 });
  const ratio = Math.round(fsw / f1);
  const healthy: DiagramAtlas = diagramAtlas({
    topology: o.topology,
    faults: [],
    ...(o.ignoreRatings === undefined ? {} : { ignoreRatings: o.ignoreRatings }),
    ...(o.levelSteps === undefined ? {} : { levelSteps: o.levelSteps }),
  });
  const limit = planLimits(healthy, phi, delta).mMax;
  if (m > limit + 1e-12)
    throw new HexsalvageInputError(
      'option',
      'switchover',
      'm',
      `at most the healthy limit ${limit.toFixed(6)} (the healthy table runs until the diagnosis acts)`,
      m,
    );
  const stream = runtimeStream(switchingTableFromAtlas(healthy), { m, loadAngleDeg: phi, polarityMarginDeg: delta, frequencyRatio: ratio });
  const T = 1 / f1;
  const psi = (phi * Math.PI) / 180;
  let unsafeStates = 0;
  let deviating = 0;
  let unsafeTime = 0;
  let first: SwitchoverRun['firstUnsafe'] = null;
  const bad: [number, number][] = [];
  for (const seg of stream.segments) {
    const mid = seg.t + seg.dt / 2;
    let isUnsafe = false;
    let deviates = false;
    for (let k = 0; k < 3; k++) {
      const ph = PHASES[k] as Phase;
      const s: CurrentSign = Math.cos(2 * Math.PI * mid - psi - (k * 2 * Math.PI) / 3) >= 0 ? '+' : '-';
      const cell = details[ph][seg.patterns[k] as string]?.[s];
      if (!cell) continue;
      if (cell.class === 'unsafe') {
        isUnsafe = true;
        first ??= { tS: seg.t * T, phase: ph, pattern: seg.patterns[k] as string, sign: s, reason: cell.reason ?? '' };
      } else if (cell.class === 'deviates') deviates = true;
    }
    if (isUnsafe) {
      unsafeStates++;
      unsafeTime += seg.dt;
      bad.push([seg.t, seg.t + seg.dt]);
    } else if (deviates) deviating++;
  }
  const longest = bad.length === 0 ? 1 : longestGap(bad);
  const period = 1 / ratio;
  // an unsafe state is due within one switching period of a fault that strikes while such states
  // are commanded, whatever the diagnosis does: any unsafe state calls for protection in hardware
  const urgency: SwitchoverRun['urgency'] = bad.length === 0 ? (deviating === 0 ? 'none' : 'distortion') : 'hardware';
  const ms = (x: number) => `${(x * T * 1000).toFixed(2)} ms`;
  const verdict = {
    none: 'no effect at this operating point: every state the healthy table commands gives its level',
    distortion: `distortion only: ${deviating} of ${stream.segments.length} states give another level, none is unsafe; the diagnosis may take its time`,
    hardware: `the healthy table overstresses a device or breaks a current within one switching period when the fault strikes while such states are due (${unsafeStates} of ${stream.segments.length} states per fundamental period are unsafe; the longest stretch without one is ${ms(longest)}${longest <= period + 1e-12 ? ', one switching period' : ''}): protection must act in hardware`,
  }[urgency];
  return {
    m,
    loadAngleDeg: phi,
    f1,
    fsw,
    states: stream.segments.length,
    unsafeStates,
    deviatingStates: deviating,
    unsafeShare: unsafeTime,
    longestSafeS: longest * T,
    firstUnsafe: first,
    verdict,
    urgency,
  };
}

// The longest stretch of the periodic time axis [0, 1) outside the given intervals.
function longestGap(bad: readonly [number, number][]): number {
  const sorted = [...bad].sort((x, y) => x[0] - y[0]);
  let longest = 0;
  for (let i = 0; i < sorted.length; i++) {
    const end = (sorted[i] as [number, number])[1];
    const next = i + 1 < sorted.length ? (sorted[i + 1] as [number, number])[0] : (sorted[0] as [number, number])[0] + 1;
    longest = Math.max(longest, next - end);
  }
  return longest;
}

// From a healthy pattern's gates, single gate actions through states usable for the sign into a
// pattern the degraded table uses for the sign (breadth first: the fewest actions).
function exitFrom(phase: Phase, h: PatternResult, sign: CurrentSign, table: LegTable, switches: readonly string[], output: string): SwitchoverExit {
  const targets = new Map<string, string>();
  for (const p of table.patterns) if (p.status === 'allowed' && p.bySign[sign].level !== null) targets.set(key(p.gates), p.name);
  const start = [...h.gates].sort();
  const here = targets.get(key(start));
  if (here !== undefined) return { phase, pattern: h.name, sign, steps: [], to: here };
  const solve = table.step;
  const seen = new Map<string, { from: string | null; act: string }>([[key(start), { from: null, act: '' }]]);
  let frontier = [start];
  while (frontier.length > 0 && seen.size < SWITCHOVER_SEARCH_LIMIT) {
    const next: string[][] = [];
    for (const gates of frontier) {
      for (const g of switches) {
        const on = gates.includes(g);
        const after = (on ? gates.filter((x) => x !== g) : [...gates, g]).sort();
        const k = key(after);
        if (seen.has(k) || !usable(solve, after, sign)) continue;
        seen.set(k, { from: key(gates), act: `turn ${g} ${on ? 'off' : 'on'}` });
        const name = targets.get(k);
        if (name !== undefined) return { phase, pattern: h.name, sign, steps: trace(seen, k), to: name };
        next.push(after);
      }
    }
    frontier = next;
  }
  return { phase, pattern: h.name, sign, steps: null, to: null, blockAll: blockAll(solve, sign, output) };
}

const key = (gates: readonly string[]) => [...gates].sort().join('+');

function usable(solve: GateSetSolver, gates: readonly string[], sign: CurrentSign): boolean {
  return usableLevel(solve(gates), sign) !== null;
}

function trace(seen: ReadonlyMap<string, { from: string | null; act: string }>, k: string): string[] {
  const acts: string[] = [];
  let at: string | null = k;
  while (at !== null) {
    const s = seen.get(at) as { from: string | null; act: string };
    if (s.from === null) break;
    acts.push(s.act);
    at = s.from;
  }
  return acts.reverse();
}

// What the current does with every gate of the phase off.
function blockAll(solve: GateSetSolver, sign: CurrentSign, output: string): string {
  const o = solve([]);
  if (o.status === 'forbidden')
    return `blocking every gate still shoots through ${o.shootThrough.from}→${o.shootThrough.to} (via the failed element): only the DC-link protection can act`;
  const l = o.bySign[sign].level;
  if (l !== null)
    return `no safe way through single gate actions; blocking every gate, the current (i ${sign === '+' ? '> 0' : '< 0'}) freewheels through the diodes and holds ${output} at ${l} × Vdc/2 until it decays`;
  const why = o.unsafe[sign];
  return `no safe way through single gate actions; blocking every gate, the current (i ${sign === '+' ? '> 0' : '< 0'}) ${why ? `flows but ${reasonInWords(why)}` : 'finds no path: it is interrupted (the inductive load drives an overvoltage a snubber or clamp must take)'}`;
}
