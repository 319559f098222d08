import { lineRmsVolts, type DeratingPoint } from '@hexsalvage/core';
import { esc, n, STYLE, svgFrame } from './svgStyle.js';

/** One fault case of a derating plot. */
export interface DeratingSeries {
  readonly label: string;
  readonly points: readonly DeratingPoint[];
}

/** Options of {@link deratingCurveSvg}. */
export interface DeratingCurveSvgOptions {
  /** Healthy limit drawn as the reference line. Default 2/√3. */
  readonly healthy?: number;
  readonly title?: string;
  /** The operating load angle, degrees: marked with a vertical line. */
  readonly operatingDeg?: number;
  /** The operating load-angle range [LO, HI], degrees: shaded. */
  readonly bandDeg?: readonly [number, number];
  /** Total DC-link voltage in volts: the mMax ticks also read in line-to-line RMS volts. */
  readonly vdc?: number;
}

const COLOURS = [STYLE.blue, STYLE.vermillion, STYLE.green, STYLE.purple, STYLE.orange, STYLE.sky];
const DASHES = ['', '6 3', '2 2', '8 3 2 3', '4 4', '1 3'];

/**
 * mMax versus load angle for one or several fault cases, with the derating ratio on a second axis,
 * the healthy limit as reference and breakpoints marked. Series differ by colour and dash pattern.
 * Where the safe limit lies below the convex-hull bound, that bound is drawn as a
 * thin dotted line of the same colour, so a reviewer sees what the geometry alone would promise.
 *
 * @param series - fault cases (points from `deratingCurve`)
 * @param options - healthy reference, title
 * @returns an SVG document
 * @example
 * ```ts
 * deratingCurveSvg([{ label: 'a.outerUpper', points: deratingCurve(atlas) }]);
 * ```
 */
export function deratingCurveSvg(series: readonly DeratingSeries[], options: DeratingCurveSvgOptions = {}): string {
  const healthy = options.healthy ?? 2 / Math.sqrt(3);
  const W = 640;
  // two legend columns, or one when an entry carries a note (it needs the width)
  const noted =
    series.some((s) => s.points.every((p) => p.mMax <= 1e-9 || Math.abs(p.mMax - healthy) <= 1e-9)) ||
    series.some((s, i) =>
      series.some(
        (t, j) => j < i && t.points.length === s.points.length && t.points.every((p, k) => Math.abs(p.mMax - (s.points[k] as DeratingPoint).mMax) <= 1e-9),
      ),
    );
  const cols = noted ? 1 : 2;
  const legendRows = Math.ceil(series.length / cols) + 1;
  const H = 344 + 14 * legendRows + (options.operatingDeg !== undefined || options.bandDeg ? 14 : 0);
  const L = 64;
  const R = W - 64;
  const T = 40;
  const B = 294;
  const xs = series.flatMap((s) => s.points.map((p) => p.loadAngleDeg));
  const x0 = Math.min(...xs, -90);
  const x1 = Math.max(...xs, 90);
  const ymax = healthy * 1.1;
  const X = (x: number) => n(L + ((x - x0) / (x1 - x0)) * (R - L));
  const Y = (y: number) => n(B - (y / ymax) * (B - T));
  const body: string[] = [];
  // grid and axes
  const xt = tickStep(x1 - x0);
  for (let x = Math.ceil(x0 / xt) * xt; x <= x1 + 1e-9; x += xt) {
    body.push(
      `<line x1="${X(x)}" y1="${Y(0)}" x2="${X(x)}" y2="${Y(ymax)}" stroke="${STYLE.grid}"/><text class="tick" x="${X(x)}" y="${n(B + 16)}" text-anchor="middle">${n(x, 0)}</text>`,
    );
  }
  const vdc = options.vdc;
  for (let y = 0; y <= ymax + 1e-9; y += 0.2) {
    body.push(
      `<line x1="${L}" y1="${Y(y)}" x2="${R}" y2="${Y(y)}" stroke="${STYLE.grid}"/><text class="tick" x="${L - 6}" y="${n(Number(Y(y)) + 4)}" text-anchor="end">${n(y, 1)}</text>`,
    );
    // second scale in volts: line-to-line RMS at this DC link, inside the frame on the left
    if (vdc !== undefined && y > 0)
      body.push(
        `<text class="tick volts" x="${R - 4}" y="${n(Number(Y(y)) - 3)}" text-anchor="end" font-size="${STYLE.smallFont}" fill="#555555">${n(lineRmsVolts(y, vdc), 0)} V</text>`,
      );
  }
  // the operating range, shaded, and the operating point, a vertical line
  if (options.bandDeg) {
    const [b0, b1] = options.bandDeg;
    body.push(
      `<rect class="operating-band" x="${X(Math.max(x0, b0))}" y="${T}" width="${n(Math.max(0, Number(X(Math.min(x1, b1))) - Number(X(Math.max(x0, b0)))))}" height="${B - T}" fill="${STYLE.yellow}" fill-opacity="0.22"/>`,
    );
  }
  if (options.operatingDeg !== undefined)
    body.push(
      `<line class="operating-point" x1="${X(options.operatingDeg)}" y1="${T}" x2="${X(options.operatingDeg)}" y2="${B}" stroke="${STYLE.ink}" stroke-width="1.2" stroke-dasharray="6 2 1 2"/>`,
    );
  for (let q = 0; q <= 1.0001; q += 0.25) body.push(`<text class="tick ratio" x="${R + 6}" y="${n(Number(Y(q * healthy)) + 4)}">${n(q * 100, 0)}%</text>`);
  body.push(`<rect x="${L}" y="${T}" width="${R - L}" height="${B - T}" fill="none" stroke="${STYLE.ink}"/>`);
  body.push(`<text x="${n((L + R) / 2)}" y="${n(B + 34)}" text-anchor="middle">load angle φ (degrees, positive = current lagging)</text>`);
  body.push(
    `<text transform="translate(18 ${n((T + B) / 2)}) rotate(-90)" text-anchor="middle">${vdc === undefined ? 'mMax (peak phase voltage / (Vdc/2))' : `mMax (Vdc/2 units); grey: line V rms, Vdc ${n(vdc, 0)} V`}</text>`,
  );
  body.push(`<text transform="translate(${W - 10} ${n((T + B) / 2)}) rotate(90)" text-anchor="middle">derating ratio mMax / healthy</text>`);
  // the convex-hull bound, thin and faint, wherever it differs from the safe limit
  const hullShown = series.some((s) => s.points.some((p) => Math.abs(p.mMaxHull - p.mMax) > 1e-9));
  // lines that lie on others would vanish: say so in the legend and on the plot
  const same = (a: readonly number[], b: readonly number[]) => a.length === b.length && a.every((v, j) => Math.abs(v - (b[j] as number)) <= 1e-9);
  const curves = series.map((s) => s.points.map((p) => p.mMax));
  const notes = series.map((_, i) => {
    if (curves[i]?.every((m) => m <= 1e-9)) return 'cannot run (mMax = 0, on the axis)';
    if (curves[i]?.every((m) => Math.abs(m - healthy) <= 1e-9)) return 'on the healthy line';
    const k = series.findIndex((_, j) => j < i && same(curves[j] as number[], curves[i] as number[]));
    return k >= 0 ? `on the line of ${series[k]?.label}` : '';
  });
  const hullOnHealthy = series
    .filter((s) => s.points.some((p) => Math.abs(p.mMaxHull - p.mMax) > 1e-9) && s.points.every((p) => Math.abs(p.mMaxHull - healthy) <= 1e-9))
    .map((s) => s.label);
  const cannot = series.filter((_, i) => notes[i]?.startsWith('cannot run')).map((s) => s.label);
  series.forEach((s, i) => {
    const c = COLOURS[i % COLOURS.length] as string;
    const dash = DASHES[i % DASHES.length] as string;
    if (s.points.some((p) => Math.abs(p.mMaxHull - p.mMax) > 1e-9)) {
      const h = s.points.map((p, j) => `${j ? 'L' : 'M'}${X(p.loadAngleDeg)},${Y(p.mMaxHull)}`).join(' ');
      body.push(`<path class="hull-series" d="${h}" fill="none" stroke="${c}" stroke-width="1" stroke-opacity="0.6" stroke-dasharray="1 3"/>`);
    }
    const d = s.points.map((p, j) => `${j ? 'L' : 'M'}${X(p.loadAngleDeg)},${Y(p.mMax)}`).join(' ');
    body.push(`<path class="series" d="${d}" fill="none" stroke="${c}" stroke-width="2"${dash ? ` stroke-dasharray="${dash}"` : ''}/>`);
    for (const p of s.points.filter((q) => q.breakpoint))
      body.push(`<circle class="breakpoint" cx="${X(p.loadAngleDeg)}" cy="${Y(p.mMax)}" r="2.6" fill="#fff" stroke="${c}" stroke-width="1.4"/>`);
    const ly = B + 56 + Math.floor(i / cols) * 14;
    const lx = L + (i % cols) * 270;
    body.push(
      `<line x1="${lx}" y1="${ly}" x2="${lx + 26}" y2="${ly}" stroke="${c}" stroke-width="2"${dash ? ` stroke-dasharray="${dash}"` : ''}/><text x="${lx + 32}" y="${ly + 4}">${esc(s.label)}${notes[i] ? `<tspan font-size="${STYLE.smallFont}" fill="#555555">${esc(`\u00a0\u2014 ${notes[i]}`)}</tspan>` : ''}</text>`,
    );
  });
  // the healthy reference last, so that no series (a healthy one compared, say) hides it
  body.push(
    `<line class="healthy" x1="${L}" y1="${Y(healthy)}" x2="${R}" y2="${Y(healthy)}" stroke="${STYLE.ink}" stroke-dasharray="3 3"/><text x="${L + 4}" y="${n(Number(Y(healthy)) - 4)}" font-size="${STYLE.smallFont}">healthy ${n(healthy, 4)}</text>`,
  );
  if (hullOnHealthy.length)
    body.push(
      `<text class="hull-on-healthy" x="${R - 4}" y="${n(Number(Y(healthy)) + 13)}" text-anchor="end" font-size="${STYLE.smallFont}">${esc(`convex-hull bound of ${hullOnHealthy.join(', ')}: on the healthy line (not safe)`)}</text>`,
    );
  if (cannot.length)
    body.push(
      `<text class="cannot-run" x="${L + 6}" y="${B - 6}" font-size="${STYLE.smallFont}" font-weight="bold" fill="${STYLE.vermillion}">${esc(`cannot run at any load angle: ${cannot.join(', ')}`)}</text>`,
    );
  const by = B + 56 + (legendRows - 1) * 14;
  // legend entries only for what is drawn
  if (series.some((s) => s.points.some((p) => p.breakpoint)))
    body.push(
      `<g font-size="${STYLE.smallFont}"><circle cx="${L + 13}" cy="${by}" r="2.6" fill="#fff" stroke="${STYLE.ink}"/><text x="${L + 32}" y="${by + 4}">computed breakpoint (a kink of the curve)</text></g>`,
    );
  const oy = by + 14;
  if (options.operatingDeg !== undefined)
    body.push(
      `<g font-size="${STYLE.smallFont}"><line x1="${L}" y1="${oy}" x2="${L + 26}" y2="${oy}" stroke="${STYLE.ink}" stroke-width="1.2" stroke-dasharray="6 2 1 2"/><text x="${L + 32}" y="${oy + 4}">operating load angle ${n(options.operatingDeg, 1)}°</text></g>`,
    );
  if (options.bandDeg)
    body.push(
      `<g font-size="${STYLE.smallFont}"><rect x="${L + 270}" y="${oy - 5}" width="26" height="10" fill="${STYLE.yellow}" fill-opacity="0.4"/><text x="${L + 302}" y="${oy + 4}">operating range ${n(options.bandDeg[0], 1)}° to ${n(options.bandDeg[1], 1)}°</text></g>`,
    );
  if (hullShown)
    body.push(
      `<g font-size="${STYLE.smallFont}"><line x1="${L + 270}" y1="${by}" x2="${L + 296}" y2="${by}" stroke="${STYLE.ink}" stroke-width="1" stroke-dasharray="1 3"/><text x="${L + 302}" y="${by + 4}">convex-hull bound (first version, not safe)</text></g>`,
    );
  return svgFrame(
    {
      width: W,
      height: H,
      title: options.title ?? 'Maximum modulation index versus load angle',
      desc: `Derating curves of ${series.length} fault case(s): ${series.map((s) => `${s.label} (min ${n(Math.min(...s.points.map((p) => p.mMax)), 4)})`).join('; ')}; healthy limit ${n(healthy, 4)}.`,
    },
    `<g font-size="${STYLE.fontSize}" fill="${STYLE.ink}">${body.join('\n')}</g>`,
  );
}

function tickStep(span: number): number {
  return span > 200 ? 45 : span > 100 ? 30 : span > 40 ? 15 : span > 20 ? 5 : 1;
}
