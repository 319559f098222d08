import { lineRmsVolts, PHASES, type LegNetlist, type PatternResult, type PhasePolarity, type RemedialPlan, type Remedy } from '@hexsalvage/core';
import { deratingCurveSvg, esc, legSchematicSvg, vectorDiagramSvg } from '@hexsalvage/plot';
import { fmt, levelText, tripletText } from '../../src/format.js';
import type { ExplorerPictures, ExplorerResult } from './explorerModel.js';
import { partnerOf, type ExplorerState } from './explorerState.js';

// Volts beside a modulation index, when the DC link is given.
function volts(m: number, vdc: number | null): string {
  return vdc === null ? '' : ` = ${fmt(lineRmsVolts(m, vdc), 1)} V line-to-line RMS`;
}

/**
 * The result panel: the safe limit and its derating ratio, the hull bound beside it, the balance
 * limit, the binding polarity and edge, and the verdict in words.
 *
 * @param r - the result
 * @param state - what is on screen
 * @returns HTML
 * @example
 * ```ts
 * resultHtml(computeResult(s), s);
 * ```
 */
export function resultHtml(r: ExplorerResult, state: ExplorerState): string {
  const p = r.plan;
  const edge = p.bindingEdge ? p.bindingEdge.map((v) => `${v.class} ${tripletText(v.levels[0] ?? [], p.dcLevels)}`).join(' – ') : 'none';
  const verdict = p.stop
    ? `<p class="verdict bad">Cannot run in this state${p.stop.everyLoadAngle ? ', at any load angle' : ''}: the drive must stop. Why: ${esc(p.stop.reason)}</p>`
    : p.faults.length === 0
      ? '<p class="verdict good">Healthy leg: the full linear range.</p>'
      : `<p class="verdict warn">May run derated to m ≤ ${fmt(p.mMax, 4)} (${fmt(p.deratingRatio * 100, 1)} % of healthy), within the cautions below.</p>`;
  const hullDiffers = Math.abs(p.mMaxHull - p.mMax) > 1e-9;
  return (
    `${verdict}<table class="numbers">` +
    `<tr><th>safe m<sub>max</sub></th><td class="big">${fmt(p.mMax, 6)}<span class="unit"> ·Vdc/2${esc(volts(p.mMax, state.vdc))}</span></td></tr>` +
    `<tr><th>derating ratio</th><td>${fmt(p.deratingRatio * 100, 2)} % of ${fmt(p.mMaxHealthy, 4)} (healthy)</td></tr>` +
    `<tr><th>convex-hull bound</th><td>${fmt(p.mMaxHull, 6)}${hullDiffers ? ' <span class="flag">not safe: it ignores what the rules take away</span>' : ' (equal)'}</td></tr>` +
    `<tr><th>midpoint held up to</th><td>m = ${fmt(p.mMaxBalanced, 6)}${esc(volts(p.mMaxBalanced, state.vdc))}</td></tr>` +
    `<tr><th>binds at</th><td>θ = ${fmt(p.limitingAngleDeg, 2)}°, polarity <code>${esc(p.limitingPolarity)}</code>, edge ${esc(edge)}</td></tr>` +
    '</table>' +
    (p.restrictions.length ? `<ul class="restrictions">${p.restrictions.map((x) => `<li>${esc(x)}</li>`).join('')}</ul>` : '')
  );
}

/**
 * The three phase legs, every element a control (`data-device="PHASE.ID"`).
 *
 * @param leg - the leg
 * @param state - the failed elements
 * @returns HTML with one figure per phase
 * @example
 * ```ts
 * legsHtml(builtinLeg('npc'), initialState('npc'));
 * ```
 */
export function legsHtml(leg: LegNetlist, state: ExplorerState): string {
  return PHASES.map((ph) => {
    const failed: string[] = [];
    const shorted: string[] = [];
    for (const [address, mode] of state.faults) {
      if (!address.startsWith(`${ph}.`)) continue;
      (mode === 'open' ? failed : shorted).push(address.slice(2));
    }
    const tag = state.bypass === ph ? ' <span class="flag">bypassed to the midpoint</span>' : '';
    const svg = legSchematicSvg(leg, { phase: ph, failed, shorted, legend: false, title: `Phase ${ph}` });
    return `<figure class="phase" data-phase="${ph}"><figcaption>Phase ${ph}${tag}</figcaption>${cropped(svg)}</figure>`;
  }).join('');
}

// The page names each phase above its drawing: the drawing's own title and side margins are cut
// away, so that the elements are as large as the width allows.
function cropped(svg: string): string {
  return svg.replace(
    / width="(\d+)" height="(\d+)" viewBox="0 0 \d+ \d+"/,
    (_m, w: string, h: string) => ` viewBox="26 30 ${Number(w) - 36} ${Number(h) - 30}"`,
  );
}

/**
 * The faults in words, each with its ambiguity toggle where the diagnosis could confuse it with its
 * partner (a switch and its antiparallel diode).
 *
 * @param leg - the leg
 * @param state - the faults
 * @returns HTML
 * @example
 * ```ts
 * faultListHtml(builtinLeg('npc'), initialState('npc')); // 'none: the leg is healthy'
 * ```
 */
export function faultListHtml(leg: LegNetlist, state: ExplorerState): string {
  if (state.faults.size === 0)
    return '<p class="muted">None: the leg is healthy. Click an element of a phase to fail it (open, then short, then healthy again).</p>';
  const rows = [...state.faults].map(([address, mode]) => {
    const partner = partnerOf(address, leg);
    const toggle =
      partner && !state.faults.has(partner)
        ? `<label class="toggle"><input type="checkbox" name="ambiguous" value="${esc(address)}"${state.ambiguous.has(address) ? ' checked' : ''}> or <code>${esc(partner)}</code> (diagnosis cannot tell)</label>`
        : '';
    return `<li><code>${esc(address)}</code> <strong class="${mode}">${mode}</strong> ${toggle}</li>`;
  });
  return `<ul class="faults">${rows.join('')}</ul>`;
}

/**
 * The vector diagram of one polarity with the admissible triangles and mMax, and the derating curve
 * with the operating angle marked: the same drawings as `hexsalvage plot`.
 *
 * @param plan - the plan
 * @param polarity - the polarity to draw
 * @param pictures - remedies and curve
 * @param state - what is on screen
 * @returns two SVG documents
 * @example
 * ```ts
 * plotsHtml(plan, plan.limitingPolarity, computePictures(s, r), s);
 * ```
 */
export function plotsHtml(plan: RemedialPlan, polarity: string, pictures: ExplorerPictures, state: ExplorerState): { diagram: string; derating: string } {
  const vdc = state.vdc === null ? {} : { vdc: state.vdc };
  const label = plan.faults.join(', ') || 'healthy';
  return {
    diagram: vectorDiagramSvg(plan, polarity, vdc),
    derating: deratingCurveSvg([{ label, points: pictures.curve }], {
      healthy: plan.mMaxHealthy,
      title: 'Safe mMax versus load angle',
      operatingDeg: state.loadAngleDeg,
      ...vdc,
    }),
  };
}

/**
 * The remedies with their limits, best first.
 *
 * @param list - from the pictures
 * @param state - for volts
 * @returns HTML table
 * @example
 * ```ts
 * remediesHtml(computePictures(s, r).remedies, s);
 * ```
 */
export function remediesHtml(list: readonly Remedy[], state: ExplorerState): string {
  if (list.length <= 1 && state.faults.size === 0) return '<p class="muted">No fault: nothing to remedy.</p>';
  const rows = list
    .map(
      (x) =>
        `<tr><td><code>${esc(x.id)}</code></td><td>${esc(x.description)}</td><td class="num"><strong>${fmt(x.mMax, 4)}</strong>${esc(volts(x.mMax, state.vdc))}</td><td class="num">${fmt(x.mMaxBalanced, 4)}</td><td>${esc(x.requires)}</td></tr>`,
    )
    .join('');
  return (
    `<table><thead><tr><th>remedy</th><th>what is done</th><th>m<sub>max</sub></th><th>midpoint held to</th><th>requires</th></tr></thead><tbody>${rows}</tbody></table>` +
    '<p class="muted">Each remedy is a change to the hardware that a qualified person must design, fit and test.</p>'
  );
}

/**
 * The level table of each faulted phase: per pattern and current sign the level, or why the pattern
 * is not used (interrupted, over a rating), and the safe level changes.
 *
 * @param r - the result
 * @returns HTML
 * @example
 * ```ts
 * levelTableHtml(computeResult(s));
 * ```
 */
export function levelTableHtml(r: ExplorerResult): string {
  const a = r.atlas.analysis;
  const dc = r.plan.dcLevels;
  const out: string[] = [];
  for (const ph of PHASES) {
    const t = a.phases[ph];
    if (t === a.healthy) continue;
    out.push(
      `<h3>Phase ${ph}</h3><table><thead><tr><th>pattern</th><th>gates on</th><th>i &gt; 0 (out of the leg)</th><th>i &lt; 0 (into the leg)</th></tr></thead><tbody>`,
    );
    t.patterns.forEach((p, i) => {
      const h = a.healthy.patterns[i] as PatternResult | undefined;
      const cell = (sg: '+' | '-') => {
        if (p.status !== 'allowed') return `<span class="flag">never used: ${esc(p.reason)}</span>`;
        const l = p.bySign[sg].level;
        const was = h && h.status === 'allowed' ? h.bySign[sg].level : null;
        const why = p.unsafe[sg];
        const txt = l === null ? (why ? `<span class="flag">not used: ${esc(why)}</span>` : '<span class="flag">current interrupted</span>') : levelText(l, dc);
        return l === was ? txt : `${txt} <span class="flag">(was ${levelText(was, dc)})</span>`;
      };
      out.push(`<tr><td>${esc(p.name)}</td><td>${esc(p.gates.join(', ') || '—')}</td><td>${cell('+')}</td><td>${cell('-')}</td></tr>`);
    });
    out.push('</tbody></table>');
    const mv = (sg: PhasePolarity) =>
      t.commutations.moves[sg]
        .filter(([x, y]) => x < y)
        .map(([x, y]) => `${levelText(x, dc)}↔${levelText(y, dc)}`)
        .join(' ') || 'none';
    out.push(
      `<p>Level sets — i &gt; 0: ${t.levels['+'].map((l) => levelText(l, dc)).join(' ') || 'none'}; i &lt; 0: ${t.levels['-'].map((l) => levelText(l, dc)).join(' ') || 'none'}; sign unknown: ${t.levels['?'].map((l) => levelText(l, dc)).join(' ') || 'none'}. Safe level changes — i &gt; 0: ${mv('+')}; i &lt; 0: ${mv('-')}.</p>`,
    );
  }
  return out.length ? out.join('') : '<p class="muted">No phase is faulted: every pattern gives its healthy level.</p>';
}
