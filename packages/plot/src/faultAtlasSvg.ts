import type { FaultAtlas } from '@hexsalvage/core';
import { esc, n, STYLE, svgFrame } from './svgStyle.js';

// Viridis (van der Walt and Smith, matplotlib, 2015; stops from memory): perceptually even and
// readable with the common colour-vision deficiencies and in grey print.
const VIRIDIS = ['#440154', '#482878', '#3e4989', '#31688e', '#26828e', '#1f9e89', '#35b779', '#6ece58', '#fde725'];

/**
 * Colour of a derating ratio on the atlas scale (0 = cannot run, 1 = full voltage).
 *
 * @param ratio - mMax / healthy, clamped to [0, 1]
 * @returns a hex colour
 * @example
 * ```ts
 * ratioColour(1); // '#fde725'
 * ```
 */
export function ratioColour(ratio: number): string {
  const r = Math.min(1, Math.max(0, Number.isFinite(ratio) ? ratio : 0));
  const x = r * (VIRIDIS.length - 1);
  const i = Math.min(VIRIDIS.length - 2, Math.floor(x));
  const t = x - i;
  const a = hex(VIRIDIS[i] as string);
  const b = hex(VIRIDIS[i + 1] as string);
  return `#${a
    .map((v, k) =>
      Math.round(v + ((b[k] as number) - v) * t)
        .toString(16)
        .padStart(2, '0'),
    )
    .join('')}`;
}

function hex(c: string): number[] {
  return [1, 3, 5].map((k) => parseInt(c.slice(k, k + 2), 16));
}

const CANNOT = 1e-9;

/**
 * The single-fault atlas as a heat map: one row per fault, one column per load angle of the grid,
 * colour = mMax / healthy mMax at that angle, a white "×" where the leg cannot run, a colour bar
 * with its scale, and the worst-case ratio over the range beside each row.
 *
 * @param atlas - a fault atlas (`faultAtlas`)
 * @returns an SVG document
 * @example
 * ```ts
 * atlasHeatmapSvg(faultAtlas({ topology: 'npc' }));
 * ```
 */
export function atlasHeatmapSvg(atlas: FaultAtlas): string {
  const rows = atlas.entries;
  const grid = atlas.healthy.mMaxAt.map(([phi]) => phi);
  const labelW = Math.max(80, 6 * Math.max(...rows.map((e) => e.faults.join(' + ').length), 10));
  const cellW = Math.max(6, Math.min(18, 520 / Math.max(1, grid.length)));
  const cellH = 14;
  const L = 12 + labelW;
  const T = 52;
  const plotW = cellW * grid.length;
  const B = T + cellH * rows.length;
  const W = Math.max(L + plotW + 150, L + 560);
  const H = B + 78;
  const body: string[] = [];
  rows.forEach((e, r) => {
    const y = T + r * cellH;
    body.push(`<text x="${L - 6}" y="${n(y + cellH - 3)}" text-anchor="end" font-size="${STYLE.smallFont}">${esc(e.faults.join(' + '))}</text>`);
    e.mMaxAt.forEach(([, m], c) => {
      const h = (atlas.healthy.mMaxAt[c] as readonly [number, number])[1];
      const ratio = h > 0 ? m / h : 0;
      const x = L + c * cellW;
      body.push(
        `<rect class="cell" x="${n(x)}" y="${y}" width="${n(cellW)}" height="${cellH}" fill="${ratioColour(ratio)}"><title>${esc(`${e.faults.join(' + ')} at ${n(grid[c] as number, 1)}°: mMax ${n(m, 4)} (${n(ratio * 100, 0)} % of healthy)`)}</title></rect>`,
      );
      if (m <= CANNOT)
        body.push(
          `<text class="cannot-run" x="${n(x + cellW / 2)}" y="${n(y + cellH - 3.5)}" text-anchor="middle" font-size="${STYLE.smallFont}" fill="#ffffff">×</text>`,
        );
    });
    body.push(
      `<text x="${n(L + plotW + 6)}" y="${n(y + cellH - 3)}" font-size="${STYLE.smallFont}">${e.verdict === 'cannot-run' ? 'cannot run' : `${n(e.deratingRatio * 100, 0)} %`}</text>`,
    );
  });
  body.push(`<rect x="${L}" y="${T}" width="${n(plotW)}" height="${B - T}" fill="none" stroke="${STYLE.ink}"/>`);
  body.push(`<text x="${n(L + plotW + 6)}" y="${T - 6}" font-size="${STYLE.smallFont}">worst</text>`);
  // load-angle ticks: at most about one every 40 px
  const every = Math.max(1, Math.ceil(40 / cellW));
  grid.forEach((phi, c) => {
    if (c % every !== 0 && c !== grid.length - 1) return;
    const x = L + (c + 0.5) * cellW;
    body.push(
      `<line x1="${n(x)}" y1="${B}" x2="${n(x)}" y2="${B + 4}" stroke="${STYLE.ink}"/><text x="${n(x)}" y="${B + 15}" text-anchor="middle" font-size="${STYLE.smallFont}">${n(phi, 0)}</text>`,
    );
  });
  body.push(`<text x="${n(L + plotW / 2)}" y="${B + 32}" text-anchor="middle">load angle φ (degrees, positive = current lagging)</text>`);
  body.push(`<text x="${L}" y="${T - 8}" font-size="${STYLE.smallFont}">colour: mMax / healthy mMax at each load angle; × = cannot run (mMax = 0)</text>`);
  body.push(colourBar(L, B + 44, Math.min(plotW, 300)));
  return svgFrame(
    {
      width: W,
      height: H,
      title: `Fault atlas: ${atlas.topology}, mMax over load angle for every ${atlas.pairs ? 'fault pair' : 'single fault'}`,
      desc: `${rows.length} fault sets over load angles ${n(grid[0] ?? 0, 1)}° to ${n(grid[grid.length - 1] ?? 0, 1)}°: ${count(atlas, 'full')} keep full voltage, ${count(atlas, 'derated')} need derating, ${count(atlas, 'cannot-run')} cannot run.`,
    },
    `<g font-size="${STYLE.fontSize}" fill="${STYLE.ink}" shape-rendering="crispEdges">${body.join('\n')}</g>`,
  );
}

/**
 * The pair atlas as a fault × fault matrix: cell (i, j) coloured by the worst-case ratio of the pair
 * over the range (mMax min / healthy), "×" where the pair leaves the leg unable to run, grey where
 * the two faults name the same device (not a pair). Rows and columns list every single fault.
 *
 * @param atlas - a pair atlas (`faultAtlas` with `pairs: true`)
 * @returns an SVG document
 * @example
 * ```ts
 * atlasPairMatrixSvg(faultAtlas({ topology: 'npc', modes: ['open'], pairs: true }));
 * ```
 */
export function atlasPairMatrixSvg(atlas: FaultAtlas): string {
  const faults: string[] = [];
  const seen = new Set<string>();
  const ratio = new Map<string, number>();
  for (const e of atlas.entries) {
    for (const f of e.faults)
      if (!seen.has(f)) {
        seen.add(f);
        faults.push(f);
      }
    ratio.set([...e.faults].sort().join('|'), e.verdict === 'cannot-run' ? 0 : e.deratingRatio);
  }
  // by phase, then device, then mode: the text order of `a.device:mode`
  faults.sort((x, y) => (x < y ? -1 : x > y ? 1 : 0));
  const labelW = Math.max(80, 6 * Math.max(...faults.map((f) => f.length), 10));
  const cell = Math.max(6, Math.min(14, 640 / Math.max(1, faults.length)));
  const L = 12 + labelW;
  const T = 40 + labelW;
  const size = cell * faults.length;
  const W = Math.max(L + size + 30, L + 600);
  const H = T + size + 70;
  const body: string[] = [];
  faults.forEach((f, i) => {
    body.push(`<text x="${L - 4}" y="${n(T + i * cell + cell - 2)}" text-anchor="end" font-size="${STYLE.smallFont}">${esc(f)}</text>`);
    body.push(`<text transform="translate(${n(L + i * cell + cell - 3)} ${T - 4}) rotate(-90)" font-size="${STYLE.smallFont}">${esc(f)}</text>`);
  });
  faults.forEach((fi, i) =>
    faults.forEach((fj, j) => {
      const x = L + j * cell;
      const y = T + i * cell;
      const r = ratio.get([fi, fj].sort().join('|'));
      if (r === undefined) {
        body.push(`<rect class="not-a-pair" x="${n(x)}" y="${n(y)}" width="${n(cell)}" height="${n(cell)}" fill="${STYLE.grid}"/>`);
        return;
      }
      body.push(
        `<rect class="cell" x="${n(x)}" y="${n(y)}" width="${n(cell)}" height="${n(cell)}" fill="${ratioColour(r)}"><title>${esc(`${fi} + ${fj}: ${r === 0 ? 'cannot run' : `${n(r * 100, 0)} % of healthy`}`)}</title></rect>`,
      );
      if (r === 0 && cell >= 8)
        body.push(
          `<text class="cannot-run" x="${n(x + cell / 2)}" y="${n(y + cell - 2.5)}" text-anchor="middle" font-size="${n(Math.min(STYLE.smallFont, cell - 2), 0)}" fill="#ffffff">×</text>`,
        );
    }),
  );
  body.push(`<rect x="${L}" y="${T}" width="${n(size)}" height="${n(size)}" fill="none" stroke="${STYLE.ink}"/>`);
  const by = T + size + 14;
  body.push(
    `<text x="${L}" y="${by}" font-size="${STYLE.smallFont}">colour: worst-case mMax / healthy over the load-angle range; × = cannot run; grey = same device (not a pair)</text>`,
  );
  body.push(colourBar(L, by + 10, Math.min(size, 300)));
  return svgFrame(
    {
      width: W,
      height: H,
      title: `Fault pairs: ${atlas.topology}, worst-case derating ratio`,
      desc: `${atlas.entries.length} fault pairs of ${faults.length} single faults: ${count(atlas, 'full')} keep full voltage, ${count(atlas, 'derated')} need derating, ${count(atlas, 'cannot-run')} cannot run.`,
    },
    `<g font-size="${STYLE.fontSize}" fill="${STYLE.ink}" shape-rendering="crispEdges">${body.join('\n')}</g>`,
  );
}

function count(atlas: FaultAtlas, verdict: string): number {
  return atlas.entries.filter((e) => e.verdict === verdict).length;
}

// A horizontal colour bar from 0 % to 100 % with its ticks.
function colourBar(x: number, y: number, w: number): string {
  const steps = 40;
  const parts: string[] = [];
  for (let k = 0; k < steps; k++)
    parts.push(`<rect x="${n(x + (k * w) / steps)}" y="${y}" width="${n(w / steps + 0.5)}" height="10" fill="${ratioColour((k + 0.5) / steps)}"/>`);
  parts.push(`<rect x="${x}" y="${y}" width="${n(w)}" height="10" fill="none" stroke="${STYLE.ink}" stroke-width="0.5"/>`);
  for (const q of [0, 0.25, 0.5, 0.75, 1])
    parts.push(`<text x="${n(x + q * w)}" y="${y + 22}" text-anchor="middle" font-size="${STYLE.smallFont}">${n(q * 100, 0)} %</text>`);
  parts.push(`<text x="${n(x + w + 8)}" y="${y + 9}" font-size="${STYLE.smallFont}">mMax / healthy</text>`);
  return `<g class="colour-bar">${parts.join('')}</g>`;
}
