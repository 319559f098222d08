import type { PlanSector, RemedialPlan } from '@hexsalvage/core';
import { esc, n, STYLE, svgFrame } from './svgStyle.js';

/**
 * One small vector diagram per polarity sector of the cycle, each with its θ range drawn as an
 * arc, the sector where the limit binds marked.
 *
 * @param plan - from `planRemedial`
 * @returns an SVG document
 * @example
 * ```ts
 * sectorOverviewSvg(planRemedial({ topology: 'npc', faults: ['a.outerUpper'], loadAngleDeg: 30 }));
 * ```
 */
export function sectorOverviewSvg(plan: RemedialPlan): string {
  const cell = 170;
  const cols = 4;
  const sectors = joinedAtZero(plan.sectors);
  const rows = Math.ceil(sectors.length / cols);
  const body: string[] = [];
  const extent = Math.max(...sectors.flatMap((s) => s.vectors.map((v) => Math.hypot(v.alpha, v.beta))), plan.mMaxHealthy) * 1.15;
  sectors.forEach((s, i) => body.push(sectorCell(plan, s, i, (i % cols) * cell + 10, Math.floor(i / cols) * (cell + 38) + 34, cell, extent)));
  const foot = rows * (cell + 38) + 50;
  const notes = [
    "Blue arc: the sector's range of θ (where the phase currents have these signs). Dots: vectors available there; grey: the admissible triangles.",
    "Green arc and dot: min r, the shortest reach of those triangles within the sector's range of θ, and where it is reached (not a circle: other directions",
    'belong to other sectors, so min r may exceed the healthy 1.1547). mMax is the smallest min r of all sectors; the framed sector, "binds here", sets it.',
  ];
  return svgFrame(
    {
      width: cols * cell + 20,
      height: rows * (cell + 38) + 60 + 13 * (notes.length - 1),
      title: `Polarity sectors at load angle ${n(plan.loadAngleDeg, 1)}°: ${plan.topology}${plan.faults.length ? `, ${plan.faults.join(', ')}` : ''}`,
      desc: `${sectors.length} sectors of constant current polarity; the limit mMax = ${n(plan.mMax, 4)} binds at θ = ${n(plan.limitingAngleDeg, 1)}° in the sector marked "binds here".`,
    },
    `${body.join('\n')}\n${notes.map((t, i) => `<text x="12" y="${foot + 13 * i}" font-size="${STYLE.smallFont}" fill="${STYLE.ink}">${esc(t)}</text>`).join('\n')}`,
  );
}

// The plan lists θ from 0 to 360, so a polarity sector that spans 0° arrives as two pieces (its
// end and its start): one panel for it, its range running past 360° and its minimum the lower one.
function joinedAtZero(sectors: readonly PlanSector[]): PlanSector[] {
  const first = sectors[0];
  const last = sectors[sectors.length - 1];
  if (!first || !last || sectors.length < 2 || first.polarity !== last.polarity || first.fromDeg > 1e-9 || last.toDeg < 360 - 1e-9) return [...sectors];
  const lower = last.minExtent <= first.minExtent ? last : { ...first, minExtentAngleDeg: first.minExtentAngleDeg + 360 };
  return [...sectors.slice(1, -1), { ...last, toDeg: first.toDeg + 360, minExtent: lower.minExtent, minExtentAngleDeg: lower.minExtentAngleDeg }];
}

// θ in degrees on the panel's circle (a range may run past 360°)
const inRange = (deg: number, s: PlanSector): boolean => [deg, deg + 360].some((d) => d >= s.fromDeg - 1e-9 && d <= s.toDeg + 1e-9);

function sectorCell(plan: RemedialPlan, s: PlanSector, index: number, x0: number, y0: number, cell: number, extent: number): string {
  const binds = inRange(plan.limitingAngleDeg, s) && s.polarity === plan.limitingPolarity;
  const cx = x0 + cell / 2;
  const cy = y0 + cell / 2;
  const k = (cell / 2 - 14) / extent;
  const X = (a: number) => n(cx + k * a);
  const Y = (b: number) => n(cy - k * b);
  const out: string[] = [`<g class="sector${binds ? ' binding' : ''}" data-index="${index}">`];
  out.push(
    `<rect x="${n(x0 + 2)}" y="${n(y0)}" width="${n(cell - 4)}" height="${n(cell + 32)}" fill="none" stroke="${binds ? STYLE.vermillion : STYLE.grid}" stroke-width="${binds ? 2.4 : 1}"/>`,
  );
  for (const t of s.triangles) {
    const pts = t.map((i) => `${X(s.vectors[i]!.alpha)},${Y(s.vectors[i]!.beta)}`);
    out.push(`<path class="triangle" d="M${pts.join(' L')} Z" fill="none" stroke="#9aa7b5" stroke-width="0.6"/>`);
  }
  for (const v of s.vectors) out.push(`<circle class="vector" cx="${X(v.alpha)}" cy="${Y(v.beta)}" r="2.2" fill="${STYLE.ink}"/>`);
  // θ range as an arc just outside the diagram
  const r = k * extent * 0.96;
  const a0 = (s.fromDeg * Math.PI) / 180;
  const a1 = (s.toDeg * Math.PI) / 180;
  const large = s.toDeg - s.fromDeg > 180 ? 1 : 0;
  out.push(
    `<path class="theta-arc" d="M${n(cx + r * Math.cos(a0))},${n(cy - r * Math.sin(a0))} A${n(r)},${n(r)} 0 ${large} 0 ${n(cx + r * Math.cos(a1))},${n(cy - r * Math.sin(a1))}" fill="none" stroke="${STYLE.blue}" stroke-width="3"/>`,
  );
  // the minimum reach over the sector's own directions: an arc of that radius over the range, and
  // a dot where it is reached
  const rm = k * s.minExtent;
  if (rm > 0) {
    out.push(
      `<path class="min-extent" d="M${n(cx + rm * Math.cos(a0))},${n(cy - rm * Math.sin(a0))} A${n(rm)},${n(rm)} 0 ${large} 0 ${n(cx + rm * Math.cos(a1))},${n(cy - rm * Math.sin(a1))}" fill="none" stroke="${STYLE.green}" stroke-width="1.6"/>`,
    );
    const am = (s.minExtentAngleDeg * Math.PI) / 180;
    out.push(`<circle class="min-extent-at" cx="${n(cx + rm * Math.cos(am))}" cy="${n(cy - rm * Math.sin(am))}" r="3" fill="${STYLE.green}"/>`);
  } else out.push(`<circle class="min-extent-at" cx="${X(0)}" cy="${Y(0)}" r="3.5" fill="${STYLE.vermillion}"/>`);
  const range = `${n(s.fromDeg, 1)}°–${n(s.toDeg > 360 + 1e-9 ? s.toDeg - 360 : s.toDeg, 1)}°`;
  out.push(
    `<text x="${n(x0 + 8)}" y="${n(y0 + cell + 12)}" font-size="${STYLE.smallFont}" fill="${STYLE.ink}"><tspan font-weight="bold">${esc(s.polarity)}</tspan>${esc(`  θ ${range}`)}</text>`,
  );
  out.push(
    `<text x="${n(x0 + 8)}" y="${n(y0 + cell + 25)}" font-size="${STYLE.smallFont}" fill="${STYLE.ink}">${esc(`min r ${n(s.minExtent, 3)}${s.minExtent > 0 ? ` at θ ${n(s.minExtentAngleDeg % 360, 1)}°` : ': cannot run'}`)}</text>`,
  );
  if (binds)
    out.push(
      `<text x="${n(x0 + cell - 8)}" y="${n(y0 + 14)}" text-anchor="end" font-size="${STYLE.smallFont}" font-weight="bold" fill="${STYLE.vermillion}">binds here</text>`,
    );
  out.push('</g>');
  return out.join('\n');
}
