import { CAUTIONS } from '../shared/cautions.js';
import { cRuntimeCode, cRuntimeTables, intType } from './cRuntime.js';
import { runtimeOptions, type RuntimeOptions } from '../table/createRuntime.js';
import { HexsalvageInputError } from '../shared/errors.js';
import { cLocate, cPolarityIndex } from './cLocator.js';
import { runtimeProgram } from '../table/runtimeProgram.js';
import type { SwitchingTable } from '../table/switchingTable.js';
import { DWELL_TOLERANCE } from '../shared/tolerance.js';
import { requireObject, requireTable } from '../shared/validate.js';

/** Options of {@link exportC}. */
export interface ExportCOptions {
  /** Identifier prefix for every symbol (C identifier characters). Default `hs`. */
  readonly prefix?: string;
  /** Floating type of the tables and the lookup: `double` (default) or `float` (half the size; dwell to about 1e-6). */
  readonly cType?: 'double' | 'float';
  /** File name the header is written to: sets the include guard and the include line. Default `<prefix>_table.h`. */
  readonly fileName?: string;
  /** The plan the table is used with: its limits, load angle, margin and rules become `#define`s. */
  readonly limits?: {
    readonly mMax: number;
    readonly mMaxHull: number;
    readonly loadAngleDeg: number;
    readonly polarityMarginDeg: number;
    readonly rules: { readonly ratings: boolean; readonly levelSteps: string };
  };
  /** Total DC-link voltage in volts, as `<PREFIX>_VDC`. */
  readonly vdc?: number;
  /** The runtime settings the header's defaults name (`<PREFIX>_RUNTIME_*`). Default: continuous, balance on. */
  readonly runtime?: RuntimeOptions;
  /**
   * The safe limit over load angle for `<prefix>_m_max_at()`: the exact minimum of mMax over each
   * cell of a grid from −180°, `stepDeg` wide (see `deratingSteps`). Without it the function returns
   * `<PREFIX>_M_MAX` at the exported load angle only and 0 elsewhere.
   */
  readonly derating?: { readonly stepDeg: number; readonly minima: readonly number[] };
}

/**
 * The switching table as a self-contained C99 header: `static const` tables and a small portable
 * lookup `<prefix>_locate()` that mirrors the TypeScript modulator (same search order, tolerance,
 * clamping and normalisation).
 *
 * Layout: polarity index p as in `POLARITY_STRINGS` (base-3 count over `+ - ?`, phase a most
 * significant, `+++` and `---` skipped; `<prefix>_polarity_index()` computes it from signs).
 * Triangles of polarity p are rows `[tri_first[p], tri_first[p+1])` of the per-triangle arrays:
 * `dwell[t][9]` (row-major M, `d = M·[α β 1]ᵀ`), `levels[t][vertex][phase]`,
 * `pattern[t][vertex][phase]` (index into `pattern_names`), `order[t][3]` (vertex order from the
 * period start to its centre). Hull corners of p are rows `[hull_first[p], hull_first[p+1])`; where the
 * admissible tiling does not fill the hull, its outline segments are rows `[outline_first[p], outline_first[p+1])`
 * and references outside the tiling are clamped to the outline instead.
 *
 * @param table - from `switchingTable`
 * @param options - symbol prefix
 * @returns the header text
 * @throws HexsalvageInputError when the prefix is not a C identifier
 * @example
 * ```ts
 * fs.writeFileSync('remedial_table.h', exportC(table, { prefix: 'pump' }));
 * ```
 */
export function exportC(table: SwitchingTable, options: ExportCOptions = {}): string {
  requireTable(table, 'exportC');
  requireObject(options, 'exportC', 'an options object { prefix?, cType?, fileName?, limits?, vdc? }');
  const h = headerSettings(table, options);
  const rows = flattenRows(table, h);
  const program = runtimeProgram(table);
  const rtOpts = runtimeOptions(options.runtime ?? {}, 'exportC.runtime');
  const runtimeTables = cRuntimeTables(program, { px: h.px, PX: h.PX, real: c });
  const derating = deratingTable(options, c, h.px, h.PX);
  const bytes = tableBytes(rows, h, runtimeTables);
  const preamble = cPreamble(table, options, h, rows, bytes, rtOpts);
  const tables = cTables(table, h, rows);
  const { px, PX, guard } = h;
  return `${preamble}${tables}

${cPolarityIndex(px)}

${derating}

${cLocate(px, PX)}

${runtimeTables}

${cRuntimeCode({ px, PX, real: c })}
#endif /* ${guard} */
`;
}

/** Names, types and the gate-mask writer of one header, from the options (checked here). */
interface HeaderSettings {
  readonly px: string;
  readonly PX: string;
  readonly real: 'double' | 'float';
  readonly base: string;
  readonly guard: string;
  readonly devices: readonly string[];
  readonly wideMask: boolean;
  readonly maskType: string;
  readonly maskOf: (pattern: string) => string;
}

function headerSettings(table: SwitchingTable, options: ExportCOptions): HeaderSettings {
  const px = options.prefix ?? 'hs';
  if (!/^[A-Za-z_][A-Za-z0-9_]{0,30}$/.test(px)) throw new HexsalvageInputError('option', 'exportC', 'prefix', 'a C identifier of up to 31 characters', px);
  const PX = px.toUpperCase();
  const real = options.cType ?? 'double';
  if (real !== 'double' && real !== 'float') throw new HexsalvageInputError('option', 'exportC', 'cType', 'double or float', real);
  const fileName = options.fileName ?? `${px}_table.h`;
  const base = fileName.replace(/^.*[\\/]/, '');
  const guard = `${base
    .replace(/[^A-Za-z0-9]/g, '_')
    .replace(/^(\d)/, '_$1')
    .toUpperCase()}_`;
  // gate masks: bit i = gated device i of the phase, in netlist order
  const devices = table.devices ?? [];
  const wideMask = devices.length > 32;
  if (devices.length > 64)
    throw new HexsalvageInputError('option', 'exportC', 'table.devices', 'at most 64 gated devices per phase (one 64-bit mask)', devices.length);
  const maskType = wideMask ? 'uint64_t' : 'uint32_t';
  const maskOf = (pattern: string): string => {
    const gates = table.patternGates?.[table.patterns.indexOf(pattern)] ?? [];
    let m = 0n;
    for (const g of gates) {
      const i = devices.indexOf(g);
      if (i >= 0) m |= 1n << BigInt(i);
    }
    return `0x${m.toString(16).toUpperCase()}${wideMask ? 'ULL' : 'UL'}`;
  };
  return { px, PX, real, base, guard, devices, wideMask, maskType, maskOf };
}

/** The per-polarity arrays of the header as C initialiser rows, and where each polarity starts. */
interface HeaderRows {
  readonly realFirst: number[];
  readonly realLevels: string[];
  readonly realMask: string[];
  readonly realSign: number[];
  readonly dwell: string[];
  readonly hull: string[];
  readonly outline: string[];
  readonly triFirst: number[];
  readonly hullFirst: number[];
  readonly outlineFirst: number[];
  readonly nTri: number;
  readonly nHull: number;
  readonly nOutline: number;
  readonly nReal: number;
}

function flattenRows(table: SwitchingTable, h: HeaderSettings): HeaderRows {
  const { maskOf } = h;
  const realFirst: number[] = [0];
  const realLevels: string[] = [];
  const realMask: string[] = [];
  const realSign: number[] = [];
  const dwell: string[] = [];
  const hull: string[] = [];
  const outline: string[] = [];
  const triFirst: number[] = [0];
  const hullFirst: number[] = [0];
  const outlineFirst: number[] = [0];
  for (const pol of table.polarityOrder) {
    const p = table.polarities[pol];
    const tris = p?.tableTriangles ?? [];
    tris.forEach((tri, t) => {
      dwell.push(`  /* ${pol.replace(/\?/g, 'x')} #${t} */ {${tri.dwell.flat().map(c).join(', ')}}`);
      for (const v of tri.vertices) {
        for (const r of v.realisations) {
          realLevels.push(`  {${r.levels.map(c).join(', ')}}`);
          realMask.push(`  {${r.phases.map((x) => maskOf(x.pattern)).join(', ')}}`);
          realSign.push(r.midpointSign === null ? 2 : r.midpointSign);
        }
        realFirst.push((realFirst[realFirst.length - 1] as number) + v.realisations.length);
      }
    });
    triFirst.push((triFirst[triFirst.length - 1] as number) + tris.length);
    for (const [a, b] of p?.hull ?? []) hull.push(`  {${c(a)}, ${c(b)}}`);
    hullFirst.push((hullFirst[hullFirst.length - 1] as number) + (p?.hull.length ?? 0));
    for (const [a, b] of p?.outline ?? []) outline.push(`  {${c(a[0])}, ${c(a[1])}, ${c(b[0])}, ${c(b[1])}}`);
    outlineFirst.push((outlineFirst[outlineFirst.length - 1] as number) + (p?.outline?.length ?? 0));
  }
  const nTri = triFirst[triFirst.length - 1] as number;
  const nHull = hullFirst[hullFirst.length - 1] as number;
  const nOutline = outlineFirst[outlineFirst.length - 1] as number;
  const nReal = realFirst[realFirst.length - 1] as number;
  return { realFirst, realLevels, realMask, realSign, dwell, hull, outline, triFirst, hullFirst, outlineFirst, nTri, nHull, nOutline, nReal };
}

// The size of the tables: every initialiser counted (numbers, masks) at the width of its type.
function tableBytes(r: HeaderRows, h: HeaderSettings, runtimeTables: string): number {
  const R = h.real === 'float' ? 4 : 8;
  return (
    (r.nTri * 9 + r.nHull * 2 + r.nOutline * 4 + r.nReal * 3) * R +
    r.nReal * 3 * (h.wideMask ? 8 : 4) +
    r.nReal +
    (3 * r.nTri + 1) * 4 +
    runtimeBytes(runtimeTables, R)
  );
}

// The leading comment (with the cautions), the include guard, the types and the macros.
function cPreamble(
  table: SwitchingTable,
  options: ExportCOptions,
  h: HeaderSettings,
  r: HeaderRows,
  bytes: number,
  rtOpts: ReturnType<typeof runtimeOptions>,
): string {
  const { px, PX, real, base, guard, devices } = h;
  const { nTri, nReal } = r;
  const lim = options.limits;
  const defines = [
    ...(lim
      ? [
          `#define ${PX}_M_MAX ${c(lim.mMax)} /* safe limit at the load angle below, units of Vdc/2 */`,
          `#define ${PX}_M_MAX_HULL ${c(lim.mMaxHull)} /* first-version convex-hull bound: NOT safe, for review only */`,
          `#define ${PX}_LOAD_ANGLE_DEG ${c(lim.loadAngleDeg)}`,
          `#define ${PX}_POLARITY_MARGIN_DEG ${c(lim.polarityMarginDeg)}`,
          `#define ${PX}_RULE_RATINGS ${lim.rules.ratings ? 1 : 0} /* 1: device voltage ratings applied */`,
          `#define ${PX}_RULE_LEVEL_STEPS ${cString(lim.rules.levelSteps)}`,
        ]
      : []),
    `#define ${PX}_RUNTIME_CONTINUOUS ${rtOpts.sequence === 'continuous' ? 1 : 0} /* ${px}_runtime_init defaults: 1 seven segments, 0 one phase clamped */`,
    `#define ${PX}_RUNTIME_BALANCE ${rtOpts.balance === 'on' ? 1 : 0}`,
    `#define ${PX}_RUNTIME_CHAIN_DWELL ${c(rtOpts.chainDwell)} /* fraction of the switching period per chained state */`,
    ...(options.vdc !== undefined ? [`#define ${PX}_VDC ${c(options.vdc)} /* total DC-link voltage, volts: one unit of Vdc/2 is ${PX}_VDC / 2 */`] : []),
  ];
  return `/*
 * ${comment(base)}: degraded switching-state table generated by hexsalvage.
 * Use: #include "${comment(base)}" in one or more C99 files (everything is static).
 * Leg: ${comment(table.topology)}; faults: ${comment(table.faults.join(', ') || 'none')}.
 * Units: levels and alpha/beta in units of Vdc/2. Floating type: ${real} (${px}_real); tables about ${bytes} bytes.
 * Gate masks: bit i is gated device i of the phase: ${devices.map((d, i) => `${i} ${comment(d)}`).join(', ') || 'none'}.
${CAUTIONS.map((x) => ` * CAUTION: ${x}`).join('\n')}
 */
#ifndef ${guard}
#define ${guard}

#include <math.h>
#include <stdint.h>

typedef ${real} ${px}_real;

#define ${PX}_POLARITY_COUNT 25
#define ${PX}_TRIANGLE_COUNT ${nTri}
#define ${PX}_PATTERN_COUNT ${table.patterns.length}
#define ${PX}_DWELL_TOLERANCE ${c(DWELL_TOLERANCE)}
#define ${PX}_DEVICE_COUNT ${devices.length}
#define ${PX}_REALISATION_COUNT ${nReal}
${defines.join('\n')}

`;
}

// The constant tables: names, gate masks, where each polarity starts, dwell matrices, realisations,
// hulls and outlines.
function cTables(table: SwitchingTable, h: HeaderSettings, r: HeaderRows): string {
  const { px, PX, devices, maskType, maskOf } = h;
  const { realFirst, realLevels, realMask, realSign, dwell, hull, outline, triFirst, hullFirst, outlineFirst, nTri, nHull, nOutline, nReal } = r;
  const firstType = intType(0, Math.max(nTri, nHull, nOutline));
  const body = (rows: string[], empty: string) => (rows.length ? rows.join(',\n') : empty);
  return `/* "?" is written "\\?" so that no "??x" trigraph forms */
static const char *const ${px}_polarity_names[${PX}_POLARITY_COUNT] = {${table.polarityOrder.map(cString).join(', ')}};
static const char *const ${px}_pattern_names[${PX}_PATTERN_COUNT] = {${table.patterns.map(cString).join(', ')}};
static const char *const ${px}_device_names[${Math.max(1, devices.length)}] = {${devices.length ? devices.map(cString).join(', ') : '0'}};
/* gate mask of each pattern (bit i = device i) */
static const ${maskType} ${px}_pattern_mask[${PX}_PATTERN_COUNT] = {${table.patterns.map(maskOf).join(', ')}};
static const ${firstType} ${px}_tri_first[${PX}_POLARITY_COUNT + 1] = {${triFirst.join(', ')}};
static const ${firstType} ${px}_hull_first[${PX}_POLARITY_COUNT + 1] = {${hullFirst.join(', ')}};
static const ${firstType} ${px}_outline_first[${PX}_POLARITY_COUNT + 1] = {${outlineFirst.join(', ')}};
static const ${px}_real ${px}_dwell[${Math.max(1, nTri)}][9] = {
${body(dwell, '  {0}')}
};
/* Every realisation of each vertex (for review; the runtime below chooses among them): vertex v of
 * global triangle t has rows [real_first[3t+v], real_first[3t+v+1]). Sign of the current into the
 * midpoint node under the polarity: +1, -1, 0 none, 2 unknown. */
static const uint32_t ${px}_real_first[${PX}_TRIANGLE_COUNT * 3 + 1] = {${realFirst.join(', ')}};
static const ${px}_real ${px}_real_levels[${Math.max(1, nReal)}][3] = {
${body(realLevels, '  {0}')}
};
static const ${maskType} ${px}_real_mask[${Math.max(1, nReal)}][3] = {
${body(realMask, '  {0}')}
};
static const signed char ${px}_real_midpoint_sign[${Math.max(1, nReal)}] = {${realSign.length ? realSign.join(', ') : '0'}};
static const ${px}_real ${px}_hull[${Math.max(1, nHull)}][2] = {
${body(hull, '  {0}')}
};
/* Outline of the admissible tiling where it does not fill the hull: {x0, y0, x1, y1}, tiling on the left. */
static const ${px}_real ${px}_outline[${Math.max(1, nOutline)}][4] = {
${body(outline, '  {0}')}
};`;
}

// `<prefix>_m_max_at()`: the cell minima of the safe limit over load angle (a step function never
// above mMax), or the exported load angle's limit alone.
function deratingTable(options: ExportCOptions, c: (x: number) => string, px: string, PX: string): string {
  const dr = options.derating;
  if (!dr) {
    const lim = options.limits;
    return `/* Safe limit at a load angle: only the exported angle is known to this header (export with the
 * derating grid for every angle); 0 (do not run) elsewhere. */
static inline double ${px}_m_max_at(double load_angle_deg)
{
  return ${lim ? `load_angle_deg == ${c(lim.loadAngleDeg)} ? ${c(lim.mMax)} : ` : '(void)load_angle_deg, '}0.0;
}`;
  }
  const ok =
    typeof dr === 'object' &&
    dr !== null &&
    Number.isFinite(dr.stepDeg) &&
    dr.stepDeg > 0 &&
    Array.isArray(dr.minima) &&
    dr.minima.length === Math.ceil(360 / dr.stepDeg - 1e-9) &&
    dr.minima.every((m) => Number.isFinite(m) && m >= 0);
  if (!ok)
    throw new HexsalvageInputError(
      'option',
      'exportC',
      'derating',
      'a grid { stepDeg > 0, minima: one limit ≥ 0 per cell of [-180, 180] } (from deratingSteps)',
    );
  return `/* Safe limit over load angle (units of Vdc/2): ${px}_derating[i] is the exact minimum of mMax over
 * load angles [-180 + i*STEP, -180 + (i+1)*STEP] degrees, so the value is never above mMax. */
#define ${PX}_DERATING_STEP_DEG ${c(dr.stepDeg)}
#define ${PX}_DERATING_CELLS ${dr.minima.length}
static const ${options.cType === 'float' ? 'double' : `${px}_real`} ${px}_derating[${PX}_DERATING_CELLS] = {
  ${dr.minima.map(c).join(',\n  ')}
};
/* The safe modulation index at a load angle in [-180, 180] degrees (currents lagging); 0 outside. */
static inline double ${px}_m_max_at(double load_angle_deg)
{
  double u = (load_angle_deg + 180.0) / ${PX}_DERATING_STEP_DEG;
  int i;
  if (!(load_angle_deg >= -180.0 && load_angle_deg <= 180.0)) return 0.0;
  i = (int)floor(u);
  if (i < 0) i = 0;
  if (i >= ${PX}_DERATING_CELLS) i = ${PX}_DERATING_CELLS - 1;
  return ${px}_derating[i];
}`;
}

// Bytes of the runtime's tables: each declaration's element count times its type's width.
function runtimeBytes(decls: string, realBytes: number): number {
  let total = 0;
  const width: Record<string, number> = { uint8_t: 1, int8_t: 1, uint16_t: 2, int16_t: 2, uint32_t: 4, int32_t: 4 };
  for (const m of decls.matchAll(/static const (\w+) \w+((?:\[[^\]]+\])+) = \{([\s\S]*?)\n\};/g)) {
    const count = (m[3] as string).split(',').length;
    total += count * (width[m[1] as string] ?? realBytes);
  }
  return total;
}

// A C string literal: quotes, backslashes and non-printable characters escaped, and every "?"
// written "\?" so that no "??x" trigraph can form.
function cString(s: string): string {
  let out = '"';
  for (const ch of s) {
    const code = ch.codePointAt(0) as number;
    if (ch === '"' || ch === '\\') out += `\\${ch}`;
    else if (ch === '?') out += '\\?';
    else if (code < 0x20 || code > 0x7e)
      out += utf8(code)
        .map((b) => `\\${b.toString(8).padStart(3, '0')}`)
        .join('');
    else out += ch;
  }
  return `${out}"`;
}

function utf8(c: number): number[] {
  if (c < 0x80) return [c];
  if (c < 0x800) return [0xc0 | (c >> 6), 0x80 | (c & 63)];
  if (c < 0x10000) return [0xe0 | (c >> 12), 0x80 | ((c >> 6) & 63), 0x80 | (c & 63)];
  return [0xf0 | (c >> 18), 0x80 | ((c >> 12) & 63), 0x80 | ((c >> 6) & 63), 0x80 | (c & 63)];
}

// Text inside a C comment: no backslash (a backslash before a line end splices lines before
// comments are read, so "*\<newline>/" would end the comment), no line ends or other control
// characters, no "*/", no trigraphs. Such characters become "?" (names are shown, never compiled).
function comment(s: string): string {
  const plain = Array.from(s, (ch) => {
    const code = ch.charCodeAt(0);
    return ch === '\\' || code <= 0x1f || (code >= 0x7f && code <= 0x9f) || code === 0x2028 || code === 0x2029 ? '?' : ch;
  }).join('');
  return plain.replace(/\*\//g, '* /').replace(/\?\?/g, '? ?').replace(/\*$/, '* ');
}

// Doubles printed so that C reads back exactly the same value (17 significant digits).
function c(x: number): string {
  if (Object.is(x, -0) || x === 0) return '0.0';
  const s = x.toPrecision(17);
  return /[.eE]/.test(s) ? s : `${s}.0`;
}
