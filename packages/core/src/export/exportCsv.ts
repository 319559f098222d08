import { requireTable } from '../shared/validate.js';
import type { TableTriangle } from '../table/polarityTable.js';
import type { SwitchingTable } from '../table/switchingTable.js';

/** CSV columns of {@link exportCsv}, in order (documented in docs/table.md). */
export const CSV_COLUMNS = [
  'polarity_index',
  'polarity',
  'triangle',
  'vertex',
  'sequence_position',
  'alpha',
  'beta',
  'vector_class',
  'la',
  'lb',
  'lc',
  'pattern_a',
  'pattern_b',
  'pattern_c',
  'np_a',
  'np_b',
  'np_c',
  'common_mode',
  'dwell_alpha',
  'dwell_beta',
  'dwell_const',
  'np_authority',
  'np_authority_lost',
  'line_devices_at_pwm',
  'level_jumps',
] as const;

/**
 * The switching table as CSV: one row per polarity × triangle × vertex, with the realisation the
 * switching sequence applies (levels, pattern per phase), the vertex's row of the dwell matrix
 * (`d = dwell_alpha·α + dwell_beta·β + dwell_const`) and the triangle's flags.
 *
 * @param table - from `switchingTable`
 * @returns CSV text with a header line, `\n` line ends, numbers at 9 decimals
 * @example
 * ```ts
 * fs.writeFileSync('table.csv', exportCsv(switchingTable({ topology: 'npc', faults: ['a.outerUpper'] })));
 * ```
 */
export function exportCsv(table: SwitchingTable): string {
  requireTable(table, 'exportCsv');
  const rows: string[] = [CSV_COLUMNS.join(',')];
  for (const pol of table.polarityOrder) {
    const p = table.polarities[pol];
    if (!p) continue;
    p.tableTriangles.forEach((tri: TableTriangle, t) => {
      const seq = tri.sequence;
      tri.vertices.forEach((v, k) => {
        const position = seq ? seq.order.indexOf(k) : -1;
        const state = seq ? seq.states[position] : v.realisations[0]?.phases;
        const rz = seq ? v.realisations[seq.choice[k] as number] : v.realisations[0];
        const m = tri.dwell[k as 0 | 1 | 2];
        rows.push(
          [
            p.index,
            pol,
            t,
            k,
            position + 1,
            num(v.alpha),
            num(v.beta),
            v.class,
            ...(rz?.levels ?? ['', '', '']).map(String),
            ...(state ?? []).map((s) => csvText(s.pattern)),
            ...(rz?.midpoint ?? ['', '', '']).map(String),
            num(rz?.commonMode ?? NaN),
            num(m[0]),
            num(m[1]),
            num(m[2]),
            tri.midpointAuthority,
            tri.authorityLost ? 1 : 0,
            csvText((seq?.lineDevicesSwitching ?? []).join(';')),
            (seq?.levelJumps ?? []).map((j) => `${j.phase}:${j.from}>${j.to}`).join(';'),
          ]
            .map(csvCell)
            .join(','),
        );
      });
    });
  }
  return `${rows.join('\n')}\n`;
}

function num(x: number): string {
  if (!Number.isFinite(x)) return '';
  const s = x.toFixed(9);
  return /^-0\.0+$/.test(s) ? s.slice(1) : s;
}

/**
 * One CSV cell (RFC 4180): quoted, with quotes doubled, when it holds a comma, a quote, CR or LF.
 *
 * @param x - the cell's value
 * @returns the cell as written
 * @example
 * ```ts
 * csvCell('a,b'); // '"a,b"'
 * ```
 */
export function csvCell(x: unknown): string {
  const s = String(x);
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/**
 * A cell of free text (a name from a netlist or a fault string): one that a spreadsheet would read
 * as a formula (starting with =, +, -, @, a tab or CR) gets a leading apostrophe. Numbers and
 * polarity strings are written as they are. Quote it with {@link csvCell} after.
 *
 * @param s - the text
 * @returns the text, safe to open in a spreadsheet
 * @example
 * ```ts
 * csvText('=HYPERLINK("x")'); // "'=HYPERLINK(\"x\")"
 * ```
 */
export function csvText(s: string): string {
  return /^[=+\-@\t\r]/.test(s) ? `'${s}` : s;
}
