import { CAUTIONS } from '../shared/cautions.js';
import type { CurrentSign } from '../leg/conduction.js';
import { currentPaths, type CurrentPath } from './currentPaths.js';
import { runtimeOptions, type SequenceMode } from '../table/createRuntime.js';
import { conductionLoss, DEMO_DEVICES, elementParameters, eventEnergy, type DeviceParameterSet, type ElementParameters } from './deviceLosses.js';
import { diagramAtlas, type DiagramAtlas } from '../vectors/diagramAtlas.js';
import { HexsalvageInputError } from '../shared/errors.js';
import { expandElements, hasMidpoint, legLevels } from '../netlist/expandElements.js';
import { PHASES, type FaultMode, type PhaseFaults } from '../netlist/faults.js';
import type { LegElement, LegNetlist } from '../netlist/netlist.js';
import { planFromAtlas } from '../limits/planRemedial.js';
import { requireVdc } from '../shared/physicalUnits.js';
import type { LimitRuleOptions } from '../leg/rules.js';
import { isHeld, runtimeStream, UPDATE_MODES, type StreamEntry, type StreamSegment, type UpdateMode } from '../table/runtimeStream.js';
import { switchingTableFromAtlas } from '../table/switchingTable.js';
import { requireNumber, requireObject } from '../shared/validate.js';

/** Options of {@link simulatePeriod}. */
export interface SimulateOptions extends LimitRuleOptions {
  readonly topology: unknown;
  readonly faults?: readonly string[];
  /** Modulation index (units of Vdc/2), at most the plan's mMax at the load angle. */
  readonly m: number;
  /** Load angle φ, degrees: the currents lag the voltage reference by φ. */
  readonly loadAngleDeg: number;
  /** Polarity margin δ, degrees. Default 0. */
  readonly polarityMarginDeg?: number;
  /** Total DC-link voltage, V. */
  readonly vdc: number;
  /** Peak of the sinusoidal phase currents, A. */
  readonly currentPeak: number;
  /** Fundamental frequency, Hz. */
  readonly f1: number;
  /** Switching frequency, Hz: fsw/f1 rounded is the number of switching periods per fundamental (6 to {@link MAX_SIMULATED_PERIODS}). */
  readonly fsw: number;
  /** Device loss parameters. Default: the invented demo values {@link DEMO_DEVICES}. */
  readonly devices?: DeviceParameterSet;
  /** Capacitance of each half of the DC link, F: gives the midpoint ripple in volts. */
  readonly capacitance?: number;
  /** Highest harmonic order listed. Default 4·fsw/f1 + 2 (the contract asks for at least 4·fsw/f1). */
  readonly maxHarmonic?: number;
  /** Dead time, seconds (default 0, at most a tenth of the switching period): each phase sits in the intermediate gate set of every change for this long. */
  readonly deadTime?: number;
  /** The runtime's sequence (default `continuous`). */
  readonly sequence?: SequenceMode;
  /** The runtime's midpoint balancing (default `on`). */
  readonly balance?: 'on' | 'off';
  /** When the runtime samples (default `half`: at the carrier's peak and valley, which keeps half-wave symmetry for any fsw/f1). */
  readonly update?: UpdateMode;
}

/** Losses and currents of one element over the fundamental period. */
export interface DeviceResult {
  readonly avgCurrent: number;
  readonly rmsCurrent: number;
  readonly conductionLoss: number;
  readonly switchingLoss: number;
  /** The element's fault, where it has one: an open element carries nothing; a shorted one's conduction loss is indicative and it is never charged switching loss. */
  readonly failed?: FaultMode;
}

/** The results for one leg (faulted or healthy) at the same operating point. */
export interface SimulationResult {
  readonly lineVoltage: {
    readonly fundamentalPeak: number;
    readonly thd: number;
    readonly wthd: number;
    readonly rms: number;
    readonly harmonics: readonly (readonly [number, number])[];
  };
  /** Per element `phase.element`, every element of every phase. */
  readonly devices: Readonly<Record<string, DeviceResult>>;
  /** The surviving element with the largest total loss, and that loss in watts. */
  readonly hottest: { readonly device: string; readonly loss: number };
  /** The midpoint: ripple (volts, with a capacitance), charge swing and average current into the node. */
  readonly midpoint: { readonly ripplePkPk: number | null; readonly chargePkPkAs: number | null; readonly averageCurrent: number | null };
  /**
   * Phase-seconds over the period in which a phase's current had the other sign than the polarity
   * its update was planned for, so that its state gave another level than planned (a polarity
   * margin avoids it; see docs).
   */
  readonly wrongSignTime: number;
  /** Phase-seconds in which a phase's state gave no path for the current's actual sign (the current would be interrupted). */
  readonly interruptedTime: number;
  /** Line-frequency devices (`switching: line`) charged switching loss, with that loss, W. */
  readonly lineDevicesAtPwm: readonly { readonly device: string; readonly switchingLoss: number }[];
  /** The runtime's steps of the period (from `runtimeStream`). */
  readonly runtime: { readonly multiPhaseSteps: number; readonly chainSteps: number; readonly heldPeriods: number };
}

/** The simulation document (`simulate --json`). */
export interface Simulation extends SimulationResult {
  readonly topology: string;
  readonly faults: readonly string[];
  readonly m: number;
  readonly loadAngleDeg: number;
  readonly vdc: number;
  readonly currentPeak: number;
  readonly f1: number;
  readonly fsw: number;
  readonly periods: number;
  /** Dead time, seconds. */
  readonly deadTime: number;
  readonly sequence: SequenceMode;
  readonly balance: 'on' | 'off';
  readonly update: UpdateMode;
  readonly deviceParameters: string;
  readonly healthy: SimulationResult;
  /**
   * Largest fraction of the given peak current at which no surviving device of the faulted leg
   * loses more than the hottest device of the healthy leg at full current (with thermal
   * resistances: rises more in temperature); capped at 1. `assumption` says which comparison was made.
   */
  readonly currentDerating: { readonly factor: number; readonly limitingDevice: string; readonly assumption: string };
  readonly cautions: readonly string[];
}

/** One piece of the period with every phase's gate set, current sign and conducting path constant. */
export interface WaveformSegment {
  readonly t0: number;
  readonly t1: number;
  /** Phase levels a, b, c, volts from the midpoint potential (what the leg gives for the actual current sign). */
  readonly phaseVolts: readonly [number, number, number];
  /** Midpoint voltage at t0 (volts; 0 without a capacitance or midpoint). */
  readonly midpointVolts: number;
  /** Per phase, the elements carrying its current, in order along the path (one branch: see docs/simulate.md). */
  readonly paths: readonly [readonly string[], readonly string[], readonly string[]];
  /** Per phase and path element: true where the current runs from the element's `from` node to its `to` node. */
  readonly forward: readonly [readonly boolean[], readonly boolean[], readonly boolean[]];
  /** Per phase: the gate set is an intermediate one (dead time of a change). */
  readonly dead: readonly [boolean, boolean, boolean];
  /** Per phase: the switches gated on. */
  readonly gates: readonly [readonly string[], readonly string[], readonly string[]];
}

const TWO_PI = 2 * Math.PI;

/** Most switching periods per fundamental a simulation runs (fsw/f1): the spectrum's work grows with its square. */
export const MAX_SIMULATED_PERIODS = 2000;

/**
 * One fundamental period of the degraded converter, exact rather than time-stepped.
 *
 * The runtime (`runtimeStream`, with the chosen sequence, balancing and update) gives the states
 * and their times. Each phase change passes through the intermediate gate set (the switches both
 * states share) for the dead time. Phase currents are sinusoids of the given peak lagging by the
 * load angle; every piece with constant gate sets and current signs gives each phase's level (the
 * leg solver's, for the actual sign) and one conducting path: of the simple paths the state
 * offers, the one with the lowest on-state voltage at the present current (device parameters), so
 * no parallel branch is counted twice. From the pieces: the line voltage a–b in closed form
 * (full-spectrum THD from its RMS), each element's average and RMS current, conduction losses,
 * switching energy where a gate change commutates current against a voltage step (docs/simulate.md),
 * and the midpoint charge. The healthy leg is run at the same operating point for comparison.
 *
 * @param options - see {@link SimulateOptions}
 * @returns the simulation document
 * @throws HexsalvageInputError on bad options or an m above the limit
 * @example
 * ```ts
 * simulatePeriod({ topology: 'npc', faults: ['a.outerUpper'], m: 0.5, loadAngleDeg: 20, vdc: 750, currentPeak: 150, f1: 50, fsw: 5000 });
 * ```
 */
export function simulatePeriod(options: SimulateOptions): Simulation {
  const { run, plan, atlas } = prepare(options);
  const faulted = runPeriod(run, atlas);
  // the healthy leg as it was: no fault and no bypass
  const { bypass: _fitted, ...healthyRules } = run.rules;
  const healthy = runPeriod({ ...run, faults: [] }, diagramAtlas({ topology: run.topology, faults: [], ...healthyRules }));
  return {
    topology: atlas.analysis.topology,
    faults: plan.faults,
    m: run.m,
    loadAngleDeg: run.phi,
    vdc: run.vdc,
    currentPeak: run.ipk,
    f1: run.f1,
    fsw: options.fsw,
    periods: run.periods,
    deadTime: run.td,
    sequence: run.sequence,
    balance: run.balance,
    update: run.update,
    deviceParameters: run.params.name,
    ...faulted.result,
    healthy: healthy.result,
    currentDerating: currentDerating(faulted, healthy),
    cautions: CAUTIONS,
  };
}

interface RunInputs {
  readonly topology: unknown;
  readonly faults: readonly string[];
  readonly rules: LimitRuleOptions;
  readonly m: number;
  readonly phi: number;
  readonly delta: number;
  readonly vdc: number;
  readonly ipk: number;
  readonly f1: number;
  readonly periods: number;
  readonly cap: number | undefined;
  readonly maxH: number;
  readonly params: DeviceParameterSet;
  readonly td: number;
  readonly sequence: SequenceMode;
  readonly balance: 'on' | 'off';
  readonly update: UpdateMode;
}

// The options checked once, and the plan they must respect (m at most its mMax).
function prepare(options: SimulateOptions): { run: RunInputs; plan: ReturnType<typeof planFromAtlas>; atlas: DiagramAtlas } {
  requireObject(
    options,
    'simulatePeriod',
    'an options object { topology, faults?, m, loadAngleDeg, vdc, currentPeak, f1, fsw, devices?, capacitance?, deadTime? }',
  );
  const vdc = requireVdc(options.vdc, 'simulatePeriod', 'vdc');
  const m = requireNumber(options.m, 'simulatePeriod', 'm', { min: 0, max: 10 });
  const phi = requireNumber(options.loadAngleDeg, 'simulatePeriod', 'loadAngleDeg', { min: -180, max: 180 });
  const delta = requireNumber(options.polarityMarginDeg ?? 0, 'simulatePeriod', 'polarityMarginDeg', { min: 0, max: 60, openMax: true });
  const ipk = requireNumber(options.currentPeak, 'simulatePeriod', 'currentPeak', { min: 0, openMin: true, max: 1e7 });
  const f1 = requireNumber(options.f1, 'simulatePeriod', 'f1', { min: 0, openMin: true, max: 1e5 });
  const fsw = requireNumber(options.fsw, 'simulatePeriod', 'fsw', { min: 6 * f1, max: 1e8 });
  const periods = Math.round(fsw / f1);
  if (periods > MAX_SIMULATED_PERIODS)
    throw new HexsalvageInputError(
      'option',
      'simulatePeriod',
      'fsw',
      `at most ${MAX_SIMULATED_PERIODS} switching periods per fundamental (fsw/f1; a documented limit)`,
      fsw,
    );
  const td = requireNumber(options.deadTime ?? 0, 'simulatePeriod', 'deadTime', { min: 0, max: 0.1 / fsw });
  const cap =
    options.capacitance === undefined ? undefined : requireNumber(options.capacitance, 'simulatePeriod', 'capacitance', { min: 0, openMin: true, max: 1e3 });
  const maxH =
    options.maxHarmonic === undefined
      ? 4 * periods + 2
      : requireNumber(options.maxHarmonic, 'simulatePeriod', 'maxHarmonic', { min: 1, max: 200000, integer: true });
  const { sequence, balance } = runtimeOptions({ sequence: options.sequence, balance: options.balance }, 'simulatePeriod');
  const update = options.update ?? 'half';
  if (!(UPDATE_MODES as readonly unknown[]).includes(update)) throw new HexsalvageInputError('option', 'simulatePeriod', 'update', 'period or half', update);
  const params = options.devices ?? DEMO_DEVICES;
  const rules = { ignoreRatings: options.ignoreRatings, levelSteps: options.levelSteps, ...(options.bypass === undefined ? {} : { bypass: options.bypass }) };
  const faults = options.faults ?? [];
  const atlas = diagramAtlas({ topology: options.topology, faults, ...rules });
  const plan = planFromAtlas(atlas, phi, delta);
  if (m > plan.mMax + 1e-12) {
    throw new HexsalvageInputError(
      'option',
      'simulatePeriod',
      'm',
      plan.mMax === 0
        ? 'nothing: the drive cannot run in this state (mMax = 0 at this load angle)'
        : `at most mMax = ${plan.mMax.toFixed(6)} at this load angle`,
      m,
    );
  }
  return {
    run: { topology: options.topology, faults, rules, m, phi, delta, vdc, ipk, f1, periods, cap, maxH, params, td, sequence, balance, update },
    plan,
    atlas,
  };
}

interface RunOutput {
  readonly result: SimulationResult;
  /** Per surviving element: loss = a·x + b·x² at x times the current (for the derating factor), and its thermal resistance. */
  readonly scaling: ReadonlyMap<string, { a: number; b: number; rth: number | undefined }>;
  readonly segments: readonly WaveformSegment[];
}

/**
 * The pieces of one fundamental period (for waveforms and tests): the same stepping as
 * {@link simulatePeriod}, faulted leg only.
 *
 * @param options - as for simulatePeriod
 * @returns the pieces in time order
 * @example
 * ```ts
 * simulationWaveform({ topology: 'npc', m: 0.8, loadAngleDeg: 0, vdc: 700, currentPeak: 100, f1: 50, fsw: 3000 }).length;
 * ```
 */
export function simulationWaveform(options: SimulateOptions): readonly WaveformSegment[] {
  const { run, atlas } = prepare(options);
  // the spectrum is not needed for the pieces: one harmonic keeps the run short
  return runPeriod({ ...run, maxH: 1 }, atlas).segments;
}

/** One phase's gate set over a stretch of time. */
interface GateSpan {
  readonly t0: number;
  readonly t1: number;
  readonly gates: readonly string[];
  readonly key: string;
  /** The level the runtime planned (the state's level for the planned polarity). */
  readonly planned: number;
  readonly dead: boolean;
}

/** A change of one phase's state: what the commutation passes through. */
interface Change {
  readonly phase: number;
  readonly t: number;
  readonly from: readonly string[];
  readonly mid: readonly string[];
  readonly to: readonly string[];
  /** When the incoming switches turn on (t + the dead time, or the end of the new state if shorter). */
  readonly tOn: number;
}

function runPeriod(x: RunInputs, atlas: DiagramAtlas): RunOutput {
  const table = switchingTableFromAtlas(atlas);
  const stream = runtimeStream(table, {
    m: x.m,
    loadAngleDeg: x.phi,
    polarityMarginDeg: x.delta,
    frequencyRatio: x.periods,
    update: x.update,
    sequence: x.sequence,
    balance: x.balance,
  });
  const analysis = atlas.analysis;
  const leg = analysis.leg;
  const elements = expandElements(leg);
  const elementById = new Map(elements.map((e) => [e.id, e] as const));
  const kindOf = new Map(leg.devices.map((d) => [d.id, d.kind] as const));
  const lineDevices = new Set(leg.devices.filter((d) => d.switching === 'line').map((d) => d.id));
  const midpoint = hasMidpoint(legLevels(leg));
  // the elements as they are in the configuration simulated (the first alternative of each failure,
  // the bypass tie closed in its phase)
  const phaseFaults = PHASES.map((ph) => analysis.simulated[ph]);
  const T = 1 / x.f1;
  const w = TWO_PI * x.f1;
  const half = x.vdc / 2;
  const psi = PHASES.map((_, k) => (x.phi * Math.PI) / 180 + (k * TWO_PI) / 3);
  const current = (k: number, t: number) => x.ipk * Math.cos(w * t - (psi[k] as number));
  const paramsOf = parameterLookup(x.params, elementById, kindOf);
  const paths = pathLookup(leg, elements, phaseFaults, paramsOf);
  const { spans, changes } = gateTimeline(stream.segments, stream.entryHeld, leg, T, x.td, x.periods);
  const acc = new Map<string, { abs: number; sq: number; esw: number }>(
    PHASES.flatMap((ph) => elements.map((e) => [`${ph}.${e.id}`, { abs: 0, sq: 0, esw: 0 }] as const)),
  );

  // switching energy of every change (see docs/simulate.md: which element takes which energy)
  for (const c of changes) chargeChange(c, paths, current, half, phaseFaults, paramsOf, acc);

  // the pieces: every boundary of every phase's spans and every current zero crossing
  const cuts = pieceBoundaries(spans, psi, w, T);
  const line = new LineVoltage(x.maxH, w, T);
  const mid = new MidpointCharge(w);
  const { segments, wrong, interrupted } = walkPieces(cuts, spans, { x, psi, w, half, midpoint, current, paths, acc, line, mid });
  return summarise(x, midpoint, acc, line, mid, wrong, interrupted, stream, phaseFaults, paramsOf, lineDevices, segments, T);
}

// Every element's parameters, found once.
function parameterLookup(
  set: DeviceParameterSet,
  elementById: ReadonlyMap<string, LegElement>,
  kindOf: ReadonlyMap<string, string>,
): (id: string) => ElementParameters {
  const cache = new Map<string, ElementParameters>();
  return (id) => {
    let p = cache.get(id);
    if (!p) {
      const e = elementById.get(id) as LegElement;
      p = elementParameters(set, e, kindOf.get(e.device) ?? e.kind);
      cache.set(id, p);
    }
    return p;
  };
}

type PathLookup = (k: number, gates: readonly string[], key: string, sign: CurrentSign, current: number) => { level: number | null; path: CurrentPath };

// The level and the one conducting path of a phase state at a current: of the simple node paths,
// the one with the lowest on-state voltage (threshold plus slope, on-resistance for a MOSFET
// channel, none for a shorted element), each hop by its element of lowest voltage; node paths and
// their elements' parameters cached per state and sign.
function pathLookup(leg: LegNetlist, elements: readonly LegElement[], faults: readonly PhaseFaults[], paramsOf: (id: string) => ElementParameters): PathLookup {
  interface Hop {
    readonly ids: readonly string[];
    readonly forward: readonly boolean[];
    readonly v0: Float64Array;
    readonly r: Float64Array;
  }
  const cache = new Map<string, { level: number | null; paths: readonly (readonly Hop[])[] }>();
  const none: CurrentPath = { elements: [], forward: [] };
  return (k, gates, key, sign, i) => {
    const ck = `${k}|${sign}|${key}`;
    let c = cache.get(ck);
    if (!c) {
      const pc = currentPaths(leg, elements, faults[k] as PhaseFaults, gates, sign);
      const drop = (id: string): [number, number] => {
        if ((faults[k] as PhaseFaults).get(id) === 'short') return [0, 0];
        const ep = paramsOf(id);
        return ep.part === 'mosfet' ? [0, ep.p.rOn ?? 0] : [ep.p.v0 ?? 0, ep.p.r ?? 0];
      };
      c = {
        level: pc.level,
        paths: pc.paths.map((p) =>
          p.hops.map((h) => ({
            ids: h.map((b) => b.element),
            forward: h.map((b) => b.forward),
            v0: Float64Array.from(h, (b) => drop(b.element)[0]),
            r: Float64Array.from(h, (b) => drop(b.element)[1]),
          })),
        ),
      };
      cache.set(ck, c);
    }
    let best: CurrentPath = none;
    let bestDrop = Infinity;
    for (const hops of c.paths) {
      let total = 0;
      const ids: string[] = [];
      const fwd: boolean[] = [];
      for (const h of hops) {
        let j = 0;
        let v = Infinity;
        for (let x = 0; x < h.ids.length; x++) {
          const dv = (h.v0[x] as number) + (h.r[x] as number) * i;
          if (dv < v) [j, v] = [x, dv];
        }
        total += v;
        ids.push(h.ids[j] as string);
        fwd.push(h.forward[j] as boolean);
      }
      if (total < bestDrop) {
        bestDrop = total;
        best = { elements: ids, forward: fwd };
      }
    }
    return { level: c.level, path: best };
  };
}

// Each phase's gate sets over the period (state, then the intermediate set of each change for the
// dead time), and the changes themselves; the change at t = 0 comes from the last state the
// previous period held (the stream's own last one when it is periodic). A state the stream holds
// for no time is no pulse for that phase: the phase goes from the state before it straight to the
// state after (nothing at all where those are the same). Each state lasts from its start to the
// next held state's.
function gateTimeline(
  stream: readonly StreamSegment[],
  entry: StreamEntry,
  leg: LegNetlist,
  T: number,
  td: number,
  periods: number,
): { spans: GateSpan[][]; changes: Change[] } {
  const spans: GateSpan[][] = [[], [], []];
  const changes: Change[] = [];
  const held = stream.filter((s) => isHeld(s.dt, periods));
  const n = held.length;
  for (let k = 0; k < 3; k++) {
    for (let s = 0; s < n; s++) {
      const seg = held[s] as StreamSegment;
      const before = s === 0 ? entry : (held[s - 1] as StreamSegment);
      const t0 = seg.t * T;
      const t1 = s + 1 < n ? (held[s + 1] as StreamSegment).t * T : T;
      const to = leg.patterns[seg.patterns[k] as string] as readonly string[];
      const key = [...to].sort().join(',');
      if (before.patterns[k] !== seg.patterns[k]) {
        const from = leg.patterns[before.patterns[k] as string] as readonly string[];
        const mid = from.filter((g) => to.includes(g));
        const tOn = Math.min(t1, t0 + td);
        changes.push({ phase: k, t: t0, from, mid, to, tOn });
        if (tOn > t0) spans[k]!.push({ t0, t1: tOn, gates: mid, key: [...mid].sort().join(','), planned: seg.levels[k] as number, dead: true });
        if (t1 > tOn) spans[k]!.push({ t0: tOn, t1, gates: to, key, planned: seg.levels[k] as number, dead: false });
      } else {
        spans[k]!.push({ t0, t1, gates: to, key, planned: seg.levels[k] as number, dead: false });
      }
    }
  }
  return { spans, changes };
}

// Switching energy of one change: at turn-off (t) a switch that stops carrying the current while
// the output level changes takes E_off, and a diode that stops conducting and then blocks (its own
// switch not gated) takes its recovery; at turn-on (tOn) a switch that takes the current over with
// a level change takes E_on, and the diode it relieves its recovery. Energies scale with the
// current and the level step. Failed elements take none.
function chargeChange(
  c: Change,
  paths: PathLookup,
  current: (k: number, t: number) => number,
  half: number,
  faults: readonly PhaseFaults[],
  paramsOf: (id: string) => ElementParameters,
  acc: Map<string, { abs: number; sq: number; esw: number }>,
): void {
  const k = c.phase;
  const ph = PHASES[k] as string;
  const healthy = (id: string) => !(faults[k] as PhaseFaults).has(id);
  const key = (g: readonly string[]) => [...g].sort().join(',');
  const charge = (id: string, what: 'eOn' | 'eOff' | 'eRec', volts: number, amps: number) => {
    if (!healthy(id) || volts <= 0 || amps <= 0) return;
    const ep = paramsOf(id);
    const e =
      what === 'eRec'
        ? ep.part === 'diode'
          ? eventEnergy(ep.p.eRec, ep.p.vRef, ep.p.iRef, volts, amps)
          : 0
        : ep.part === 'diode'
          ? 0
          : eventEnergy(ep.p[what], ep.p.vRef, ep.p.iRef, volts, amps);
    const a = acc.get(`${ph}.${id}`);
    if (a) a.esw += e;
  };
  const blocksAfter = (id: string, gates: readonly string[]) => {
    // a diode next to its own gated, healthy switch carries no voltage
    if (!id.endsWith('.diode')) return true;
    const own = id.slice(0, -'.diode'.length);
    return !(gates.includes(own) && healthy(own));
  };
  const event = (t: number, before: readonly string[], after: readonly string[], turning: readonly string[], what: 'eOn' | 'eOff') => {
    const i = current(k, t);
    const sign: CurrentSign = i >= 0 ? '+' : '-';
    const amps = Math.abs(i);
    const A = paths(k, before, key(before), sign, amps);
    const B = paths(k, after, key(after), sign, amps);
    if (A.level === null || B.level === null || A.level === B.level) return;
    const volts = Math.abs(A.level - B.level) * half;
    const inA = new Set(A.path.elements);
    const inB = new Set(B.path.elements);
    if (what === 'eOff') for (const g of turning) if (inA.has(g) && !inB.has(g)) charge(g, 'eOff', volts, amps);
    if (what === 'eOn') for (const g of turning) if (inB.has(g) && !inA.has(g)) charge(g, 'eOn', volts, amps);
    for (const id of A.path.elements) if (!inB.has(id) && paramsOf(id).part === 'diode' && blocksAfter(id, after)) charge(id, 'eRec', volts, amps);
  };
  const off = c.from.filter((g) => !c.to.includes(g));
  const on = c.to.filter((g) => !c.from.includes(g));
  event(c.t, c.from, c.mid, off, 'eOff');
  event(c.tOn, c.mid, c.to, on, 'eOn');
}

// Sorted piece boundaries: the spans of the three phases and the zeros of the phase currents.
function pieceBoundaries(spans: readonly GateSpan[][], psi: readonly number[], w: number, T: number): number[] {
  const cuts: number[] = [0, T];
  for (const list of spans) for (const s of list) cuts.push(s.t0, s.t1);
  for (let k = 0; k < 3; k++) {
    // zeros of cos(wt − ψ): wt − ψ = π/2 + nπ
    for (let n = -2; n <= 2; n++) {
      const tz = ((psi[k] as number) + Math.PI / 2 + n * Math.PI) / w;
      if (tz > 0 && tz < T) cuts.push(tz);
    }
  }
  cuts.sort((a, b) => a - b);
  const out: number[] = [];
  for (const c of cuts) if (out.length === 0 || c > (out[out.length - 1] as number)) out.push(c);
  return out;
}

/** The line voltage a–b, piecewise constant: its square integral and Fourier sums, added at each change of value. */
class LineVoltage {
  private readonly an: Float64Array;
  private readonly bn: Float64Array;
  sq = 0;
  private value = NaN;
  private start = 0;
  constructor(
    private readonly maxH: number,
    private readonly w: number,
    readonly T: number,
  ) {
    this.an = new Float64Array(maxH + 1);
    this.bn = new Float64Array(maxH + 1);
  }
  add(a: number, b: number, v: number): void {
    this.sq += v * v * (b - a);
    if (v === this.value) return;
    this.flush(a);
    this.value = v;
    this.start = a;
  }
  /** Closes the last stretch and returns peak amplitudes per order, V_n = (2/T)·|∫ v e^{−jnwt} dt|. */
  harmonics(): [number, number][] {
    this.flush(this.T);
    const out: [number, number][] = [];
    for (let n = 1; n <= this.maxH; n++) out.push([n, (2 / this.T) * Math.hypot(this.an[n] as number, this.bn[n] as number)]);
    return out;
  }
  // ∫ v cos(nwt) and ∫ v sin(nwt) over [start, b]: sines and cosines by rotation, order after order
  private flush(b: number): void {
    if (Number.isNaN(this.value) || b <= this.start || this.value === 0) return;
    const v = this.value;
    const w = this.w;
    const ca = Math.cos(w * this.start);
    const sa = Math.sin(w * this.start);
    const cb = Math.cos(w * b);
    const sb = Math.sin(w * b);
    let cna = ca;
    let sna = sa;
    let cnb = cb;
    let snb = sb;
    for (let n = 1; n <= this.maxH; n++) {
      const nw = n * w;
      this.an[n] = (this.an[n] as number) + (v * (snb - sna)) / nw;
      this.bn[n] = (this.bn[n] as number) - (v * (cnb - cna)) / nw;
      // (n+1)·angle from n·angle and the angle
      const c1 = cna * ca - sna * sa;
      sna = sna * ca + cna * sa;
      cna = c1;
      const c2 = cnb * cb - snb * sb;
      snb = snb * cb + cnb * sb;
      cnb = c2;
    }
  }
}

/** The midpoint charge: q' = A cos wt + B sin wt per piece, its extremes and its net. */
class MidpointCharge {
  charge = 0;
  min = 0;
  max = 0;
  net = 0;
  constructor(private readonly w: number) {}
  add(a: number, b: number, A: number, B: number): void {
    const w = this.w;
    if (A !== 0 || B !== 0) {
      const q0 = this.charge;
      const at = (t: number) => q0 + (A * (Math.sin(w * t) - Math.sin(w * a)) - B * (Math.cos(w * t) - Math.cos(w * a))) / w;
      // extremes inside where q' = 0: tan(wt) = −A/B
      const base = Math.atan2(-A, B);
      for (let n = Math.ceil((w * a - base) / Math.PI); ; n++) {
        const tz = (base + n * Math.PI) / w;
        if (tz >= b) break;
        if (tz > a) {
          const v = at(tz);
          if (v < this.min) this.min = v;
          if (v > this.max) this.max = v;
        }
      }
      const end = at(b);
      this.net += end - q0;
      this.charge = end;
    }
    if (this.charge < this.min) this.min = this.charge;
    if (this.charge > this.max) this.max = this.charge;
  }
}

function summarise(
  x: RunInputs,
  hasMidpoint: boolean,
  acc: ReadonlyMap<string, { abs: number; sq: number; esw: number }>,
  line: LineVoltage,
  mid: MidpointCharge,
  wrong: number,
  interrupted: number,
  stream: ReturnType<typeof runtimeStream>,
  faults: readonly PhaseFaults[],
  paramsOf: (id: string) => ElementParameters,
  lineDevices: ReadonlySet<string>,
  segments: WaveformSegment[],
  T: number,
): RunOutput {
  const harmonics = line.harmonics();
  const v1 = harmonics[0]?.[1] ?? 0;
  const rms = Math.sqrt(line.sq / T);
  const v1rms = v1 / Math.SQRT2;
  // full spectrum: everything in the RMS that is not the fundamental
  const thd = v1rms > 0 ? Math.sqrt(Math.max(0, rms * rms - v1rms * v1rms)) / v1rms : 0;
  const wthd = v1 > 0 ? Math.sqrt(harmonics.slice(1).reduce((s, [n, v]) => s + (v / n) * (v / n), 0)) / v1 : 0;
  const devices: Record<string, DeviceResult> = {};
  const scaling = new Map<string, { a: number; b: number; rth: number | undefined }>();
  let hottest = { device: '', loss: -1 };
  const lineAtPwm: { device: string; switchingLoss: number }[] = [];
  let totalSwitching = 0;
  for (const e of acc.values()) totalSwitching += e.esw / T;
  for (const [id, e] of acc) {
    const k = PHASES.indexOf(id.slice(0, 1) as 'a');
    const element = id.slice(2);
    const failed = (faults[k] as PhaseFaults).get(element);
    const avg = e.abs / T;
    const rmsI = Math.sqrt(e.sq / T);
    const ep = paramsOf(element);
    const cond = failed === 'open' ? 0 : conductionLoss(ep, avg, rmsI);
    const sw = failed ? 0 : e.esw / T;
    devices[id] = {
      avgCurrent: failed === 'open' ? 0 : avg,
      rmsCurrent: failed === 'open' ? 0 : rmsI,
      conductionLoss: cond,
      switchingLoss: sw,
      ...(failed ? { failed } : {}),
    };
    if (failed) continue;
    // at x times the current: v0·Iavg and switching scale with x, r·Irms² with x²
    const lin = (ep.part === 'mosfet' ? 0 : (ep.p.v0 ?? 0) * avg) + sw;
    scaling.set(id, { a: lin, b: cond - (ep.part === 'mosfet' ? 0 : (ep.p.v0 ?? 0) * avg), rth: ep.rth });
    if (cond + sw > hottest.loss) hottest = { device: id, loss: cond + sw };
    // a line-frequency device charged switching loss above a trace (0.05 W and 1 % of the leg's)
    if (lineDevices.has(element.replace(/\.diode$/, '')) && sw > 0.05 && sw > 0.01 * totalSwitching) lineAtPwm.push({ device: id, switchingLoss: sw });
  }
  return {
    result: {
      lineVoltage: { fundamentalPeak: v1, thd, wthd, rms, harmonics },
      devices,
      hottest,
      midpoint: hasMidpoint
        ? { ripplePkPk: x.cap ? (mid.max - mid.min) / (2 * x.cap) : null, chargePkPkAs: mid.max - mid.min, averageCurrent: mid.net / T }
        : { ripplePkPk: null, chargePkPkAs: null, averageCurrent: null },
      wrongSignTime: wrong,
      interruptedTime: interrupted,
      lineDevicesAtPwm: lineAtPwm,
      runtime: { multiPhaseSteps: stream.multiPhaseSteps, chainSteps: stream.chainSteps, heldPeriods: stream.heldUpdates },
    },
    scaling,
    segments,
  };
}

// ∫ |I cos(wt − ψ)| dt over [a, b] (no sign change inside: the caller splits at zeros)
function integralAbs(I: number, w: number, psi: number, a: number, b: number): number {
  return Math.abs((I * (Math.sin(w * b - psi) - Math.sin(w * a - psi))) / w);
}

// ∫ (I cos(wt − ψ))² dt over [a, b]
function integralSq(I: number, w: number, psi: number, a: number, b: number): number {
  return I * I * ((b - a) / 2 + (Math.sin(2 * (w * b - psi)) - Math.sin(2 * (w * a - psi))) / (4 * w));
}

function currentDerating(faulted: RunOutput, healthy: RunOutput): Simulation['currentDerating'] {
  const withRth = [...faulted.scaling.values(), ...healthy.scaling.values()].every((s) => s.rth !== undefined);
  const stress = (s: { a: number; b: number; rth: number | undefined }, x: number) => (withRth ? (s.rth as number) : 1) * (s.a * x + s.b * x * x);
  let limit = 0;
  for (const s of healthy.scaling.values()) limit = Math.max(limit, stress(s, 1));
  let factor = 1;
  let limiting = '';
  for (const [id, s] of faulted.scaling) {
    const k = withRth ? (s.rth as number) : 1;
    const A = k * s.a;
    const B = k * s.b;
    // largest x with A·x + B·x² ≤ limit
    const x = B > 1e-300 ? (-A + Math.sqrt(A * A + 4 * B * limit)) / (2 * B) : A > 0 ? limit / A : Infinity;
    if (x < factor) [factor, limiting] = [x, id];
  }
  return {
    factor: Math.max(0, factor),
    limitingDevice: limiting,
    assumption: withRth
      ? 'temperature rise = thermal resistance × loss per surviving device, from the parameter file'
      : 'equal thermal resistance for every surviving device: losses compared directly',
  };
}

/** What walking the pieces of a period needs: the run's inputs and the accumulators it fills. */
interface PieceContext {
  readonly x: RunInputs;
  readonly psi: readonly number[];
  readonly w: number;
  readonly half: number;
  readonly midpoint: boolean;
  readonly current: (k: number, t: number) => number;
  readonly paths: PathLookup;
  readonly acc: Map<string, { abs: number; sq: number; esw: number }>;
  readonly line: LineVoltage;
  readonly mid: MidpointCharge;
}

// Every piece between consecutive cuts: each phase's gate span and current sign give its path and
// level; conduction integrals go to the path's elements, the line voltage and the midpoint charge
// are accumulated, and the piece is kept as a waveform segment. Returns the segments and the time
// with a wrong level or an interrupted current.
function walkPieces(
  cuts: readonly number[],
  spans: readonly (readonly GateSpan[])[],
  ctx: PieceContext,
): { segments: WaveformSegment[]; wrong: number; interrupted: number } {
  const { x, psi, w, half, midpoint, current, paths, acc, line, mid } = ctx;
  const cursor = [0, 0, 0];
  const segments: WaveformSegment[] = [];
  let wrong = 0;
  let interrupted = 0;
  for (let c = 0; c + 1 < cuts.length; c++) {
    const a = cuts[c] as number;
    const b = cuts[c + 1] as number;
    if (b <= a) continue;
    const tm = (a + b) / 2;
    const levels: number[] = [];
    const chosen: CurrentPath[] = [];
    const dead: boolean[] = [];
    const gates: (readonly string[])[] = [];
    let qA = 0;
    let qB = 0;
    for (let k = 0; k < 3; k++) {
      const list = spans[k] as GateSpan[];
      while ((cursor[k] as number) + 1 < list.length && (list[cursor[k] as number] as GateSpan).t1 <= tm) cursor[k] = (cursor[k] as number) + 1;
      const span = list[cursor[k] as number] as GateSpan;
      const i = current(k, tm);
      const sign: CurrentSign = i >= 0 ? '+' : '-';
      const got = paths(k, span.gates, span.key, sign, Math.abs(i));
      dead.push(span.dead);
      gates.push(span.gates);
      if (got.level === null) {
        // no path for the actual sign: the current would be interrupted (reported); the planned level stands for the voltage
        interrupted += b - a;
        levels.push(span.planned);
        chosen.push({ elements: [], forward: [] });
      } else {
        if (!span.dead && got.level !== span.planned) wrong += b - a;
        levels.push(got.level);
        chosen.push(got.path);
      }
      const ia = integralAbs(x.ipk, w, psi[k] as number, a, b);
      const i2 = integralSq(x.ipk, w, psi[k] as number, a, b);
      for (const id of (chosen[k] as CurrentPath).elements) {
        const e = acc.get(`${PHASES[k]}.${id}`);
        if (e) {
          e.abs += ia;
          e.sq += i2;
        }
      }
      // current into the midpoint node: −i_k for a phase at its potential, = A cos wt + B sin wt
      if (midpoint && levels[k] === 0) {
        qA -= x.ipk * Math.cos(psi[k] as number);
        qB -= x.ipk * Math.sin(psi[k] as number);
      }
    }
    line.add(a, b, ((levels[0] as number) - (levels[1] as number)) * half);
    segments.push({
      t0: a,
      t1: b,
      phaseVolts: [(levels[0] as number) * half, (levels[1] as number) * half, (levels[2] as number) * half],
      midpointVolts: x.cap ? mid.charge / (2 * x.cap) : 0,
      paths: [chosen[0]!.elements, chosen[1]!.elements, chosen[2]!.elements],
      forward: [chosen[0]!.forward, chosen[1]!.forward, chosen[2]!.forward],
      dead: [dead[0] as boolean, dead[1] as boolean, dead[2] as boolean],
      gates: [gates[0] as readonly string[], gates[1] as readonly string[], gates[2] as readonly string[]],
    });
    mid.add(a, b, qA, qB);
  }
  return { segments, wrong, interrupted };
}
