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
  const rows = Math.ceil(plan.sectors.length / cols);
  const body: string[] = [];
  const extent = Math.max(...plan.sectors.flatMap((s) => s.vectors.map((v) => Math.hypot(v.alpha, v.beta))), plan.mMaxHealthy) * 1.15;
  plan.sectors.forEach((s, i) => body.push(sectorCell(plan, s, i, (i % cols) * cell + 10, Math.floor(i / cols) * (cell + 26) + 34, cell, extent)));
  return svgFrame({
    width: cols * cell + 20,
    height: rows * (cell + 26) + 60,
    title: `Polarity sectors at load angle ${n(plan.loadAngleDeg, 1)}°: ${plan.topology}${plan.faults.length ? `, ${plan.faults.join(', ')}` : ''}`,
    desc: `${plan.sectors.length} sectors of constant current polarity; the limit mMax = ${n(plan.mMax, 4)} binds at θ = ${n(plan.limitingAngleDeg, 1)}° in the sector marked "binds here".`,
  }, `${body.join('\n')}\n<text x="12" y="${rows * (cell + 26) + 50}" font-size="${STYLE.smallFont}" fill="${STYLE.ink}">Arc: the sector's range of θ. Dots: vectors available there. Thick frame and "binds here": the sector that sets mMax.</text>`);
}

function sectorCell(plan: RemedialPlan, s: PlanSector, index: number, x0: number, y0: number, cell: number, extent: number): string {
  const binds = plan.limitingAngleDeg >= s.fromDeg - 1e-9 && plan.limitingAngleDeg <= s.toDeg + 1e-9 && s.polarity === plan.limitingPolarity;
  const cx = x0 + cell / 2;
  const cy = y0 + cell / 2;
  const k = (cell / 2 - 14) / extent;
  const X = (a: number) => n(cx + k * a);
  const Y = (b: number) => n(cy - k * b);
  const out: string[] = [`<g class="sector${binds ? ' binding' : ''}" data-index="${index}">`];
  out.push(`<rect x="${n(x0 + 2)}" y="${n(y0)}" width="${n(cell - 4)}" height="${n(cell + 20)}" fill="none" stroke="${binds ? STYLE.vermillion : STYLE.grid}" stroke-width="${binds ? 2.4 : 1}"/>`);
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
  out.push(`<path class="theta-arc" d="M${n(cx + r * Math.cos(a0))},${n(cy - r * Math.sin(a0))} A${n(r)},${n(r)} 0 ${large} 0 ${n(cx + r * Math.cos(a1))},${n(cy - r * Math.sin(a1))}" fill="none" stroke="${STYLE.blue}" stroke-width="3"/>`);
  out.push(`<circle cx="${X(0)}" cy="${Y(0)}" r="${n(k * s.minExtent)}" fill="none" stroke="${STYLE.green}" stroke-width="1.2"/>`);
  out.push(`<text x="${n(x0 + 8)}" y="${n(y0 + cell + 14)}" font-size="${STYLE.smallFont}" fill="${STYLE.ink}">${esc(`${s.polarity}  ${n(s.fromDeg, 1)}°–${n(s.toDeg, 1)}°  min r ${n(s.minExtent, 3)}`)}</text>`);
  if (binds) out.push(`<text x="${n(x0 + cell - 8)}" y="${n(y0 + 14)}" text-anchor="end" font-size="${STYLE.smallFont}" font-weight="bold" fill="${STYLE.vermillion}">binds here</text>`);
  out.push('</g>');
  return out.join('\n');
}
