import { createHash } from 'node:crypto';
import { existsSync, readFileSync, statSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import {
  HexsalvageInputError,
  isBuiltinTopology,
  MAX_SIMULATED_PERIODS,
  LEVEL_STEP_RULES,
  type DeratingClaim,
  type LegNetlist,
  type LevelStepRule,
} from '@hexsalvage/core';
import { fileValue } from '@hexsalvage/core/internal';
import { confined, loadTopology } from './loadTopology.js';
import { claimsFromDocument, parseClaimList } from './readClaims.js';
import { readJsonFile } from '@hexsalvage/core/node';

/** A review scenario: what a design review needs once (docs/schema/scenario.schema.json). */
export interface Scenario {
  /** Drive or plant name. */
  readonly drive: string;
  readonly ratedPowerKw?: number;
  /** Rated line-to-line RMS voltage of the motor or grid side, volts. */
  readonly ratedLineVoltageV?: number;
  /** Total DC-link voltage, volts. */
  readonly vdc: number;
  readonly fundamentalHz?: number;
  readonly switchingHz?: number;
  /** Capacitance of each half of the DC link, farads. */
  readonly dcLinkCapacitanceF?: number;
  /** Dead time, seconds (at most a tenth of the switching period). */
  readonly deadTimeS?: number;
  /** Operating load-angle range [LO, HI], degrees. */
  readonly loadAngleRangeDeg?: readonly [number, number];
  /** The load angle the report is drawn at, degrees (default: the middle of the range, else 0). */
  readonly loadAngleDeg: number;
  readonly polarityMarginDeg: number;
  /** As written in the file (built-in id or netlist path relative to it). */
  readonly topologyText: string;
  readonly topology: string | LegNetlist;
  readonly faults: readonly string[];
  readonly levelSteps?: LevelStepRule;
  readonly claims: readonly DeratingClaim[];
  /** Every file read, with its SHA-256: the scenario itself, the netlist, a claims file, claim netlists. */
  readonly inputs: readonly { readonly path: string; readonly sha256: string }[];
}

const KEYS = [
  '$schema',
  'drive',
  'ratedPowerKw',
  'ratedLineVoltageV',
  'vdc',
  'fundamentalHz',
  'switchingHz',
  'dcLinkCapacitanceF',
  'deadTimeS',
  'loadAngleRangeDeg',
  'loadAngleDeg',
  'polarityMarginDeg',
  'topology',
  'faults',
  'levelSteps',
  'claims',
  'claimsFile',
];

/**
 * SHA-256 of a file's bytes, hex.
 *
 * @param path - file path
 * @returns 64 hex digits
 * @example
 * ```ts
 * fileSha256('examples/pump-scenario.json');
 * ```
 */
export function fileSha256(path: string): string {
  // a regular file only: a pipe or device would block or never end
  if (!statSync(path).isFile()) throw new HexsalvageInputError('usage', path, '(file)', 'a regular file (not a device, pipe or folder)');
  return createHash('sha256').update(readFileSync(path)).digest('hex');
}

/**
 * Reads and checks a scenario file; netlist and claims paths in it are relative to its folder.
 *
 * @param path - the scenario file
 * @returns the scenario, with its claims checked and every input file hashed
 * @example
 * ```ts
 * readScenario('examples/pump-scenario.json').vdc; // 750
 * ```
 */
export function readScenario(path: string): Scenario {
  // messages name the key and what was expected; a value from the file only by its kind
  const err = (key: string, expected: string, got?: unknown) =>
    new HexsalvageInputError('scenario', path, key, expected, got === undefined ? undefined : fileValue(got));
  if (!existsSync(path)) throw err('(file)', 'an existing scenario file');
  const doc = readJsonFile(path, path, 'scenario');
  if (typeof doc !== 'object' || doc === null || Array.isArray(doc)) throw err('(document)', 'an object (see docs/schema/scenario.schema.json)', doc);
  const o = doc as Record<string, unknown>;
  for (const k of Object.keys(o)) if (!KEYS.includes(k)) throw err(k, `one of the keys ${KEYS.filter((x) => x !== '$schema').join(', ')}`, k);
  const num = (k: string, lo: number, hi: number, required = false): number | undefined => {
    const v = o[k];
    if (v === undefined && !required) return undefined;
    if (typeof v !== 'number' || !Number.isFinite(v) || v < lo || v > hi || (lo === 0 && v === 0))
      throw err(k, `a number ${lo === 0 ? 'above 0' : `from ${lo}`} up to ${hi}`, v);
    return v;
  };
  if (typeof o.drive !== 'string' || o.drive.trim() === '') throw err('drive', 'the drive or plant name (text)', o.drive);
  const vdc = num('vdc', 0, 1e7, true) as number;
  const range = o.loadAngleRangeDeg;
  if (
    range !== undefined &&
    (!Array.isArray(range) ||
      range.length !== 2 ||
      range.some((x) => typeof x !== 'number' || !Number.isFinite(x)) ||
      (range[0] as number) > (range[1] as number) ||
      (range[0] as number) < -180 ||
      (range[1] as number) > 180)
  ) {
    throw err('loadAngleRangeDeg', '[LO, HI] in degrees with -180 ≤ LO ≤ HI ≤ 180', range);
  }
  const r = range as [number, number] | undefined;
  const loadAngleDeg = num('loadAngleDeg', -180, 180) ?? (r ? (r[0] + r[1]) / 2 : 0);
  if (r && (loadAngleDeg < r[0] || loadAngleDeg > r[1])) throw err('loadAngleDeg', `a load angle inside loadAngleRangeDeg [${r[0]}, ${r[1]}]`, loadAngleDeg);
  const margin = o.polarityMarginDeg ?? 0;
  if (typeof margin !== 'number' || !(margin >= 0 && margin < 60)) throw err('polarityMarginDeg', 'degrees in [0, 60)', margin);
  if (typeof o.topology !== 'string' || o.topology === '')
    throw err('topology', 'a built-in leg id or a netlist path relative to the scenario file', o.topology);
  if (o.faults !== undefined && (!Array.isArray(o.faults) || o.faults.some((f) => typeof f !== 'string')))
    throw err('faults', 'an array of fault strings PHASE.DEVICE[:MODE]', o.faults);
  if (o.levelSteps !== undefined && !(LEVEL_STEP_RULES as readonly unknown[]).includes(o.levelSteps))
    throw err('levelSteps', `one of ${LEVEL_STEP_RULES.join(', ')}`, o.levelSteps);
  const base = dirname(path);
  const inputs = [{ path, sha256: fileSha256(path) }];
  let topology: string | LegNetlist;
  try {
    topology = loadTopology(o.topology, base, true);
  } catch (e) {
    if (e instanceof HexsalvageInputError) throw err('topology', e.expected, o.topology);
    throw e;
  }
  if (!isBuiltinTopology(o.topology)) inputs.push({ path: resolve(base, o.topology), sha256: fileSha256(resolve(base, o.topology)) });
  let claims: DeratingClaim[] = [];
  let claimTexts: unknown = o.claims;
  let claimBase = base;
  if (o.claims !== undefined && o.claimsFile !== undefined) throw err('claimsFile', 'either "claims" or "claimsFile", not both', o.claimsFile);
  if (o.claims !== undefined) claims = parseClaimList(o.claims, path, 'claims', 'scenario', vdc);
  if (o.claimsFile !== undefined) {
    if (typeof o.claimsFile !== 'string' || o.claimsFile === '') throw err('claimsFile', 'a claims file path relative to the scenario file', o.claimsFile);
    const cf = resolve(base, o.claimsFile);
    if (!existsSync(cf)) throw err('claimsFile', 'an existing claims file (relative to the scenario file)', o.claimsFile);
    try {
      confined(o.claimsFile, base, 'claimsFile', "a claims file in the scenario file's folder or below");
    } catch (e) {
      if (e instanceof HexsalvageInputError) throw err('claimsFile', e.expected, o.claimsFile);
      throw e;
    }
    const doc = readJsonFile(cf, o.claimsFile, 'claims');
    claims = claimsFromDocument(doc, cf);
    inputs.push({ path: cf, sha256: fileSha256(cf) });
    claimTexts = (doc as { claims: unknown }).claims;
    claimBase = dirname(cf);
  }
  // netlists the claims name (relative to the file that holds them), hashed once each
  for (const t of new Set(((claimTexts ?? []) as { topology: string }[]).map((c) => c.topology))) {
    const p = resolve(claimBase, t);
    if (!isBuiltinTopology(t) && !inputs.some((x) => x.path === p)) inputs.push({ path: p, sha256: fileSha256(p) });
  }
  const opt = (k: string, v: number | undefined) => (v === undefined ? {} : { [k]: v });
  // the simulated period: 6 to MAX_SIMULATED_PERIODS switching periods per fundamental
  const f1 = num('fundamentalHz', 0, 1e5);
  const fsw = num('switchingHz', 0, 1e8);
  if (f1 !== undefined && fsw !== undefined && !(fsw / f1 >= 6 && Math.round(fsw / f1) <= MAX_SIMULATED_PERIODS)) {
    throw err(
      'switchingHz',
      `a switching frequency of 6 to ${MAX_SIMULATED_PERIODS} times fundamentalHz (${f1} Hz; a documented limit of the simulated period)`,
      fsw,
    );
  }
  return {
    drive: o.drive,
    ...opt('ratedPowerKw', num('ratedPowerKw', 0, 1e7)),
    ...opt('ratedLineVoltageV', num('ratedLineVoltageV', 0, 1e7)),
    vdc,
    ...opt('fundamentalHz', num('fundamentalHz', 0, 1e5)),
    ...opt('switchingHz', num('switchingHz', 0, 1e8)),
    ...opt('dcLinkCapacitanceF', num('dcLinkCapacitanceF', 0, 1e3)),
    ...opt('deadTimeS', deadTime(num('deadTimeS', -1, 1), num('switchingHz', 0, 1e8))),
    ...(r ? { loadAngleRangeDeg: r } : {}),
    loadAngleDeg,
    polarityMarginDeg: margin,
    topologyText: o.topology,
    topology,
    faults: (o.faults as string[] | undefined) ?? [],
    ...(o.levelSteps !== undefined ? { levelSteps: o.levelSteps as LevelStepRule } : {}),
    claims,
    inputs,
  };
}

// The scenario's dead time: 0 or more, at most a tenth of the switching period.
function deadTime(td: number | undefined, fsw: number | undefined): number | undefined {
  if (td === undefined) return undefined;
  const most = fsw === undefined ? 1e-3 : 0.1 / fsw;
  if (!(td >= 0 && td <= most))
    throw new HexsalvageInputError(
      'scenario',
      'scenario',
      'deadTimeS',
      `a dead time in seconds from 0 to a tenth of the switching period (${most.toExponential(3)} s)`,
      td,
    );
  return td;
}
