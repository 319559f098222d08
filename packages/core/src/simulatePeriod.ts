import { analyseLeg } from './analyseLeg.js';
import { CAUTIONS } from './cautions.js';
import { createModulator } from './createModulator.js';
import { conductionLoss, DEMO_DEVICES, elementParameters, eventEnergy, type DeviceParameterSet, type ElementParameters } from './deviceLosses.js';
import { diagramAtlas } from './diagramAtlas.js';
import { HexsalvageInputError } from './errors.js';
import { expandElements } from './expandElements.js';
import { PHASES } from './faults.js';
import type { LegTable } from './legTable.js';
import { planFromAtlas } from './planRemedial.js';
import { requireVdc } from './physicalUnits.js';
import { polarityAt } from './polaritySectors.js';
import type { LimitRuleOptions } from './rules.js';
import type { LegState } from './switchingSequence.js';
import { switchingTableFromAtlas } from './switchingTable.js';
import { requireNumber, requireObject } from './validate.js';

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
  /** Switching frequency, Hz: fsw/f1 rounded is the number of switching periods per fundamental (≥ 6). */
  readonly fsw: number;
  /** Device loss parameters. Default: the invented demo values {@link DEMO_DEVICES}. */
  readonly devices?: DeviceParameterSet;
  /** Capacitance of each half of the DC link, F: gives the midpoint ripple in volts. */
  readonly capacitance?: number;
  /** Highest harmonic order listed. Default 4·fsw/f1 + 2 (the contract asks for at least 4·fsw/f1). */
  readonly maxHarmonic?: number;
}

/** Losses and currents of one element over the fundamental period. */
export interface DeviceResult {
  readonly avgCurrent: number;
  readonly rmsCurrent: number;
  readonly conductionLoss: number;
  readonly switchingLoss: number;
}

/** The results for one leg (faulted or healthy) at the same operating point. */
export interface SimulationResult {
  readonly lineVoltage: { readonly fundamentalPeak: number; readonly thd: number; readonly wthd: number; readonly rms: number; readonly harmonics: readonly (readonly [number, number])[] };
  /** Per element `phase.element`, every element of every phase. */
  readonly devices: Readonly<Record<string, DeviceResult>>;
  /** The element with the largest total loss, and that loss in watts. */
  readonly hottest: { readonly device: string; readonly loss: number };
  readonly midpoint: { readonly ripplePkPk: number | null; readonly chargePkPkAs: number | null; readonly averageCurrent: number | null };
  /**
   * Phase-seconds over the period in which a phase's current had the other sign than the polarity
   * its switching period was planned for, so that its state gave another level than planned, or
   * none (a polarity margin avoids it; see docs).
   */
  readonly wrongSignTime: number;
  /** Line-frequency devices (`switching: line`) that switched a current under PWM, with their switching loss, W. */
  readonly lineDevicesAtPwm: readonly { readonly device: string; readonly switchingLoss: number }[];
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
  readonly deviceParameters: string;
  readonly healthy: SimulationResult;
  /**
   * Largest fraction of the given peak current at which no device of the faulted leg loses more
   * than the hottest device of the healthy leg at full current (with thermal resistances: rises
   * more in temperature); capped at 1. `assumption` says which comparison was made.
   */
  readonly currentDerating: { readonly factor: number; readonly limitingDevice: string; readonly assumption: string };
  readonly cautions: readonly string[];
}

/** One piece of the period with every phase's level, sign and conducting path constant. */
export interface WaveformSegment {
  readonly t0: number;
  readonly t1: number;
  /** Phase levels a, b, c, volts from the midpoint potential. */
  readonly phaseVolts: readonly [number, number, number];
  /** Midpoint voltage at t0 (volts; 0 without a capacitance or midpoint). */
  readonly midpointVolts: number;
  /** Per phase, the elements carrying its current (the leg table's path for the current's sign). */
  readonly paths: readonly [readonly string[], readonly string[], readonly string[]];
}

const TWO_PI = 2 * Math.PI;

/**
 * One fundamental period of the degraded converter, exact rather than time-stepped: every switching
 * period runs the table's sequence (centre-aligned, s1 s2 s3 s2 s1) with the modulator's dwell
 * times, so the phase voltages are piecewise constant and the phase currents (sinusoids of the
 * given peak, lagging by the load angle) are sinusoid pieces. Each piece is further split where a
 * phase current changes sign, since the conducting path (the leg table's `path`) depends on it.
 * From the pieces: the line voltage a–b's Fourier coefficients in closed form, each element's
 * average and RMS current (integrals of |i| and i²), conduction losses, switching losses per
 * commutation (the elements entering and leaving a phase's path when its level changes, energy
 * scaled with the voltage step and the current), and the midpoint charge. The healthy leg is run
 * at the same operating point for comparison.
 *
 * @param options - see {@link SimulateOptions}
 * @returns the simulation document
 * @example
 * ```ts
 * simulatePeriod({ topology: 'npc', faults: ['a.outerUpper'], m: 0.5, loadAngleDeg: 20, vdc: 750, currentPeak: 150, f1: 50, fsw: 5000 });
 * ```
 */
export function simulatePeriod(options: SimulateOptions): Simulation {
  const { run, plan, atlas } = prepare(options);
  const faulted = runPeriod(run);
  const healthy = runPeriod({ ...run, faults: [] });
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
    deviceParameters: run.params.name,
    ...faulted.result,
    healthy: healthy.result,
    currentDerating: currentDerating(faulted, healthy),
    cautions: CAUTIONS,
  };
}

// The options checked once, and the plan they must respect (m at most its mMax).
function prepare(options: SimulateOptions): { run: RunInputs; plan: ReturnType<typeof planFromAtlas>; atlas: ReturnType<typeof diagramAtlas> } {
  requireObject(options, 'simulatePeriod', 'an options object { topology, faults?, m, loadAngleDeg, vdc, currentPeak, f1, fsw, devices?, capacitance? }');
  const vdc = requireVdc(options.vdc, 'simulatePeriod', 'vdc');
  const m = requireNumber(options.m, 'simulatePeriod', 'm', { min: 0, max: 10 });
  const phi = requireNumber(options.loadAngleDeg, 'simulatePeriod', 'loadAngleDeg', { min: -180, max: 180 });
  const delta = requireNumber(options.polarityMarginDeg ?? 0, 'simulatePeriod', 'polarityMarginDeg', { min: 0, max: 60, openMax: true });
  const ipk = requireNumber(options.currentPeak, 'simulatePeriod', 'currentPeak', { min: 0, openMin: true, max: 1e7 });
  const f1 = requireNumber(options.f1, 'simulatePeriod', 'f1', { min: 0, openMin: true, max: 1e5 });
  const fsw = requireNumber(options.fsw, 'simulatePeriod', 'fsw', { min: 6 * f1, max: 1e8 });
  const periods = Math.round(fsw / f1);
  if (periods > 20000) throw new HexsalvageInputError('option', 'simulatePeriod', 'fsw', 'at most 20000 switching periods per fundamental (fsw/f1)', fsw);
  const cap = options.capacitance === undefined ? undefined : requireNumber(options.capacitance, 'simulatePeriod', 'capacitance', { min: 0, openMin: true, max: 1e3 });
  const maxH = options.maxHarmonic === undefined ? 4 * periods + 2 : requireNumber(options.maxHarmonic, 'simulatePeriod', 'maxHarmonic', { min: 1, max: 200000, integer: true });
  const params = options.devices ?? DEMO_DEVICES;
  const rules = { ignoreRatings: options.ignoreRatings, levelSteps: options.levelSteps };
  const faults = options.faults ?? [];
  const atlas = diagramAtlas({ topology: options.topology, faults, ...rules });
  const plan = planFromAtlas(atlas, phi, delta);
  if (m > plan.mMax + 1e-12) {
    throw new HexsalvageInputError('option', 'simulatePeriod', 'm', plan.mMax === 0 ? 'nothing: the drive cannot run in this state (mMax = 0 at this load angle)' : `at most mMax = ${plan.mMax.toFixed(6)} at this load angle`, m);
  }
  return { run: { topology: options.topology, faults, rules, m, phi, delta, vdc, ipk, f1, periods, cap, maxH, params }, plan, atlas };
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
}

interface RunOutput {
  readonly result: SimulationResult;
  /** Per element: loss = a·x + b·x² at x times the current (for the derating factor), and its thermal resistance. */
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
  // the spectrum is not needed for the pieces: one harmonic keeps the run short
  return runPeriod({ ...prepare(options).run, maxH: 1 }).segments;
}

function runPeriod(x: RunInputs): RunOutput {
  const atlas = diagramAtlas({ topology: x.topology, faults: x.faults, ...x.rules });
  const analysis = analyseLeg({ topology: x.topology, faults: x.faults, ...x.rules });
  const table = switchingTableFromAtlas(atlas);
  const mod = createModulator(table);
  const leg = analysis.leg;
  const elements = expandElements(leg);
  const elementById = new Map(elements.map((e) => [e.id, e] as const));
  const kindOf = new Map(leg.devices.map((d) => [d.id, d.kind] as const));
  const lineDevices = new Set(leg.devices.filter((d) => d.switching === 'line').map((d) => d.id));
  const dc = new Set(Object.values(leg.dcNodes));
  const hasMidpoint = dc.has(0) && dc.size >= 3;
  const T = 1 / x.f1;
  const w = TWO_PI * x.f1;
  const ts = T / x.periods;
  const half = x.vdc / 2;
  const psi = PHASES.map((_, k) => (x.phi * Math.PI) / 180 + (k * TWO_PI) / 3);
  const current = (k: number, t: number) => x.ipk * Math.cos(w * t - (psi[k] as number));
  // per-phase pattern results by name
  const byName = PHASES.map((ph) => new Map((analysis.phases[ph] as LegTable).patterns.map((p) => [p.name, p] as const)));
  const ids = PHASES.flatMap((ph) => elements.map((e) => `${ph}.${e.id}`));
  const acc = new Map<string, { abs: number; sq: number; esw: number }>(ids.map((id) => [id, { abs: 0, sq: 0, esw: 0 }]));
  // line voltage a–b Fourier sums (a_n, b_n) for n = 1…maxH, and the DC term and the square integral
  const an = new Float64Array(x.maxH + 1);
  const bn = new Float64Array(x.maxH + 1);
  let sq = 0;
  let q = 0;
  let qMin = 0;
  let qMax = 0;
  let qAll = 0;
  let wrong = 0;
  const segments: WaveformSegment[] = [];
  let prev: { levels: number[]; paths: string[][]; t: number } | null = null;
  let first: { levels: number[]; paths: string[][] } | null = null;
  const transition = (from: { levels: number[]; paths: string[][] }, to: { levels: number[]; paths: string[][] }, t: number) => {
    for (let k = 0; k < 3; k++) {
      const dl = Math.abs((to.levels[k] as number) - (from.levels[k] as number));
      if (dl === 0) continue;
      const v = dl * half;
      const i = Math.abs(current(k, t));
      const before = new Set(from.paths[k]);
      const after = new Set(to.paths[k]);
      for (const id of after) if (!before.has(id)) charge(k, id, 'on', v, i);
      for (const id of before) if (!after.has(id)) charge(k, id, 'off', v, i);
    }
  };
  const paramCache = new Map<string, ElementParameters>();
  const paramsOf = (id: string): ElementParameters => {
    let p = paramCache.get(id);
    if (!p) {
      const e = elementById.get(id) as (typeof elements)[number];
      p = elementParameters(x.params, e, kindOf.get(e.device) ?? e.kind);
      paramCache.set(id, p);
    }
    return p;
  };
  const charge = (k: number, id: string, what: 'on' | 'off', v: number, i: number) => {
    const ep = paramsOf(id);
    let e = 0;
    if (ep.part === 'diode') e = what === 'off' ? eventEnergy(ep.p.eRec, ep.p.vRef, ep.p.iRef, v, i) : 0;
    else e = eventEnergy(what === 'on' ? ep.p.eOn : ep.p.eOff, ep.p.vRef, ep.p.iRef, v, i);
    const a = acc.get(`${PHASES[k]}.${id}`);
    if (a) a.esw += e;
  };
  for (let p = 0; p < x.periods; p++) {
    const tStart = p * ts;
    const thetaDeg = ((p + 0.5) * 360) / x.periods;
    const th = (thetaDeg * Math.PI) / 180;
    const pol = polarityAt(thetaDeg, x.phi, x.delta);
    const r = mod.modulate(x.m * Math.cos(th), x.m * Math.sin(th), pol);
    const entry = table.polarities[pol];
    const seq = r.triangle >= 0 ? entry?.tableTriangles[r.triangle]?.sequence : undefined;
    if (!seq) throw new HexsalvageInputError('option', 'simulatePeriod', 'm', `a point the table can modulate (polarity ${pol} has no sequence there)`, x.m);
    const o = seq.order;
    const parts = [r.dwell[o[0]] as number / 2, r.dwell[o[1]] as number / 2, r.dwell[o[2]] as number, r.dwell[o[1]] as number / 2, r.dwell[o[0]] as number / 2];
    const states: LegState[] = [seq.states[0], seq.states[1], seq.states[2], seq.states[1], seq.states[0]];
    let t0 = tStart;
    for (let s = 0; s < 5; s++) {
      const t1 = s === 4 ? tStart + ts : t0 + (parts[s] as number) * ts;
      if (t1 <= t0) continue;
      // split where a phase current changes sign
      const cuts = [t0];
      for (let k = 0; k < 3; k++) {
        // zeros of cos(wt − ψ): wt − ψ = π/2 + nπ
        const nStart = Math.ceil((w * t0 - (psi[k] as number) - Math.PI / 2) / Math.PI);
        for (let n = nStart; ; n++) {
          const tz = ((psi[k] as number) + Math.PI / 2 + n * Math.PI) / w;
          if (tz >= t1) break;
          if (tz > t0) cuts.push(tz);
        }
      }
      cuts.sort((u, v) => u - v);
      cuts.push(t1);
      for (let c = 0; c + 1 < cuts.length; c++) {
        const a = cuts[c] as number;
        const b = cuts[c + 1] as number;
        if (b <= a) continue;
        const mid = (a + b) / 2;
        const levels: number[] = [];
        const paths: string[][] = [];
        let qRate = [0, 0]; // i_mid = −Σ (connected) I cos(wt − ψ) = A cos wt + B sin wt
        for (let k = 0; k < 3; k++) {
          const st = (states[s] as LegState)[k];
          const sign = current(k, mid) >= 0 ? '+' : '-';
          const pr = byName[k]?.get(st?.pattern ?? '');
          const out = pr && pr.status === 'allowed' ? pr.bySign[sign] : null;
          if (!out || out.level === null) {
            // the state does not serve this sign (the polarity was taken at the period centre): the
            // planned level stands for the voltage, and the time is reported
            wrong += b - a;
            levels.push(st?.level ?? 0);
            paths.push([]);
          } else {
            // a pattern may give another level for the other sign (an open switch's diode path):
            // that is what the hardware does, so it is used, and the time is reported too
            if (out.level !== st?.level) wrong += b - a;
            levels.push(out.level);
            // a gated MOSFET and its own body diode both lie on a reverse path; the channel takes the
            // current (synchronous rectification, common practice), so the diode is left out
            paths.push(out.path.filter((id) => !(id.endsWith('.diode') && out.path.includes(id.slice(0, -'.diode'.length)))));
          }
          // element currents: |i| and i² integrals over [a, b]
          const ia = integralAbs(x.ipk, w, psi[k] as number, a, b);
          const i2 = integralSq(x.ipk, w, psi[k] as number, a, b);
          for (const id of paths[k] as string[]) {
            const e = acc.get(`${PHASES[k]}.${id}`);
            if (e) { e.abs += ia; e.sq += i2; }
          }
          if (hasMidpoint && levels[k] === 0) qRate = [(qRate[0] as number) - x.ipk * Math.cos(psi[k] as number), (qRate[1] as number) - x.ipk * Math.sin(psi[k] as number)];
        }
        const cur = { levels, paths };
        if (prev) transition(prev, cur, a);
        else first = cur;
        prev = { ...cur, t: a };
        // line voltage a–b: constant over [a, b]
        const vab = ((levels[0] as number) - (levels[1] as number)) * half;
        sq += vab * vab * (b - a);
        for (let n = 1; n <= x.maxH; n++) {
          const nw = n * w;
          an[n] = (an[n] as number) + (vab * (Math.sin(nw * b) - Math.sin(nw * a))) / nw;
          bn[n] = (bn[n] as number) - (vab * (Math.cos(nw * b) - Math.cos(nw * a))) / nw;
        }
        // midpoint charge: q' = A cos wt + B sin wt; extremes inside where q' = 0
        const [A, B] = qRate as [number, number];
        const qAt = (t: number) => q + (A * (Math.sin(w * t) - Math.sin(w * a)) - B * (Math.cos(w * t) - Math.cos(w * a))) / w;
        segments.push({ t0: a, t1: b, phaseVolts: [(levels[0] as number) * half, (levels[1] as number) * half, (levels[2] as number) * half], midpointVolts: x.cap ? q / (2 * x.cap) : 0, paths: [paths[0] as string[], paths[1] as string[], paths[2] as string[]] });
        if (A !== 0 || B !== 0) {
          const base = Math.atan2(-A, B); // A cos + B sin = 0 ⇒ tan(wt) = −A/B
          const nS = Math.ceil((w * a - base) / Math.PI);
          for (let n = nS; ; n++) {
            const tz = (base + n * Math.PI) / w;
            if (tz >= b) break;
            if (tz > a) { const v = qAt(tz); qMin = Math.min(qMin, v); qMax = Math.max(qMax, v); }
          }
          qAll += (A * (Math.sin(w * b) - Math.sin(w * a)) - B * (Math.cos(w * b) - Math.cos(w * a))) / w;
          q = qAt(b);
        }
        qMin = Math.min(qMin, q);
        qMax = Math.max(qMax, q);
      }
      t0 = t1;
    }
  }
  if (prev && first) transition(prev, first, T);
  // line voltage spectrum: peak amplitudes Vn = (2/T)·|∫ v e^{−jnwt}|
  const harmonics: [number, number][] = [];
  for (let n = 1; n <= x.maxH; n++) harmonics.push([n, (2 / T) * Math.hypot(an[n] as number, bn[n] as number)]);
  const v1 = harmonics[0]?.[1] ?? 0;
  const rest = harmonics.slice(1);
  const thd = v1 > 0 ? Math.sqrt(rest.reduce((s, [, v]) => s + v * v, 0)) / v1 : 0;
  const wthd = v1 > 0 ? Math.sqrt(rest.reduce((s, [n, v]) => s + (v / n) * (v / n), 0)) / v1 : 0;
  const devices: Record<string, DeviceResult> = {};
  const scaling = new Map<string, { a: number; b: number; rth: number | undefined }>();
  let hottest = { device: '', loss: -1 };
  const line: { device: string; switchingLoss: number }[] = [];
  for (const id of ids) {
    const e = acc.get(id) as { abs: number; sq: number; esw: number };
    const avg = e.abs / T;
    const rms = Math.sqrt(e.sq / T);
    const ep = paramsOf(id.slice(2));
    const cond = conductionLoss(ep, avg, rms);
    const sw = e.esw / T;
    devices[id] = { avgCurrent: avg, rmsCurrent: rms, conductionLoss: cond, switchingLoss: sw };
    // at x times the current: v0·Iavg and switching scale with x, r·Irms² with x²
    const lin = (ep.part === 'mosfet' ? 0 : (ep.p.v0 ?? 0) * avg) + sw;
    scaling.set(id, { a: lin, b: cond - (ep.part === 'mosfet' ? 0 : (ep.p.v0 ?? 0) * avg), rth: ep.rth });
    if (cond + sw > hottest.loss) hottest = { device: id, loss: cond + sw };
    const element = elementById.get(id.slice(2));
    // a line-frequency device that commutates current under PWM (above 50 mW: not a rounding trace)
    if (element && lineDevices.has(element.device) && sw > 0.05) line.push({ device: id, switchingLoss: sw });
  }
  return {
    result: {
      lineVoltage: { fundamentalPeak: v1, thd, wthd, rms: Math.sqrt(sq / T), harmonics },
      devices,
      hottest,
      midpoint: hasMidpoint
        ? { ripplePkPk: x.cap ? (qMax - qMin) / (2 * x.cap) : null, chargePkPkAs: qMax - qMin, averageCurrent: qAll / T }
        : { ripplePkPk: null, chargePkPkAs: null, averageCurrent: null },
      wrongSignTime: wrong,
      lineDevicesAtPwm: line,
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
      ? 'temperature rise = thermal resistance × loss per device, from the parameter file'
      : 'equal thermal resistance for every device: losses compared directly',
  };
}
