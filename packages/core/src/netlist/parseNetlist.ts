import { deepFreeze } from '../shared/boundedCache.js';
import { fileValue, hasInvisible, HexsalvageInputError } from '../shared/errors.js';
import type { DeviceKind, DeviceSpec, LegNetlist, SwitchingClass } from './netlist.js';

const KINDS: readonly DeviceKind[] = ['igbt', 'mosfet', 'diode'];
const SWITCHING: readonly SwitchingClass[] = ['pwm', 'line'];
const TOP_KEYS = ['name', 'description', 'dcNodes', 'output', 'devices', 'patterns'];
const DEVICE_KEYS = ['id', 'kind', 'from', 'to', 'antiparallelDiode', 'switching', 'technology', 'rating'];
// Keys that would reach Object.prototype when a parsed file is spread or indexed.
const POISON_KEYS = new Set(['__proto__', 'constructor', 'prototype']);
// Device ids must survive the fault syntax PHASE.DEVICE[:MODE] and the CSV export; node names
// only need to be visible text.
const ID_RE = /^[^\s.:,;"'\\]{1,64}$/;
const NODE_RE = /^\S(.{0,62}\S)?$/;

type Obj = Record<string, unknown>;

/**
 * What a netlist may hold, so that the work on it is bounded before it starts (docs/interface.md,
 * "Limits"): devices, named patterns, DC nodes (levels), devices side by side between the same two
 * nodes, switches one named pattern turns on or off against another (the commutation search walks
 * their subsets), and the span of potentials.
 */
export const NETLIST_LIMITS = Object.freeze({
  devices: 64,
  patterns: 64,
  dcNodes: 21,
  parallelDevices: 4,
  patternChange: 24,
  /** Largest |potential| of the DC nodes: from `potentialMin` to `potentialMax` (units of the file). */
  potentialMin: 1e-6,
  potentialMax: 1e6,
  /** Smallest non-zero |potential| (or rating) beside the largest potential. */
  resolution: 1e-9,
});

// Netlists this module has returned: frozen, so they stay as checked.
const CHECKED = new WeakSet<object>();

/**
 * Validates a parsed netlist document and returns it as a typed leg.
 *
 * Checks types, unknown and prototype-polluting keys, duplicate element ids (antiparallel diodes
 * included), DC potentials, the output node, dangling nodes and pattern contents. Every problem is a
 * {@link HexsalvageInputError} naming `input`, the key path and what was expected.
 *
 * @param value - the parsed JSON (e.g. `JSON.parse(text)`)
 * @param input - name of the input for messages, usually the file path
 * @returns a fresh, validated {@link LegNetlist}
 * @example
 * ```ts
 * const leg = parseNetlist(JSON.parse(fs.readFileSync('leg.json', 'utf8')), 'leg.json');
 * ```
 */
export function parseNetlist(value: unknown, input: string): LegNetlist {
  if (typeof value === 'object' && value !== null && CHECKED.has(value)) return value as LegNetlist;
  // messages name the key and what was expected; a value from the file only by its kind
  const err = (key: string, expected: string, got?: unknown) =>
    new HexsalvageInputError('netlist', input, key, expected, got === undefined ? undefined : fileValue(got));
  rejectPoisonKeys(value, '', err);
  const doc = asObject(value, '(document)', 'a JSON object describing one leg', err);
  for (const k of Object.keys(doc)) if (!TOP_KEYS.includes(k)) throw err(k, `one of the keys ${TOP_KEYS.join(', ')}`, k);

  const name = doc.name;
  if (typeof name !== 'string' || name.trim() === '') throw err('name', 'a non-empty string', name);
  if (name.length > 200 || hasInvisible(name))
    throw err('name', 'a name of at most 200 visible characters (no control, bidirectional or zero-width characters)', name);
  if (doc.description !== undefined && typeof doc.description !== 'string') throw err('description', 'a text (string), or no key', doc.description);

  const dcObj = asObject(doc.dcNodes, 'dcNodes', 'an object mapping DC node names to potentials in units of Vdc/2', err);
  const dcNodes: Record<string, number> = {};
  for (const [node, v] of Object.entries(dcObj)) {
    checkNode(node, `dcNodes.${node}`, err);
    if (typeof v !== 'number' || !Number.isFinite(v)) throw err(`dcNodes.${node}`, 'a finite potential in units of Vdc/2', v);
    dcNodes[node] = v;
  }
  if (Object.keys(dcNodes).length < 2) throw err('dcNodes', 'at least two DC nodes', Object.keys(dcNodes).length);
  if (Object.keys(dcNodes).length > NETLIST_LIMITS.dcNodes)
    throw err('dcNodes', `at most ${NETLIST_LIMITS.dcNodes} DC nodes (levels; a documented limit; it has ${Object.keys(dcNodes).length})`);
  const top = Math.max(...Object.values(dcNodes).map(Math.abs));
  if (!(top >= NETLIST_LIMITS.potentialMin && top <= NETLIST_LIMITS.potentialMax)) {
    throw err(
      'dcNodes',
      `potentials whose largest magnitude lies between ${NETLIST_LIMITS.potentialMin} and ${NETLIST_LIMITS.potentialMax} (write them in units of Vdc/2, or in volts)`,
    );
  }
  for (const [node, v] of Object.entries(dcNodes)) {
    if (v !== 0 && Math.abs(v) < NETLIST_LIMITS.resolution * top)
      throw err(`dcNodes.${node}`, `0, or a potential of at least ${NETLIST_LIMITS.resolution} times the largest`);
  }
  // Two DC nodes at one potential would be one node written twice (which of them a current returns
  // to would be arbitrary): each node has its own potential, so a link has a span.
  const seen = new Map<number, string>();
  for (const [node, v] of Object.entries(dcNodes)) {
    const other = seen.get(v);
    if (other !== undefined) throw err(`dcNodes.${node}`, `a potential different from every other DC node (${other} is at ${v} already)`, v);
    seen.set(v, node);
  }

  const output = doc.output;
  if (typeof output !== 'string') throw err('output', 'the name of the output node (string)', output);
  checkNode(output, 'output', err);
  if (output in dcNodes) throw err('output', 'a node that is not a DC node', output);

  if (!Array.isArray(doc.devices) || doc.devices.length === 0) throw err('devices', 'a non-empty array of devices', doc.devices);
  if (doc.devices.length > NETLIST_LIMITS.devices)
    throw err('devices', `at most ${NETLIST_LIMITS.devices} devices (a documented limit; it has ${doc.devices.length})`);
  const devices: DeviceSpec[] = [];
  const elementIds = new Set<string>();
  doc.devices.forEach((raw, i) => {
    const device = parseDevice(raw, `devices[${i}]`, err);
    for (const id of [device.id, ...(device.antiparallelDiode ? [`${device.id}.diode`] : [])]) {
      if (elementIds.has(id)) throw err(`devices[${i}].id`, 'an element id not used before in this leg', id);
      elementIds.add(id);
    }
    devices.push(device);
  });

  checkNodes(devices, dcNodes, output, err);
  checkParallel(devices, err);
  devices.forEach((d, i) => {
    if (d.rating !== undefined && !(d.rating >= NETLIST_LIMITS.resolution * top && d.rating <= top / NETLIST_LIMITS.resolution)) {
      throw err(`devices[${i}].rating`, `a rating between ${NETLIST_LIMITS.resolution} and ${1 / NETLIST_LIMITS.resolution} times the largest DC potential`);
    }
  });

  const patObj = asObject(doc.patterns, 'patterns', 'an object mapping pattern names to lists of gated switches', err);
  const gated = new Set(devices.filter((d) => d.kind !== 'diode').map((d) => d.id));
  const patterns: Record<string, string[]> = {};
  if (Object.keys(patObj).length > NETLIST_LIMITS.patterns)
    throw err('patterns', `at most ${NETLIST_LIMITS.patterns} named patterns (a documented limit; it has ${Object.keys(patObj).length})`);
  for (const [pname, list] of Object.entries(patObj)) {
    if (pname.trim() === '' || pname.length > 64 || hasInvisible(pname))
      throw err('patterns', 'pattern names of 1 to 64 visible characters (no control, bidirectional or zero-width characters)', pname);
    if (!Array.isArray(list)) throw err(`patterns.${pname}`, 'an array of switch ids', list);
    const seen = new Set<string>();
    list.forEach((sw, j) => {
      const key = `patterns.${pname}[${j}]`;
      if (typeof sw !== 'string') throw err(key, 'a switch id (string)', sw);
      if (!gated.has(sw)) {
        const why = elementIds.has(sw) ? 'a gated device (igbt or mosfet), not a diode' : `one of the switches ${[...gated].join(', ')}`;
        throw err(key, why, sw);
      }
      if (seen.has(sw)) throw err(key, 'each switch at most once per pattern', sw);
      seen.add(sw);
    });
    patterns[pname] = [...list] as string[];
  }
  if (Object.keys(patterns).length === 0) throw err('patterns', 'at least one gate pattern');
  // the commutation search walks the subsets of the switches a change turns off and turns on
  const names = Object.keys(patterns);
  for (const a of names)
    for (const b of names) {
      const pa = patterns[a] as string[];
      const pb = patterns[b] as string[];
      const off = pa.filter((g) => !pb.includes(g)).length;
      if (off > NETLIST_LIMITS.patternChange)
        throw err(
          `patterns.${b}`,
          `patterns that differ from each other in at most ${NETLIST_LIMITS.patternChange} switches each way (from ${a} it turns off ${off}; a documented limit)`,
        );
    }

  // frozen, and remembered as checked: passing it on (CLI → planRemedial) is not checked twice
  const leg: LegNetlist = deepFreeze({ name, dcNodes, output, devices, patterns });
  CHECKED.add(leg);
  return leg;
}

function parseDevice(raw: unknown, at: string, err: (k: string, e: string, g?: unknown) => HexsalvageInputError): DeviceSpec {
  const d = asObject(raw, at, 'a device object', err);
  for (const k of Object.keys(d)) if (!DEVICE_KEYS.includes(k)) throw err(`${at}.${k}`, `one of the keys ${DEVICE_KEYS.join(', ')}`, k);
  const { id, kind, from, to, antiparallelDiode, switching, technology, rating } = d;
  if (typeof id !== 'string') throw err(`${at}.id`, 'a device id (string)', id);
  if (!ID_RE.test(id) || hasInvisible(id)) throw err(`${at}.id`, 'an id of up to 64 visible characters without spaces, ".", ":", ",", ";" or quotes', id);
  if (typeof kind !== 'string' || !KINDS.includes(kind as DeviceKind)) throw err(`${at}.kind`, `one of ${KINDS.join(', ')}`, kind);
  if (typeof from !== 'string') throw err(`${at}.from`, 'a node name (string)', from);
  if (typeof to !== 'string') throw err(`${at}.to`, 'a node name (string)', to);
  checkNode(from, `${at}.from`, err);
  checkNode(to, `${at}.to`, err);
  if (from === to) throw err(`${at}.to`, 'a node different from "from"', to);
  if (antiparallelDiode !== undefined && typeof antiparallelDiode !== 'boolean') throw err(`${at}.antiparallelDiode`, 'true or false', antiparallelDiode);
  if (antiparallelDiode === true && kind === 'diode') throw err(`${at}.antiparallelDiode`, 'false or absent on a diode', antiparallelDiode);
  if (switching !== undefined && !SWITCHING.includes(switching as SwitchingClass)) throw err(`${at}.switching`, `one of ${SWITCHING.join(', ')}`, switching);
  if (technology !== undefined && typeof technology !== 'string') throw err(`${at}.technology`, 'a text label', technology);
  if (rating !== undefined && !(typeof rating === 'number' && Number.isFinite(rating) && rating > 0)) {
    throw err(`${at}.rating`, 'a blocking voltage > 0 in units of Vdc/2 (or no key: unrated)', rating);
  }
  const spec: DeviceSpec = { id, kind: kind as DeviceKind, from, to };
  return {
    ...spec,
    ...(antiparallelDiode ? { antiparallelDiode: true } : {}),
    ...(switching !== undefined ? { switching: switching as SwitchingClass } : {}),
    ...(technology !== undefined ? { technology: technology as string } : {}),
    ...(rating !== undefined ? { rating: rating as number } : {}),
  };
}

// A node that only one device touches is almost always a misspelt name; refuse it rather than
// silently computing a leg with a dangling branch.
function checkNodes(
  devices: DeviceSpec[],
  dcNodes: Record<string, number>,
  output: string,
  err: (k: string, e: string, g?: unknown) => HexsalvageInputError,
): void {
  const uses = new Map<string, number>();
  for (const d of devices) for (const n of [d.from, d.to]) uses.set(n, (uses.get(n) ?? 0) + 1);
  if (!uses.has(output)) throw err('output', 'a node connected to at least one device', output);
  devices.forEach((d, i) => {
    for (const side of ['from', 'to'] as const) {
      const n = d[side];
      if (n in dcNodes || n === output) continue;
      if ((uses.get(n) ?? 0) < 2) {
        throw err(
          `devices[${i}].${side}`,
          `a DC node (${Object.keys(dcNodes).join(', ')}), the output "${output}", or an internal node shared by two or more devices`,
          n,
        );
      }
    }
  });
}

function checkNode(s: string, key: string, err: (k: string, e: string, g?: unknown) => HexsalvageInputError): void {
  if (!NODE_RE.test(s) || hasInvisible(s)) throw err(key, 'a node name of 1 to 64 visible characters, not starting or ending with a space', s);
}

// Devices side by side between the same two nodes: each adds a branch to every conducting path.
function checkParallel(devices: DeviceSpec[], err: (k: string, e: string, g?: unknown) => HexsalvageInputError): void {
  const count = new Map<string, number>();
  devices.forEach((d, i) => {
    const key = [d.from, d.to].sort().join('\u0000');
    const n = (count.get(key) ?? 0) + 1;
    count.set(key, n);
    if (n > NETLIST_LIMITS.parallelDevices)
      throw err(`devices[${i}]`, `at most ${NETLIST_LIMITS.parallelDevices} devices side by side between the same two nodes (a documented limit)`);
  });
}

function asObject(v: unknown, key: string, expected: string, err: (k: string, e: string, g?: unknown) => HexsalvageInputError): Obj {
  if (typeof v !== 'object' || v === null || Array.isArray(v)) throw err(key, expected, v);
  return v as Obj;
}

/** Deepest nesting of arrays and objects a netlist may have (a leg needs four levels). */
const MAX_DEPTH = 64;

// Walks the document with an explicit stack (a document nested 100,000 deep must not overflow the
// call stack) and refuses prototype keys and nesting beyond MAX_DEPTH.
function rejectPoisonKeys(v: unknown, path: string, err: (k: string, e: string, g?: unknown) => HexsalvageInputError): void {
  const stack: [unknown, string, number][] = [[v, path, 1]];
  while (stack.length > 0) {
    const [x, at, depth] = stack.pop() as [unknown, string, number];
    if (typeof x !== 'object' || x === null) continue;
    if (depth > MAX_DEPTH) throw err(at || '(document)', `nesting at most ${MAX_DEPTH} deep`);
    if (Array.isArray(x)) {
      x.forEach((y, i) => stack.push([y, `${at}[${i}]`, depth + 1]));
      continue;
    }
    for (const k of Object.keys(x)) {
      const here = at ? `${at}.${k}` : k;
      if (POISON_KEYS.has(k)) throw err(here, 'no "__proto__", "constructor" or "prototype" keys', k);
      stack.push([(x as Obj)[k], here, depth + 1]);
    }
  }
}
