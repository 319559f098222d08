import { lineRmsVolts, phasePeakVolts } from '@hexsalvage/core';

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
  const line = (cells: readonly string[]) => cells.map((c, i) => c.padEnd(widths[i] as number)).join('  ').trimEnd();
  return [line(header), widths.map((w) => '-'.repeat(w)).join('  '), ...rows.map(line)].join('\n');
}

/**
 * A level in units of Vdc/2 as a short text: the P/O/N letter for ±1 and 0, else the number.
 *
 * @param level - potential, or null for an interrupted current
 * @returns e.g. `P`, `O`, `N`, `+0.5`, or `open` for null
 * @example
 * ```ts
 * levelText(1); // 'P'
 * ```
 */
export function levelText(level: number | null): string {
  if (level === null) return 'open';
  if (level === 1) return 'P';
  if (level === 0) return 'O';
  if (level === -1) return 'N';
  return `${level > 0 ? '+' : ''}${fmt(level, 3)}`;
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
