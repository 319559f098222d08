import { levelNotation, type SampledPeriod } from '@hexsalvage/core';
import { esc, n, STYLE, svgFrame } from './svgStyle.js';

/** Options of {@link switchingPeriodSvg}. */
export interface SwitchingPeriodOptions {
  /** Switch ids of the leg (gate rows drawn for each phase). */
  readonly switches: readonly string[];
  /** DC potentials, ascending, for the level axis. */
  readonly levels: readonly number[];
  /** Devices meant to switch at line frequency (their changes are named). */
  readonly lineDevices?: readonly string[];
  readonly title?: string;
}

/**
 * One centre-aligned switching period as the runtime applies it: each phase's level over the
 * period and the gate signal of every switch, with the gate changes per period counted beside
 * each row (a period begins and ends in the same state, so every change is counted once).
 *
 * @param period - from `samplePeriod`
 * @param options - switch ids, level axis
 * @returns an SVG document
 * @example
 * ```ts
 * switchingPeriodSvg(samplePeriod(table, { alpha: 0.5, beta: 0.2, polarity: '+--' }), { switches, levels: table.levels });
 * ```
 */
export function switchingPeriodSvg(period: SampledPeriod, options: SwitchingPeriodOptions): string {
  const W = 640;
  const L = 150;
  const R = W - 70;
  const body: string[] = [];
  const note = levelNotation(options.levels);
  const states = period.states;
  if (states.length === 0) {
    return svgFrame(
      { width: W, height: 120, title: options.title ?? 'Switching period', desc: 'No switching period: the polarity has no triangle here.' },
      `<text x="12" y="60">No switching period: the polarity ${esc(period.polarity)} has no triangle to run here.</text>`,
    );
  }
  const edges = [0];
  for (const s of states) edges.push((edges[edges.length - 1] as number) + s.duration);
  const span = (edges[edges.length - 1] as number) || 1;
  const X = (t: number) => n(L + (t / span) * (R - L));
  // gate changes per device over the period: between consecutive states (it ends where it began)
  const changes = new Map<string, number>();
  let total = 0;
  for (let i = 0; i + 1 < states.length; i++) {
    for (let k = 0; k < 3; k++) {
      const a = states[i]!.gates[k]!;
      const b = states[i + 1]!.gates[k]!;
      for (const g of new Set([...a, ...b])) {
        if (a.includes(g) === b.includes(g)) continue;
        const key = `${'abc'[k]}.${g}`;
        changes.set(key, (changes.get(key) ?? 0) + 1);
        total++;
      }
    }
  }
  const line = new Set(options.lineDevices ?? []);
  const lineChanging = [...changes.keys()].filter((k) => line.has(k.slice(2)));
  let y = 44;
  const lo = Math.min(...options.levels);
  const hi = Math.max(...options.levels);
  const levelRow = 54;
  for (let k = 0; k < 3; k++) {
    const ph = 'abc'[k] as string;
    const Y = (l: number) => n(y + levelRow - 6 - ((l - lo) / (hi - lo || 1)) * (levelRow - 14));
    body.push(`<text x="12" y="${n(y + levelRow / 2)}" font-weight="bold">phase ${ph} level</text>`);
    for (const l of options.levels)
      body.push(
        `<line x1="${L}" y1="${Y(l)}" x2="${R}" y2="${Y(l)}" stroke="${STYLE.grid}"/><text x="${L - 6}" y="${n(Number(Y(l)) + 3)}" text-anchor="end" font-size="${STYLE.smallFont}">${esc(note.level(l))}</text>`,
      );
    const d = states
      .map((s, i) => `${i ? 'L' : 'M'}${X(edges[i] as number)},${Y(s.levels[k] as number)} L${X(edges[i + 1] as number)},${Y(s.levels[k] as number)}`)
      .join(' ');
    body.push(`<path class="level-trace" d="${d}" fill="none" stroke="${STYLE.blue}" stroke-width="2"/>`);
    y += levelRow;
    for (const sw of options.switches) {
      const c = changes.get(`${ph}.${sw}`) ?? 0;
      body.push(`<text x="24" y="${n(y + 11)}" font-size="${STYLE.smallFont}">${esc(`${ph}.${sw}`)}</text>`);
      body.push(`<line x1="${L}" y1="${n(y + 12)}" x2="${R}" y2="${n(y + 12)}" stroke="${STYLE.grid}"/>`);
      states.forEach((s, i) => {
        if (s.gates[k]!.includes(sw))
          body.push(
            `<rect class="gate-on" x="${X(edges[i] as number)}" y="${n(y + 3)}" width="${n(Number(X(edges[i + 1] as number)) - Number(X(edges[i] as number)))}" height="9" fill="${STYLE.ink}"/>`,
          );
      });
      body.push(`<text x="${R + 6}" y="${n(y + 11)}" font-size="${STYLE.smallFont}" fill="${c ? STYLE.vermillion : STYLE.ink}">${c} ch.</text>`);
      y += 15;
    }
    y += 8;
  }
  for (let i = 0; i < edges.length; i++)
    body.push(`<line x1="${X(edges[i] as number)}" y1="40" x2="${X(edges[i] as number)}" y2="${n(y)}" stroke="${STYLE.faint}" stroke-dasharray="2 2"/>`);
  const names = states.map((s) => note.triplet([...s.levels]));
  // state names under each segment, where there is room for them
  states.forEach(
    (_, i) =>
      Number(X(edges[i + 1] as number)) - Number(X(edges[i] as number)) >= 28 &&
      body.push(
        `<text x="${n((Number(X(edges[i] as number)) + Number(X(edges[i + 1] as number))) / 2)}" y="${n(y + 14)}" text-anchor="middle" font-size="${STYLE.smallFont}">${esc(names[i] as string)}</text>`,
      ),
  );
  body.push(
    `<text x="${n((L + R) / 2)}" y="${n(y + 28)}" text-anchor="middle" font-size="${STYLE.smallFont}">time within one switching period (start, centre, end); segment widths are the dwell times</text>`,
  );
  body.push(
    `<text x="12" y="${n(y + 44)}" font-size="${STYLE.smallFont}">"n ch." = gate changes of that device in one period (non-zero in red-orange).</text>`,
  );
  body.push(`<text x="12" y="${n(y + 58)}" font-size="${STYLE.smallFont}">${esc(`Levels: ${note.legend}.`)}</text>`);
  y += 30;
  const split = Number.isNaN(period.split) ? 'three states' : `a redundant vertex split ${n(100 * period.split)} % / ${n(100 - 100 * period.split)} %`;
  body.push(
    `<text x="12" y="${n(y + 44)}" font-size="${STYLE.smallFont}">${esc(`One switching period as the runtime applies it (${split}); ${total} gate changes per period.`)}</text>`,
  );
  const warnings = [
    ...(lineChanging.length ? [`LINE-RATE DEVICES SWITCHED IN THE PERIOD: ${lineChanging.join(', ')}`] : []),
    ...(period.held ? ['HELD: no safe way into this triangle; the runtime keeps its state'] : []),
  ];
  warnings.forEach((w, i) => body.push(`<text x="12" y="${n(y + 58 + 14 * i)}" font-size="${STYLE.smallFont}" fill="${STYLE.vermillion}">${esc(w)}</text>`));
  y += 14 * warnings.length;
  return svgFrame(
    {
      width: W,
      height: Math.round(y + 60),
      title: options.title ?? 'Switching period',
      desc: `Sequence ${names.join(' > ')}, ${total} gate changes per period.`,
    },
    body.join('\n'),
  );
}
