import {
  CAUTIONS, deratingCurve, describeRules, gatedDeviceIds, locateReference, PHASES, type ClaimVerdict, type DiagramAtlas, type FaultAtlas, type PatternResult,
  type PhasePolarity, type RemedialPlan, type SwitchingTable,
} from '@hexsalvage/core';
import { atlasHeatmapSvg, atlasPairMatrixSvg, deratingCurveSvg, esc, legSchematicSvg, sectorOverviewSvg, switchingPeriodSvg, vectorDiagramSvg } from '@hexsalvage/plot';
import { fmt, levelText } from '../format.js';
import { schematicFocus } from '../schematicFocus.js';
import { REPORT_CSS } from './reportStyles.js';

/** Inputs of {@link buildReport}. */
export interface ReportInputs {
  readonly atlas: DiagramAtlas;
  readonly plan: RemedialPlan;
  readonly table: SwitchingTable;
  /** The `--topology` value as the user gave it. */
  readonly topologyText: string;
  readonly verdicts?: readonly ClaimVerdict[];
  /** Every fault of the leg (`report --atlas`): an appendix. */
  readonly faultAtlas?: FaultAtlas;
  /** Shown in the header; default the ISO date of today is not used so that output is reproducible. */
  readonly generatedBy: string;
}

/**
 * The design-review report: one self-contained HTML file (inline CSS and SVG, no scripts, no
 * external requests) that prints on A4.
 *
 * @param r - atlas, plan, table and optional claim verdicts
 * @returns the HTML document
 * @example
 * ```ts
 * writeFileSync('review.html', buildReport({ atlas, plan, table, topologyText: 'npc', generatedBy: 'hexsalvage 0.1.0' }));
 * ```
 */
export function buildReport(r: ReportInputs): string {
  const { atlas, plan, table } = r;
  const leg = atlas.analysis.leg;
  const faultText = plan.faults.join(', ') || 'none (healthy leg)';
  const s: string[] = [];
  s.push(`<h1>Remedial operation review: ${esc(plan.topology)}</h1>`);
  s.push(`<p class="muted">Faults: <strong>${esc(faultText)}</strong> · load angle ${fmt(plan.loadAngleDeg, 1)}° · polarity margin ${fmt(plan.polarityMarginDeg, 1)}° · ${esc(r.generatedBy)}</p>`);
  s.push(`<div class="caution" role="note"><strong>Caution.</strong><ul>${CAUTIONS.map((c) => `<li>${esc(c)}</li>`).join('')}</ul></div>`);

  s.push('<h2>1. Inputs and assumptions</h2>');
  s.push(`<table><tr><th>leg</th><td>${esc(leg.name)} (from <code>${esc(r.topologyText)}</code>), ${leg.devices.length} devices, DC nodes ${Object.entries(leg.dcNodes).map(([k, v]) => `${esc(k)} = ${fmt(v, 2)}`).join(', ')} (units of Vdc/2)</td></tr>`
    + `<tr><th>faults</th><td>${esc(faultText)}</td></tr>`
    + `<tr><th>operating point</th><td>load angle φ = ${fmt(plan.loadAngleDeg, 2)}° (currents lag the voltage reference); polarity margin δ = ${fmt(plan.polarityMarginDeg, 2)}° (within δ of a current zero crossing the sign counts as unknown)</td></tr>`
    + `<tr><th>rules applied</th><td>${esc(describeRules(plan.rules))}${plan.unrated.length ? `; <span class="flag">unrated devices, not checked: ${esc(plan.unrated.join(', '))}</span>` : ''}</td></tr>`
    + '<tr><th>model</th><td>ideal switches and diodes; an open fault removes all conduction of the element, a short makes it conduct both ways; levels from the highest (i &gt; 0) or lowest (i &lt; 0) reachable DC node; a state is used only if a static distribution of node voltages keeps every rated device within its rating; a phase changes level only by switch actions, one at a time, that pass through such states; no dead time, switching transients or thermal effects</td></tr>'
    + '<tr><th>units</th><td>potentials and modulation index m in units of Vdc/2 (m = peak fundamental phase voltage / (Vdc/2)); healthy linear limit 2/√3 ≈ 1.1547</td></tr></table>');

  s.push('<h2>2. Limit and derating</h2>');
  if (plan.mMax === 0) s.push(`<p class="verdict-fails"><strong>The drive cannot run in this state</strong> at this load angle: no modulation index above 0 can be produced without overstressing a device or breaking a current.</p>`);
  const hullDiffers = Math.abs(plan.mMaxHull - plan.mMax) > 1e-9;
  s.push(`<table><tr><th>maximum modulation index, faulted (safe)</th><td><strong>${fmt(plan.mMax, 6)}</strong></td></tr><tr><th>healthy</th><td>${fmt(plan.mMaxHealthy, 6)}</td></tr><tr><th>derating ratio</th><td><strong>${fmt(plan.deratingRatio * 100, 2)} %</strong></td></tr>`
    + `<tr><th>convex-hull bound (first version)</th><td>${fmt(plan.mMaxHull, 6)}${hullDiffers ? ' <span class="flag">not safe: it ignores what the rules below take away</span>' : ''}</td></tr>`
    + `<tr><th>midpoint balance holds up to</th><td>m = ${fmt(plan.mMaxBalanced, 6)}${plan.mMaxBalanced < plan.mMax - 1e-9 ? ' <span class="flag">above this the average midpoint current cannot be held at zero</span>' : ''}</td></tr></table>`);
  s.push(`<p>${esc(bindingExplanation(plan))}</p>`);
  if (plan.restrictions.length) s.push(`<p>What the rules take away:</p><ul>${plan.restrictions.map((x) => `<li>${esc(x)}</li>`).join('')}</ul>`);
  if (plan.notes.length) s.push(`<ul>${plan.notes.map((x) => `<li class="flag">${esc(x)}</li>`).join('')}</ul>`);

  s.push('<h2>3. What each phase leg can still do</h2>');
  for (const ph of PHASES) {
    const t = atlas.analysis.phases[ph];
    if (t === atlas.analysis.healthy) continue;
    s.push(`<h3>Phase ${ph}</h3><table><tr><th>pattern</th><th>gates on</th><th>i &gt; 0</th><th>i &lt; 0</th></tr>`);
    t.patterns.forEach((p, i) => {
      const h = atlas.analysis.healthy.patterns[i] as PatternResult;
      const cell = (sg: '+' | '-') => {
        if (p.status !== 'allowed') return '<span class="flag">forbidden</span>';
        const l = p.bySign[sg].level;
        const was = h.status === 'allowed' ? h.bySign[sg].level : null;
        const why = p.unsafe[sg];
        const txt = l === null ? (why ? `<span class="flag">unsafe: ${esc(why)}</span>` : '<span class="flag">interrupted (forbidden)</span>') : levelText(l);
        return l === was ? txt : `${txt} <span class="flag">(was ${levelText(was)})</span>`;
      };
      s.push(`<tr><td>${esc(p.name)}</td><td>${esc(p.gates.join(', '))}</td><td>${cell('+')}</td><td>${cell('-')}</td></tr>`);
    });
    s.push('</table>');
    s.push(`<p>Level sets — i &gt; 0: ${t.levels['+'].map(levelText).join(' ') || 'none'}; i &lt; 0: ${t.levels['-'].map(levelText).join(' ') || 'none'}; unknown sign: ${t.levels['?'].map(levelText).join(' ') || 'none'}.</p>`);
    const mv = (sg: PhasePolarity) => t.commutations.moves[sg].filter(([a, b]) => a < b).map(([a, b]) => `${levelText(a)}↔${levelText(b)}`).join(' ') || 'none (the phase cannot change level)';
    s.push(`<p>Safe level changes — i &gt; 0: ${mv('+')}; i &lt; 0: ${mv('-')}; unknown sign: ${mv('?')}.</p>`);
  }
  if (PHASES.every((ph) => atlas.analysis.phases[ph] === atlas.analysis.healthy)) s.push('<p>No phase is faulted.</p>');

  const focus = schematicFocus(atlas.analysis);
  s.push(figure(legSchematicSvg(leg, focus), `Leg drawn from the netlist. The failed element is crossed out; the thick path is where the current flows for pattern ${focus.pattern?.name ?? '—'} with ${focus.sign === '-' ? 'i < 0' : 'i > 0'}.`));

  s.push('<h2>4. Vectors and polarity sectors</h2>');
  s.push(figure(vectorDiagramSvg(plan, plan.limitingPolarity), `Vector diagram of the polarity ${plan.limitingPolarity} in force where the limit binds. Filled dots survive, hollow squares marked × are lost; the grey triangles are the admissible ones a switching sequence can run; the thick red edge is where the limit binds; the green circle is mMax.`));
  s.push(figure(sectorOverviewSvg(plan), 'One diagram per polarity sector over the fundamental cycle; the arc shows the sector’s range of θ, the framed sector sets the limit.'));

  s.push('<h2>5. Derating versus load angle</h2>');
  const curve = deratingCurve(atlas, { polarityMarginDeg: plan.polarityMarginDeg });
  s.push(figure(deratingCurveSvg([{ label: faultText, points: curve }], { healthy: plan.mMaxHealthy, title: 'Maximum modulation index versus load angle' }), `Safe mMax from −90° to 90° (exact at every point, breakpoints circled); worst ${fmt(Math.min(...curve.map((p) => p.mMax)), 4)}, best ${fmt(Math.max(...curve.map((p) => p.mMax)), 4)}. Where drawn, the thin dotted line is the first version's convex-hull bound, which the hardware would not survive.`));

  s.push('<h2>6. Degraded switching-state table</h2>');
  const f = table.flags;
  s.push(`<p>${Object.keys(table.polarities).length} polarity strings, ${Object.values(table.polarities).reduce((n, p) => n + p.tableTriangles.length, 0)} triangles in all. Export with <code>hexsalvage export --format json|csv|c</code>.</p>`);
  s.push(`<table><tr><th>flag</th><th>triangles</th><th>examples</th></tr>`
    + flagRow('line-frequency devices driven at PWM rate', f.lineDevicesAtPwm)
    + flagRow('midpoint (neutral-point) control lost', f.midpointAuthorityLost)
    + flagRow('phase jumps between non-adjacent levels', f.levelJumps)
    + flagRow('no sequence obeys the sequence rule', f.noSequence)
    + '</table>');
  s.push('<table><thead><tr><th>polarity</th><th>vectors</th><th>lost</th><th>triangles</th><th>reach</th><th>midpoint authority full / partial / none</th></tr></thead><tbody>');
  for (const pol of table.polarityOrder) {
    const p = table.polarities[pol]!;
    const count = (a: string) => p.tableTriangles.filter((t) => t.midpointAuthority === a).length;
    s.push(`<tr><td><code>${esc(pol)}</code></td><td>${p.vectors.length}</td><td>${p.lost.length}</td><td>${p.tableTriangles.length}</td><td>${fmt(p.reach, 4)}</td><td>${count('full')} / ${count('partial')} / ${count('none')}</td></tr>`);
  }
  s.push('</tbody></table>');
  const entry = table.polarities[plan.limitingPolarity]!;
  const th = (plan.limitingAngleDeg * Math.PI) / 180;
  const at = locateReference(entry, 0.7 * plan.mMax * Math.cos(th), 0.7 * plan.mMax * Math.sin(th));
  if (at.ok) {
    s.push(figure(switchingPeriodSvg(entry.tableTriangles[at.triangle]!, { dwell: [...at.dwell] as [number, number, number], switches: gatedDeviceIds(leg), levels: table.levels, title: `Switching period, polarity ${plan.limitingPolarity}, triangle ${at.triangle}` }), `One centre-aligned switching period at 0.7·mMax in the direction where the limit binds: phase levels and gate signals, gate changes counted per device.`));
  }

  if (r.verdicts && r.verdicts.length) {
    s.push('<h2>7. Derating claims</h2><table><tr><th>claim</th><th>verdict</th><th>m promised</th><th>worst mMax</th><th>hull bound</th><th>at load angle</th><th>short by</th><th>rules</th><th>binding edge</th></tr>');
    for (const v of r.verdicts) {
      const edge = v.bindingEdge ? v.bindingEdge.map((e) => `${e.class} ${e.levels[0]?.join('/')}`).join(' – ') : v.mMaxAtWorst === 0 ? 'none: cannot run in this state' : 'none';
      const rules = `${v.rules.ratings ? 'ratings' : 'ratings IGNORED'}, ${v.rules.levelSteps}`;
      s.push(`<tr><td>${esc(v.name)}</td><td class="${v.holds ? 'verdict-holds' : 'verdict-fails'}">${v.holds ? 'holds' : 'FAILS'}</td><td>${fmt(v.m, 4)}</td><td>${fmt(v.mMaxAtWorst, 6)}</td><td>${fmt(v.mMaxHullAtWorst, 6)}</td><td>${fmt(v.worstLoadAngleDeg, 2)}°</td><td>${v.holds ? '—' : fmt(v.shortfall, 6)}</td><td>${esc(rules)}</td><td>${esc(edge)}</td></tr>`);
    }
    s.push('</table><p class="muted">Each verdict is exact over the whole load-angle range of the claim, not sampled.</p>');
  }
  if (r.faultAtlas) s.push(atlasAppendix(r.faultAtlas));
  s.push(`<div class="caution" role="note"><strong>Before operating with a failed device:</strong> confirm the remaining devices' current, voltage and thermal stress, the DC-link capacitor ripple and midpoint balance, and the load, by test and against the device ratings. Local electrical codes and licensed practice come first.</div>`);
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>Remedial operation review: ${esc(plan.topology)}, ${esc(faultText)}</title>
<style>${REPORT_CSS}</style>
</head>
<body>
${s.join('\n')}
</body>
</html>
`;
}

// Rows listed in the appendix table; a pair atlas has more (the CSV of `atlas` lists them all).
const ATLAS_ROWS = 300;

function atlasAppendix(a: FaultAtlas): string {
  const count = (v: string) => a.entries.filter((e) => e.verdict === v).length;
  const words = { full: 'full voltage', derated: 'derated', 'cannot-run': 'CANNOT RUN' } as const;
  const [lo, hi] = a.loadAngleRangeDeg;
  const out: string[] = [];
  out.push(`<h2>Appendix: every ${a.pairs ? 'pair of faults' : 'single fault'} of this leg (fault atlas)</h2>`);
  out.push(`<p>${a.entries.length} fault sets, modes ${esc(a.modes.join(', '))}, load angle ${fmt(lo, 1)}° to ${fmt(hi, 1)}°, polarity margin ${fmt(a.polarityMarginDeg, 1)}°, rules: ${esc(describeRules(a.rules))}. <strong>${count('full')}</strong> keep full voltage, <strong>${count('derated')}</strong> need derating, <strong class="verdict-fails">${count('cannot-run')}</strong> cannot run (the drive must stop; protection must not try to continue). Each minimum is exact over the whole range.${a.pairs ? '' : ' Faults in phases b and c give the same figures (phase rotation).'}</p>`);
  out.push(figure(a.pairs ? atlasPairMatrixSvg(a) : atlasHeatmapSvg(a), a.pairs ? 'Worst-case derating ratio of every pair of faults over the load-angle range; × marks pairs that leave the leg unable to run.' : 'mMax as a fraction of the healthy limit for every single fault (rows, worst first) at each load angle of the grid (columns); × marks load angles where the leg cannot run.'));
  out.push('<table><tr><th>faults</th><th>verdict</th><th>mMax min</th><th>ratio</th><th>worst at</th><th>hull bound</th><th>why</th></tr>');
  for (const e of a.entries.slice(0, ATLAS_ROWS)) {
    out.push(`<tr><td>${esc(e.faults.join(' + '))}</td><td class="${e.verdict === 'cannot-run' ? 'verdict-fails' : e.verdict === 'full' ? 'verdict-holds' : ''}">${words[e.verdict]}</td><td>${fmt(e.mMaxMin, 4)}</td><td>${fmt(e.deratingRatio * 100, 1)} %</td><td>${fmt(e.worstLoadAngleDeg, 1)}°</td><td>${fmt(e.mMaxHullMin, 4)}</td><td>${esc(e.reason)}</td></tr>`);
  }
  out.push('</table>');
  if (a.entries.length > ATLAS_ROWS) out.push(`<p class="muted">The ${ATLAS_ROWS} worst of ${a.entries.length} are listed; <code>hexsalvage atlas --csv</code> lists them all.</p>`);
  return out.join('\n');
}

function figure(svg: string, caption: string): string {
  return `<div class="figure">${svg.replace(/^<\?xml[^>]*>\s*/, '')}<p>${esc(caption)}</p></div>`;
}

function flagRow(label: string, list: readonly { polarity: string; triangle: number; detail: readonly string[] }[]): string {
  const ex = list.slice(0, 3).map((x) => `${x.polarity} #${x.triangle}: ${x.detail.join(' ')}`).join('; ');
  return `<tr><td>${esc(label)}</td><td${list.length ? ' class="flag"' : ''}>${list.length}</td><td>${esc(ex || '—')}${list.length > 3 ? ' …' : ''}</td></tr>`;
}

function bindingExplanation(plan: RemedialPlan): string {
  if (!plan.bindingEdge) {
    return `The drive cannot run in this state: under the polarity ${plan.limitingPolarity} (around θ = ${fmt(plan.limitingAngleDeg, 1)}°) the triangles a switching sequence can safely run do not surround the origin, so no balanced three-phase voltage can be synthesised through that part of the cycle.`;
  }
  const [a, b] = plan.bindingEdge;
  const v = (x: typeof a) => `the ${x.class} vector ${x.levels[0]?.map(levelText).join('')} (α ${fmt(x.alpha, 3)}, β ${fmt(x.beta, 3)})`;
  return `The limit binds at θ = ${fmt(plan.limitingAngleDeg, 2)}°, where the phase currents read ${plan.limitingPolarity} (a, b, c). There the reference leaves the region of safely runnable triangles through the edge from ${v(a)} to ${v(b)}: the reference vector can be no longer than ${fmt(plan.mMax, 4)} in that direction, against ${fmt(plan.mMaxHealthy, 4)} for the healthy leg.`;
}
