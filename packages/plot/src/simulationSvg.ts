import type { Simulation, WaveformSegment } from '@hexsalvage/core';
import { esc, n, STYLE, svgFrame } from './svgStyle.js';

/**
 * Device losses of one simulated period, healthy and faulted as paired horizontal bars (conduction
 * and switching stacked), sorted by the faulted total, elements without loss in either left out.
 *
 * @param s - from `simulatePeriod`
 * @returns an SVG document
 * @example
 * ```ts
 * lossBarsSvg(simulatePeriod(options));
 * ```
 */
export function lossBarsSvg(s: Simulation): string {
  const total = (d: { conductionLoss: number; switchingLoss: number } | undefined) => (d ? d.conductionLoss + d.switchingLoss : 0);
  const ids = Object.keys(s.devices)
    .filter((id) => total(s.devices[id]) > 1e-6 || total(s.healthy.devices[id]) > 1e-6)
    .sort((a, b) => total(s.devices[b]) - total(s.devices[a]) || (a < b ? -1 : 1));
  const rowH = 26;
  const L = 150;
  const R = 600;
  const T = 58;
  const H = T + rowH * ids.length + 70;
  const max = Math.max(1e-9, ...ids.flatMap((id) => [total(s.devices[id]), total(s.healthy.devices[id])]));
  const X = (w: number) => L + (w / max) * (R - L);
  const body: string[] = [];
  const step = niceStep(max);
  for (let w = 0; w <= max + 1e-9; w += step)
    body.push(
      `<line x1="${n(X(w))}" y1="${T - 4}" x2="${n(X(w))}" y2="${T + rowH * ids.length}" stroke="${STYLE.grid}"/><text x="${n(X(w))}" y="${T + rowH * ids.length + 14}" text-anchor="middle" font-size="${STYLE.smallFont}">${n(w, step < 1 ? 1 : 0)}</text>`,
    );
  ids.forEach((id, r) => {
    const y = T + r * rowH;
    const f = s.devices[id] as { conductionLoss: number; switchingLoss: number };
    const h = s.healthy.devices[id] as { conductionLoss: number; switchingLoss: number };
    body.push(`<text x="${L - 6}" y="${y + 15}" text-anchor="end" font-size="${STYLE.smallFont}">${esc(id)}</text>`);
    const bar = (cls: string, y0: number, d: { conductionLoss: number; switchingLoss: number }, cond: string, sw: string) =>
      `<rect class="${cls} conduction" x="${L}" y="${y0}" width="${n(X(d.conductionLoss) - L)}" height="9" fill="${cond}"/><rect class="${cls} switching" x="${n(X(d.conductionLoss))}" y="${y0}" width="${n(X(d.conductionLoss + d.switchingLoss) - X(d.conductionLoss))}" height="9" fill="${sw}"/>`;
    body.push(bar('healthy', y + 2, h, '#9ab7d3', '#c9dbeb'));
    body.push(bar('faulted', y + 12, f, STYLE.vermillion, '#f0b48c'));
    body.push(`<text x="${n(X(total(f)) + 4)}" y="${y + 20}" font-size="${STYLE.smallFont}">${n(total(f), 1)} W</text>`);
  });
  body.push(`<text x="${n((L + R) / 2)}" y="${T + rowH * ids.length + 32}" text-anchor="middle">loss over one fundamental period (W)</text>`);
  const ly = T - 22;
  body.push(
    `<g font-size="${STYLE.smallFont}"><rect x="${L}" y="${ly - 8}" width="14" height="9" fill="#9ab7d3"/><text x="${L + 18}" y="${ly}">healthy: conduction</text><rect x="${L + 130}" y="${ly - 8}" width="14" height="9" fill="#c9dbeb"/><text x="${L + 148}" y="${ly}">switching</text>` +
      `<rect x="${L + 230}" y="${ly - 8}" width="14" height="9" fill="${STYLE.vermillion}"/><text x="${L + 248}" y="${ly}">faulted: conduction</text><rect x="${L + 360}" y="${ly - 8}" width="14" height="9" fill="#f0b48c"/><text x="${L + 378}" y="${ly}">switching</text></g>`,
  );
  return svgFrame(
    {
      width: 660,
      height: H,
      title: `Device losses, healthy and faulted: ${s.topology}${s.faults.length ? `, ${s.faults.join(', ')}` : ''}`,
      desc: `Losses of ${ids.length} elements at m = ${n(s.m, 3)}, ${n(s.currentPeak, 1)} A peak, load angle ${n(s.loadAngleDeg, 1)}°; hottest ${s.hottest.device} ${n(s.hottest.loss, 1)} W against ${n(s.healthy.hottest.loss, 1)} W healthy; current derating ${n(100 * s.currentDerating.factor, 1)} %.`,
    },
    `<g font-size="${STYLE.fontSize}" fill="${STYLE.ink}">${body.join('\n')}</g>`,
  );
}

/** Options of {@link spectrumSvg}. */
export interface SpectrumSvgOptions {
  /** Logarithmic amplitude axis (0.01 % to 100 % of the fundamental). Default false. */
  readonly log?: boolean;
}

/**
 * The line-voltage spectrum of one simulated period: each harmonic's amplitude as a percentage of the
 * fundamental, faulted as stems and healthy as dots, with THD and WTHD of both.
 *
 * @param s - from `simulatePeriod`
 * @param options - log scale
 * @returns an SVG document
 * @example
 * ```ts
 * spectrumSvg(simulatePeriod(options), { log: true });
 * ```
 */
export function spectrumSvg(s: Simulation, options: SpectrumSvgOptions = {}): string {
  const log = options.log ?? false;
  const L = 70;
  const R = 630;
  const T = 50;
  const B = 300;
  const v1 = s.lineVoltage.fundamentalPeak || 1;
  const hv1 = s.healthy.lineVoltage.fundamentalPeak || 1;
  const nMax = s.lineVoltage.harmonics.length;
  const X = (k: number) => L + ((k - 0.5) / nMax) * (R - L);
  const lo = 0.01;
  const Y = (pct: number) =>
    log ? B - ((Math.log10(Math.max(lo, pct)) - Math.log10(lo)) / (2 - Math.log10(lo))) * (B - T) : B - (Math.min(100, pct) / 100) * (B - T);
  const body: string[] = [];
  const ticks = log ? [0.01, 0.1, 1, 10, 100] : [0, 20, 40, 60, 80, 100];
  for (const t of ticks)
    body.push(
      `<line x1="${L}" y1="${n(Y(t))}" x2="${R}" y2="${n(Y(t))}" stroke="${STYLE.grid}"/><text x="${L - 6}" y="${n(Y(t) + 4)}" text-anchor="end" font-size="${STYLE.smallFont}">${t} %</text>`,
    );
  const xs = niceStep(nMax);
  for (let k = xs; k <= nMax; k += xs) body.push(`<text x="${n(X(k))}" y="${B + 14}" text-anchor="middle" font-size="${STYLE.smallFont}">${k}</text>`);
  body.push(`<rect x="${L}" y="${T}" width="${R - L}" height="${B - T}" fill="none" stroke="${STYLE.ink}"/>`);
  const stems = s.lineVoltage.harmonics
    .filter(([, v]) => (100 * v) / v1 >= (log ? lo : 0.05))
    .map(([k, v]) => `M${n(X(k))},${n(B)} L${n(X(k))},${n(Y((100 * v) / v1))}`);
  body.push(`<path class="faulted-stems" d="${stems.join(' ')}" stroke="${STYLE.vermillion}" stroke-width="1.2" fill="none"/>`);
  const dots = s.healthy.lineVoltage.harmonics
    .filter(([, v]) => (100 * v) / hv1 >= (log ? lo : 0.05))
    .map(([k, v]) => `<circle cx="${n(X(k))}" cy="${n(Y((100 * v) / hv1))}" r="1.6" fill="${STYLE.blue}"/>`);
  body.push(`<g class="healthy-dots">${dots.join('')}</g>`);
  body.push(
    `<text x="${n((L + R) / 2)}" y="${B + 32}" text-anchor="middle">harmonic order n (frequency n·f1, f1 = ${n(s.f1, 1)} Hz; switching at n = ${s.periods})</text>`,
  );
  body.push(`<text transform="translate(16 ${n((T + B) / 2)}) rotate(-90)" text-anchor="middle">amplitude, % of the fundamental${log ? ' (log)' : ''}</text>`);
  body.push(
    `<g font-size="${STYLE.smallFont}"><line x1="${L}" y1="${B + 50}" x2="${L + 20}" y2="${B + 50}" stroke="${STYLE.vermillion}" stroke-width="1.5"/><text x="${L + 26}" y="${B + 54}">${esc(`faulted: V1 ${n(s.lineVoltage.fundamentalPeak, 1)} V peak, THD ${n(100 * s.lineVoltage.thd, 2)} %, WTHD ${n(100 * s.lineVoltage.wthd, 3)} %`)}</text>` +
      `<circle cx="${L + 10}" cy="${B + 66}" r="2" fill="${STYLE.blue}"/><text x="${L + 26}" y="${B + 70}">${esc(`healthy: V1 ${n(s.healthy.lineVoltage.fundamentalPeak, 1)} V peak, THD ${n(100 * s.healthy.lineVoltage.thd, 2)} %, WTHD ${n(100 * s.healthy.lineVoltage.wthd, 3)} %`)}</text></g>`,
  );
  return svgFrame(
    {
      width: 660,
      height: B + 84,
      title: `Line-voltage spectrum (a-b): ${s.topology}${s.faults.length ? `, ${s.faults.join(', ')}` : ''}`,
      desc: `Harmonics to order ${nMax} at m = ${n(s.m, 3)}: faulted THD ${n(100 * s.lineVoltage.thd, 2)} %, healthy ${n(100 * s.healthy.lineVoltage.thd, 2)} %.`,
    },
    `<g font-size="${STYLE.fontSize}" fill="${STYLE.ink}">${body.join('\n')}</g>`,
  );
}

/**
 * One fundamental period: the line voltage a-b (stepped, volts, left axis) and the phase currents
 * a and b (amperes, right axis).
 *
 * @param s - from `simulatePeriod`
 * @param segments - from `simulationWaveform` with the same options
 * @returns an SVG document
 * @example
 * ```ts
 * waveformsSvg(sim, simulationWaveform(options));
 * ```
 */
export function waveformsSvg(s: Simulation, segments: readonly WaveformSegment[]): string {
  const L = 70;
  const R = 590;
  const T = 50;
  const B = 300;
  const period = 1 / s.f1;
  const vMax = s.vdc * 1.05;
  // the current axis shares the voltage axis's grid lines (±Vdc, ±Vdc/2, 0): its scale is chosen so
  // that those lines fall on round currents (a step of 1, 2 or 5 times a power of ten)
  const iStep = niceAbove((s.currentPeak * 1.25) / 2);
  const iMax = (2 * iStep * vMax) / s.vdc;
  const X = (t: number) => L + (t / period) * (R - L);
  const Yv = (v: number) => (T + B) / 2 - (v / vMax) * ((B - T) / 2);
  const Yi = (i: number) => (T + B) / 2 - (i / iMax) * ((B - T) / 2);
  const body: string[] = [];
  for (const v of [-1, -0.5, 0, 0.5, 1])
    body.push(
      `<line x1="${L}" y1="${n(Yv(v * s.vdc))}" x2="${R}" y2="${n(Yv(v * s.vdc))}" stroke="${STYLE.grid}"/><text x="${L - 6}" y="${n(Yv(v * s.vdc) + 4)}" text-anchor="end" font-size="${STYLE.smallFont}">${n(v * s.vdc, 0)}</text><text x="${R + 6}" y="${n(Yv(v * s.vdc) + 4)}" font-size="${STYLE.smallFont}">${n((v * s.vdc * iMax) / vMax, 0)}</text>`,
    );
  for (let k = 0; k <= 4; k++)
    body.push(`<text x="${n(X((k * period) / 4))}" y="${B + 14}" text-anchor="middle" font-size="${STYLE.smallFont}">${n((k * period * 1000) / 4, 2)}</text>`);
  body.push(`<rect x="${L}" y="${T}" width="${R - L}" height="${B - T}" fill="none" stroke="${STYLE.ink}"/>`);
  const v = segments
    .map((g, k) => `${k ? 'L' : 'M'}${n(X(g.t0))},${n(Yv(g.phaseVolts[0] - g.phaseVolts[1]))} L${n(X(g.t1))},${n(Yv(g.phaseVolts[0] - g.phaseVolts[1]))}`)
    .join(' ');
  body.push(`<path class="line-voltage" d="${v}" fill="none" stroke="${STYLE.blue}" stroke-width="0.8"/>`);
  const w = 2 * Math.PI * s.f1;
  const phi = (s.loadAngleDeg * Math.PI) / 180;
  for (const [k, colour] of [
    [0, STYLE.vermillion],
    [1, STYLE.green],
  ] as const) {
    const pts = Array.from({ length: 241 }, (_, j) => {
      const t = (j / 240) * period;
      return `${j ? 'L' : 'M'}${n(X(t))},${n(Yi(s.currentPeak * Math.cos(w * t - phi - (k * 2 * Math.PI) / 3)))}`;
    });
    body.push(`<path class="current" d="${pts.join(' ')}" fill="none" stroke="${colour}" stroke-width="1.8"/>`);
  }
  body.push(`<text x="${n((L + R) / 2)}" y="${B + 32}" text-anchor="middle">time (ms)</text>`);
  body.push(`<text transform="translate(16 ${n((T + B) / 2)}) rotate(-90)" text-anchor="middle">line voltage a-b (V)</text>`);
  body.push(`<text transform="translate(${R + 44} ${n((T + B) / 2)}) rotate(90)" text-anchor="middle">phase current (A)</text>`);
  body.push(
    `<g font-size="${STYLE.smallFont}"><line x1="${L}" y1="${B + 50}" x2="${L + 20}" y2="${B + 50}" stroke="${STYLE.blue}"/><text x="${L + 26}" y="${B + 54}">v_ab</text><line x1="${L + 80}" y1="${B + 50}" x2="${L + 100}" y2="${B + 50}" stroke="${STYLE.vermillion}" stroke-width="1.8"/><text x="${L + 106}" y="${B + 54}">i_a</text><line x1="${L + 150}" y1="${B + 50}" x2="${L + 170}" y2="${B + 50}" stroke="${STYLE.green}" stroke-width="1.8"/><text x="${L + 176}" y="${B + 54}">i_b</text></g>`,
  );
  return svgFrame(
    {
      width: 660,
      height: B + 68,
      title: `One fundamental period: ${s.topology}${s.faults.length ? `, ${s.faults.join(', ')}` : ''}`,
      desc: `Line voltage a-b over ${n(period * 1000, 2)} ms at m = ${n(s.m, 3)}, Vdc ${n(s.vdc, 0)} V, and phase currents a and b of ${n(s.currentPeak, 1)} A peak lagging by ${n(s.loadAngleDeg, 1)}°.`,
    },
    `<g font-size="${STYLE.fontSize}" fill="${STYLE.ink}">${body.join('\n')}</g>`,
  );
}

// The smallest 1, 2 or 5 times a power of ten at or above x.
function niceAbove(x: number): number {
  const p = 10 ** Math.floor(Math.log10(x > 0 ? x : 1));
  const f = x / p;
  return (f <= 1 ? 1 : f <= 2 ? 2 : f <= 5 ? 5 : 10) * p;
}

function niceStep(span: number): number {
  const raw = span / 6;
  const p = 10 ** Math.floor(Math.log10(raw || 1));
  const f = raw / p;
  return (f < 1.5 ? 1 : f < 3.5 ? 2 : f < 7.5 ? 5 : 10) * p;
}
