import { WELL_INSIDE } from '../table/createModulator.js';
import { NO_PATH, type RuntimeProgram } from '../table/runtimeProgram.js';

/** What the C runtime tables and code are generated with. */
export interface CRuntimeSpec {
  /** Symbol prefix (lower case) and its upper-case form for macros. */
  readonly px: string;
  readonly PX: string;
  /** Prints a double so that C reads back the same value. */
  readonly real: (x: number) => string;
}

/**
 * The smallest standard C integer type that holds every value in [min, max].
 *
 * @param min - smallest value
 * @param max - largest value
 * @returns a `<stdint.h>` type name
 * @example
 * ```ts
 * intType(-1, 200); // 'int16_t'
 * ```
 */
export function intType(min: number, max: number): string {
  if (min >= 0) return max <= 0xff ? 'uint8_t' : max <= 0xffff ? 'uint16_t' : 'uint32_t';
  return min >= -0x80 && max <= 0x7f ? 'int8_t' : min >= -0x8000 && max <= 0x7fff ? 'int16_t' : 'int32_t';
}

function range(a: ArrayLike<number>): [number, number] {
  let lo = 0;
  let hi = 0;
  for (let i = 0; i < a.length; i++) {
    const v = a[i] as number;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return [lo, hi];
}

// Initialiser rows of `width` numbers, several rows to a line (about 100 characters).
function rows(a: ArrayLike<number>, width: number, fmt: (x: number) => string): string {
  const items: string[] = [];
  for (let i = 0; i < a.length; i += width) {
    const r: string[] = [];
    for (let j = 0; j < width; j++) r.push(fmt(a[i + j] as number));
    items.push(width === 1 ? (r[0] as string) : `{${r.join(', ')}}`);
  }
  if (items.length === 0) return width === 1 ? '0' : '{0}';
  const lines: string[] = [];
  let line = '';
  for (const it of items) {
    if (line && line.length + it.length > 96) {
      lines.push(line);
      line = '';
    }
    line += line ? `, ${it}` : it;
  }
  lines.push(line);
  return lines.join(',\n  ');
}

/**
 * The runtime's tables as C99 `static const` arrays, each integer array in the smallest type that
 * holds its values.
 *
 * @param p - the runtime program
 * @param spec - prefix and number printer
 * @returns C declarations
 * @example
 * ```ts
 * cRuntimeTables(runtimeProgram(table), { px: 'hs', PX: 'HS', real: String });
 * ```
 */
export function cRuntimeTables(p: RuntimeProgram, spec: CRuntimeSpec): string {
  const { px, PX, real } = spec;
  const P = p.patternCount;
  const nCand = p.candCount.length;
  const nSeq = p.pathFirst.length - 1;
  const nPath = p.pathPattern.length / 4;
  const decl = (name: string, a: ArrayLike<number>, width: number, dims: string, type?: string) => {
    const [lo, hi] = range(a);
    const t = type ?? intType(lo, hi);
    const fmt = t.includes('real') ? real : (x: number) => String(x);
    return `static const ${t} ${px}_${name}${dims} = {\n  ${rows(a, width, fmt)}\n};`;
  };
  const usable = Uint8Array.from(p.level, (x) => (Number.isNaN(x) ? 0 : 1));
  const levels = Float64Array.from(p.level, (x) => (Number.isNaN(x) ? 0 : x));
  // the candidates' levels as positions among the levels they take (a byte each, not a number)
  const dc = p.candLevels;
  return [
    `#define ${PX}_MAX_SEGMENTS ${4 + 3 * P + 4}`,
    `#define ${PX}_HAS_MIDPOINT ${p.hasMidpoint ? 1 : 0}`,
    `#define ${PX}_NO_PATH ${NO_PATH}`,
    "/* most sequence candidates of one triangle (the size of the runtime's context cache) */",
    `#define ${PX}_MAX_TRI_CANDIDATES ${maxPerTriangle(p.candFirst)}`,
    '/* polarity character of each phase per polarity index: 0 "+", 1 "-", 2 unknown */',
    decl('polarity_chars', p.polarityChars, 3, `[${PX}_POLARITY_COUNT][3]`),
    '/* per phase k and character c, index (k*3 + c)*PATTERN_COUNT + p: level of pattern p, and whether it is usable */',
    decl('pattern_level', levels, 1, `[9 * ${PX}_PATTERN_COUNT]`, `${px}_real`),
    decl('pattern_usable', usable, 1, `[9 * ${PX}_PATTERN_COUNT]`),
    `/* shortest allowed pattern path i -> j of one phase, index ((e*9 + k*3 + c)*PATTERN_COUNT + i)*PATTERN_COUNT + j
   (e = 1: the first step enters character c at a boundary where it changed): length (${PX}_NO_PATH: none) and first hop */`,
    decl('step_dist', p.dist, 1, `[18 * ${PX}_PATTERN_COUNT * ${PX}_PATTERN_COUNT]`, 'uint16_t'),
    decl('step_next', p.next, 1, `[18 * ${PX}_PATTERN_COUNT * ${PX}_PATTERN_COUNT]`),
    '/* 1 where phase k left in pattern p can enter character c at the next boundary, index (k*3 + c)*PATTERN_COUNT + p */',
    decl('enterable', p.enterable, 1, `[9 * ${PX}_PATTERN_COUNT]`),
    '/* sequence candidates of global triangle g: rows cand_first[g] .. cand_first[g+1]-1, best static rank first */',
    '/* the triangles of the same polarity sharing an edge with each triangle (-1: none), tested when a reference leaves its previous one */',
    decl('tri_next', p.triNext.length ? p.triNext : [-1, -1, -1], 3, `[${Math.max(1, p.triNext.length / 3)}][3]`),
    decl('cand_first', p.candFirst, 1, `[${PX}_TRIANGLE_COUNT + 1]`),
    decl('cand_count', p.candCount, 1, `[${Math.max(1, nCand)}]`),
    decl('cand_pos', p.candPos, 4, `[${Math.max(1, nCand)}][4]`),
    "/* levels of the candidates' states: cand_level[c][3*s + k] indexes cand_levels */",
    decl('cand_levels', dc.length ? dc : [0], 1, `[${Math.max(1, dc.length)}]`, `${px}_real`),
    decl('cand_level', p.candLevel, 12, `[${Math.max(1, nCand)}][12]`),
    decl('cand_mask', p.candMask, 4, `[${Math.max(1, nCand)}][4]`),
    decl('cand_seq', p.candSeq, 3, `[${Math.max(1, nCand)}][3]`),
    decl('cand_clamped', p.candClamped, 1, `[${Math.max(1, nCand)}]`),
    '/* pattern paths of each phase sequence: rows path_first[s] .. path_first[s+1]-1, a pattern per state (-1 unused) */',
    decl('path_first', p.pathFirst, 1, `[${nSeq + 1}]`),
    decl('path_pattern', p.pathPattern, 4, `[${Math.max(1, nPath)}][4]`),
    '/* per (sequence, direction, boundary, previous pattern + 1), options 0 (no step), 1 (one step), 2 (fewest steps):\n   the path (-1: none), its gate changes of line-rate devices and of all devices, and its entry steps */',
    decl('pick', p.pick, 3, `[${Math.max(1, p.pick.length / 3)}][3]`),
    decl('pick_line', p.pickLine, 3, `[${Math.max(1, p.pick.length / 3)}][3]`),
    decl('pick_gates', p.pickGates, 3, `[${Math.max(1, p.pick.length / 3)}][3]`),
    decl('pick_dist', p.pickDist, 3, `[${Math.max(1, p.pick.length / 3)}][3]`),
  ].join('\n');
}

/**
 * The C runtime: the same choice, split and chain as the TypeScript runtime (`createRuntime`),
 * statement for statement, so that a header gives the same states and dwell times.
 *
 * @param spec - prefix
 * @returns C code (needs the tables of {@link cRuntimeTables} and the header's `locate`)
 * @example
 * ```ts
 * cRuntimeCode({ px: 'hs', PX: 'HS', real: String });
 * ```
 */
export function cRuntimeCode(spec: CRuntimeSpec): string {
  const { px, PX } = spec;
  return `/* ---- runtime: one centre-aligned switching period (or half period) at a time ---- */

/* What one call writes: the states applied in time order and their durations (fractions of the
 * call's time, summing to 1). */
typedef struct {
  int count;
  int pattern[${PX}_MAX_SEGMENTS][3];   /* pattern index per phase (see ${px}_pattern_names, ${px}_pattern_mask) */
  double level[${PX}_MAX_SEGMENTS][3];  /* levels, units of Vdc/2 */
  double duration[${PX}_MAX_SEGMENTS];
  int triangle;                         /* triangle of the polarity, -1: none (nothing written) */
  int clamped;                          /* the reference was brought back to the tiling */
  double split;                         /* share of the split vertex's dwell in its first state (NAN: none split) */
  int chain_steps;                      /* states inserted to reach the period's first state one phase at a time */
  int held;                             /* 1: no safe way into the triangle: the present state is held (one segment) */
} ${px}_output;

/* The runtime's memory and settings. */
typedef struct {
  int prev[3];
  int prev_char[3];
  int up;
  int continuous;        /* 1: seven segments (a redundant vertex split); 0: one phase clamped */
  int balance;           /* 1: the split meets the midpoint target */
  double midpoint_gain;  /* target midpoint current = -midpoint_gain * midpoint_error */
  double chain_dwell;    /* duration of a chained state, fraction of the switching period */
  /* the triangle each polarity's last reference fell in (-1: none): a rotating reference is
   * usually still inside it, and one test then replaces the search */
  int last_tri[${PX}_POLARITY_COUNT];
  /* the choice's static part for the last context (triangle, state, characters, next polarity,
   * direction; ctx_key[0] = -1: none): the candidates with the best unreachable / stuck / chain
   * tier, in the order of select_'s early stop, each as candidate, form, gate changes, entry
   * steps, three paths, three line-device changes */
  int ctx_key[10];
  int ctx_n;
  int ctx_unreach;
  int ctx_rows[${PX}_MAX_TRI_CANDIDATES][10];
} ${px}_runtime;

static inline void ${px}_runtime_reset(${px}_runtime *rt)
{
  int k;
  for (k = 0; k < 3; k++) { rt->prev[k] = -1; rt->prev_char[k] = -1; }
  for (k = 0; k < ${PX}_POLARITY_COUNT; k++) rt->last_tri[k] = -1;
  rt->ctx_key[0] = -1;
  rt->up = 1;
}

static inline void ${px}_runtime_init(${px}_runtime *rt, int continuous, int balance, double midpoint_gain, double chain_dwell)
{
  rt->continuous = continuous;
  rt->balance = balance && ${PX}_HAS_MIDPOINT;
  rt->midpoint_gain = midpoint_gain;
  rt->chain_dwell = chain_dwell;
  ${px}_runtime_reset(rt);
}

static inline int ${px}_cmp_(double a, double b) { return a < b ? -1 : a > b ? 1 : 0; }

/* The current into the midpoint per set of phases at the midpoint (bit k: phase k), once per call. */
static inline void ${px}_charge_table_(double ia, double ib, double ic, double qm[8])
{
  int mask;
  for (mask = 0; mask < 8; mask++) qm[mask] = -(((mask & 1) ? ia : 0.0) + ((mask & 2) ? ib : 0.0) + ((mask & 4) ? ic : 0.0));
}

static inline void ${px}_charges_(int c, int k, const double qm[8], double q[4])
{
  int s;
  for (s = 0; s < k; s++) q[s] = qm[${px}_cand_mask[c][s]];
}

static inline double ${px}_miss_(int c, int k, const double d[3], const double qm[8], double target, double tol)
{
  double q[4], lo, hi, miss;
  ${px}_charges_(c, k, qm, q);
  if (k == 4) {
    double dA = d[${px}_cand_pos[c][0]];
    double rest = d[${px}_cand_pos[c][1]] * q[1] + d[${px}_cand_pos[c][2]] * q[2];
    double e0 = rest + dA * q[0], e1 = rest + dA * q[3];
    lo = e0 < e1 ? e0 : e1;
    hi = e0 < e1 ? e1 : e0;
  } else {
    lo = d[${px}_cand_pos[c][0]] * q[0] + d[${px}_cand_pos[c][1]] * q[1] + d[${px}_cand_pos[c][2]] * q[2];
    hi = lo;
  }
  miss = target < lo ? lo - target : target > hi ? target - hi : 0.0;
  return miss <= tol ? 0.0 : miss;
}

/* The static part of the choice for one candidate (see createRuntime): its paths from the present
 * state, unreachable phases, phases left stuck for the next character, entry steps, gate changes
 * and line-device changes per phase. */
static void ${px}_static_(const ${px}_runtime *rt, int c, int qi, int nq, int dir, int exit, int path[3], int lines[3], int *unreach, int *stuck, int *cost, int *gates_out)
{
  int k = ${px}_cand_count[c], all0 = 1, one = -1, o0[3], o1[3], at[3], ph, x, xs;
  double line = 0, gates = 0, cLine = INFINITY, cGates = INFINITY;
  *unreach = 0; *stuck = 0; *cost = 0;
  for (ph = 0; ph < 3; ph++) {
    int b = rt->prev[ph] < 0 || rt->prev_char[ph] == ${px}_polarity_chars[qi][ph] ? 0 : 1;
    int a = ((((int)${px}_cand_seq[c][ph] * 2 + dir) * 2 + b) * (${PX}_PATTERN_COUNT + 1) + rt->prev[ph] + 1);
    at[ph] = a;
    o0[ph] = ${px}_pick[a][0];
    o1[ph] = ${px}_pick[a][1];
    if (o0[ph] < 0) all0 = 0;
    else { line += ${px}_pick_line[a][0]; gates += ${px}_pick_gates[a][0]; }
  }
  if (all0) { cLine = line; cGates = gates; }
  for (ph = 0; ph < 3; ph++) {
    int ok = 1;
    double l = 0, gt = 0;
    if (o1[ph] < 0) continue;
    for (x = 0; x < 3; x++) {
      if (x == ph) { l += ${px}_pick_line[at[x]][1]; gt += ${px}_pick_gates[at[x]][1]; }
      else if (o0[x] < 0) ok = 0;
      else { l += ${px}_pick_line[at[x]][0]; gt += ${px}_pick_gates[at[x]][0]; }
    }
    if (ok && (l < cLine || (l == cLine && gt < cGates))) { cLine = l; cGates = gt; one = ph; }
  }
  for (ph = 0; ph < 3; ph++) {
    int o = one >= 0 ? (ph == one ? 1 : 0) : !all0 ? 2 : 0;
    path[ph] = ${px}_pick[at[ph]][o];
    if (path[ph] < 0) { (*unreach)++; path[ph] = (int)${px}_path_first[${px}_cand_seq[c][ph]]; lines[ph] = 0; }
    else lines[ph] = ${px}_pick_line[at[ph]][o];
    if (o == 2 && ${px}_pick[at[ph]][2] >= 0) *cost += ${px}_pick_dist[at[ph]][2];
  }
  if (one >= 0) *cost = 1;
  else if (!all0) {
    cGates = 0;
    for (ph = 0; ph < 3; ph++) if (${px}_pick[at[ph]][2] >= 0) cGates += ${px}_pick_gates[at[ph]][2];
  }
  xs = exit < 0 ? k - 1 : exit;
  for (ph = 0; ph < 3; ph++) {
    int nc = ${px}_polarity_chars[nq][ph];
    if (nc != ${px}_polarity_chars[qi][ph] && ${px}_enterable[(ph * 3 + nc) * ${PX}_PATTERN_COUNT + ${px}_path_pattern[path[ph]][xs]] != 1) (*stuck)++;
  }
  *gates_out = (int)cGates;
}

/* The static part of the choice for a context, kept in rt: the candidates of triangle g with the
 * best unreachable / stuck / chain tier, sorted for select_'s early stop (worked out again only
 * when the context changes). */
static void ${px}_context_(${px}_runtime *rt, int g, int qi, int nq, int dir, int exit)
{
  int key[10], i, c, ph, end = (int)${px}_cand_first[g + 1], bU = 0, bX = 0, bT = 0, n = 0, same = rt->ctx_key[0] >= 0;
  key[0] = g; key[1] = nq; key[2] = dir; key[3] = exit;
  for (ph = 0; ph < 3; ph++) { key[4 + ph] = rt->prev[ph]; key[7 + ph] = rt->prev_char[ph]; }
  for (i = 0; i < 10 && same; i++) same = key[i] == rt->ctx_key[i];
  if (same) return;
  for (c = (int)${px}_cand_first[g]; c < end; c++) {
    int path[3], lines[3], unreach, stuck, cost, gates, tier, order, *row;
    if (!rt->continuous && ${px}_cand_count[c] == 4) continue;
    ${px}_static_(rt, c, qi, nq, dir, exit, path, lines, &unreach, &stuck, &cost, &gates);
    tier = cost <= 1 ? 0 : cost;
    if (n > 0) {
      order = unreach < bU ? -1 : unreach > bU ? 1 : stuck < bX ? -1 : stuck > bX ? 1 : tier < bT ? -1 : tier > bT ? 1 : 0;
      if (order > 0) continue;
      if (order < 0) n = 0;
    }
    bU = unreach; bX = stuck; bT = tier;
    row = rt->ctx_rows[n++];
    row[0] = c; row[1] = rt->continuous ? (${px}_cand_count[c] == 4 ? 0 : 1) : 0; row[2] = gates; row[3] = cost;
    for (ph = 0; ph < 3; ph++) { row[4 + ph] = path[ph]; row[7 + ph] = lines[ph]; }
  }
  /* in the order of the early stop in select_: form, gate changes, entry steps, candidate
   * (insertion sort: a few rows, at most ${PX}_MAX_TRI_CANDIDATES) */
  for (i = 1; i < n; i++) {
    int j, tmp[10];
    for (ph = 0; ph < 10; ph++) tmp[ph] = rt->ctx_rows[i][ph];
    for (j = i; j > 0; j--) {
      const int *o = rt->ctx_rows[j - 1];
      if (!(o[1] > tmp[1] || (o[1] == tmp[1] && (o[2] > tmp[2] || (o[2] == tmp[2] && (o[3] > tmp[3] || (o[3] == tmp[3] && o[0] > tmp[0]))))))) break;
      for (ph = 0; ph < 10; ph++) rt->ctx_rows[j][ph] = o[ph];
    }
    for (ph = 0; ph < 10; ph++) rt->ctx_rows[j][ph] = tmp[ph];
  }
  rt->ctx_n = n;
  rt->ctx_unreach = bU;
  for (i = 0; i < 10; i++) rt->ctx_key[i] = key[i];
}

/* The candidate of global triangle g for this period and each phase's path (see createRuntime):
 * the key, compared in order, is unreachable phases, phases left stuck for the next character,
 * chain tier (the static part, per context), then balance miss, form, clamp, line-device changes
 * weighed by current, gate changes, entry steps; ties go to the first candidate. In continuous
 * mode the first row of the best form that meets the target without a line-device change is
 * taken at once: no later row can beat it (the rows are in the order of the rest of the key). */
static int ${px}_select_(${px}_runtime *rt, int g, int qi, int nq, int dir, int exit, const double d[3], double ia, double ib, double ic, const double qm[8], double target, double tol, int best_path[3], int *unreachable)
{
  int best = -1, i, ph, order;
  double bM = 0, bF = 0, bC = 0, bL = 0, bG = 0, bS = 0;
  int big = fabs(ia) >= fabs(ib) && fabs(ia) >= fabs(ic) ? 0 : fabs(ib) >= fabs(ic) ? 1 : 2;
  double wI[3];
  wI[0] = fabs(ia); wI[1] = fabs(ib); wI[2] = fabs(ic);
  ${px}_context_(rt, g, qi, nq, dir, exit);
  for (i = 0; i < rt->ctx_n; i++) {
    const int *row = rt->ctx_rows[i];
    int c = row[0];
    double form = row[1], gates = row[2], cost = row[3], miss, clamp, line;
    miss = rt->balance ? ${px}_miss_(c, ${px}_cand_count[c], d, qm, target, tol) : 0.0;
    clamp = rt->continuous ? 0 : (${px}_cand_clamped[c] == big ? 0 : 1);
    line = wI[0] * row[7] + wI[1] * row[8] + wI[2] * row[9];
    if (rt->continuous && row[1] == rt->ctx_rows[0][1] && ((row[7] | row[8] | row[9]) == 0 || line == 0) && miss == 0) {
      best = c;
      for (ph = 0; ph < 3; ph++) best_path[ph] = row[4 + ph];
      break;
    }
    if (best >= 0) {
      order = ${px}_cmp_(miss, bM);
      if (!order) order = ${px}_cmp_(form, bF);
      if (!order) order = ${px}_cmp_(clamp, bC);
      if (!order) order = ${px}_cmp_(line, bL);
      if (!order) order = ${px}_cmp_(gates, bG);
      if (!order) order = ${px}_cmp_(cost, bS);
      if (order >= 0) continue;
    }
    best = c;
    bM = miss; bF = form; bC = clamp; bL = line; bG = gates; bS = cost;
    for (ph = 0; ph < 3; ph++) best_path[ph] = row[4 + ph];
  }
  *unreachable = rt->ctx_unreach;
  return best;
}

static inline double ${px}_split_(const ${px}_runtime *rt, int c, const double d[3], const double qm[8], double target, double tol)
{
  double q[4], dA, den, rest, x;
  if (!rt->balance) return 0.5;
  ${px}_charges_(c, 4, qm, q);
  dA = d[${px}_cand_pos[c][0]];
  den = dA * (q[0] - q[3]);
  if (!(fabs(den) > tol)) return 0.5;
  rest = d[${px}_cand_pos[c][1]] * q[1] + d[${px}_cand_pos[c][2]] * q[2] + dA * q[3];
  x = (target - rest) / den;
  return x < 0 ? 0.0 : x > 1 ? 1.0 : x;
}

static inline double ${px}_chain_level_(const ${px}_runtime *rt, int ph, int p, int qi)
{
  int i = (ph * 3 + ${px}_polarity_chars[qi][ph]) * ${PX}_PATTERN_COUNT + p;
  if (!${px}_pattern_usable[i] && rt->prev_char[ph] >= 0) i = (ph * 3 + rt->prev_char[ph]) * ${PX}_PATTERN_COUNT + p;
  return ${px}_pattern_level[i];
}

/* The chain of one-phase steps from the previous state to the entry (phases a, b, c in turn). */
static int ${px}_chain_(const ${px}_runtime *rt, int slot, int qi, const int best_path[3], ${px}_output *out)
{
  int n = 0, remaining = 0, ph, x, cur[3];
  for (ph = 0; ph < 3; ph++) {
    int to = ${px}_path_pattern[best_path[ph]][slot];
    cur[ph] = rt->prev[ph];
    if (cur[ph] < 0) cur[ph] = to;
    else if (cur[ph] != to) remaining++;
  }
  for (ph = 0; ph < 3 && remaining > 0; ph++) {
    int to = ${px}_path_pattern[best_path[ph]][slot];
    int e = rt->prev_char[ph] == ${px}_polarity_chars[qi][ph] ? 0 : 1;
    if (cur[ph] == to) continue;
    while (cur[ph] != to) {
      int row = ((e * 9 + ph * 3 + ${px}_polarity_chars[qi][ph]) * ${PX}_PATTERN_COUNT + cur[ph]) * ${PX}_PATTERN_COUNT + to;
      e = 0;
      cur[ph] = ${px}_step_next[row]; /* select_ never returns a candidate no allowed path reaches */
      if (cur[ph] == to && --remaining == 0) break;
      for (x = 0; x < 3; x++) { out->pattern[n][x] = cur[x]; out->level[n][x] = ${px}_chain_level_(rt, x, cur[x], qi); }
      out->duration[n++] = 0;
    }
  }
  return n;
}

static inline double ${px}_duration_(int c, int k, int s, const double d[3], double x)
{
  double dv = d[${px}_cand_pos[c][s]];
  if (k != 4) return dv;
  return s == 0 ? x * dv : s == 3 ? (1 - x) * dv : dv;
}

static inline void ${px}_write_(${px}_output *out, int n, int c, int s, const int best_path[3], double duration)
{
  int ph;
  for (ph = 0; ph < 3; ph++) {
    out->pattern[n][ph] = ${px}_path_pattern[best_path[ph]][s];
    out->level[n][ph] = ${px}_cand_levels[${px}_cand_level[c][3 * s + ph]];
  }
  out->duration[n] = duration;
}

/* The modulator's test for its previous triangle: every dwell at least the margin; then the dwell
 * times, normalised as the search does. */
static inline int ${px}_well_inside_(int t, double alpha, double beta, double d[3])
{
  const ${px}_real *m = ${px}_dwell[t];
  double d0 = m[0] * alpha + m[1] * beta + m[2], d1 = m[3] * alpha + m[4] * beta + m[5], d2 = m[6] * alpha + m[7] * beta + m[8], sum;
  if (!(d0 >= ${WELL_INSIDE} && d1 >= ${WELL_INSIDE} && d2 >= ${WELL_INSIDE})) return 0;
  sum = d0 + d1 + d2;
  d[0] = d0 / sum; d[1] = d1 / sum; d[2] = d2 / sum;
  return 1;
}

static int ${px}_run_(${px}_runtime *rt, double alpha, double beta, int qi, int nq, double ia, double ib, double ic, double err, ${px}_output *out, int dir, int whole)
{
  double d[3], qm[8], target, tol, rest = 1, x;
  int g, c, k, n, s, ph, exit, clamped = 0, unreachable = 0, best_path[3] = {0, 0, 0};
  out->count = 0; out->chain_steps = 0; out->held = 0; out->split = NAN; out->triangle = -1;
  if (qi < 0 || qi >= ${PX}_POLARITY_COUNT || nq < 0 || nq >= ${PX}_POLARITY_COUNT) return -1;
  /* the previous triangle of the polarity, then its neighbours: one well inside is the triangle the
   * search would find, with the same dwell times */
  g = -1;
  if (rt->last_tri[qi] >= 0) {
    int j, t0 = rt->last_tri[qi];
    if (${px}_well_inside_(t0, alpha, beta, d)) g = t0;
    for (j = 0; j < 3 && g < 0; j++) if (${px}_tri_next[t0][j] >= 0 && ${px}_well_inside_(${px}_tri_next[t0][j], alpha, beta, d)) g = ${px}_tri_next[t0][j];
    if (g >= 0) rt->last_tri[qi] = g;
  }
  if (g < 0) {
    g = ${px}_locate(qi, alpha, beta, d, &clamped);
    if (g < 0) return -1;
    rt->last_tri[qi] = clamped ? -1 : g;
  }
  out->triangle = g - ${px}_tri_first[qi];
  out->clamped = clamped;
  /* the balance target, the midpoint current of each set of phases and the tolerance of both, once
   * per call */
  target = -rt->midpoint_gain * err;
  tol = 1e-12 * (fabs(ia) + fabs(ib) + fabs(ic));
  if (rt->balance) ${px}_charge_table_(ia, ib, ic, qm);
  c = ${px}_select_(rt, g, qi, nq, dir, whole || dir == 1 ? 0 : -1, d, ia, ib, ic, qm, target, tol, best_path, &unreachable);
  if (c < 0 && rt->prev[0] < 0) return -1;
  if (c < 0 || unreachable > 0) {
    out->held = 1;
    for (ph = 0; ph < 3; ph++) { out->pattern[0][ph] = rt->prev[ph]; out->level[0][ph] = ${px}_chain_level_(rt, ph, rt->prev[ph], qi); }
    out->duration[0] = 1;
    out->count = 1;
    return out->triangle;
  }
  k = ${px}_cand_count[c];
  n = ${px}_chain_(rt, dir == 0 ? 0 : k - 1, qi, best_path, out);
  if (n > 0) {
    double tau = whole ? rt->chain_dwell : 2 * rt->chain_dwell, va = 0, vb = 0, a, b, d0, d1, d2, sum;
    const ${px}_real *m = ${px}_dwell[g];
    if (n * tau > 0.5) tau = 0.5 / n;
    for (s = 0; s < n; s++) {
      double la = out->level[s][0], lb = out->level[s][1], lc = out->level[s][2];
      out->duration[s] = tau;
      va += tau * ((2.0 / 3.0) * (la - (lb + lc) / 2));
      vb += tau * ((lb - lc) / sqrt(3.0));
    }
    rest = 1 - n * tau;
    a = (alpha - va) / rest;
    b = (beta - vb) / rest;
    d0 = fmax(0.0, m[0] * a + m[1] * b + m[2]);
    d1 = fmax(0.0, m[3] * a + m[4] * b + m[5]);
    d2 = fmax(0.0, m[6] * a + m[7] * b + m[8]);
    sum = d0 + d1 + d2;
    d[0] = sum > 0 ? d0 / sum : 1.0 / 3.0;
    d[1] = sum > 0 ? d1 / sum : 1.0 / 3.0;
    d[2] = sum > 0 ? d2 / sum : 1.0 / 3.0;
    out->chain_steps = n;
  }
  x = k == 4 ? ${px}_split_(rt, c, d, qm, target, tol) : NAN;
  out->split = x;
  if (whole) {
    for (s = 0; s < k; s++) ${px}_write_(out, n++, c, s, best_path, (rest * ${px}_duration_(c, k, s, d, x)) / (s == k - 1 ? 1 : 2));
    for (s = k - 2; s >= 0; s--) ${px}_write_(out, n++, c, s, best_path, (rest * ${px}_duration_(c, k, s, d, x)) / 2);
  } else {
    int i;
    for (i = 0; i < k; i++) { s = dir == 0 ? i : k - 1 - i; ${px}_write_(out, n++, c, s, best_path, rest * ${px}_duration_(c, k, s, d, x)); }
  }
  out->count = n;
  exit = dir == 0 && !whole ? k - 1 : 0;
  for (ph = 0; ph < 3; ph++) {
    rt->prev[ph] = ${px}_path_pattern[best_path[ph]][exit];
    rt->prev_char[ph] = ${px}_polarity_chars[qi][ph];
  }
  return out->triangle;
}

/* One whole switching period from one sample: the first half, then the same states mirrored (the
 * centre state once). Currents positive out of the leg; the midpoint error in the unit of
 * midpoint_gain; next_polarity_index: the polarity expected at the next update (the same index
 * when not known). Returns the triangle of the polarity, or -1 (nothing to apply: trip). */
static inline int ${px}_runtime_period(${px}_runtime *rt, int polarity_index, int next_polarity_index, double alpha, double beta, double ia, double ib, double ic, double midpoint_error, ${px}_output *out)
{
  rt->up = 1;
  return ${px}_run_(rt, alpha, beta, polarity_index, next_polarity_index, ia, ib, ic, midpoint_error, out, 0, 1);
}

/* One half period from its own sample (update at the carrier's peak and valley): up halves run
 * the sequence forwards, down halves backwards, alternately. */
static inline int ${px}_runtime_half(${px}_runtime *rt, int polarity_index, int next_polarity_index, double alpha, double beta, double ia, double ib, double ic, double midpoint_error, ${px}_output *out)
{
  int dir = rt->up ? 0 : 1;
  rt->up = !rt->up;
  return ${px}_run_(rt, alpha, beta, polarity_index, next_polarity_index, ia, ib, ic, midpoint_error, out, dir, 0);
}
`;
}

// The most candidates any one triangle has (at least 1: a C array is never empty).
function maxPerTriangle(first: Int32Array): number {
  let most = 1;
  for (let g = 0; g + 1 < first.length; g++) most = Math.max(most, (first[g + 1] as number) - (first[g] as number));
  return most;
}
