import { levelNotation, type LevelNotation, type PlanPolarity, type PlanVector, type RemedialPlan } from '@hexsalvage/core';
import { esc, n, STYLE, svgFrame, wrapWords } from './svgStyle.js';

/** Options of {@link vectorDiagramSvg}. */
export interface VectorDiagramOptions {
  /** Draw a reference circle at this modulation index too. Default: none. */
  readonly referenceM?: number;
  /** Level-triplet labels beside the vectors. Default true. */
  readonly labels?: boolean;
  /** Side of the square plot in px. Default 520. */
  readonly size?: number;
  /** Total DC-link voltage in volts: the axes also say what one unit is in volts. */
  readonly vdc?: number;
}

/**
 * The vector diagram of one polarity string: the healthy diagram faintly, the surviving vectors
 * (filled circles), the lost ones (hollow squares with a "×" mark and a "lost" legend, never colour
 * alone), the hull, the re-triangulation, the achievable circle mMax, the binding edge and,
 * optionally, a reference circle.
 *
 * @param plan - from `planRemedial`
 * @param polarity - polarity string
 * @param options - reference circle, labels, size
 * @returns an SVG document
 * @example
 * ```ts
 * vectorDiagramSvg(planRemedial({ topology: 'npc', faults: ['a.outerUpper'] }), '+--');
 * ```
 */
export function vectorDiagramSvg(plan: RemedialPlan, polarity: string, options: VectorDiagramOptions = {}): string {
  const d = plan.polarities[polarity] as PlanPolarity;
  const size = options.size ?? 520;
  const labels = options.labels ?? true;
  const all = [...d.vectors, ...d.lost];
  const extent = Math.max(1e-9, ...all.map((v) => Math.hypot(v.alpha, v.beta)), plan.mMaxHealthy) * 1.18;
  const cx = size / 2;
  const cy = size / 2 + 14;
  const k = (size / 2 - 34) / extent;
  const X = (a: number) => n(cx + k * a);
  const Y = (b: number) => n(cy - k * b);
  const body: string[] = [];
  const note = levelNotation(plan.dcLevels);
  const named = (v: PlanVector) => v.levels.map((t) => note.triplet(t)).join(', ');
  body.push(
    `<g stroke="${STYLE.grid}" stroke-width="1"><line x1="${X(-extent)}" y1="${Y(0)}" x2="${X(extent)}" y2="${Y(0)}"/><line x1="${X(0)}" y1="${Y(-extent)}" x2="${X(0)}" y2="${Y(extent)}"/></g>`,
  );
  const axisName = `α (Vdc/2${options.vdc !== undefined ? ` = ${n(options.vdc / 2, 0)} V` : ''})`;
  body.push(
    `<text x="${X(extent)}" y="${n(cy + 14)}" text-anchor="end" fill="${STYLE.ink}">${esc(axisName)}</text><text x="${n(cx + 4)}" y="${Y(extent)}" dominant-baseline="hanging" fill="${STYLE.ink}">${esc(`β${axisName.slice(1)}`)}</text>`,
  );
  // healthy limit circle, faint
  body.push(
    `<circle class="healthy-limit" cx="${X(0)}" cy="${Y(0)}" r="${n(k * plan.mMaxHealthy)}" fill="none" stroke="${STYLE.faint}" stroke-dasharray="2 3"/>`,
  );
  // triangles
  body.push('<g class="triangles" fill="none" stroke="#9aa7b5" stroke-width="0.8">');
  for (const t of d.triangles) {
    const pts = t.map((i) => `${X((d.vectors[i] as PlanVector).alpha)},${Y((d.vectors[i] as PlanVector).beta)}`).join(' ');
    body.push(`<path class="triangle" d="M${pts.split(' ').join(' L')} Z"/>`);
  }
  body.push('</g>');
  // hull; where the admissible triangles do not fill it, the hull is drawn faint (not safe) and the
  // outline of the admissible tiling is the boundary that counts
  if (d.hull.length >= 2) {
    const faint = d.outline ? ` stroke-dasharray="5 4" stroke-opacity="0.55"` : '';
    body.push(
      `<polygon class="hull" points="${d.hull.map(([a, b]) => `${X(a)},${Y(b)}`).join(' ')}" fill="none" stroke="${STYLE.blue}" stroke-width="1.6"${faint}/>`,
    );
  }
  if (d.outline)
    body.push(
      `<path class="outline" d="${d.outline.map(([a, b]) => `M${X(a[0])},${Y(a[1])} L${X(b[0])},${Y(b[1])}`).join(' ')}" fill="none" stroke="${STYLE.blue}" stroke-width="2.2"/>`,
    );
  // achievable circle: the plan's mMax over the whole cycle at its load angle
  body.push(`<circle class="mmax" cx="${X(0)}" cy="${Y(0)}" r="${n(k * plan.mMax)}" fill="none" stroke="${STYLE.green}" stroke-width="1.6"/>`);
  if (options.referenceM !== undefined)
    body.push(
      `<circle class="reference" cx="${X(0)}" cy="${Y(0)}" r="${n(k * options.referenceM)}" fill="none" stroke="${STYLE.orange}" stroke-width="1.4" stroke-dasharray="6 3"/>`,
    );
  // binding edge: the plan's, where this polarity is the limiting one; else the nearest edge of the
  // tiling's boundary (its outline, or the hull where the tiling fills it)
  const bind =
    plan.limitingPolarity === polarity && plan.bindingEdge
      ? ([
          [plan.bindingEdge[0].alpha, plan.bindingEdge[0].beta],
          [plan.bindingEdge[1].alpha, plan.bindingEdge[1].beta],
        ] as [readonly [number, number], readonly [number, number]])
      : bindingEdge(d);
  if (bind)
    body.push(
      `<line class="binding-edge" x1="${X(bind[0][0])}" y1="${Y(bind[0][1])}" x2="${X(bind[1][0])}" y2="${Y(bind[1][1])}" stroke="${STYLE.vermillion}" stroke-width="3.2" stroke-linecap="round"/>`,
    );
  // vectors first (dots), then their labels in order of importance: the binding edge's ends, the
  // lost vectors, the hull's corners, the rest. A label tries four places around its dot and is
  // left out where all four would overlap a label already placed or a dot (a many-level diagram
  // would be unreadable); every vector still names itself on hover (its <title>). A white halo
  // keeps a label readable where it crosses a triangle's side.
  body.push('<g class="vectors">');
  for (const v of d.vectors)
    body.push(
      `<circle class="vector surviving" cx="${X(v.alpha)}" cy="${Y(v.beta)}" r="3.6" fill="${STYLE.ink}"><title>${esc(`${v.class} ${named(v)}`)}</title></circle>`,
    );
  for (const v of d.lost) {
    const x = cx + k * v.alpha;
    const y = cy - k * v.beta;
    body.push(
      `<g class="vector lost"><rect x="${n(x - 4)}" y="${n(y - 4)}" width="8" height="8" fill="#ffffff" stroke="${STYLE.vermillion}" stroke-width="1.4"/><path d="M${n(x - 3)},${n(y - 3)} L${n(x + 3)},${n(y + 3)} M${n(x - 3)},${n(y + 3)} L${n(x + 3)},${n(y - 3)}" stroke="${STYLE.vermillion}" stroke-width="1.2"/><title>${esc(`lost ${v.class} ${named(v)}`)}</title></g>`,
    );
  }
  body.push('</g>');
  let thinned = 0;
  if (labels) {
    const dots = all.map((v) => [cx + k * v.alpha, cy - k * v.beta] as const);
    const placed: Box[] = dots.map(([x, y]) => [x - 4.5, y - 4.5, x + 4.5, y + 4.5]);
    // the axis names (11 px text, about 6.5 px a character)
    const ax = cx + k * extent;
    placed.push([ax - 6.5 * axisName.length, cy + 3, ax, cy + 17], [cx + 4, cy - k * extent, cx + 4 + 6.5 * axisName.length, cy - k * extent + 13]);
    const near = (v: PlanVector, p: readonly [number, number] | undefined) => p !== undefined && Math.hypot(v.alpha - p[0], v.beta - p[1]) < 1e-9;
    const onHull = (v: PlanVector) => d.hull.some((p) => near(v, p));
    const rank = (v: PlanVector, lost: boolean) => (bind && (near(v, bind[0]) || near(v, bind[1])) ? 0 : lost ? 1 : onHull(v) ? 2 : 3);
    const queue = [...d.vectors.map((v) => ({ v, lost: false })), ...d.lost.map((v) => ({ v, lost: true }))]
      .map((q, i) => ({ ...q, i, r: rank(q.v, q.lost) }))
      .sort((a, b) => a.r - b.r || a.i - b.i);
    body.push(`<g class="labels" font-size="${STYLE.smallFont}" stroke="#ffffff" stroke-width="3" stroke-linejoin="round" paint-order="stroke">`);
    for (const { v, lost, r } of queue) {
      const text = `${lost ? '× ' : ''}${levelLabel(v, note)}`;
      const spot = labelSpot(cx + k * v.alpha, cy - k * v.beta, text.length * 5.6, placed, r === 0);
      if (!spot) {
        thinned++;
        continue;
      }
      placed.push(spot.box);
      body.push(
        `<text class="label${lost ? ' lost-label' : ''}${r === 0 ? ' binding-end' : ''}" x="${n(spot.x)}" y="${n(spot.y)}"${spot.anchor === 'end' ? ' text-anchor="end"' : ''} fill="${lost ? STYLE.vermillion : STYLE.ink}"${r === 0 ? ' font-weight="bold"' : ''}>${esc(text)}</text>`,
      );
    }
    body.push('</g>');
  }
  body.push(legend(size, plan, options.referenceM, d.outline !== null, bind !== null));
  const ny = size + (d.outline ? 88 : 70);
  const foot = wrapWords(
    `Labels: ${note.legend}. "+n" after a label: n more redundant realisations of the same vector.${thinned ? ` ${thinned} labels left out where they would overlap; the binding edge's ends are always named (hover a dot for its name; \`vectors --json\` lists every vector).` : ''}`,
    Math.floor((size - 28) / 5.5),
  );
  body.push(
    `<g class="notation" font-size="${STYLE.smallFont}" fill="${STYLE.ink}">${foot.map((line, i) => `<text x="14" y="${ny + 13 * i}">${esc(line)}</text>`).join('')}</g>`,
  );
  return svgFrame(
    {
      width: size,
      height: size + (d.outline ? 112 : 96) + 13 * Math.max(0, foot.length - 2),
      title: `Vector diagram, polarity ${polarity}: ${plan.topology}${plan.faults.length ? `, ${plan.faults.join(', ')}` : ''}`,
      desc: `${d.vectors.length} surviving vectors (filled dots), ${d.lost.length} lost vectors (hollow squares marked ×), ${d.triangles.length} admissible triangles, reach ${n(d.reach, 4)} (hull radius ${n(d.radius, 4)}) of healthy ${n(plan.mMaxHealthy, 4)} (units of Vdc/2).`,
    },
    body.join('\n'),
  );
}

type Box = [number, number, number, number];

// The first of four places around a dot (right above, left above, right below, left below) whose
// text box overlaps nothing placed; a label that must appear takes the first place regardless.
function labelSpot(
  x: number,
  y: number,
  width: number,
  placed: readonly Box[],
  must: boolean,
): { x: number; y: number; anchor: 'start' | 'end'; box: Box } | null {
  const spots = [
    { x: x + 6, y: y - 6, anchor: 'start' as const },
    { x: x - 6, y: y - 6, anchor: 'end' as const },
    { x: x + 6, y: y + 13, anchor: 'start' as const },
    { x: x - 6, y: y + 13, anchor: 'end' as const },
  ];
  const boxOf = (s: (typeof spots)[number]): Box => (s.anchor === 'start' ? [s.x, s.y - 8, s.x + width, s.y + 2] : [s.x - width, s.y - 8, s.x, s.y + 2]);
  const free = spots.find((s) => !placed.some((b) => overlaps(boxOf(s), b)));
  const chosen = free ?? (must ? spots[0] : undefined);
  return chosen ? { ...chosen, box: boxOf(chosen) } : null;
}

function overlaps(a: Box, b: Box): boolean {
  return a[0] < b[2] && b[0] < a[2] && a[1] < b[3] && b[1] < a[3];
}

function levelLabel(v: PlanVector, note: LevelNotation): string {
  const t = v.levels[0];
  if (!t) return '';
  return note.triplet(t) + (v.levels.length > 1 ? ` +${v.levels.length - 1}` : '');
}

function bindingEdge(d: PlanPolarity): [readonly [number, number], readonly [number, number]] | null {
  if (d.reach <= 0 || d.hull.length < 3) return null;
  const edges = d.outline ?? d.hull.map((a, i) => [a, d.hull[(i + 1) % d.hull.length] as readonly [number, number]] as const);
  let best: [readonly [number, number], readonly [number, number]] | null = null;
  let dist = Infinity;
  for (const [a, b] of edges) {
    // distance from the origin to the segment (on a hull, the foot of the perpendicular lies on it)
    const ex = b[0] - a[0];
    const ey = b[1] - a[1];
    const s = Math.min(1, Math.max(0, -(a[0] * ex + a[1] * ey) / (ex * ex + ey * ey)));
    const h = Math.hypot(a[0] + s * ex, a[1] + s * ey);
    if (h < dist - 1e-12) [best, dist] = [[a, b], h];
  }
  return best;
}

function legend(size: number, plan: RemedialPlan, refM: number | undefined, outlined: boolean, bound: boolean): string {
  const y = size + 34;
  const items = [
    `<circle cx="20" cy="${y}" r="3.6" fill="${STYLE.ink}"/><text x="30" y="${y + 4}">surviving vector</text>`,
    `<rect x="136" y="${y - 4}" width="8" height="8" fill="#fff" stroke="${STYLE.vermillion}" stroke-width="1.4"/><text x="150" y="${y + 4}" fill="${STYLE.vermillion}">× lost vector</text>`,
    outlined
      ? `<line x1="240" y1="${y}" x2="262" y2="${y}" stroke="${STYLE.blue}" stroke-width="2.2"/><text x="268" y="${y + 4}">safe region</text><line x1="340" y1="${y}" x2="362" y2="${y}" stroke="${STYLE.blue}" stroke-width="1.6" stroke-dasharray="5 4" stroke-opacity="0.55"/><text x="368" y="${y + 4}">hull (not safe)</text>`
      : `<line x1="240" y1="${y}" x2="262" y2="${y}" stroke="${STYLE.blue}" stroke-width="1.6"/><text x="268" y="${y + 4}">hull</text>`,
  ];
  // the binding edge goes on the first row beside the hull, or under the legend where the
  // safe-region entry takes that room
  const yb = outlined ? y + 36 : y;
  if (bound || !outlined)
    items.push(
      `<line x1="${outlined ? 240 : 304}" y1="${yb}" x2="${outlined ? 262 : 326}" y2="${yb}" stroke="${STYLE.vermillion}" stroke-width="3.2"/><text x="${outlined ? 268 : 332}" y="${yb + 4}">binding edge</text>`,
    );
  const y2 = y + 18;
  items.push(
    `<circle cx="31" cy="${y2}" r="8" fill="none" stroke="${STYLE.green}" stroke-width="1.6"/><text x="44" y="${y2 + 4}">${plan.mMax > 0 ? `mMax = ${n(plan.mMax, 4)} over the cycle at φ = ${n(plan.loadAngleDeg, 1)}°` : `mMax = 0 at φ = ${n(plan.loadAngleDeg, 1)}°: cannot run`}</text>`,
  );
  items.push(`<line x1="290" y1="${y2}" x2="312" y2="${y2}" stroke="${STYLE.faint}" stroke-dasharray="2 3"/><text x="318" y="${y2 + 4}">healthy limit</text>`);
  if (refM !== undefined)
    items.push(
      `<line x1="400" y1="${y2}" x2="422" y2="${y2}" stroke="${STYLE.orange}" stroke-width="1.4" stroke-dasharray="6 3"/><text x="428" y="${y2 + 4}">m = ${n(refM, 3)}</text>`,
    );
  return `<g class="legend" font-size="${STYLE.smallFont}" fill="${STYLE.ink}">${items.join('')}</g>`;
}
