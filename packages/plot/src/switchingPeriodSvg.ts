import { levelNotation, type LegState, type TableTriangle } from '@hexsalvage/core';
import { esc, n, STYLE, svgFrame } from './svgStyle.js';

/** Options of {@link switchingPeriodSvg}. */
export interface SwitchingPeriodOptions {
  /** Dwell times of the triangle's vertices (vertex order). Default: the centroid (⅓ each). */
  readonly dwell?: readonly [number, number, number];
  /** Switch ids of the leg (gate rows drawn for each phase). */
  readonly switches: readonly string[];
  /** DC potentials, ascending, for the level axis. */
  readonly levels: readonly number[];
  readonly title?: string;
}

/**
 * One centre-aligned switching period of a triangle: each phase's level over the period and the
 * gate signal of every switch, with the gate changes per period counted beside each row.
 *
 * @param tri - a triangle of the switching table
 * @param options - dwell times, switch ids, level axis
 * @returns an SVG document
 * @example
 * ```ts
 * switchingPeriodSvg(table.polarities['+--'].tableTriangles[3], { switches, levels: table.levels });
 * ```
 */
export function switchingPeriodSvg(tri: TableTriangle, options: SwitchingPeriodOptions): string {
  const seq = tri.sequence;
  const W = 640;
  const L = 150;
  const R = W - 70;
  const dwell = options.dwell ?? [1 / 3, 1 / 3, 1 / 3];
  const body: string[] = [];
  const note = levelNotation(options.levels);
  if (!seq) {
    return svgFrame({ width: W, height: 120, title: options.title ?? 'Switching period', desc: 'This triangle has no realisable sequence.' }, `<text x="12" y="60">No sequence: a vertex cannot be realised.</text>`);
  }
  // segments: s1 s2 s3 s2 s1 with half dwell on each side of the centre
  const order = seq.order;
  const part = [dwell[order[0]]! / 2, dwell[order[1]]! / 2, dwell[order[2]]!, dwell[order[1]]! / 2, dwell[order[0]]! / 2];
  const states: LegState[] = [seq.states[0], seq.states[1], seq.states[2], seq.states[1], seq.states[0]];
  const edges = [0];
  for (const p of part) edges.push((edges[edges.length - 1] as number) + p);
  const X = (t: number) => n(L + t * (R - L));
  let y = 44;
  const lo = Math.min(...options.levels);
  const hi = Math.max(...options.levels);
  const levelRow = 54;
  for (let k = 0; k < 3; k++) {
    const ph = 'abc'[k] as string;
    const Y = (l: number) => n(y + levelRow - 6 - ((l - lo) / (hi - lo || 1)) * (levelRow - 14));
    body.push(`<text x="12" y="${n(y + levelRow / 2)}" font-weight="bold">phase ${ph} level</text>`);
    for (const l of options.levels) body.push(`<line x1="${L}" y1="${Y(l)}" x2="${R}" y2="${Y(l)}" stroke="${STYLE.grid}"/><text x="${L - 6}" y="${n(Number(Y(l)) + 3)}" text-anchor="end" font-size="${STYLE.smallFont}">${esc(note.level(l))}</text>`);
    const d = states.map((s, i) => `${i ? 'L' : 'M'}${X(edges[i] as number)},${Y(s[k]!.level)} L${X(edges[i + 1] as number)},${Y(s[k]!.level)}`).join(' ');
    body.push(`<path class="level-trace" d="${d}" fill="none" stroke="${STYLE.blue}" stroke-width="2"/>`);
    y += levelRow;
    for (const sw of options.switches) {
      const changes = seq.gateChanges[`${ph}.${sw}`] ?? 0;
      body.push(`<text x="24" y="${n(y + 11)}" font-size="${STYLE.smallFont}">${esc(`${ph}.${sw}`)}</text>`);
      body.push(`<line x1="${L}" y1="${n(y + 12)}" x2="${R}" y2="${n(y + 12)}" stroke="${STYLE.grid}"/>`);
      states.forEach((s, i) => {
        if (s[k]!.gates.includes(sw)) body.push(`<rect class="gate-on" x="${X(edges[i] as number)}" y="${n(y + 3)}" width="${n(Number(X(edges[i + 1] as number)) - Number(X(edges[i] as number)))}" height="9" fill="${STYLE.ink}"/>`);
      });
      body.push(`<text x="${R + 6}" y="${n(y + 11)}" font-size="${STYLE.smallFont}" fill="${changes ? STYLE.vermillion : STYLE.ink}">${changes} ch.</text>`);
      y += 15;
    }
    y += 8;
  }
  for (let i = 0; i < edges.length; i++) body.push(`<line x1="${X(edges[i] as number)}" y1="40" x2="${X(edges[i] as number)}" y2="${n(y)}" stroke="${STYLE.faint}" stroke-dasharray="2 2"/>`);
  const names = states.map((s) => note.triplet(s.map((x) => x.level)));
  // state names under each segment, where there is room for them
  states.forEach((_, i) => Number(X(edges[i + 1] as number)) - Number(X(edges[i] as number)) >= 28 && body.push(`<text x="${n((Number(X(edges[i] as number)) + Number(X(edges[i + 1] as number))) / 2)}" y="${n(y + 14)}" text-anchor="middle" font-size="${STYLE.smallFont}">${esc(names[i] as string)}</text>`));
  body.push(`<text x="${n((L + R) / 2)}" y="${n(y + 28)}" text-anchor="middle" font-size="${STYLE.smallFont}">time within one switching period (start, centre, end); segment widths are the dwell times</text>`);
  body.push(`<text x="12" y="${n(y + 44)}" font-size="${STYLE.smallFont}">"n ch." = gate changes of that device in one period (non-zero in red-orange).</text>`);
  body.push(`<text x="12" y="${n(y + 58)}" font-size="${STYLE.smallFont}">${esc(`Levels: ${note.legend}.`)}</text>`);
  y += 30;
  body.push(`<text x="12" y="${n(y + 44)}" font-size="${STYLE.smallFont}">One switching period, centre-aligned. ${seq.totalGateChanges} gate changes per period${seq.lineDevicesSwitching.length ? `; LINE-RATE DEVICES AT PWM: ${esc(seq.lineDevicesSwitching.join(', '))}` : ''}${seq.levelJumps.length ? '; LEVEL JUMP' : ''}.</text>`);
  return svgFrame({
    width: W,
    height: Math.round(y + 60),
    title: options.title ?? 'Switching period',
    desc: `Sequence ${names.join(' > ')}, ${seq.totalGateChanges} gate changes per period.`,
  }, body.join('\n'));
}
