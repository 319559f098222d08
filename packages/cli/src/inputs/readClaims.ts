import { existsSync } from 'node:fs';
import { dirname } from 'node:path';
import { evaluateClaim, HexsalvageInputError, LEVEL_STEP_RULES, type ClaimVerdict, type DeratingClaim, type LevelStepRule } from '@hexsalvage/core';
import { fileValue } from '@hexsalvage/core/internal';
import { loadTopology } from './loadTopology.js';
import { readJsonFile } from '@hexsalvage/core/node';

/**
 * Reads and validates a claims file; netlist paths are taken relative to the file and must stay in
 * its folder or below (a claims file cannot make the tool read files elsewhere). The file is read
 * as every input is (regular file, 1 MiB, no duplicate keys); its content is never echoed.
 *
 * @param path - the claims JSON file
 * @returns the claims with topologies resolved
 * @throws HexsalvageInputError naming the file, the key path (`claims[1].m`) and what was expected
 * @example
 * ```ts
 * readClaims('examples/pump-claims.json');
 * ```
 */
export function readClaims(path: string): DeratingClaim[] {
  const err = (key: string, expected: string, got?: unknown) =>
    new HexsalvageInputError('claims', path, key, expected, got === undefined ? undefined : fileValue(got));
  if (!existsSync(path)) throw err('(file)', 'an existing claims file');
  return claimsFromDocument(readJsonFile(path, path, 'claims'), path);
}

/**
 * The claims of a claims document already read (a scenario that names a claims file reads it once).
 *
 * @param doc - the parsed JSON of the claims file
 * @param path - the file (names it in errors; netlist paths are relative to its folder)
 * @returns the checked claims
 * @example
 * ```ts
 * claimsFromDocument(JSON.parse(text), 'claims.json');
 * ```
 */
export function claimsFromDocument(doc: unknown, path: string): DeratingClaim[] {
  const err = (key: string, expected: string, got?: unknown) =>
    new HexsalvageInputError('claims', path, key, expected, got === undefined ? undefined : fileValue(got));
  if (typeof doc !== 'object' || doc === null || Array.isArray(doc)) throw err('(document)', 'an object { "claims": [...] }', doc);
  for (const k of Object.keys(doc)) if (k !== 'claims') throw err(k, 'only the key "claims" at the top level', k);
  return parseClaimList((doc as Record<string, unknown>).claims, path, 'claims');
}

/**
 * Checks a list of claims (the `claims` array of a claims or scenario file); netlist paths are
 * relative to that file's folder.
 *
 * @param list - the array as read
 * @param path - the file it came from (names it in errors, and anchors netlist paths)
 * @param listKey - the key of the array in that file
 * @param code - error code for this kind of file
 * @param defaultVdc - DC-link voltage a claim without `vdc` takes (a scenario's own)
 * @returns the claims
 * @example
 * ```ts
 * parseClaimList(doc.claims, 'scenario.json', 'claims', 'scenario');
 * ```
 */
export function parseClaimList(list: unknown, path: string, listKey: string, code: 'claims' | 'scenario' = 'claims', defaultVdc?: number): DeratingClaim[] {
  const err = (key: string, expected: string, got?: unknown) =>
    new HexsalvageInputError(code, path, key, expected, got === undefined ? undefined : fileValue(got));
  if (!Array.isArray(list) || list.length === 0) throw err(listKey, 'a non-empty array of claims', list);
  const names = new Set<string>();
  return list.map((c, i) => {
    const at = `${listKey}[${i}]`;
    if (typeof c !== 'object' || c === null || Array.isArray(c)) throw err(at, 'a claim object', c);
    const o: Record<string, unknown> = { ...(defaultVdc !== undefined ? { vdc: defaultVdc } : {}), ...(c as Record<string, unknown>) };
    if (Object.prototype.hasOwnProperty.call(c, '__proto__')) throw err(`${at}.__proto__`, 'no "__proto__" key', '__proto__');
    const keys = ['name', 'topology', 'faults', 'm', 'vdc', 'lineRmsV', 'loadAngleDeg', 'polarityMarginDeg', 'levelSteps', 'bypass'];
    for (const k of Object.keys(o)) if (!keys.includes(k)) throw err(`${at}.${k}`, `one of the keys ${keys.join(', ')}`, k);
    if (typeof o.name !== 'string' || o.name === '') throw err(`${at}.name`, 'a non-empty name', o.name);
    if (names.has(o.name)) throw err(`${at}.name`, 'a name not used by another claim', o.name);
    names.add(o.name);
    if (typeof o.topology !== 'string') throw err(`${at}.topology`, 'a built-in leg id or a netlist path relative to the claims file', o.topology);
    if (!Array.isArray(o.faults) || o.faults.some((f) => typeof f !== 'string'))
      throw err(`${at}.faults`, 'an array of fault strings PHASE.DEVICE[:MODE]', o.faults);
    if (o.vdc !== undefined && (typeof o.vdc !== 'number' || !Number.isFinite(o.vdc) || o.vdc <= 0 || o.vdc > 1e7))
      throw err(`${at}.vdc`, 'the DC-link voltage in volts, above 0', o.vdc);
    if (o.lineRmsV !== undefined) {
      if (o.m !== undefined) throw err(`${at}.lineRmsV`, 'either "m" or "lineRmsV", not both', o.lineRmsV);
      if (o.vdc === undefined) throw err(`${at}.vdc`, 'the DC-link voltage in volts (needed with "lineRmsV")');
      if (typeof o.lineRmsV !== 'number' || !Number.isFinite(o.lineRmsV) || o.lineRmsV < 0)
        throw err(`${at}.lineRmsV`, 'a line-to-line RMS voltage ≥ 0 in volts', o.lineRmsV);
    } else if (typeof o.m !== 'number' || !Number.isFinite(o.m) || o.m < 0)
      throw err(`${at}.m`, 'a modulation index ≥ 0 (units of Vdc/2), or "lineRmsV" with "vdc"', o.m);
    const r = o.loadAngleDeg;
    if (
      !Array.isArray(r) ||
      r.length !== 2 ||
      r.some((x) => typeof x !== 'number' || !Number.isFinite(x)) ||
      (r[0] as number) > (r[1] as number) ||
      (r[0] as number) < -180 ||
      (r[1] as number) > 180
    ) {
      throw err(`${at}.loadAngleDeg`, '[LO, HI] in degrees with -180 ≤ LO ≤ HI ≤ 180', r);
    }
    const d = o.polarityMarginDeg;
    if (d !== undefined && (typeof d !== 'number' || !(d >= 0 && d < 60))) throw err(`${at}.polarityMarginDeg`, 'degrees in [0, 60)', d);
    const steps = o.levelSteps;
    if (o.bypass !== undefined && !['a', 'b', 'c'].includes(o.bypass as string)) throw err(`${at}.bypass`, 'a phase, one of a, b, c', o.bypass);
    if (steps !== undefined && !(LEVEL_STEP_RULES as readonly unknown[]).includes(steps))
      throw err(`${at}.levelSteps`, `one of ${LEVEL_STEP_RULES.join(', ')}`, steps);
    let topology: unknown;
    try {
      topology = loadTopology(o.topology, dirname(path), true);
    } catch (e) {
      // the netlist's own message already names the file and the key (and quotes the value once)
      if (e instanceof HexsalvageInputError) {
        const key = `${at} ("${o.name}").topology`;
        throw e.code === 'topology' ? err(key, e.expected, o.topology) : err(key, `a valid netlist (${e.message})`);
      }
      throw e;
    }
    return {
      name: o.name,
      topology,
      faults: o.faults as string[],
      loadAngleDeg: [r[0], r[1]] as [number, number],
      ...(o.lineRmsV !== undefined ? { lineRmsV: o.lineRmsV as number } : { m: o.m as number }),
      ...(o.vdc !== undefined ? { vdc: o.vdc as number } : {}),
      ...(d !== undefined ? { polarityMarginDeg: d as number } : {}),
      ...(steps !== undefined ? { levelSteps: steps as LevelStepRule } : {}),
      ...(o.bypass !== undefined ? { bypass: o.bypass as 'a' | 'b' | 'c' } : {}),
    };
  });
}

/**
 * Reads a claims file and decides every claim; an error in one claim names the file and the claim.
 *
 * @param path - the claims JSON file
 * @param ignoreRatings - judge without the rating check (`--ignore-ratings`)
 * @returns one verdict per claim, in file order
 * @throws HexsalvageInputError naming the file and the claim
 * @example
 * ```ts
 * judgeClaims('examples/pump-claims.json', false);
 * ```
 */
export function judgeClaims(path: string, ignoreRatings: boolean): ClaimVerdict[] {
  return judgeClaimList(readClaims(path), path, ignoreRatings);
}

/**
 * Verdicts of checked claims; an error in one names the file and the claim.
 *
 * @param claims - from {@link parseClaimList}
 * @param path - the file they came from
 * @param ignoreRatings - judge without the rating check
 * @param listKey - the key of the claims array in that file
 * @param code - error code for this kind of file
 * @returns one verdict per claim
 * @example
 * ```ts
 * judgeClaimList(claims, 'scenario.json', false, 'claims', 'scenario');
 * ```
 */
export function judgeClaimList(
  claims: readonly DeratingClaim[],
  path: string,
  ignoreRatings: boolean,
  listKey = 'claims',
  code: 'claims' | 'scenario' = 'claims',
): ClaimVerdict[] {
  return claims.map((c, i) => {
    try {
      return evaluateClaim(ignoreRatings ? { ...c, ignoreRatings: true } : c);
    } catch (e) {
      if (e instanceof HexsalvageInputError) throw new HexsalvageInputError(code, path, `${listKey}[${i}]`, e.message);
      throw e;
    }
  });
}
