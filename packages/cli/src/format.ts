import { levelNotation, lineRmsVolts, phasePeakVolts, type ClaimVerdict } from '@hexsalvage/core';

/**
 * Renders rows as a left-aligned text table with a header rule.
 *
 * @param header - column titles
 * @param rows - cells as text
 * @returns the table, one line per row, no trailing newline
 * @example
 * ```ts
 * textTable(['a', 'b'], [['1', '2']]);
 * ```
 */
export function textTable(header: readonly string[], rows: readonly (readonly string[])[]): string {
  const widths = header.map((h, i) => Math.max(h.length, ...rows.map((r) => (r[i] ?? '').length)));
  const line = (cells: readonly string[]) =>
    cells
      .map((c, i) => c.padEnd(widths[i] as number))
      .join('  ')
      .trimEnd();
  return [line(header), widths.map((w) => '-'.repeat(w)).join('  '), ...rows.map(line)].join('\n');
}

/**
 * One level in the leg's notation (`levelNotation`): P/O/N on a leg with exactly those levels,
 * a signed number of Vdc/2 otherwise; `open` for an interrupted current.
 *
 * @param level - a DC potential, or null
 * @param dcLevels - the leg's DC potentials
 * @returns text
 * @example
 * ```ts
 * levelText(1, [-1, 0, 1]); // 'P'
 * ```
 */
export function levelText(level: number | null, dcLevels: readonly number[]): string {
  return level === null ? 'open' : levelNotation(dcLevels).level(level);
}

/**
 * A vector (level triplet of phases a, b, c) in the leg's notation.
 *
 * @param t - the triplet
 * @param dcLevels - the leg's DC potentials
 * @returns e.g. `PON`, or `+0.5/0/-1` on a five-level leg
 * @example
 * ```ts
 * tripletText([1, 0, -1], [-1, 0, 1]); // 'PON'
 * ```
 */
export function tripletText(t: readonly number[], dcLevels: readonly number[]): string {
  return levelNotation(dcLevels).triplet(t);
}

/**
 * A number at fixed precision without a negative zero.
 *
 * @param x - value
 * @param digits - decimals (default 4)
 * @returns the text
 * @example
 * ```ts
 * fmt(-0.00001, 3); // '0.000'
 * ```
 */
export function fmt(x: number, digits = 4): string {
  const s = x.toFixed(digits);
  return /^-0\.?0*$/.test(s) ? s.slice(1) : s;
}

/** The caution block printed under every readable review output. */
export function cautionBlock(cautions: readonly string[]): string {
  return ['', 'Cautions:', ...cautions.map((c) => `  ! ${c}`)].join('\n');
}

/**
 * A modulation index in volts, for text beside the per-unit figure.
 *
 * @param m - modulation index (units of Vdc/2)
 * @param vdc - total DC-link voltage in volts, or undefined (then empty)
 * @returns e.g. ` = 265 V line-to-line RMS (217 V phase peak)`
 * @example
 * ```ts
 * voltsText(0.5774, 750);
 * ```
 */
export function voltsText(m: number, vdc: number | undefined): string {
  if (vdc === undefined) return '';
  return ` = ${fmt(lineRmsVolts(m, vdc), 1)} V line-to-line RMS (${fmt(phasePeakVolts(m, vdc), 1)} V phase peak)`;
}

/**
 * The rules of a verdict in a few words, saying when the rating check checked nothing or only
 * part of the leg (devices without a rating pass unchecked).
 *
 * @param v - a verdict
 * @returns e.g. `ratings, commutable` or `ratings NOT checked (no device rated), commutable`
 * @example
 * ```ts
 * claimRulesText(evaluateClaim(claim));
 * ```
 */
export function claimRulesText(v: ClaimVerdict): string {
  const ratings = !v.rules.ratings
    ? 'ratings IGNORED'
    : v.unrated.length === 0
      ? 'ratings'
      : v.unrated.length >= v.deviceCount
        ? 'ratings NOT checked (no device rated)'
        : `ratings (unrated, not checked: ${v.unrated.join(', ')})`;
  return `${ratings}, ${v.rules.levelSteps}`;
}
